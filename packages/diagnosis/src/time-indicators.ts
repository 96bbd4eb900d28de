import { DiagnosisInputError } from './errors.js';

export interface TimeIndicators {
  /** Largest absolute sample after mean removal, in the samples' unit. */
  peak: number;
  /** Root mean square after mean removal. */
  rms: number;
  /** peak / rms (sine √2, common practice). */
  crestFactor: number;
  /** Pearson (non-excess) kurtosis m4/m2²: Gaussian 3, sine 1.5 (check-values §9). */
  kurtosis: number;
}

/**
 * Time-domain condition indicators of a vibration channel. The mean is removed first so that a sensor's
 * DC offset does not read as vibration. A constant signal gives rms 0, crest factor 0 and kurtosis 0.
 */
// Kurtosis: K. Pearson (1905), fourth standardised moment, the definition scipy.stats.kurtosis(fisher=False) uses.
export function timeIndicators(samples: ArrayLike<number>): TimeIndicators {
  const n = samples.length;
  if (n === 0) throw new DiagnosisInputError('empty_recording', 'samples must hold at least one value');
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i]!;
  mean /= n;
  let m2 = 0;
  let m4 = 0;
  let peak = 0;
  for (let i = 0; i < n; i++) {
    const d = samples[i]! - mean;
    const d2 = d * d;
    m2 += d2;
    m4 += d2 * d2;
    const a = Math.abs(d);
    if (a > peak) peak = a;
  }
  m2 /= n;
  m4 /= n;
  const rms = Math.sqrt(m2);
  if (m2 === 0) return { peak, rms: 0, crestFactor: 0, kurtosis: 0 };
  return { peak, rms, crestFactor: peak / rms, kurtosis: m4 / (m2 * m2) };
}
