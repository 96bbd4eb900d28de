import type { Hypothesis, RecordingAnalysis } from './api-types.js';
import type { PredictedLine } from './predicted-lines.js';

// Units and counts of a hypothesis's evidence, and the amplitude scale a spectrum opens in. Pure: the
// analysis view and its tests share it.

/** The counts the reason sentence uses when the analysis gives them, else counted from the evidence. */
export function evidenceCounts(h: Pick<Hypothesis, 'evidence' | 'linesMatched' | 'linesPredicted'>): { matched: number; predicted: number } {
  return {
    matched: h.linesMatched ?? h.evidence.filter((e) => e.matched).length,
    predicted: h.linesPredicted ?? h.evidence.length,
  };
}

export interface AmplitudeColumns {
  /** heading of the predicted column, with its unit */
  predictedHeading: string;
  /** heading of the measured column, with its unit */
  measuredHeading: string;
  /** true when the predictions are scaled to the measurement (predictedScaled) */
  scaled: boolean;
  predictedOf(e: Hypothesis['evidence'][number]): number | null;
}

/**
 * What the predicted and measured columns show. Measured amplitudes are read off the chart the hypothesis is
 * judged on, in that chart's unit and scaling (peak, as the analysis stores its plot spectra). Predictions scaled
 * to the measurement (`predictedScaled`, by the level the analysis fitted) share that unit; without them the raw
 * prediction is on the model's own scale (a nominal mean torque or a relative size), said in its heading.
 */
export function amplitudeUnits(h: Hypothesis, a: Pick<RecordingAnalysis, 'spectrum' | 'envelopeSpectrum'>): AmplitudeColumns {
  const chartUnit = h.domain === 'envelope' && a.envelopeSpectrum ? `${a.envelopeSpectrum.unit} peak` : `${a.spectrum.unit} ${a.spectrum.scaling}`;
  const unit = h.unit ?? chartUnit;
  const scaled = h.evidence.some((e) => typeof e.predictedScaled === 'number');
  return {
    predictedHeading: scaled ? `Predicted (${unit}, scaled)` : 'Predicted (model scale, not fitted)',
    measuredHeading: `Measured (${unit})`,
    scaled,
    predictedOf: (e) => (scaled ? (typeof e.predictedScaled === 'number' ? e.predictedScaled : null) : e.predicted),
  };
}

/**
 * Whether a spectrum shows its drawn evidence better on a log amplitude axis: when the matched peaks are mostly
 * small beside the tallest peak of the range shown (the median under a tenth of it), a linear axis leaves them
 * as a flat line. 20 dB is where a peak drops to a few pixels of a 250-pixel linear plot (common practice).
 */
export function prefersLogScale(lines: readonly PredictedLine[], xs: ArrayLike<number>, ys: ArrayLike<number>, range: { min: number; max: number } | null): boolean {
  const lo = range?.min ?? -Infinity;
  const hi = range?.max ?? Infinity;
  const shown = lines.filter((l) => l.matched && l.x >= lo && l.x <= hi && typeof l.measured === 'number' && l.measured > 0).map((l) => l.measured as number);
  if (shown.length === 0) return false;
  let top = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    if (x >= lo && x <= hi && ys[i]! > top) top = ys[i]!;
  }
  if (!(top > 0)) return false;
  shown.sort((p, q) => p - q);
  const median = shown[Math.floor(shown.length / 2)]!;
  return median < 0.1 * top;
}
