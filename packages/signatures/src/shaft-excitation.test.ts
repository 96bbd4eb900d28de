import { describe, expect, it } from 'vitest';
import { electricalExcitation } from './electrical-excitation.js';
import { modulatedLines } from './line-modulation.js';
import { loosenessExcitation, misalignmentExcitation, unbalanceExcitation } from './shaft-excitation.js';

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

describe('unbalanceExcitation', () => {
  it('is one line at 1× (common practice)', () => {
    expect(unbalanceExcitation().lines.map((l) => [l.order, l.coefficient.amplitude])).toEqual([[1, 1]]);
  });
});

describe('misalignmentExcitation', () => {
  it('gives 1×, 2× and 3× with the stated relative sizes', () => {
    expect(misalignmentExcitation({ relativeAmplitudes: [1.5, 0.2] }).lines.map((l) => [l.order, l.coefficient.amplitude])).toEqual([[1, 1], [2, 1.5], [3, 0.2]]);
  });
});

describe('loosenessExcitation', () => {
  it('gives half orders with the pulse-train envelope |sinc(n·w)| and its zeros', () => {
    // c_n = w·sinc(n·w) for a rectangular pulse of w periods (Oppenheim & Willsky Ex. 3.5, from memory).
    const ex = loosenessExcitation({ periodRevs: 2, widthFraction: 0.1, harmonics: 24 });
    expect(ex.fundamentalOrder).toBe(0.5);
    const a1 = Math.abs(sinc(0.1));
    for (const l of ex.lines) expect(l.coefficient.amplitude).toBeCloseTo(Math.abs(sinc(l.harmonic * 0.1)) / a1, 12);
    expect(ex.lines.map((l) => l.order)).not.toContain(5); // n = 10: sinc(1) = 0
    expect(ex.lines[0]!.order).toBe(0.5);
  });
});

describe('electricalExcitation', () => {
  it('puts a line at twice the line frequency, fixed in Hz', () => {
    const ex = electricalExcitation({ lineFrequencyHz: 50 });
    expect(ex.lines).toHaveLength(1);
    expect(ex.lines[0]!.frequencyHz).toBe(100);
    expect(ex.lines[0]!.order).toBeNull();
  });
});

describe('modulatedLines', () => {
  it('adds pairs that land on one frequency (cos 2x·cos x = (cos 3x + cos x)/2)', () => {
    const one = (a: number) => ({ a0: 1, terms: [{ harmonic: 1, a, b: 0, amplitude: a, phaseRad: 0 }] });
    const lines = modulatedLines(one(1), 2, one(1), 1, () => '');
    expect(lines.map((l) => [l.order, l.coefficient.amplitude])).toEqual([[1, 1.5], [2, 1], [3, 0.5]]);
  });
});
