/*
 * Trend indicators: the names an analysis reports in `indicators` (see the coordination contract),
 * their units, and which one the console shows first.
 */

export const MAIN_INDICATOR = 'velocity_rms_mm_per_s';

const ACCELERATION_UNITS = new Set(['g', 'm/s^2', 'mm/s^2']);

/** Indicators in an acceleration unit (time-domain peak and r.m.s., envelope level). */
export const ACCELERATION_INDICATORS = ['acceleration_peak', 'acceleration_rms', 'envelope_rms'] as const;

/**
 * The one unit a point's acceleration indicators are trended in, whatever unit a recording came in:
 * the point's own unit when it is an acceleration unit, else m/s^2 (velocity and displacement points).
 */
export function accelerationTrendUnit(pointUnit: string | null): string {
  return pointUnit !== null && ACCELERATION_UNITS.has(pointUnit) ? pointUnit : 'm/s^2';
}

/** The unit of an indicator's values at a point whose samples are in `pointUnit` (e.g. 'g'). */
export function indicatorUnit(indicator: string, pointUnit: string | null): string {
  if (indicator === 'velocity_rms_mm_per_s') return 'mm/s';
  if ((ACCELERATION_INDICATORS as readonly string[]).includes(indicator)) return accelerationTrendUnit(pointUnit);
  if (indicator === 'speed_rpm') return 'rpm';
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
