// `kinespec trend` throughput: snapshots of 2,560 samples (0.1 s at 25.6 kHz, as the PRONOSTIA rig records them)
// trended and forecast on one core. Goal of issue 10: at least 200 snapshots per second. The reference measured in
// the same run is decoding the same files alone (the floor any indicator pays). Prints figures; asserts nothing.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decodeRecording, encodeWav } from '../packages/signal/src/index.js';
import type { CliIo } from '../services/cli/src/io.js';
import { main } from '../services/cli/src/main.js';

const GOAL_PER_S = 200;
const SNAPSHOTS = 600;
const N = 2560;
const FS = 25_600;
const dir = mkdtempSync(join(tmpdir(), 'kinespec-trend-bench-'));
const machine = new URL('../fixtures/machines/aeration-mixer-2.json', import.meta.url).pathname;

// Gaussian snapshots whose r.m.s. rises after two thirds of the run (Park–Miller and Box–Muller), float32 WAV.
let seed = 7;
const u = () => {
  seed = (seed * 16807) % 2147483647;
  return seed / 2147483647;
};
const entries = [];
for (let i = 0; i < SNAPSHOTS; i++) {
  const rms = 0.3 * Math.exp(i > (2 * SNAPSHOTS) / 3 ? 0.01 * (i - (2 * SNAPSHOTS) / 3) : 0);
  const samples = Float64Array.from({ length: N }, () => rms * Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()));
  const file = `s${i}.wav`;
  writeFileSync(join(dir, file), encodeWav({ sampleRateHz: FS, channels: [{ name: 'gb-input-h', unit: 'g', samples }], metadata: {} }, { format: 'float32' }));
  entries.push({ file, recordedAt: new Date(Date.UTC(2025, 0, 1) + 10_000 * i).toISOString() });
}
const manifest = join(dir, 'manifest.json');
writeFileSync(manifest, JSON.stringify(entries));

const quiet: CliIo = { out: () => {}, err: (t) => process.stderr.write(`${t}\n`) };

function best(runs: number, f: () => void | Promise<void>): Promise<number> {
  return (async () => {
    let min = Infinity;
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      await f();
      min = Math.min(min, performance.now() - t0);
    }
    return min;
  })();
}

// warm-up: the JIT and the file cache, so that the first figure is not the cold one
await main(['trend', manifest, '--machine', machine, '--point', 'gb-input-h', '--unit', 'g', '--indicator', 'velocity_rms_mm_per_s', '--threshold', '100', '--json'], quiet);
const decodeMs = await best(3, () => {
  for (const e of entries) decodeRecording(new Uint8Array(readFileSync(join(dir, e.file))), { filename: e.file, unit: 'g' });
});
console.log(`${SNAPSHOTS} snapshots of ${N} samples; minimum of 3 runs on one core`);
console.log(`${'decode only (reference)'.padEnd(44)} ${decodeMs.toFixed(0).padStart(6)} ms  ${((SNAPSHOTS / decodeMs) * 1000).toFixed(0).padStart(6)} snapshots/s`);
for (const indicator of ['acceleration_peak', 'acceleration_rms', 'kurtosis', 'velocity_rms_mm_per_s', 'envelope_rms']) {
  const ms = await best(3, async () => {
    const code = await main(['trend', manifest, '--machine', machine, '--point', 'gb-input-h', '--unit', 'g', '--indicator', indicator, '--threshold', '100', '--json'], quiet);
    if (code !== 0) throw new Error(`trend exited ${code}`);
  });
  const perS = (SNAPSHOTS / ms) * 1000;
  console.log(
    `${`kinespec trend --indicator ${indicator}`.padEnd(44)} ${ms.toFixed(0).padStart(6)} ms  ${perS.toFixed(0).padStart(6)} snapshots/s  ` +
      `${(ms / decodeMs).toFixed(2)} × decode  ${perS >= GOAL_PER_S ? 'meets' : 'MISSES'} the goal of ${GOAL_PER_S}/s`,
  );
}
rmSync(dir, { recursive: true, force: true });
