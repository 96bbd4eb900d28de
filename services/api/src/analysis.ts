import {
  analyseRecording,
  gradeSeverity,
  SOFTWARE_VERSION,
  type AnalyseOptions,
  type RecordingAnalysis,
} from '@kinespec/diagnosis';
import type { MachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';

/*
 * The one place where the service asks the packages to analyse a recording: ingest, re-analysis and
 * the demo seeding all call analyse() and severityLevels() here, never a package directly.
 * @kinespec/diagnosis analyseRecording does the work (overall severity, time indicators, spectra,
 * running speed, envelope, a scored hypothesis with evidence for every fault candidate of the model).
 */

export type { RecordingAnalysis } from '@kinespec/diagnosis';

export type Zone = 'A' | 'B' | 'C' | 'D';

/** Points kept in each stored plot spectrum (min/max per bucket, so peaks survive). */
export const MAX_PLOT_POINTS = 2048;

/** The version of the analysing software, stored with every analysis. */
export function softwareVersion(): string {
  return SOFTWARE_VERSION;
}

/**
 * Analyses one recording of a machine point. Throws the packages' typed errors for unusable input.
 * The indicators come in the units the registry of @kinespec/diagnosis gives at the model's point
 * (acceleration levels in the point's unit), so a series keeps one unit when recordings arrive in g one
 * day and m/s^2 the next; they are stored as they are.
 */
export function analyse(
  recording: Recording,
  options: { model: MachineModel | null; pointId: string; speedRpm?: number; channel?: number },
): RecordingAnalysis {
  const opts: AnalyseOptions = { model: options.model, pointId: options.pointId, maxPlotPoints: MAX_PLOT_POINTS };
  if (options.speedRpm !== undefined) opts.speedRpm = options.speedRpm;
  // 0-based here, as @kinespec/diagnosis takes it; the API and the store number channels from 1
  if (options.channel !== undefined) opts.channel = options.channel;
  return analyseRecording(recording, opts);
}

type IsoClass = { group: 1 | 2; foundation: 'rigid' | 'flexible' };

/** The point's ISO class: its own, else the machine's. */
function isoClassOf(model: MachineModel | null, pointId: string): IsoClass | null {
  const point = model?.points.find((p) => p.id === pointId);
  return (point?.iso ?? model?.iso ?? null) as IsoClass | null;
}

export interface SeverityOfPoint {
  zone: Zone | null;
  boundaries: { ab: number; bc: number; cd: number } | null;
  alarmLevel: number | null;
  tripLevel: number | null;
}

interface PointLevels {
  iso: IsoClass | null;
  alarmVelocityRmsMmPerS: number | null;
  tripVelocityRmsMmPerS: number | null;
  baselineVelocityRmsMmPerS: number | null;
}

function pointLevels(source: { model: MachineModel | null; pointId: string } | PointLevels): PointLevels {
  if ('iso' in source) return source;
  const point = source.model?.points.find((p) => p.id === source.pointId);
  return {
    iso: isoClassOf(source.model, source.pointId),
    alarmVelocityRmsMmPerS: point?.alarmVelocityRmsMmPerS ?? null,
    tripVelocityRmsMmPerS: point?.tripVelocityRmsMmPerS ?? null,
    baselineVelocityRmsMmPerS: point?.baseline?.velocityRmsMmPerS ?? null,
  };
}

/**
 * The ISO zone of an overall r.m.s. velocity at a point and the point's alarm and trip levels
 * (the rule is @kinespec/diagnosis gradeSeverity: the point's own levels, else ALARM = baseline +
 * 0.25 x B/C capped at 1.25 x B/C, or B/C without a baseline, and TRIP = C/D; ISO 10816-3 §6.3).
 */
export function severityLevels(
  velocityRmsMmPerS: number,
  source: { model: MachineModel | null; pointId: string } | PointLevels,
): SeverityOfPoint {
  const p = pointLevels(source);
  if (!Number.isFinite(velocityRmsMmPerS)) {
    return { zone: null, boundaries: null, alarmLevel: p.alarmVelocityRmsMmPerS, tripLevel: p.tripVelocityRmsMmPerS };
  }
  const g = gradeSeverity(Math.max(0, velocityRmsMmPerS), {
    iso: p.iso,
    alarmVelocityRmsMmPerS: p.alarmVelocityRmsMmPerS,
    tripVelocityRmsMmPerS: p.tripVelocityRmsMmPerS,
    baselineVelocityRmsMmPerS: p.baselineVelocityRmsMmPerS,
  });
  return {
    zone: g.zone,
    boundaries: g.boundaries ? { ab: g.boundaries.abMmPerS, bc: g.boundaries.bcMmPerS, cd: g.boundaries.cdMmPerS } : null,
    alarmLevel: g.alarmLevelMmPerS,
    tripLevel: g.tripLevelMmPerS,
  };
}

/** A fault score at or above this reads "the recording shows that fault" (machine-model contract). */
export const FAULT_SCORE_ALARM = 0.5;
