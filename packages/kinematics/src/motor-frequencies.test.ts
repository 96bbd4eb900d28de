import { describe, expect, it } from 'vitest';
import { polePassFrequencyHz, slipFrequencyHz, synchronousSpeedHz } from './motor-frequencies.js';

describe('synchronousSpeedHz', () => {
  it('is 120·f/p rpm', () => {
    // Common practice: 4 poles on 50 Hz run at 1500 rpm synchronous, 2 poles on 60 Hz at 3600 rpm, 6 poles on 50 Hz at 1000 rpm.
    expect(synchronousSpeedHz(50, 4) * 60).toBeCloseTo(1500, 12);
    expect(synchronousSpeedHz(60, 2) * 60).toBeCloseTo(3600, 12);
    expect(synchronousSpeedHz(50, 6) * 60).toBeCloseTo(1000, 12);
  });
});

describe('slipFrequencyHz', () => {
  it('is synchronous speed minus rotor speed, never negative', () => {
    // Common practice; by hand: a 4-pole 50 Hz motor at 1480 rpm slips (1500 - 1480)/60 = 0.3333 Hz.
    expect(slipFrequencyHz(50, 4, 1480 / 60)).toBeCloseTo(1 / 3, 12);
    expect(slipFrequencyHz(50, 4, 1510 / 60)).toBe(0);
  });
});

describe('polePassFrequencyHz', () => {
  it('is poles × slip frequency', () => {
    // Common practice: f_pp = p·f_slip, 4 × 0.3333 = 1.3333 Hz for the motor above.
    expect(polePassFrequencyHz(50, 4, 1480 / 60)).toBeCloseTo(4 / 3, 12);
  });
});
