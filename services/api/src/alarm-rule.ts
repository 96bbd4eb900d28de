/*
 * The alarm rule with hysteresis and persistence (README "Alarms"). A pure function of an indicator's levels,
 * its newest values and the alarm open on it, so that it can be tested without a database.
 *
 * Why (ANSI/ISA-18.2-2016, "Management of alarm systems for the process industries", and EEMUA 191 name the two
 * tools against chattering alarms: a deadband and on/off delays; the values below are ours, argued here):
 * - Persistence (on-delay): an ALARM is raised only when RAISE_AFTER consecutive recordings reach the level. A
 *   single reading over the level is as often a passing load, a loose sensor or a noisy score as a fault; a fault
 *   that is there stays there. Two readings are the fewest that tell the two apart and cost one recording of delay
 *   (half a week at the demo's two recordings a week).
 * - TRIP is raised at once: the trip level is where the machine should be stopped (ISO 10816-3 zone D: "vibration
 *   values normally considered to be of sufficient severity to cause damage"); waiting a recording is not acceptable.
 * - Deadband (hysteresis): an open alarm clears only below a clear level under the alarm level, and only after
 *   CLEAR_AFTER consecutive recordings there (off-delay). For the overall velocity the clear level is 10 % under the
 *   alarm level: repeat measurements of a steady machine's overall velocity spread by several percent (from memory,
 *   common practice), so a smaller deadband is crossed by repeatability alone. For a fault score it is 0.4, a tenth
 *   of the scale under the 0.5 at which a recording shows the fault: on the demo a score between 0.3 and 0.7 moves
 *   by 0.075 in the median from one recording to the next (tests/api/count-demo-alarms.ts), so 0.1 holds a typical
 *   step. On the demo the rule took the alarms from 21 raised with 8 raise/clear pairs to 14 raised with none.
 */

export const RAISE_AFTER = 2;
export const CLEAR_AFTER = 2;
/** Clear level of the overall velocity, as a fraction of its alarm level. */
export const VELOCITY_CLEAR_FRACTION = 0.9;
/** Clear level of a fault score (its alarm level is 0.5). */
export const SCORE_CLEAR_LEVEL = 0.4;

export interface RuleLevels {
  alarmLevel: number | null;
  tripLevel: number | null;
  /** Below this an open alarm may clear (under alarmLevel). */
  clearLevel: number | null;
}

export type AlarmAction =
  | { action: 'none' }
  | { action: 'raise'; level: 'alarm' | 'trip'; value: number; threshold: number }
  | { action: 'escalate'; value: number; threshold: number }
  | { action: 'clear'; reason: string };

/**
 * What to do with one indicator of a point after a new recording. `recent` holds the newest values of the
 * indicator, oldest first, the new recording's value last (at least max(RAISE_AFTER, CLEAR_AFTER) when there is
 * that much history).
 */
export function alarmAction(levels: RuleLevels, recent: readonly number[], open: { level: 'alarm' | 'trip' } | null): AlarmAction {
  if (recent.length === 0 || (levels.alarmLevel === null && levels.tripLevel === null)) return { action: 'none' };
  const value = recent[recent.length - 1]!;
  const last = (n: number) => recent.slice(-n);
  if (levels.tripLevel !== null && value >= levels.tripLevel) {
    if (!open) return { action: 'raise', level: 'trip', value, threshold: levels.tripLevel };
    if (open.level === 'alarm') return { action: 'escalate', value, threshold: levels.tripLevel };
    return { action: 'none' };
  }
  if (open) {
    const clearLevel = levels.clearLevel ?? levels.alarmLevel ?? levels.tripLevel!;
    const below = last(CLEAR_AFTER);
    if (below.length >= CLEAR_AFTER && below.every((v) => v < clearLevel)) {
      return { action: 'clear', reason: `rule: ${CLEAR_AFTER} recordings in a row below the clear level ${clearLevel}` };
    }
    return { action: 'none' };
  }
  if (levels.alarmLevel !== null) {
    const over = last(RAISE_AFTER);
    if (over.length >= RAISE_AFTER && over.every((v) => v >= levels.alarmLevel!)) {
      return { action: 'raise', level: 'alarm', value, threshold: levels.alarmLevel };
    }
  }
  return { action: 'none' };
}
