// Decoding throughput: 2^20 samples from WAV (float32, pcm16) and CSV, in million samples per second, against
// scipy.io.wavfile.read and numpy.loadtxt on the same files in the same run. Prints figures; asserts nothing.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decodeCsv, decodeWav, encodeWav } from '../packages/signal/src/decode/index.js';

const N = 2 ** 20;
const FS = 25600;
const work = mkdtempSync(join(tmpdir(), 'kinespec-decode-bench-'));

/** Invented test signal: two machine lines and noise (xorshift32), within ±1 full scale. */
function signal(n: number): Float64Array {
  const x = new Float64Array(n);
  let s = 0x9e3779b9;
  for (let i = 0; i < n; i++) {
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    const noise = (s >>> 0) / 4294967296 - 0.5;
    x[i] = 0.4 * Math.sin((2 * Math.PI * 29.6 * i) / FS) + 0.2 * Math.sin((2 * Math.PI * 1243.7 * i) / FS) + 0.1 * noise;
  }
  return x;
}

const x = signal(N);
const recording = { sampleRateHz: FS, channels: [{ name: 'DE-H', unit: 'FS', samples: x }], metadata: {} };
const files = {
  float32: join(work, 'float32.wav'),
  pcm16: join(work, 'pcm16.wav'),
  csvTime: join(work, 'time-value.csv'),
  csvSingle: join(work, 'single.csv'),
  csv18e: join(work, 'savetxt-18e.csv'),
};
writeFileSync(files.float32, encodeWav(recording, { format: 'float32' }));
writeFileSync(files.pcm16, encodeWav(recording, { format: 'pcm16' }));
const rows: string[] = new Array(N);
const cells: string[] = new Array(N);
for (let i = 0; i < N; i++) {
  cells[i] = x[i].toFixed(6);
  rows[i] = `${(i / FS).toFixed(7)},${cells[i]}`;
}
writeFileSync(files.csvTime, `time_s,accel [g]\n${rows.join('\n')}\n`);
writeFileSync(files.csvSingle, `accel [g]\n${cells.join('\n')}\n`);
// numpy.savetxt's default format, '%.18e': 19 significant digits, past Clinger's fast path.
for (let i = 0; i < N; i++) rows[i] = `${(i / FS).toExponential(18)},${x[i].toExponential(18)}`;
writeFileSync(files.csv18e, `time_s,accel [g]\n${rows.join('\n')}\n`);

interface Timing {
  bestMs: number;
  medianMs: number;
}

function time(run: () => unknown, repetitions: number): Timing {
  run();
  const ms: number[] = [];
  for (let k = 0; k < repetitions; k++) {
    const t0 = performance.now();
    run();
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  return { bestMs: ms[0], medianMs: ms[Math.floor(ms.length / 2)] };
}

const msps = (ms: number) => (N / ms / 1000).toFixed(1);
function line(name: string, t: Timing, reference?: Timing, referenceName?: string): void {
  let text = `${name.padEnd(44)} best ${t.bestMs.toFixed(1).padStart(7)} ms (${msps(t.bestMs).padStart(6)} MS/s)  median ${t.medianMs.toFixed(1).padStart(7)} ms`;
  if (reference) text += `   vs ${referenceName}: x${(reference.bestMs / t.bestMs).toFixed(2)} (best), x${(reference.medianMs / t.medianMs).toFixed(2)} (median)`;
  console.log(text);
}

// Same files, same run: scipy.io.wavfile.read from bytes in memory (with and without the float64 conversion
// our decoder includes) and numpy.loadtxt from the file.
const python = `
import io, json, sys, time
import numpy as np
from scipy.io import wavfile
def t(f, reps):
    f()
    ms = []
    for _ in range(reps):
        t0 = time.perf_counter(); f(); ms.append((time.perf_counter() - t0) * 1000)
    ms.sort()
    return {'bestMs': ms[0], 'medianMs': ms[len(ms) // 2]}
files = json.loads(sys.argv[1])
out = {}
for k in ('float32', 'pcm16'):
    data = open(files[k], 'rb').read()
    out[k] = t(lambda: wavfile.read(io.BytesIO(data)), 7)
    scale = 1.0 if k == 'float32' else 1 / 32768
    out[k + 'F64'] = t(lambda: wavfile.read(io.BytesIO(data))[1].astype(np.float64) * scale, 7)
out['csvTime'] = t(lambda: np.loadtxt(files['csvTime'], delimiter=',', skiprows=1), 3)
out['csvSingle'] = t(lambda: np.loadtxt(files['csvSingle'], skiprows=1), 3)
out['csv18e'] = t(lambda: np.loadtxt(files['csv18e'], delimiter=',', skiprows=1), 3)
print(json.dumps(out))
`;

try {
  const bytes = Object.fromEntries(Object.entries(files).map(([k, f]) => [k, new Uint8Array(readFileSync(f))]));
  console.log(`decode ${N} samples (2^20) at ${FS} Hz, mono; files in ${work}`);
  const ts = {
    float32: time(() => decodeWav(bytes.float32), 9),
    pcm16: time(() => decodeWav(bytes.pcm16), 9),
    csvTime: time(() => decodeCsv(bytes.csvTime), 7),
    csvSingle: time(() => decodeCsv(bytes.csvSingle, { sampleRateHz: FS }), 7),
    csv18e: time(() => decodeCsv(bytes.csv18e), 5),
    freshMemory: time(() => new Float64Array(N).fill(1), 9),
    csvNaive: time(() => {
      const text = new TextDecoder().decode(bytes.csvTime);
      const lines = text.split('\n');
      const out = new Float64Array(lines.length - 2);
      for (let i = 1; i < lines.length - 1; i++) out[i - 1] = Number(lines[i].split(',')[1]);
      return out;
    }, 5),
  };
  const py = spawnSync('python3', ['-c', python, JSON.stringify(files)], { encoding: 'utf8' });
  const ref: Record<string, Timing> | undefined = py.status === 0 ? JSON.parse(py.stdout) : undefined;
  if (!ref) console.log(`(python3 with scipy not available: ${py.error?.message ?? py.stderr.trim().split('\n').pop()})`);
  line('decodeWav float32', ts.float32, ref?.float32, 'scipy.io.wavfile.read');
  if (ref) line('  (scipy read + astype(float64))', ref.float32F64);
  line('decodeWav pcm16 -> float64 FS', ts.pcm16, ref?.pcm16, 'scipy.io.wavfile.read');
  if (ref) line('  (scipy read + astype(float64) / 32768)', ref.pcm16F64, undefined);
  if (ref) console.log(`${''.padEnd(44)} vs scipy read + float64 conversion: float32 x${(ref.float32F64.bestMs / ts.float32.bestMs).toFixed(2)}, pcm16 x${(ref.pcm16F64.bestMs / ts.pcm16.bestMs).toFixed(2)} (best)`);
  line('decodeCsv time_s,value (2^21 numbers)', ts.csvTime, ref?.csvTime, 'numpy.loadtxt');
  line('decodeCsv single column', ts.csvSingle, ref?.csvSingle, 'numpy.loadtxt');
  line("decodeCsv '%.18e' time_s,value", ts.csv18e, ref?.csv18e, 'numpy.loadtxt');
  line('split + Number() baseline (time_s,value)', ts.csvNaive);
  console.log(`${''.padEnd(44)} hand-rolled scanner vs split + Number(): x${(ts.csvNaive.bestMs / ts.csvTime.bestMs).toFixed(2)} (best)`);
  // Where WAV time goes: every decode returns fresh Float64Arrays, and first-touching fresh pages dominates here.
  line('(first touch of a fresh 8 MiB Float64Array)', ts.freshMemory);
} finally {
  rmSync(work, { recursive: true, force: true });
}
