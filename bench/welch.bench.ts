// Welch PSD throughput against scipy.signal.welch, and `kinespec spectrum` start to finish against a
// python process doing the same job. Prints figures; asserts nothing (no timed tests: DEVELOPERS.md).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { welchPsd } from '../packages/signal/src/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const work = mkdtempSync(join(tmpdir(), 'kinespec-welch-bench-'));
const FS = 25600;
const SEGMENT = 8192;

/** Invented test signal: two machine lines and broadband noise (xorshift32, Box-Muller). */
function signal(n: number): Float64Array {
  let s = 2463534242;
  const u = () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return (s + 0.5) / 4294967296;
  };
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / FS;
    x[i] = Math.sin(2 * Math.PI * 49.7 * t) + 0.3 * Math.sin(2 * Math.PI * 1234.5 * t) + 0.1 * Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  }
  return x;
}

const median = (a: number[]) => [...a].sort((p, q) => p - q)[Math.floor(a.length / 2)];
const fmt = (ms: number) => `${ms.toFixed(1)} ms`;

function hasScipy(): boolean {
  const r = spawnSync('python3', ['-c', 'import scipy.signal, scipy.io.wavfile, numpy'], { stdio: 'ignore' });
  return r.status === 0;
}

function benchWelch(python: boolean): void {
  const n = 1 << 20;
  const x = signal(n);
  const reps = 15;
  for (let i = 0; i < 3; i++) welchPsd(x, FS, { window: 'hann', segmentLength: SEGMENT, overlapFraction: 0.5 });
  const times: number[] = [];
  let psd = welchPsd(x, FS, { window: 'hann', segmentLength: SEGMENT, overlapFraction: 0.5 });
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    psd = welchPsd(x, FS, { window: 'hann', segmentLength: SEGMENT, overlapFraction: 0.5 });
    times.push(performance.now() - t0);
  }
  const ts = median(times);
  console.log(`welchPsd, 2^20 float64 samples, Hann, ${SEGMENT} segment, 50 % overlap, ${psd.averages} averages, ${reps} repetitions`);
  console.log(`  TypeScript (fft.js):   median ${fmt(ts)}, best ${fmt(Math.min(...times))}, ${(n / ts / 1e3).toFixed(1)} M samples/s`);
  if (!python) {
    console.log('  scipy: python3 with scipy not found, comparison skipped');
    return;
  }
  const dataPath = join(work, 'x.f64');
  const outPath = join(work, 'p.f64');
  writeFileSync(dataPath, new Uint8Array(x.buffer));
  const script = `
import json, sys, time
import numpy as np
from scipy import signal
x = np.fromfile(sys.argv[1], dtype='<f8')
for _ in range(3): signal.welch(x, ${FS}, window='hann', nperseg=${SEGMENT}, noverlap=${SEGMENT / 2})
times = []
for _ in range(${reps}):
    t0 = time.perf_counter()
    f, p = signal.welch(x, ${FS}, window='hann', nperseg=${SEGMENT}, noverlap=${SEGMENT / 2})
    times.append((time.perf_counter() - t0) * 1e3)
p.astype('<f8').tofile(sys.argv[2])
import scipy
print(json.dumps({"median": float(np.median(times)), "best": min(times), "scipy": scipy.__version__}))
`;
  const r = spawnSync('python3', ['-c', script, dataPath, outPath], { encoding: 'utf8' });
  if (r.status !== 0) {
    console.log(`  scipy run failed: ${r.stderr.split('\n').filter(Boolean).pop()}`);
    return;
  }
  const py = JSON.parse(r.stdout) as { median: number; best: number; scipy: string };
  const ref = new Float64Array(readFileSync(outPath).buffer.slice(0));
  let worst = 0;
  for (let k = 0; k < ref.length; k++) worst = Math.max(worst, Math.abs(psd.values[k] - ref[k]) / Math.abs(ref[k]));
  console.log(`  scipy ${py.scipy} welch:    median ${fmt(py.median)}, best ${fmt(py.best)}, ${(n / py.median / 1e3).toFixed(1)} M samples/s`);
  console.log(
    `  ratio scipy / TypeScript (>= 1 means TypeScript is at least as fast): medians ${(py.median / ts).toFixed(2)}, ` +
      `best times ${(py.best / Math.min(...times)).toFixed(2)} (best times are the steadier figure on a busy machine)`,
  );
  console.log(`  largest relative difference from scipy over ${ref.length} bins: ${worst.toExponential(2)}`);
}

/** Mono IEEE-float WAV (RIFF layout of check-values.md section 11). */
function floatWav(x: Float64Array, sampleRateHz: number): Uint8Array {
  const bytes = new Uint8Array(44 + x.length * 4);
  const v = new DataView(bytes.buffer);
  const ascii = (o: number, s: string) => [...s].forEach((c, i) => v.setUint8(o + i, c.charCodeAt(0)));
  ascii(0, 'RIFF');
  v.setUint32(4, 36 + x.length * 4, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  v.setUint32(16, 16, true);
  v.setUint16(20, 3, true);
  v.setUint16(22, 1, true);
  v.setUint32(24, sampleRateHz, true);
  v.setUint32(28, sampleRateHz * 4, true);
  v.setUint16(32, 4, true);
  v.setUint16(34, 32, true);
  ascii(36, 'data');
  v.setUint32(40, x.length * 4, true);
  new Float32Array(bytes.buffer, 44, x.length).set(x);
  return bytes;
}

function wallMs(cmd: string, args: string[]): { ms: number; ok: boolean; err: string } {
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 28 });
  return { ms: performance.now() - t0, ok: r.status === 0, err: (r.stderr ?? '').split('\n').filter(Boolean).pop() ?? '' };
}

function benchCli(python: boolean): void {
  const bin = join(root, 'services/cli/bin/kinespec.js');
  const built = join(root, 'services/cli/dist/verbs/spectrum.js');
  const n = 1 << 22;
  const wav = join(work, 'feed-pump-de.wav');
  writeFileSync(wav, floatWav(signal(n), FS));
  console.log(`\nkinespec spectrum on a 2^22-sample float32 WAV (${FS} Hz, ${(n / FS).toFixed(0)} s), start to finish, --json to a pipe, 5 runs`);
  if (!existsSync(built)) {
    console.log('  services/cli/dist is missing: run `npm run build` first; skipped');
    return;
  }
  const cli = Array.from({ length: 5 }, () => wallMs(process.execPath, [bin, 'spectrum', wav, '--unit', 'g', '--json']));
  if (!cli[0].ok) {
    console.log(`  kinespec failed: ${cli[0].err}`);
    return;
  }
  const cliMs = median(cli.map((c) => c.ms));
  console.log(`  kinespec spectrum (node ${process.version}): median ${fmt(cliMs)}`);
  if (!python) {
    console.log('  python3 with scipy not found, comparison skipped');
    return;
  }
  // the same job in python: read the WAV, Welch (Hann, 8192, 50 %), rms scaling, overall rms, top peaks, JSON out
  const script = `
import json, sys
import numpy as np
from scipy.io import wavfile
from scipy import signal
fs, x = wavfile.read(sys.argv[1])
x = x.astype(np.float64)
f, p = signal.welch(x, fs, window='hann', nperseg=8192, noverlap=4096, scaling='spectrum')
w = signal.get_window('hann', 8192)
enbw = len(w) * np.sum(w**2) / np.sum(w)**2
rms = float(np.sqrt(np.sum(p) / enbw))
v = np.sqrt(p)
k = np.argsort(v)[::-1][:10]
json.dump({"sampleRateHz": fs, "overall": {"rms": rms}, "peaks": [{"frequencyHz": float(f[i]), "amplitude": float(v[i])} for i in k],
           "frequenciesHz": f.tolist(), "values": v.tolist()}, sys.stdout)
`;
  const py = Array.from({ length: 5 }, () => wallMs('python3', ['-c', script, wav]));
  if (!py[0].ok) {
    console.log(`  python failed: ${py[0].err}`);
    return;
  }
  const pyMs = median(py.map((c) => c.ms));
  console.log(`  python3 + scipy (wavfile.read + welch + json): median ${fmt(pyMs)}`);
  console.log(`  ratio python / kinespec (>= 1 means kinespec is at least as fast): ${(pyMs / cliMs).toFixed(2)}`);
}

try {
  const python = hasScipy();
  benchWelch(python);
  benchCli(python);
} finally {
  rmSync(work, { recursive: true, force: true });
}
