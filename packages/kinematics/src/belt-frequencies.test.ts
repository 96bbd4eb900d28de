import { describe, expect, it } from 'vitest';
import { beltPassFrequencyHz } from './belt-frequencies.js';

describe('beltPassFrequencyHz', () => {
  it('is belt speed over belt length, π·D·n/L', () => {
    // Common practice; by hand: a 180 mm sheave at 1480 rpm moves the belt π·0.18 m·24.667 rev/s = 13.9487 m/s,
    // so a 2240 mm belt goes round 6.2271 times per second (python3 math check).
    expect(beltPassFrequencyHz(180, 1480 / 60, 2240)).toBeCloseTo(6.2271, 4);
  });

  it('doubles with the speed and halves with the belt length', () => {
    const f = beltPassFrequencyHz(200, 25, 1800);
    expect(beltPassFrequencyHz(200, 50, 1800)).toBeCloseTo(2 * f, 12);
    expect(beltPassFrequencyHz(200, 25, 3600)).toBeCloseTo(f / 2, 12);
  });
});
