import { describe, expect, it } from 'vitest';
import type { Hypothesis } from './api-types.js';
import { classifyLabel, familyCaptions, predictedLines } from './predicted-lines.js';

describe('classifyLabel', () => {
  it('reads harmonics with and without a base rate', () => {
    expect(classifyLabel('3×BPFO')).toEqual({ family: 'harmonic', familyName: 'BPFO', harmonic: 3 });
    expect(classifyLabel('2x')).toEqual({ family: 'harmonic', familyName: 'shaft', harmonic: 2 });
    expect(classifyLabel('BPFO')).toEqual({ family: 'harmonic', familyName: 'BPFO', harmonic: 1 });
    expect(classifyLabel('1× pinion-1')).toEqual({ family: 'harmonic', familyName: 'pinion-1', harmonic: 1 });
    expect(classifyLabel('GMF ls-mesh')).toEqual({ family: 'harmonic', familyName: 'GMF ls-mesh', harmonic: 1 });
    expect(classifyLabel('2×GMF hs-mesh')).toEqual({ family: 'harmonic', familyName: 'GMF hs-mesh', harmonic: 2 });
    expect(classifyLabel('3×BPFO fan-de')).toEqual({ family: 'harmonic', familyName: 'BPFO fan-de', harmonic: 3 });
    expect(classifyLabel('1× id-fan')).toEqual({ family: 'harmonic', familyName: 'id-fan', harmonic: 1 });
  });

  it('reads sidebands and names their carrier', () => {
    expect(classifyLabel('GMF-1×')).toMatchObject({ family: 'sideband', familyName: 'GMF' });
    expect(classifyLabel('2×GMF+2×')).toMatchObject({ family: 'sideband', familyName: '2×GMF' });
    expect(classifyLabel('BPFI − fs')).toMatchObject({ family: 'sideband', familyName: 'BPFI' });
    expect(classifyLabel('GMF ± 1x')).toMatchObject({ family: 'sideband', familyName: 'GMF' });
    expect(classifyLabel('GMF hs-mesh − 1× input')).toMatchObject({ family: 'sideband', familyName: 'GMF hs-mesh' });
    expect(classifyLabel('GMF hs-mesh + 1× input')).toMatchObject({ family: 'sideband', familyName: 'GMF hs-mesh' });
    expect(classifyLabel('BPFI - 1× input')).toMatchObject({ family: 'sideband', familyName: 'BPFI' });
  });
});

describe('predictedLines', () => {
  const hypothesis: Hypothesis = {
    fault: 'bearing-outer-race',
    component: 'input-de',
    score: 0.8,
    reason: 'invented',
    domain: 'envelope',
    evidence: [
      { label: '2×BPFO', frequencyHz: 180, predicted: 0.5, measured: null, snrDb: null, matched: false },
      { label: 'BPFO', frequencyHz: 90, predicted: 1, measured: 0.9, snrDb: 14, matched: true },
    ],
  };

  it('sorts by position, keeps matched and missing apart, and maps to orders', () => {
    const lines = predictedLines(hypothesis, (f) => f / 25);
    expect(lines.map((l) => [l.x, l.matched, l.harmonic])).toEqual([
      [3.6, true, 1],
      [7.2, false, 2],
    ]);
    expect(familyCaptions(lines)).toEqual(['harmonics of BPFO (2)']);
  });

  it('draws nothing without a hypothesis', () => {
    expect(predictedLines(null)).toEqual([]);
  });
});
