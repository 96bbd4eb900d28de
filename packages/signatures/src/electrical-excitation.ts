import { checkPositive, checkWhole, coefficientFromPhasor, fmt, type Excitation } from './excitation.js';

/**
 * Electrical: the magnetic pull of an induction motor pulses at twice the line frequency (the force goes as
 * the square of the flux density), a line that does not follow the shaft speed (common practice). Higher
 * even multiples are optional, with a stated 1/k fall-off (a template choice, not a law).
 */
export function electricalExcitation(options: { lineFrequencyHz: number; harmonics?: number }): Excitation {
  checkPositive('lineFrequencyHz', options.lineFrequencyHz);
  const K = options.harmonics ?? 1;
  checkWhole('harmonics', K, 1, 50);
  const f = options.lineFrequencyHz;
  const lines = Array.from({ length: K }, (_, i) => ({
    order: null,
    frequencyHz: 2 * (i + 1) * f,
    harmonic: i + 1,
    sideband: 0,
    coefficient: coefficientFromPhasor(1 / (i + 1), 0),
    formula: `${2 * (i + 1)} × ${fmt(f)} Hz line: A = 1/${i + 1}`,
  }));
  return {
    template: 'magnetic-pull', reference: 'force of the 2×LF line', path: 'lateral', domain: 'spectrum', fundamentalOrder: null,
    modulationOrder: null, mean: 0, lines, formula: `F ∝ B², pulsing at 2 × ${fmt(f)} Hz = ${fmt(2 * f)} Hz`, segments: null, series: null,
  };
}
