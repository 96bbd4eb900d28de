// Analysed uploads per second: 65,536-sample WAV recordings POSTed with autocannon to a local Kinespec
// server (a child process, `kinespec serve`, built: run `npm run build` first) on the PostgreSQL server
// (BENCH_DATABASE_URL, default postgres://postgres@127.0.0.1:5432/postgres; a scratch database is created
// and dropped). Each request carries its own Idempotency-Key, so every one is stored and analysed.
// Prints uploads/s and p50/p99 latency; asserts nothing. Goal: >= 100 uploads/s, p99 < 250 ms on 2 cores.
//
//   UPLOAD_SECONDS (default 20), UPLOAD_CONNECTIONS (default 4), KINESPEC_ANALYSIS_THREADS (passed on)
import { spawn } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';
import postgres from 'postgres';
import { loadMachineModel } from '../packages/kinematics/src/index.js';
import { encodeWav } from '../packages/signal/src/index.js';
import { simulateRecording } from '../packages/simulator/src/index.js';
import { analyseRecording } from '../packages/diagnosis/src/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const baseUrl = process.env.BENCH_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
const SECONDS = Number(process.env.UPLOAD_SECONDS ?? 20);
const CONNECTIONS = Number(process.env.UPLOAD_CONNECTIONS ?? 4);
const ADMIN_KEY = 'bench-admin-key-0123456789abcdef';
const MACHINE = 'skelmere-id-fan-1';
const POINT = 'fan-de-h';

async function main(): Promise<void> {
  const cli = join(root, 'services/cli/bin/kinespec.js');
  if (!existsSync(join(root, 'services/api/dist/index.js'))) {
    console.log('api-upload bench skipped: the service is not built (run `npm run build`)');
    return;
  }
  const admin = postgres(baseUrl, { max: 1, onnotice: () => {} });
  try {
    await admin`select 1`;
  } catch (err) {
    console.log(`api-upload bench skipped: no PostgreSQL at ${baseUrl} (${(err as Error).message})`);
    await admin.end();
    return;
  }
  const name = `kinespec_bench_upload_${Date.now()}`;
  await admin.unsafe(`create database ${name}`);
  const url = new URL(baseUrl);
  url.pathname = `/${name}`;
  const threads = process.env.KINESPEC_ANALYSIS_THREADS ?? String(availableParallelism());
  const child = spawn(process.execPath, [cli, 'serve', '--port', '0'], {
    env: {
      ...process.env,
      DATABASE_URL: url.toString(),
      KINESPEC_ADMIN_KEY: ADMIN_KEY,
      KINESPEC_DEMO: 'off',
      KINESPEC_RATE_LIMIT_MAX: '0',
      KINESPEC_LOG_LEVEL: 'warn',
      KINESPEC_ANALYSIS_THREADS: threads,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    const server = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout!.on('data', (chunk: Buffer) => {
        out += chunk.toString();
        const m = /listening on (http:\/\/\S+)/.exec(out);
        if (m) resolve(m[1]!);
      });
      child.once('exit', (code) => reject(new Error(`kinespec serve exited with ${code}: ${out}`)));
    });
    const adminHeaders = { authorization: `Bearer ${ADMIN_KEY}` };
    const modelText = readFileSync(join(root, `fixtures/machines/${MACHINE}.json`), 'utf8');
    const put = await fetch(`${server}/api/v1/machines/${MACHINE}/model`, { method: 'PUT', headers: { ...adminHeaders, 'content-type': 'application/json' }, body: modelText });
    if (!put.ok) throw new Error(`PUT model: ${put.status} ${await put.text()}`);
    const logger = (await (await fetch(`${server}/api/v1/keys`, { method: 'POST', headers: { ...adminHeaders, 'content-type': 'application/json' }, body: JSON.stringify({ role: 'logger', label: 'bench' }) })).json()) as { key: string };

    // one realistic recording (a fan with an outer-race defect), 65,536 samples at 25.6 kHz, float32 WAV
    const model = loadMachineModel(modelText);
    const recording = simulateRecording(model, { pointId: POINT, sampleRateHz: 25_600, sampleCount: 65_536, faults: [{ fault: 'bearing-outer-race', component: 'fan-de', severity: 0.6 }] });
    const wav = Buffer.from(encodeWav({ ...recording, channels: recording.channels.slice(0, 1) }, { format: 'float32' }));
    const path = `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`;
    const warm = await fetch(server + path, { method: 'POST', headers: { authorization: `Bearer ${logger.key}`, 'content-type': 'audio/wav', 'idempotency-key': 'warm-up' }, body: wav });
    if (warm.status !== 201) throw new Error(`warm-up upload: ${warm.status} ${await warm.text()}`);

    let n = 0;
    const result = await autocannon({
      url: server,
      connections: CONNECTIONS,
      duration: SECONDS,
      requests: [{
        method: 'POST',
        path,
        headers: { authorization: `Bearer ${logger.key}`, 'content-type': 'audio/wav' },
        body: wav,
        setupRequest: (req: Record<string, unknown>) => ({ ...req, headers: { ...(req['headers'] as object), 'idempotency-key': `bench-${n++}` } }),
      }],
    });
    const ok = result['2xx'];
    const [stored] = await admin.unsafe(`select 1`).then(async () => {
      const s = postgres(url.toString(), { max: 1, onnotice: () => {} });
      const rows = await s<{ recordings: number; analyses: number }[]>`select (select count(*)::int from recordings) as recordings, (select count(*)::int from analyses) as analyses`;
      await s.end();
      return rows;
    });
    console.log(`server: PostgreSQL, ${threads} analysis thread(s), ${availableParallelism()} cores; ${CONNECTIONS} connections for ${SECONDS} s; body ${(wav.length / 1024).toFixed(0)} KiB`);
    console.log(`analysed uploads        ${(ok / SECONDS).toFixed(1).padStart(8)} /s   (${ok} x 201, ${result.non2xx} non-2xx, ${result.errors} errors; ${stored!.recordings} recordings, ${stored!.analyses} analyses stored)`);
    console.log(`latency                 p50 ${String(result.latency.p50).padStart(5)} ms   p99 ${String(result.latency.p99).padStart(5)} ms   max ${result.latency.max} ms`);
    // one upload at a time: where its time goes (the service's Server-Timing header)
    const phases: Record<string, number[]> = {};
    for (let i = 0; i < 10; i++) {
      const res = await fetch(server + path, { method: 'POST', headers: { authorization: `Bearer ${logger.key}`, 'content-type': 'audio/wav', 'idempotency-key': `probe-${i}` }, body: wav });
      await res.arrayBuffer();
      for (const m of (res.headers.get('server-timing') ?? '').matchAll(/(\w+);dur=([\d.]+)/g)) (phases[m[1]!] ??= []).push(Number(m[2]));
    }
    const median = (x: number[]) => [...x].sort((a, b) => a - b)[Math.floor(x.length / 2)]!;
    console.log(`one at a time (median)  ${Object.entries(phases).map(([k, v]) => `${k} ${median(v).toFixed(1)} ms`).join(', ')}`);
    // what one analysis costs on its own (same recording, this process, after the load): the ceiling it sets
    const runs = 10;
    analyseRecording(recording, { model, pointId: POINT });
    const t0 = performance.now();
    for (let i = 0; i < runs; i++) analyseRecording(recording, { model, pointId: POINT });
    const analysisMs = (performance.now() - t0) / runs;
    console.log(`analyseRecording alone  ${analysisMs.toFixed(1).padStart(8)} ms per recording: at most ${((1000 / analysisMs) * Number(threads)).toFixed(0)} analyses/s on ${threads} thread(s)`);
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => child.once('exit', r));
    await admin.unsafe(`drop database if exists ${name} with (force)`);
    await admin.end();
  }
}

await main();
