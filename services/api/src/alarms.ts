import { FAULT_SCORE_ALARM, severityLevels } from './analysis.js';
import type { Queryable } from './database.js';
import { scoreIndicator } from './indicators.js';
import {
  clearAlarm,
  escalateAlarm,
  newestRecordedAt,
  openAlarms,
  raiseAlarm,
  type PointRow,
} from './store.js';

/*
 * The alarm rule, kept simple and written down (README "Alarms"):
 * - Overall r.m.s. velocity (velocity_rms_mm_per_s): ALARM and TRIP levels are the point's own
 *   (alarmVelocityRmsMmPerS, tripVelocityRmsMmPerS in the machine model); without them ALARM is
 *   baseline + 0.25 x the B/C boundary, at most 1.25 x B/C (ISO 10816-3 §6.3), or the B/C boundary
 *   itself without a baseline, and TRIP is the C/D boundary (zone D begins).
 * - Fault scores (score:<fault>:<component>): ALARM at 0.5, the score at which the recording shows
 *   the fault; no TRIP.
 * - A value at or above a level raises an alarm of that level unless one is open for that point and
 *   indicator; an open ALARM is raised to TRIP (to be acknowledged again); a value below the ALARM
 *   level clears the open alarm. Only the newest recording of a point moves alarms, so uploading old
 *   history never reopens or clears today's state.
 */

export interface IndicatorLevels {
  alarmLevel: number | null;
  tripLevel: number | null;
}

/**
 * The levels of an indicator at a point. For the overall velocity the analysis's own graded levels when given
 * (`graded`, stored with the analysis: one grading, the package's), else those of the point's model columns
 * (analyses stored before the levels were kept).
 */
export function levelsOf(point: PointRow, indicator: string, graded?: IndicatorLevels | null): IndicatorLevels {
  if (indicator === 'velocity_rms_mm_per_s') {
    if (graded) return graded;
    const s = severityLevels(0, {
      iso: point.isoGroup && point.isoFoundation ? { group: point.isoGroup, foundation: point.isoFoundation } : null,
      alarmVelocityRmsMmPerS: point.alarmVelocityRmsMmPerS,
      tripVelocityRmsMmPerS: point.tripVelocityRmsMmPerS,
      baselineVelocityRmsMmPerS: point.baselineVelocityRmsMmPerS,
    });
    return { alarmLevel: s.alarmLevel, tripLevel: s.tripLevel };
  }
  if (scoreIndicator(indicator)) return { alarmLevel: FAULT_SCORE_ALARM, tripLevel: null };
  return { alarmLevel: null, tripLevel: null };
}

export type AlarmStateName = 'normal' | 'alarm' | 'trip';

export function alarmState(value: number, levels: IndicatorLevels): AlarmStateName | null {
  if (levels.alarmLevel === null && levels.tripLevel === null) return null;
  if (levels.tripLevel !== null && value >= levels.tripLevel) return 'trip';
  if (levels.alarmLevel !== null && value >= levels.alarmLevel) return 'alarm';
  return 'normal';
}

/** Applies the rule to one recording's indicators. Call inside the ingest transaction (point locked). */
export async function evaluateAlarms(
  tx: Queryable,
  r: {
    siteId: string;
    point: PointRow;
    recordingId: string;
    recordedAt: Date;
    indicators: Record<string, number>;
    /** The analysis's graded alarm and trip levels of the overall velocity (analysis-row.ts velocityLevels). */
    velocityLevels?: IndicatorLevels | null;
  },
): Promise<void> {
  const newest = await newestRecordedAt(tx, r.point.id, r.recordingId);
  if (newest !== null && newest > r.recordedAt) return;
  const open = await openAlarms(tx, r.point.id);
  const openByIndicator = new Map(open.map((a) => [a.indicator, a]));
  for (const [indicator, value] of Object.entries(r.indicators)) {
    if (!Number.isFinite(value)) continue;
    const levels = levelsOf(r.point, indicator, r.velocityLevels);
    const state = alarmState(value, levels);
    if (state === null) continue;
    const current = openByIndicator.get(indicator);
    if (state === 'normal') {
      if (current) await clearAlarm(tx, current.id, r.recordedAt, 'rule: value below the alarm level');
      continue;
    }
    const threshold = (state === 'trip' ? levels.tripLevel : levels.alarmLevel)!;
    if (!current) {
      await raiseAlarm(tx, {
        siteId: r.siteId,
        pointId: r.point.id,
        indicator,
        level: state,
        value,
        threshold,
        recordingId: r.recordingId,
        raisedAt: r.recordedAt,
      });
    } else if (state === 'trip' && current.level === 'alarm') {
      await escalateAlarm(tx, { id: current.id, value, threshold, recordingId: r.recordingId });
    }
  }
  // a score alarm whose hypothesis the new analysis no longer reports is cleared as well
  for (const a of open) {
    if (scoreIndicator(a.indicator) && !(a.indicator in r.indicators)) {
      await clearAlarm(tx, a.id, r.recordedAt, 'rule: hypothesis no longer reported');
    }
  }
}
