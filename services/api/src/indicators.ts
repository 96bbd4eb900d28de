/*
 * Trend indicators: the names an analysis reports in `indicators` (see the coordination contract),
 * their units, and which one the console shows first.
 */

export const MAIN_INDICATOR = 'velocity_rms_mm_per_s';

/** The unit of an indicator's values at a point whose samples are in `pointUnit` (e.g. 'g'). */
export function indicatorUnit(indicator: string, pointUnit: string | null): string {
  if (indicator === 'velocity_rms_mm_per_s') return 'mm/s';
  if (indicator === 'acceleration_peak' || indicator === 'envelope_rms') return pointUnit ?? '';
  // crest factor, kurtosis, scores (0..1) and the TSA indicators are dimensionless
  return '1';
}

/** A fault score indicator "score:<fault>:<component>" split into its parts, or null. */
export function scoreIndicator(indicator: string): { fault: string; component: string } | null {
  const m = /^score:([^:]+):(.+)$/.exec(indicator);
  return m ? { fault: m[1]!, component: m[2]! } : null;
}

/** An indicator name as the API accepts it: letters, digits and `_ : . -`, at most 200 characters. */
export const INDICATOR_PATTERN = /^[A-Za-z0-9_:.\-]{1,200}$/;
