import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  assemblyPhaseCount,
  assemblyPhaseFrequencyHz,
  gearMeshFrequencyHz,
  greatestCommonDivisor,
  huntingToothFrequencyHz,
} from './gear-frequencies.js';

describe('gearMeshFrequencyHz', () => {
  it('is teeth × shaft speed, the same from either gear of a pair', () => {
    // Common practice: GMF = N_p·f_p = N_g·f_g (check-values §4: 20 teeth at 30 Hz = 600 Hz; 45 teeth at 13.333 Hz).
    expect(gearMeshFrequencyHz(20, 30)).toBe(600);
    expect(gearMeshFrequencyHz(45, (30 * 20) / 45)).toBeCloseTo(600, 12);
  });
});

describe('assemblyPhaseCount', () => {
  it('is the greatest common divisor of the tooth counts (1 for a hunting-tooth set)', () => {
    // W. C. Foiles, "Gear Frequencies Using the Euclidean Algorithm", Vibration Institute: N_A = GCD(N_p, N_g);
    // the set is hunting if and only if the GCD is 1. Worked pairs from check-values §4.
    expect(assemblyPhaseCount(20, 45)).toBe(5);
    expect(assemblyPhaseCount(17, 41)).toBe(1);
    expect(assemblyPhaseCount(22, 66)).toBe(22);
  });
});

describe('huntingToothFrequencyHz', () => {
  it('reproduces the worked examples GMF·N_A/(N_p·N_g)', () => {
    // J. I. Taylor, The Gear Analysis Handbook (2000), from memory; Foiles (Vibration Institute); values check-values §4.
    expect(huntingToothFrequencyHz(600, 20, 45)).toBeCloseTo(3.3333, 4); // 20/45 at 30 Hz: LCM 180
    expect(huntingToothFrequencyHz(425, 17, 41)).toBeCloseTo(0.60976, 5); // 17/41 at 25 Hz: LCM 697
    expect(huntingToothFrequencyHz(1100, 22, 66)).toBeCloseTo(16.6667, 4); // 22/66 at 50 Hz: the gear shaft rate
  });

  it('is not the GCD × shaft speed formula some public calculators give', () => {
    // check-values §4: for 20/60 teeth at 1800 rpm the right answer is 10 Hz; "GCD × rpm/60" would say 600 Hz.
    const pinionHz = 1800 / 60;
    const gmf = gearMeshFrequencyHz(20, pinionHz);
    expect(huntingToothFrequencyHz(gmf, 20, 60)).toBeCloseTo(10, 12);
    expect(huntingToothFrequencyHz(gmf, 20, 60)).not.toBeCloseTo(greatestCommonDivisor(20, 60) * pinionHz, 3);
  });

  it('equals f_pinion·N_A/N_g and GMF/LCM for any pair', () => {
    // Taylor (2000), from memory: f_HT = GMF/LCM(N_p, N_g) = f_p·N_A/N_g.
    fc.assert(
      fc.property(fc.integer({ min: 5, max: 200 }), fc.integer({ min: 5, max: 200 }), fc.double({ min: 0.1, max: 200, noNaN: true }), (np, ng, fp) => {
        const gmf = gearMeshFrequencyHz(np, fp);
        const na = greatestCommonDivisor(np, ng);
        const lcm = (np * ng) / na;
        expect(huntingToothFrequencyHz(gmf, np, ng)).toBeCloseTo(gmf / lcm, 9);
        expect(huntingToothFrequencyHz(gmf, np, ng)).toBeCloseTo((fp * na) / ng, 9);
      }),
    );
  });
});

describe('assemblyPhaseFrequencyHz', () => {
  it('is GMF / N_A', () => {
    // Foiles (Vibration Institute): with 5 assembly phases on 20/45 teeth, each phase repeats at 600/5 = 120 Hz.
    expect(assemblyPhaseFrequencyHz(600, 20, 45)).toBe(120);
    expect(assemblyPhaseFrequencyHz(425, 17, 41)).toBe(425);
  });
});

describe('greatestCommonDivisor', () => {
  it('divides both numbers and no larger number does', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 10_000 }), fc.integer({ min: 1, max: 10_000 }), (a, b) => {
        const g = greatestCommonDivisor(a, b);
        expect(a % g).toBe(0);
        expect(b % g).toBe(0);
        expect(greatestCommonDivisor(a / g, b / g)).toBe(1);
      }),
    );
  });
});
