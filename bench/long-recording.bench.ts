// Long recordings: (1) analyseRecording's cost per sample from 2^16 to 2^24 samples (it should stay flat:
// every stage is bounded, the envelope goes block by block), and (2) one upload of a 10,000,000-sample
// recording to a running `kinespec serve` (built: run `npm run build` first) on a scratch database of the
// PostgreSQL server (BENCH_DATABASE_URL, default the local one; LONG_EMBEDDED=1 for the embedded database):
// its answer time and the server's peak resident memory (VmHWM). Goals: under 10 s and under 600 MB. Then (3) the
// latency of ordinary uploads (65,536 samples, another point, two clients) alone and beside a second large upload:
// goal p99 under 1 s beside it (PROBE_TIMING=1 prints each one's Server-Timing).
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
    // Each large upload differs in its last sample: the same bytes again would be answered as a duplicate.
    let largeSerial = 0;
    const largeBody = () => {
      const b = Buffer.from(body);
      b.writeFloatLE(b.readFloatLE(b.length - 4) + ++largeSerial * 1e-6, b.length - 4);
      return b;
    };
    const large = async () => {
      const t0 = performance.now();
      const res = await fetch(`${server}/api/v1/machines/${MACHINE}/points/${POINT}/recordings?sampleRateHz=${FS}&unit=g`, {
        method: 'POST', headers: { ...headers, 'content-type': 'application/octet-stream', prefer: 'wait=120' }, body: largeBody(),
      });
      return { res, text: await res.text(), seconds: (performance.now() - t0) / 1000 };
    };
    const { res, text, seconds } = await large();
    console.log(`\nupload of ${n.toLocaleString('en')} samples (${(body.length / 2 ** 20).toFixed(0)} MiB raw float32) to kinespec serve, ${database}`);
    console.log(`answer ${res.status} in ${seconds.toFixed(1)} s (goal < 10 s); server peak RSS ${hwm().toFixed(0)} MB (goal < 600 MB; ${idle.toFixed(0)} MB before the upload)`);
    console.log(`Server-Timing: ${res.headers.get('server-timing') ?? '-'}`);
    // Other requests of a plant: a logger's ordinary upload (65,536 samples) to another point, one after another
    // from two clients; their latency alone (after a warm-up) is the reference, then beside a second large upload.
    const probe = probeUploads(server, headers);
    await probe.run(() => false, PROBE_WARM_UP);
    const alone = await probe.run(() => false, PROBE_ALONE);
    let done = false;
    const beside = probe.run(() => done, Infinity);
    await large();
    done = true;
    const during = await beside;
    console.log(`other uploads (65,536 samples, another point, 2 clients): alone p50 ${pct(alone, 0.5)} ms p99 ${pct(alone, 0.99)} ms (${alone.length}); `
      + `beside a large upload p50 ${pct(during, 0.5)} ms p99 ${pct(during, 0.99)} ms (${during.length}; goal p99 < 1000 ms), p99 ratio ${(Number(pct(during, 0.99)) / Number(pct(alone, 0.99))).toFixed(2)}`);
    if (res.status >= 300) console.log(text.slice(0, 300));
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => child.once('exit', r));
    rmSync(dataDir, { recursive: true, force: true });
    await dropDatabase();
  }
}

/** Uploads other requests make while the large one runs: the probe point and its ordinary recording. */
const PROBE_POINT = 'motor-de-h';
const PROBE_ALONE = 40;
const PROBE_WARM_UP = 6;

function probeUploads(server: string, headers: Record<string, string>) {
  const samples = simulateRecording(model, { pointId: PROBE_POINT, sampleRateHz: FS, sampleCount: 2 ** 16, faults: [] }).channels[0]!.samples;
  const f32 = new Float32Array(samples.length);
  for (let i = 0; i < samples.length; i++) f32[i] = samples[i]!;
  const unit = model.points.find((p) => p.id === PROBE_POINT)?.unit ?? 'g';
  let serial = 0;
  const one = async (): Promise<number> => {
    const bytes = new Uint8Array(f32.buffer.slice(0));
    // a different last sample each time, so no upload is a duplicate of another
    new DataView(bytes.buffer).setFloat32(bytes.length - 4, f32[f32.length - 1]! + ++serial * 1e-6, true);
    const t = performance.now();
    const r = await fetch(`${server}/api/v1/machines/${MACHINE}/points/${PROBE_POINT}/recordings?sampleRateHz=${FS}&unit=${encodeURIComponent(unit)}`, {
      method: 'POST', headers: { ...headers, 'content-type': 'application/octet-stream' }, body: bytes,
    });
    await r.arrayBuffer();
    if (r.status >= 300) throw new Error(`probe upload answered ${r.status}`);
    const ms = performance.now() - t;
    if (process.env.PROBE_TIMING) console.log(`probe ${ms.toFixed(0)} ms at ${(t / 1000).toFixed(2)} s: ${r.headers.get('server-timing')}`);
    return ms;
  };
  return {
    async run(stop: () => boolean, count: number): Promise<number[]> {
      const times: number[] = [];
      const client = async () => {
        while (!stop() && times.length < count) times.push(await one());
      };
      await Promise.all([client(), client()]);
      return times.sort((a, b) => a - b);
    },
  };
}

function pct(sorted: readonly number[], q: number): string {
  if (sorted.length === 0) return '-';
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!.toFixed(0);
}

perSample();
await upload();
