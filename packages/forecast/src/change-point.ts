import { robustBaseline, type Baseline } from './baseline.js';
import { driftPosterior } from './drift-model.js';

/**
 * Reference value k and decision interval h of the one-sided CUSUM, in baseline standard deviations.
 * k = 0.5 tunes the chart to a rise of one standard deviation and h = 5 holds false alarms on an in-control
 * series to about one in several hundred values (D. C. Montgomery, Introduction to Statistical Quality
 * Control, §9.1: k = 0.5 with h = 4 or 5 is the usual design; the run lengths from memory).
 */
export const CUSUM_REFERENCE = 0.5;
export const CUSUM_DECISION = 5;

/**
 * A rise is growth when its drift lies this many posterior standard deviations above zero (one-sided 97.7 %);
 * a change that holds a baseline's worth of values without it is a level shift, and its level the new normal.
 */
export const GROWTH_Z = 2;

export interface Onset {
  /** Index of the last value at the healthy level (Page's estimate of the change point): growth starts after it. */
  index: number;
  /** Index of the value at which the CUSUM crossed its decision interval. */
  alarmIndex: number;
  /** The baseline the rise was measured against (the first one, or the level a shift settled at). */
  baseline: Baseline;
  /** How many level shifts without growth were absorbed into the baseline before this onset. */
  levelShifts: number;
}

/**
 * The start of the current rise of a series against its healthy baseline, using values [0, upTo) only.
 * One-sided CUSUM of the lasting levels standardised by the baseline (E. S. Page, "Continuous inspection schemes",
 * Biometrika 41:100, 1954); the change point is the last index at which the sum was zero (Page's estimate). The
 * baseline's level and spread come from the values as measured (`raw`): a trailing median is correlated from one
 * value to the next, so its own spread would understate how far its running sum wanders and alarm too often.
 * A change whose next `baselineCount` values after the alarm show no credible growth (driftPosterior, GROWTH_Z)
 * is a level shift (a repair, a remounted sensor, a new operating point): those values become the baseline and
 * the search goes on. Null when the series never leaves its baseline.
 */
export function findOnset(
  timesS: ArrayLike<number>,
  levels: ArrayLike<number>,
  raw: ArrayLike<number>,
  upTo: number,
  baselineCount: number,
  minSpread: number,
): Onset | null {
  if (upTo <= baselineCount) return null;
  let baseline = robustBaseline(raw, 0, baselineCount, minSpread);
  let levelShifts = 0;
  let sum = 0;
  let lastZero = baselineCount - 1;
  let i = baselineCount;
  while (i < upTo) {
    sum = Math.max(0, sum + (levels[i]! - baseline.level) / baseline.spread - CUSUM_REFERENCE);
    if (sum === 0) lastZero = i;
    if (sum > CUSUM_DECISION) {
      const settled = i + baselineCount;
      if (settled < upTo) {
        // growth after the alarm: a step that then holds still is a shift, a step that keeps rising is not
        const drift = driftPosterior(timesS, levels, i, settled, levels[i]!, null);
        if (drift.meanPerS <= GROWTH_Z * Math.sqrt(drift.varPerS2)) {
          baseline = robustBaseline(raw, i + 1, settled + 1, minSpread);
          levelShifts++;
          sum = 0;
          lastZero = settled;
          i = settled + 1;
          continue;
        }
      }
      return { index: lastZero, alarmIndex: i, baseline, levelShifts };
    }
    i++;
  }
  return null;
}
