import { describe, expect, it } from 'vitest';
import type { Hypothesis } from './api-types.js';
import { amplitudeUnits, evidenceCounts, prefersLogScale } from './evidence-units.js';
import type { PredictedLine } from './predicted-lines.js';

const evidence = (matched: boolean, predicted: number, predictedScaled?: number) => ({ label: '1×', frequencyHz: 25, predicted, measured: 2, snrDb: 20, matched, ...(predictedScaled !== undefined ? { predictedScaled } : {}) });
const hyp = (over: Partial<Hypothesis>): Hypothesis => ({ fault: 'unbalance', component: 'rotor', score: 0.6, reason: '', domain: 'spectrum', evidence: [], ...over });
const spectra = { spectrum: { quantity: 'acceleration' as const, unit: 'g', scaling: 'peak' as const, frequencyResolutionHz: 1, frequenciesHz: [], values: [] }, envelopeSpectrum: { bandHz: [2000, 6000] as [number, number], unit: 'g', frequenciesHz: [], values: [] } };

describe('evidenceCounts', () => {
  it("takes the analysis's counts (those of the reason sentence) over a count of the evidence rows", () => {
    expect(evidenceCounts(hyp({ evidence: [evidence(true, 1), evidence(false, 1)] }))).toEqual({ matched: 1, predicted: 2 });
    expect(evidenceCounts(hyp({ evidence: [evidence(true, 1)], linesMatched: 48, linesPredicted: 48 }))).toEqual({ matched: 48, predicted: 48 });
  });
});

describe('amplitudeUnits', () => {
  it('puts the unit in both amplitude columns, the scaled prediction sharing the measured unit', () => {
    const u = amplitudeUnits(hyp({ unit: 'g peak', evidence: [evidence(true, 0.001, 2.4)] }), spectra);
    expect([u.predictedHeading, u.measuredHeading, u.scaled]).toEqual(['Predicted (g peak, scaled)', 'Measured (g peak)', true]);
    expect(u.predictedOf(evidence(true, 0.001, 2.4))).toBe(2.4);
  });

  it('falls back to the raw prediction with a heading that says it is on the model scale, and the chart unit for measurements', () => {
    const u = amplitudeUnits(hyp({ domain: 'envelope', evidence: [evidence(true, 0.001)] }), spectra);
    expect([u.predictedHeading, u.measuredHeading]).toEqual(['Predicted (model scale, not fitted)', 'Measured (g peak)']);
    expect(u.predictedOf(evidence(true, 0.001))).toBe(0.001);
  });
});

describe('prefersLogScale', () => {
  const line = (x: number, measured: number, matched = true) => ({ x, measured, matched }) as PredictedLine;
  const xs = [0, 10, 20, 30, 40];
  it('chooses log when the matched peaks are under a tenth of the tallest peak shown', () => {
    expect(prefersLogScale([line(10, 0.02), line(20, 0.03), line(30, 0.05)], xs, [0, 0.02, 0.03, 1, 0.05], null)).toBe(true);
  });
  it('keeps linear when the evidence is among the tall peaks, or when nothing is matched', () => {
    expect(prefersLogScale([line(10, 0.8), line(30, 1)], xs, [0, 0.8, 0.1, 1, 0.05], null)).toBe(false);
    expect(prefersLogScale([line(10, 0.01, false)], xs, [0, 0.01, 0, 1, 0], null)).toBe(false);
  });
  it('judges only the range the chart opens on', () => {
    expect(prefersLogScale([line(10, 0.05)], xs, [0, 0.05, 0.06, 1, 0], { min: 0, max: 20 })).toBe(false);
  });
});
