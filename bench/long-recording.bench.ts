// Long recordings: (1) analyseRecording's cost per sample from 2^16 to 2^24 samples (it should stay flat:
// every stage is bounded, the envelope goes block by block), and (2) one upload of a 10,000,000-sample
// recording to a running `kinespec serve` (built: run `npm run build` first) on a scratch database of the
// PostgreSQL server (BENCH_DATABASE_URL, default the local one; LONG_EMBEDDED=1 for the embedded database):
// its answer time and the server's peak resident memory (VmHWM). Goals: under 10 s and under 600 MB.
// Prints figures; asserts nothing. Run under the shared lock: flock /tmp/kinespec-heavy.lock npm run bench long
//
//   LONG_SIZES (default 16,18,20,22,24: log2 sample counts), LONG_UPLOAD_SAMPLES (default 10000000)
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import postgres from 'postgres';
import { analyseRecording } from '../packages/diagnosis/src/index.js';
import { loadMachineModel } from '../packages/kinematics/src/index.js';
import { simulateRecording } from '../packages/simulator/src/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const MACHINE = 'skelmere-id-fan-1';
const POINT = 'fan-de-h';
const modelText = readFileSync(join(root, `fixtures/machines/${MACHINE}.json`), 'utf8');
const model = loadMachineModel(modelText);
const FS = 25_600;

/** A fan with an outer-race defect, 2^16 simulated samples repeated to `n` (plus a slow drift so no two periods are equal). */
function recordingOf(n: number): Float64Array {
  const base = simulateRecording(model, { pointId: POINT, sampleRateHz: FS, sampleCount: 2 ** 16, faults: [{ fault: 'bearing-outer-race', component: 'fan-de', severity: 0.6 }] }).channels[0]!.samples;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = base[i % base.length]! + 1e-3 * Math.sin(i * 1e-3);
  return x;
}

function perSample(): void {
  const sizes = (process.env.LONG_SIZES ?? '16,18,20,22,24').split(',').map(Number);
  console.log('analyseRecording, one channel at 25.6 kHz (minimum of 3 runs below 2^22, 1 run above)');
  console.log('samples        ms   ns/sample   ratio to 2^18');
  let reference: number | null = null;
  for (const log2 of sizes) {
    const n = 2 ** log2;
    const samples = recordingOf(n);
    const recording = { sampleRateHz: FS, metadata: {}, channels: [{ name: 'acc', unit: 'g', samples }] };
    const runs = log2 < 22 ? 3 : 1;
    let best = Infinity;
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      analyseRecording(recording, { model, pointId: POINT });
      best = Math.min(best, performance.now() - t0);
    }
    const ns = (best / n) * 1e6;
    if (log2 === 18) reference = ns;
    console.log(`2^${String(log2).padEnd(4)} ${best.toFixed(0).padStart(9)} ${ns.toFixed(0).padStart(11)}   ${reference ? (ns / reference).toFixed(2) : '-'}`);
  }
}

async function upload(): Promise<void> {
  const cli = join(root, 'services/cli/bin/kinespec.js');
  if (!existsSync(join(root, 'services/api/dist/index.js'))) {
    console.log('upload part skipped: the service is not built (run `npm run build`)');
    return;
  }
  const n = Number(process.env.LONG_UPLOAD_SAMPLES ?? 10_000_000);
  const body = Buffer.from(new Float32Array(recordingOf(n)).buffer);
  const dataDir = mkdtempSync(join(tmpdir(), 'kinespec-long-'));
  const adminKey = 'long-bench-admin-key-0123456789';
  let database = 'embedded';
  let dropDatabase = async () => {};
  let databaseUrl: string | undefined;
  if (!process.env.LONG_EMBEDDED) {
    const baseUrl = process.env.BENCH_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
    const admin = postgres(baseUrl, { max: 1, onnotice: () => {} });
    try {
      const name = `kinespec_bench_long_${Date.now()}`;
      await admin.unsafe(`create database ${name}`);
      const url = new URL(baseUrl);
      url.pathname = `/${name}`;
      databaseUrl = url.toString();
      database = 'PostgreSQL server';
      dropDatabase = async () => {
        await admin.unsafe(`drop database if exists ${name} with (force)`);
        await admin.end();
      };
    } catch {
      await admin.end();
    }
  }
  const child = spawn(process.execPath, [cli, 'serve', '--port', '0'], {
    env: {
      ...process.env, KINESPEC_DATA_DIR: dataDir, KINESPEC_DEMO: 'off', ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}), KINESPEC_ADMIN_KEY: adminKey, KINESPEC_LOG_LEVEL: 'warn',
      KINESPEC_MAX_UPLOAD_BYTES: String(body.length + 1024), KINESPEC_RATE_LIMIT_MAX: '0',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    const server = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout!.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /listening on (http:\/\/\S+)/.exec(out);
        if (m) resolve(m[1]!);
      });
      child.once('exit', (code) => reject(new Error(`kinespec serve exited with ${code}`)));
    });
    const headers = { authorization: `Bearer ${adminKey}` };
    const put = await fetch(`${server}/api/v1/machines/${MACHINE}/model`, { method: 'PUT', headers: { ...headers, 'content-type': 'application/json' }, body: modelText });
    if (!put.ok) throw new Error(`PUT model: ${put.status}`);
    const hwm = () => Number(/VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${child.pid}/status`, 'utf8'))?.[1] ?? NaN) / 1024;
    const idle = hwm();
    const t0 = performance.now();
    const res = await fetch(`${server}/api/v1/machines/${MACHINE}/points/${POINT}/recordings?sampleRateHz=${FS}&unit=g`, {
      method: 'POST', headers: { ...headers, 'content-type': 'application/octet-stream', prefer: 'wait=120' }, body,
    });
    const text = await res.text();
    const seconds = (performance.now() - t0) / 1000;
    console.log(`\nupload of ${n.toLocaleString('en')} samples (${(body.length / 2 ** 20).toFixed(0)} MiB raw float32) to kinespec serve, ${database}`);
    console.log(`answer ${res.status} in ${seconds.toFixed(1)} s (goal < 10 s); server peak RSS ${hwm().toFixed(0)} MB (goal < 600 MB; ${idle.toFixed(0)} MB before the upload)`);
    console.log(`Server-Timing: ${res.headers.get('server-timing') ?? '-'}`);
    if (res.status >= 300) console.log(text.slice(0, 300));
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => child.once('exit', r));
    rmSync(dataDir, { recursive: true, force: true });
    await dropDatabase();
  }
}

perSample();
await upload();
