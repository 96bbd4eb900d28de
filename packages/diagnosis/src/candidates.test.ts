import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { buildCandidates, ISOLATED_LINE_BINS, RUNNING_LINE_TOLERANCE_BINS, type CandidateLimits } from './candidates.js';
import { lineToleranceHz } from './line-matching.js';

const load = (name: string): MachineModel => loadMachineModel(readFileSync(new URL(`../../../fixtures/machines/${name}.json`, import.meta.url), 'utf8'));
const blower = load('skelmere-aeration-blower-1');
const mixer = load('aeration-mixer-2');

function limits(resolutionHz: number): CandidateLimits {
  return { spectrumTopHz: 10_000, spectrumLowHz: 2 * resolutionHz, spectrumResolutionHz: resolutionHz, envelopeTopHz: 2_000, envelopeLowHz: 0, maxLines: 48 };
}

function candidatesAt(model: MachineModel, pointId: string, speedHz: number, resolutionHz: number) {
  const point = model.points.find((p) => p.id === pointId)!;
  return buildCandidates(model, point, speedHz, point.unit ?? 'g', limits(resolutionHz), []);
}

describe('buildCandidates: one candidate per part the spectrum can tell apart', () => {
  // Common practice: the two gears of a 1:1 pair turn at one speed and share one mesh, so a tooth fault of either puts
  // lines at the same mesh harmonics with the same shaft-rate sidebands; only the measuring point says which is nearer.
  it('names a tooth fault of a 1:1 timing-gear pair once, after the gear on the point’s shaft, the other its twin', () => {
    for (const [pointId, near, far] of [['blower-drive-h', 'drive-timing-gear', 'idle-timing-gear'], ['blower-idle-v', 'idle-timing-gear', 'drive-timing-gear']] as const) {
      const tooth = candidatesAt(blower, pointId, 50, 0.5).filter((c) => c.fault === 'gear-missing-tooth');
      expect(tooth.map((c) => c.component)).toEqual([near]);
      expect(tooth[0]!.twins).toEqual([far]);
      expect(tooth[0]!.own.has('timing-gears')).toBe(true);
    }
  });

  it('keeps gears of a reducing stage apart (their sideband spacings differ)', () => {
    const tooth = candidatesAt(mixer, 'gb-input-h', 24.5, 0.5).filter((c) => c.fault === 'gear-missing-tooth');
    expect(tooth.map((c) => c.component).sort()).toEqual(['pinion-1', 'pinion-2', 'wheel-1', 'wheel-2']);
    expect(tooth.every((c) => c.twins.length === 0)).toBe(true);
  });
});

describe('buildCandidates: running lines are looked for where the speed puts them', () => {
  // Hann window: main lobe ±2 bins (Harris, Proc. IEEE 66:51–83, 1978, table 1); an isolated tone's interpolated
  // frequency scatters by about 0.18 bin at 10 dB over the floor (Rife & Boorstyn 1974 bound × 2.5, line-matching.test.ts).
  it('reads the lines of presence faults on a shaft whose harmonics lie 4 bins apart or more within half a bin', () => {
    const resolutionHz = 0.5;
    const all = candidatesAt(mixer, 'gb-input-h', 24.5, resolutionHz);
    const misalignment = all.find((c) => c.fault === 'misalignment' && c.shaft === 'motor')!;
    expect(24.5 >= ISOLATED_LINE_BINS * resolutionHz).toBe(true);
    expect(misalignment.lines.length).toBeGreaterThan(1);
    for (const l of misalignment.lines) {
      expect(l.toleranceBins).toBe(RUNNING_LINE_TOLERANCE_BINS);
      expect(lineToleranceHz(l, { frequencyResolutionHz: resolutionHz, speedUncertaintyHz: 0 })).toBeCloseTo(0.25, 12);
    }
    // Chance-judged patterns keep the full bin: their chance accounts for the window's width.
    const tooth = all.find((c) => c.fault === 'gear-missing-tooth')!;
    expect(tooth.lines.every((l) => l.toleranceBins === undefined)).toBe(true);
  });

  it('keeps the full bin for a multi-line pattern of a shaft whose harmonics merge (under 4 bins apart), not for a lone 1×', () => {
    // The mixer's output shaft turns at 1.37 Hz with the motor at 24.5 Hz: with 0.5 Hz bins its lines are 2.7 bins apart.
    const all = candidatesAt(mixer, 'gb-input-h', 24.5, 0.5);
    expect(all.find((c) => c.shaft === 'output')!.shaftRatio * 24.5).toBeLessThan(ISOLATED_LINE_BINS * 0.5);
    const outputMisalignment = all.find((c) => c.fault === 'misalignment' && c.shaft === 'output')!;
    expect(outputMisalignment.lines.length).toBeGreaterThan(1);
    expect(outputMisalignment.lines.every((l) => l.toleranceBins === undefined)).toBe(true);
    const outputUnbalance = all.find((c) => c.fault === 'unbalance' && c.shaft === 'output')!;
    expect(outputUnbalance.lines).toHaveLength(1);
    expect(outputUnbalance.lines[0]!.toleranceBins).toBe(RUNNING_LINE_TOLERANCE_BINS);
  });
});
