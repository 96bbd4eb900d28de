import { noiseFloor, welchSpectrum } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, sine } from '../test/signals.js';
import { LineCatalogue } from './ambiguity.js';
import { scoreCandidates, type Candidate, type ScoringInputs } from './hypothesis-score.js';
import { matchableSpectrum } from './line-matching.js';

const fs = 4096;
const n = 4096 * 16;
const shaftHz = 25;

function spectrumOf(lines: Array<[number, number]>) {
  const x = add(gaussianNoise(n, 9, 0.001), ...lines.map(([f, a]) => sine(n, fs, f, a)));
  const s = welchSpectrum(x, fs, { segmentLength: 16384, scaling: 'peak' });
  return matchableSpectrum(s, noiseFloor(s));
}

function candidate(fault: string, orders: Array<[number, number]>, extra: Partial<Candidate> = {}): Candidate {
  return {
    fault,
    component: 'shaft-a',
    domain: 'spectrum',
    lines: orders.map(([o, a]) => ({ frequencyHz: o * shaftHz, amplitude: a, label: `${o}×`, order: o })),
    context: 'shaft:shaft-a',
    own: new Set(['shaft-a']),
    ownsRunningLines: true,
    kind: 'shaft',
    shaftRatio: 1,
    atPoint: true,
    ...extra,
  };
}

function inputs(spectrum: ReturnType<typeof spectrumOf>, catalogue: LineCatalogue = new LineCatalogue([])): ScoringInputs {
  return {
    spectra: { spectrum, envelope: null },
    speedUncertaintyHz: 0,
    catalogue: { spectrum: catalogue, envelope: catalogue },
    runningLines: new LineCatalogue([]),
    minSnrDb: 6,
    level: () => 1,
    support: () => 1,
  };
}

// Patterns from common practice (machine-model.md fault table): unbalance 1×; misalignment 1×, 2× (and 3×), 2× dominant.
const unbalance = candidate('unbalance', [[1, 1]]);
const misalignment = candidate('misalignment', [[1, 0.5], [2, 1], [3, 0.3]]);

describe('scoreCandidates', () => {
  it('lets misalignment win over unbalance when 2× is the strongest line (exclusivity)', () => {
    const s = spectrumOf([[25, 0.3], [50, 0.6], [75, 0.2]]);
    const [u, m] = scoreCandidates([unbalance, misalignment], inputs(s));
    expect(m!.score).toBeGreaterThanOrEqual(0.5);
    expect(u!.score).toBeLessThan(0.5);
    expect(u!.parts.exclusivity).toBeLessThan(0.3);
  });

  it('lets unbalance win when 1× dominates and 2×, 3× are small (shape)', () => {
    const s = spectrumOf([[25, 0.8], [50, 0.02], [75, 0.01]]);
    const [u, m] = scoreCandidates([unbalance, misalignment], inputs(s));
    expect(u!.score).toBeGreaterThanOrEqual(0.5);
    expect(m!.parts.shape).toBeLessThan(0.5);
    expect(u!.score).toBeGreaterThan(m!.score);
  });

  it('scores 0 when none of the predicted lines stands above the noise', () => {
    const [u] = scoreCandidates([unbalance], inputs(spectrumOf([])));
    expect(u!.score).toBe(0);
    expect(u!.matches.every((x) => !x.matched)).toBe(true);
  });

  it('keeps a hypothesis seen only through lines another component also explains below 0.5', () => {
    const s = spectrumOf([[25, 0.8]]);
    const catalogue = new LineCatalogue([{ frequencyHz: 25, component: 'motor', label: 'twice something of the motor', kind: 'motor' }]);
    const [u] = scoreCandidates([unbalance], inputs(s, catalogue));
    expect(u!.matches[0]!.ambiguous).toBe(true);
    expect(u!.score).toBeLessThan(0.5);
  });
});
