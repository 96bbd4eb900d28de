import { readFileSync } from 'node:fs';
import { componentLines, loadMachineModel } from '@kinespec/kinematics';
import { noiseFloor, welchSpectrum } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { gaussianNoise } from '../test/signals.js';
import { matchableSpectrum } from './line-matching.js';
import { speedFromSpectrum } from './running-speed.js';

const model = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));

/** Tones at the model's running lines (1×, 2× of every shaft, mesh frequencies) for a known speed, plus noise. */
function machineAt(speedHz: number, fs: number, n: number): Float64Array {
  const x = gaussianNoise(n, 3, 0.02);
  const lines = componentLines(model, speedHz).filter((l) => (l.family === 'shaft-harmonic' && l.harmonic <= 2) || (l.family === 'gear-mesh' && l.harmonic === 1));
  lines.forEach((l, j) => {
    const a = l.family === 'gear-mesh' ? 0.3 : 0.05;
    for (let i = 0; i < n; i++) x[i] += a * Math.sin((2 * Math.PI * l.frequencyHz * i) / fs + j);
  });
  return x;
}

describe('speedFromSpectrum', () => {
  it('recovers a speed 2.3 % under nominal from the running lines, within its stated uncertainty', () => {
    const fs = 8192;
    const n = 8192 * 16;
    const trueHz = (model.speed.nominalRpm * (1 - 0.023)) / 60;
    const spectrum = welchSpectrum(machineAt(trueHz, fs, n), fs, { segmentLength: 32768, scaling: 'peak' });
    const found = speedFromSpectrum(matchableSpectrum(spectrum, noiseFloor(spectrum)), model, { searchRangeHz: [1380 / 60, 1500 / 60] })!;
    expect(found).not.toBeNull();
    expect(Math.abs(found.speedHz - trueHz)).toBeLessThan(Math.max(3 * found.uncertaintyHz, 1e-4 * trueHz));
    expect(Math.abs(found.speedHz - trueHz) / trueHz).toBeLessThan(5e-4);
    expect(found.support.some((s) => s.label === 'GMF stage-1')).toBe(true);
  });

  it('returns null when no running line stands above the noise', () => {
    const fs = 8192;
    const spectrum = welchSpectrum(gaussianNoise(65536, 8, 0.1), fs, { segmentLength: 16384, scaling: 'peak' });
    expect(speedFromSpectrum(matchableSpectrum(spectrum, noiseFloor(spectrum)), model, { searchRangeHz: [1380 / 60, 1500 / 60] })).toBeNull();
  });

  it('rejects an empty or inverted search range, naming the parameter', () => {
    const spectrum = welchSpectrum(gaussianNoise(8192, 8, 0.1), 8192, { scaling: 'peak' });
    expect(() => speedFromSpectrum(matchableSpectrum(spectrum, noiseFloor(spectrum)), model, { searchRangeHz: [30, 20] })).toThrow(/searchRangeHz/);
  });
});
