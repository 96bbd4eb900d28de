import type { FourierSeries } from './fourier-series.js';
import { coefficientFromPhasor, ZERO_LINE_FRACTION, type ExcitationLine } from './excitation.js';

/** c_k of a series for any integer k (c_−k = conj c_k for a real waveform). */
function twoSided(series: FourierSeries, k: number): [number, number] {
  if (k === 0) return [series.a0, 0];
  const t = series.terms[Math.abs(k) - 1];
  if (!t) return [0, 0];
  // c_k = (a − jb)/2
  return [t.a / 2, (k > 0 ? -t.b : t.b) / 2];
}

/**
 * Lines of the product of two periodic waveforms p(t)·q(t) with fundamentals at `carrierOrder` and
 * `modulationOrder` (which need not be commensurate): the spectrum of a product is the convolution of the
 * two line spectra, c_{k,m} = p_k·q_m at k·f_p + m·f_q (convolution theorem; Randall, Vibration-based
 * Condition Monitoring, 2011, §3 on modulation sidebands, from memory). Carrier harmonics k = 0..K and
 * sidebands m = −M..M; every pair with a positive frequency is one line (its conjugate pair is the negative
 * frequency), pairs that land on the same frequency add.
 */
export function modulatedLines(
  carrier: FourierSeries,
  carrierOrder: number,
  modulation: FourierSeries,
  modulationOrder: number,
  formula: (k: number, m: number) => string,
): ExcitationLine[] {
  const K = carrier.terms.length;
  const M = modulation.terms.length;
  const byOrder = new Map<string, ExcitationLine>();
  const lines: ExcitationLine[] = [];
  for (let k = -K; k <= K; k++) {
    const [pr, pi] = twoSided(carrier, k);
    if (pr === 0 && pi === 0) continue;
    for (let m = -M; m <= M; m++) {
      const order = k * carrierOrder + m * modulationOrder;
      if (!(order > 1e-12)) continue;
      const [qr, qi] = twoSided(modulation, m);
      // one-sided phasor = 2·c
      const re = 2 * (pr * qr - pi * qi);
      const im = 2 * (pr * qi + pi * qr);
      const key = order.toPrecision(12);
      const found = byOrder.get(key);
      if (found) {
        const c = coefficientFromPhasor(found.coefficient.re + re, found.coefficient.im + im);
        found.coefficient = c;
        found.formula += ` + (k=${k}, m=${m})`;
      } else {
        const line: ExcitationLine = {
          order, frequencyHz: null, harmonic: k, sideband: m, coefficient: coefficientFromPhasor(re, im), formula: formula(k, m),
        };
        byOrder.set(key, line);
        lines.push(line);
      }
    }
  }
  const peak = Math.max(0, ...lines.map((l) => l.coefficient.amplitude));
  return lines
    .filter((l) => l.coefficient.amplitude > ZERO_LINE_FRACTION * peak && l.coefficient.amplitude > 0)
    .sort((a, b) => a.order! - b.order!);
}
