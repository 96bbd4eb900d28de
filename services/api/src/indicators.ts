import { indicatorUnit as unitAtPoint } from '@kinespec/diagnosis';

/*
 * Trend indicators as the service names them. Names, units and computation live in the indicator registry of
 * @kinespec/diagnosis (one descriptor per indicator); the service stores the values analyseRecording returns, in
 * the units the registry gives, and does no arithmetic on them.
 */

export { scoreIndicator } from '@kinespec/diagnosis';

/** The indicator the fleet and the machine pages show first. */
export const MAIN_INDICATOR = 'velocity_rms_mm_per_s';

/** The unit of an indicator's values at a point whose samples are in `pointUnit` (e.g. 'g'; null for tach and encoder points). */
export function indicatorUnit(indicator: string, pointUnit: string | null): string {
  return unitAtPoint(indicator, { unit: pointUnit });
}

/** An indicator name as the API accepts it: letters, digits and `_ : . -`, at most 200 characters. */
export const INDICATOR_PATTERN = /^[A-Za-z0-9_:.\-]{1,200}$/;
