import { indicatorLevels, scoreIndicator, type LevelPoint } from '@kinespec/diagnosis';
import { alarmAction, CLEAR_AFTER, RAISE_AFTER, SCORE_CLEAR_LEVEL, VELOCITY_CLEAR_FRACTION, type RuleLevels } from './alarm-rule.js';
import type { Queryable } from './database.js';
import {
  clearAlarm,
  clearAlarmsRaisedBy,
  clearPointAlarms,
  escalateAlarm,
  newestRecordingValues,
  newestRecordedAt,
  openAlarms,
  raiseAlarm,
  recentTrendValues,
  type PointRow,
} from './store.js';

/*
 * The alarm rule, written down (README "Alarms"); the levels come from the indicator registry of
 * @kinespec/diagnosis, the hysteresis and persistence from alarm-rule.ts:
 * - Overall r.m.s. velocity (velocity_rms_mm_per_s): ALARM and TRIP levels are the point's own
 *   (alarmVelocityRmsMmPerS, tripVelocityRmsMmPerS in the machine model); without them ALARM is
 *   baseline + 0.25 x the B/C boundary, at most 1.25 x B/C (ISO 10816-3 §6.3), or the B/C boundary
 *   itself without a baseline, and TRIP is the C/D boundary (zone D begins). The analysis grades these once
 *   and they are stored with it (analysis-row.ts); the rule reads those stored levels, and the registry's only for
 *   analyses stored before the levels were kept.
 * - Fault scores (score:<fault>:<component>): ALARM at 0.5, the score at which the recording shows
 *   the fault; no TRIP.
 * - Levels belong to vibration points: tach and encoder points have none.
 * - ALARM is raised after two recordings in a row at or over its level, TRIP at once; an open alarm clears
 *   after two recordings in a row under its clear level (10 % under the velocity alarm level; 0.4 for a
 *   score). Only the newest recording of a point moves alarms, so uploading old history never reopens or
 *   clears today's state.
 */

export interface IndicatorLevels {
  alarmLevel: number | null;
  tripLevel: number | null;
}

/** The level inputs of a stored point (its own ISO class, else the machine's, as the store keeps it). */
export function levelPointOfRow(point: PointRow): LevelPoint {
  return {
    quantity: point.quantity as LevelPoint['quantity'],
    iso: point.isoGroup && point.isoFoundation ? { group: point.isoGroup, foundation: point.isoFoundation } : null,
    alarmVelocityRmsMmPerS: point.alarmVelocityRmsMmPerS,
    tripVelocityRmsMmPerS: point.tripVelocityRmsMmPerS,
    baselineVelocityRmsMmPerS: point.baselineVelocityRmsMmPerS,
  };
}

/**
 * The levels of an indicator at a point. For the overall velocity the analysis's own graded levels when given
 * (`graded`, stored with the analysis: one grading, the package's), else the registry's levels from the
 * point's model columns (analyses stored before the levels were kept).
 */
export function levelsOf(point: PointRow, indicator: string, graded?: IndicatorLevels | null): IndicatorLevels {
  if (graded && indicator === 'velocity_rms_mm_per_s') return graded;
  const levels = indicatorLevels(indicator, levelPointOfRow(point));
  return { alarmLevel: levels.alarmLevel, tripLevel: levels.tripLevel };
}

/** The levels with the clear level of the hysteresis (alarm-rule.ts). */
export function ruleLevelsOf(point: PointRow, indicator: string, graded?: IndicatorLevels | null): RuleLevels {
  const { alarmLevel, tripLevel } = levelsOf(point, indicator, graded);
  const clearLevel = alarmLevel === null ? null : scoreIndicator(indicator) ? Math.min(SCORE_CLEAR_LEVEL, alarmLevel) : VELOCITY_CLEAR_FRACTION * alarmLevel;
  return { alarmLevel, tripLevel, clearLevel };
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
  const withLevels = Object.entries(r.indicators)
    .filter(([, value]) => Number.isFinite(value))
    .map(([indicator]) => ({ indicator, levels: ruleLevelsOf(r.point, indicator, r.velocityLevels) }))
    .filter((x) => x.levels.alarmLevel !== null || x.levels.tripLevel !== null);
  // the newest values of each indicator up to this recording (its own included), oldest first
  const history = await recentTrendValues(tx, { pointId: r.point.id, indicators: withLevels.map((x) => x.indicator), upTo: r.recordedAt, count: Math.max(RAISE_AFTER, CLEAR_AFTER) });
  for (const { indicator, levels } of withLevels) {
    const current = openByIndicator.get(indicator);
    const recent = history.get(indicator) ?? [r.indicators[indicator]!];
    const act = alarmAction(levels, recent, current ? { level: current.level } : null);
    if (act.action === 'clear' && current) await clearAlarm(tx, current.id, r.recordedAt, act.reason);
    else if (act.action === 'raise') {
      await raiseAlarm(tx, {
        siteId: r.siteId,
        pointId: r.point.id,
        indicator,
        level: act.level,
        value: act.value,
        threshold: act.threshold,
        recordingId: r.recordingId,
        raisedAt: r.recordedAt,
      });
    } else if (act.action === 'escalate' && current) {
      await escalateAlarm(tx, { id: current.id, value: act.value, threshold: act.threshold, recordingId: r.recordingId });
    }
  }
  // a score alarm whose hypothesis the new analysis no longer reports is cleared as well
  for (const a of open) {
    if (scoreIndicator(a.indicator) && !(a.indicator in r.indicators)) {
      await clearAlarm(tx, a.id, r.recordedAt, 'rule: hypothesis no longer reported');
    }
  }
}

/**
 * After a recording left a point (deleted, or moved away or in time), the point's alarms follow what is left: an
 * alarm that recording raised is withdrawn (its reading is no longer one of this point's, so the off-delay that
 * guards against a passing reading does not apply), then the rule runs on the point's newest remaining recording as
 * after an upload, and may raise again what the remaining readings still show. A point with no recording left has
 * no open alarm.
 */
export async function reevaluatePointAlarms(
  tx: Queryable,
  r: { siteId: string; point: PointRow; at: Date; why: string; leftRecordingId?: string },
): Promise<void> {
  if (r.leftRecordingId) await clearAlarmsRaisedBy(tx, r.point.id, r.leftRecordingId, r.at, `correction: ${r.why}`);
  const newest = await newestRecordingValues(tx, r.point.id);
  if (!newest) {
    await clearPointAlarms(tx, r.point.id, r.at, `rule: no recording left on the point (${r.why})`);
    return;
  }
  await evaluateAlarms(tx, {
    siteId: r.siteId,
    point: r.point,
    recordingId: newest.recordingId,
    recordedAt: newest.recordedAt,
    indicators: newest.indicators,
    velocityLevels: newest.velocityLevels,
  });
}
