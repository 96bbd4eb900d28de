import type { Resonance } from '@kinespec/kinematics';
import { fastKurtogram, type Kurtogram } from './kurtogram.js';

export interface EnvelopeBand {
  bandHz: [number, number];
  source: 'resonance' | 'kurtogram';
  /** The kurtogram's best band kurtosis, when the kurtogram chose the band. */
  kurtosis?: number;
  kurtogram?: Kurtogram;
}

/** Resonances below this carry the machine's own running lines, not ringing impacts: no demodulation band there. */
const LOWEST_DEMODULATION_HZ = 500;

/**
 * The demodulation band for envelope analysis. A structural resonance named on the point, the highest one
 * inside the record's band, is used first: impacts ring it, so its band carries them (Randall & Antoni 2011, §3).
 * The band spans ±3 half-power bandwidths (6·ζ·f_r wide), and at least `minBandwidthHz` so that the fault's
 * sidebands fit in. Without a usable resonance, the fast kurtogram picks the most impulsive band (Antoni 2007).
 */
export function envelopeBand(
  samples: Float64Array,
  sampleRateHz: number,
  options: { resonances?: readonly Resonance[]; minBandwidthHz: number },
): EnvelopeBand {
  // Keep clear of the recorder's anti-alias roll-off above 0.45 × fs.
  const topHz = 0.45 * sampleRateHz;
  const minBandwidthHz = Math.min(options.minBandwidthHz, topHz / 2);
  const usable = (options.resonances ?? []).filter((r) => r.frequencyHz >= LOWEST_DEMODULATION_HZ && r.frequencyHz < topHz);
  if (usable.length > 0) {
    const r = usable.reduce((a, b) => (b.frequencyHz > a.frequencyHz ? b : a));
    const half = Math.max(3 * r.dampingRatio * r.frequencyHz, minBandwidthHz / 2);
    let lo = Math.max(LOWEST_DEMODULATION_HZ / 2, r.frequencyHz - half);
    let hi = Math.min(topHz, r.frequencyHz + half);
    // Near the top of the record's band, slide the band down rather than narrow it.
    if (hi - lo < minBandwidthHz) lo = Math.max(0, hi - minBandwidthHz);
    if (hi - lo < minBandwidthHz) hi = Math.min(topHz, lo + minBandwidthHz);
    return { bandHz: [lo, hi], source: 'resonance' };
  }
  const kurtogram = fastKurtogram(samples, sampleRateHz, { minBandwidthHz, searchRangeHz: [0, topHz] });
  const best = kurtogram.best;
  return { bandHz: [Math.max(best.lowHz, 1), Math.min(best.highHz, topHz)], source: 'kurtogram', kurtosis: best.kurtosis, kurtogram };
}
