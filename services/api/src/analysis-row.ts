import { softwareVersion, type RecordingAnalysis } from './analysis.js';
import { finite, storedAnalysisJson } from './ingest.js';
import type { NewAnalysis } from './store.js';

/**
 * The row an analysis is stored as: the analysis's own grading (zone, alarm state, alarm and trip levels of the
 * overall velocity) kept beside it, as the package made it, so that alarms and trends read one grading.
 */
export function analysisRow(recordingId: string, modelVersion: number | null, analysis: RecordingAnalysis): NewAnalysis {
  const top = analysis.hypotheses[0];
  const o = analysis.overall;
  return {
    recordingId,
    modelVersion,
    softwareVersion: analysis.softwareVersion ?? softwareVersion(),
    speedHz: finite(analysis.speedHz),
    speedSource: analysis.speedSource,
    velocityRmsMmPerS: finite(o.velocityRmsMmPerS),
    zone: o.zone,
    alarmState: o.alarmState ?? null,
    alarmLevelMmPerS: finite(o.alarmLevelMmPerS),
    tripLevelMmPerS: finite(o.tripLevelMmPerS),
    topHypothesis: top ? { fault: top.fault, component: top.component, score: top.score, reason: top.reason } : null,
    resultJson: storedAnalysisJson(analysis),
  };
}

/** The graded levels of the overall velocity for the alarm rule; null when the analysis graded none. */
export function velocityLevels(analysis: RecordingAnalysis): { alarmLevel: number | null; tripLevel: number | null } | null {
  const o = analysis.overall;
  if (o.alarmLevelMmPerS === undefined && o.tripLevelMmPerS === undefined) return null;
  return { alarmLevel: finite(o.alarmLevelMmPerS), tripLevel: finite(o.tripLevelMmPerS) };
}
