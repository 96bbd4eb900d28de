import * as diagnosis from '@kinespec/diagnosis';
import type { MachineModel } from '@kinespec/kinematics';
import {
  downsampleForPlot,
  isMotionUnit,
  overallVelocityRms,
  quantityOfUnit,
  welchSpectrum,
  type Recording,
} from '@kinespec/signal';

/*
 * The one place where the service asks the packages to analyse a recording: routes, re-analysis and
 * the demo seeding all call analyse() and severityLevels() here, never a package directly.
 * When @kinespec/diagnosis exports analyseRecording (the coordination contract), it does the work;
 * until then this adapter computes the overall levels and a plot spectrum with @kinespec/signal and
 * reports no hypotheses.
 */

export type Zone = 'A' | 'B' | 'C' | 'D';

export interface Evidence {
  label: string;
  frequencyHz: number;
  predicted: number;
  measured: number | null;
  snrDb: number | null;
  matched: boolean;
  ambiguous?: boolean;
}

export interface Hypothesis {
  fault: string;
  component: string;
  score: number;
  reason: string;
  domain: 'spectrum' | 'envelope' | 'order';
  evidence: Evidence[];
}

/** The analysis object of the coordination contract. */
export interface RecordingAnalysis {
  softwareVersion: string;
  speedHz: number | null;
  speedSource: 'tach' | 'encoder' | 'spectrum' | 'given' | null;
  speedUncertaintyHz?: number;
  domain: 'frequency' | 'angle';
  overall: {
    velocityRmsMmPerS: number;
    bandHz: [number, number];
    zone: Zone | null;
    accelerationPeak: number;
    accelerationUnit: string;
    crestFactor: number;
    kurtosis: number;
    envelopeRms?: number;
  };
  indicators: Record<string, number>;
  spectrum: {
    quantity: 'acceleration' | 'velocity';
    unit: string;
    scaling: 'peak' | 'rms' | 'psd';
    frequencyResolutionHz: number;
    frequenciesHz: number[];
    values: number[];
  };
  envelopeSpectrum?: { bandHz: [number, number]; unit: string; frequenciesHz: number[]; values: number[] };
  orderSpectrum?: { shaft: string; orders: number[]; values: number[] };
  hypotheses: Hypothesis[];
  unexplainedPeaks: Array<{ frequencyHz: number; amplitude: number; snrDb: number }>;
  warnings: string[];
}

export interface AnalyseOptions {
  model: MachineModel | null;
  pointId: string;
  speedRpm?: number;
  channel?: number;
  tachChannel?: number;
  baseline?: unknown;
  maxPlotPoints?: number;
}

/** Points kept in the stored plot spectrum (min/max per bucket, so peaks survive). */
export const MAX_PLOT_POINTS = 2048;

type AnalyseRecording = (recording: Recording, options: AnalyseOptions) => RecordingAnalysis;

const diagnosisExports = diagnosis as unknown as Record<string, unknown>;

function diagnosisFunction<T>(name: string): T | null {
  const f = diagnosisExports[name];
  return typeof f === 'function' ? (f as T) : null;
}

/** The version of the analysing software, stored with every analysis. */
export function softwareVersion(): string {
  const v = diagnosisExports['SOFTWARE_VERSION'] ?? diagnosisExports['softwareVersion'];
  if (typeof v === 'string') return v;
  return diagnosisFunction<AnalyseRecording>('analyseRecording') ? 'kinespec-diagnosis' : 'kinespec-api-overall-0.1';
}

/** Analyses one recording of a machine point. Throws the packages' typed errors for unusable input. */
export function analyse(recording: Recording, options: AnalyseOptions): RecordingAnalysis {
  const analyseRecording = diagnosisFunction<AnalyseRecording>('analyseRecording');
  const opts = { maxPlotPoints: MAX_PLOT_POINTS, ...options };
  if (analyseRecording) return analyseRecording(recording, opts);
  return overallOnly(recording, opts);
}

interface TimeIndicators {
  peak: number;
  rms: number;
  crestFactor: number;
  kurtosis: number;
}

type IsoClass = { group: 1 | 2; foundation: 'rigid' | 'flexible' };

/** The point's ISO class: its own, else the machine's. */
function isoClassOf(model: MachineModel | null, pointId: string): IsoClass | null {
  const point = model?.points.find((p) => p.id === pointId);
  return (point?.iso ?? model?.iso ?? null) as IsoClass | null;
}

function mainChannelIndex(recording: Recording, channel: number | undefined): number {
  if (channel !== undefined) return channel;
  const i = recording.channels.findIndex((c) => isMotionUnit(c.unit) && quantityOfUnit(c.unit) !== 'displacement');
  return i >= 0 ? i : 0;
}

/** Until diagnosis lands: overall levels and a plot spectrum, no hypotheses. */
function overallOnly(recording: Recording, options: AnalyseOptions & { maxPlotPoints: number }): RecordingAnalysis {
  const index = mainChannelIndex(recording, options.channel);
  const channel = recording.channels[index];
  if (!channel) throw new RangeError(`channel (${index}) must name one of the recording's ${recording.channels.length} channels`);
  const { samples, unit } = channel;
  const fs = recording.sampleRateHz;
  const warnings: string[] = [];
  const speedHz = options.speedRpm !== undefined ? options.speedRpm / 60 : null;
  const bandHz: [number, number] = speedHz !== null && speedHz * 60 < 600 ? [2, 1000] : [10, 1000];
  const overall = overallVelocityRms(samples, fs, unit, { bandHz });
  const quantity = quantityOfUnit(unit) === 'velocity' ? 'velocity' : 'acceleration';
  const spectrum = welchSpectrum(samples, fs, { scaling: 'peak', unit });
  const plot = downsampleForPlot(spectrum, options.maxPlotPoints);
  const timeIndicators = diagnosisFunction<(x: ArrayLike<number>) => TimeIndicators>('timeIndicators');
  const t = timeIndicators ? timeIndicators(samples) : null;
  if (!t) warnings.push('time-domain indicators are not available in this build');
  const levels = severityLevels(overall.velocityRmsMmPerS, { model: options.model, pointId: options.pointId });
  const indicators: Record<string, number> = { velocity_rms_mm_per_s: overall.velocityRmsMmPerS };
  if (t) {
    indicators['crest_factor'] = t.crestFactor;
    indicators['kurtosis'] = t.kurtosis;
    if (quantity === 'acceleration') indicators['acceleration_peak'] = t.peak;
  }
  if (!options.model) warnings.push('the machine has no model: no fault hypotheses');
  else warnings.push('fault diagnosis is not available in this build: overall levels only');
  return {
    softwareVersion: softwareVersion(),
    speedHz,
    speedSource: speedHz !== null ? 'given' : null,
    domain: 'frequency',
    overall: {
      velocityRmsMmPerS: overall.velocityRmsMmPerS,
      bandHz: overall.bandHz,
      zone: levels.zone,
      accelerationPeak: quantity === 'acceleration' && t ? t.peak : Number.NaN,
      accelerationUnit: quantity === 'acceleration' ? unit : '',
      crestFactor: t ? t.crestFactor : Number.NaN,
      kurtosis: t ? t.kurtosis : Number.NaN,
    },
    indicators,
    spectrum: {
      quantity,
      unit: spectrum.valueUnit,
      scaling: 'peak',
      frequencyResolutionHz: spectrum.frequencyResolutionHz,
      frequenciesHz: Array.from(plot.frequenciesHz),
      values: Array.from(plot.values),
    },
    hypotheses: [],
    unexplainedPeaks: [],
    warnings,
  };
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

type GradeSeverity = (v: number, o: Record<string, unknown>) => {
  zone: Zone | null;
  boundaries: { abMmPerS: number; bcMmPerS: number; cdMmPerS: number } | null;
  alarmLevelMmPerS: number | null;
  tripLevelMmPerS: number | null;
};

/**
 * The ISO zone of an overall r.m.s. velocity at a point and the point's alarm and trip levels
 * (the rule is @kinespec/diagnosis gradeSeverity: the point's own levels, else ALARM = baseline +
 * 0.25 x B/C capped at 1.25 x B/C, or B/C without a baseline, and TRIP = C/D; ISO 10816-3 §6.3).
 */
export function severityLevels(
  velocityRmsMmPerS: number,
  source: { model: MachineModel | null; pointId: string } | PointLevels,
): SeverityOfPoint {
  const grade = diagnosisFunction<GradeSeverity>('gradeSeverity');
  const p = pointLevels(source);
  if (!grade || !Number.isFinite(velocityRmsMmPerS)) {
    return { zone: null, boundaries: null, alarmLevel: p.alarmVelocityRmsMmPerS, tripLevel: p.tripVelocityRmsMmPerS };
  }
  const g = grade(Math.max(0, velocityRmsMmPerS), {
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
