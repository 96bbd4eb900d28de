import { pointUnit, shaftRatios, speedRangeRpm, type MachineModel } from '@kinespec/kinematics';
import { bandRms, integrateSpectrum, quantityOfUnit, welchSpectrum, withScaling, type Recording } from '@kinespec/signal';
import { accelerationSignal } from '../acceleration-signal.js';
import { analyseRecording, chooseSegmentLength, velocityPsdMmPerS, type AnalyseOptions } from '../analyse-recording.js';
import { readChannel } from '../channel-selection.js';
import { DiagnosisInputError } from '../errors.js';
import { isoBandHz } from '../iso-zones.js';
import { timeIndicators } from '../time-indicators.js';
import { indicatorDescriptor, type IndicatorPoint, type IndicatorSources, type IndicatorStage } from './indicator-registry.js';

/** The options of analyseRecording that choose the channel, point and speed. */
export type IndicatorOptions = Pick<AnalyseOptions, 'model' | 'pointId' | 'channel' | 'tachChannel' | 'pulsesPerRev' | 'speedRpm'>;

export interface ComputedIndicators {
  /** The requested indicators the recording gives (a score of a hypothesis the model does not have is absent). */
  values: Record<string, number>;
  /** The unit of each requested indicator at the point. */
  units: Record<string, string>;
  /** The most expensive stage that was computed. */
  stage: IndicatorStage;
  warnings: string[];
}

const STAGE_ORDER: readonly IndicatorStage[] = ['time', 'spectrum', 'envelope', 'analysis'];

/** Speed below which the ISO velocity band starts at 2 Hz instead of 10 Hz (isoBandHz). */
const SLOW_MACHINE_RPM = 600;

/**
 * Computes the named indicators of one recording, doing only the work they need: the time indicators need the
 * acceleration signal alone, the overall velocity one Welch spectrum; the envelope level (its band depends on the
 * bearings' defect frequencies at the measured speed) the analysis up to its envelope stage, the speed, the fault
 * scores and the gear averages the whole analysis; analyseRecording makes both. The values equal those of analyseRecording for the same options
 * (a test holds them together): channel, point and unit are chosen by the same rules.
 */
export function computeIndicators(recording: Recording, names: readonly string[], options: IndicatorOptions = {}): ComputedIndicators {
  if (names.length === 0) throw new DiagnosisInputError('invalid_argument', 'names must list at least one indicator');
  const descriptors = names.map((n) => indicatorDescriptor(n));
  const model = options.model ?? null;
  let stage: IndicatorStage = 'time';
  for (const d of descriptors) if (STAGE_ORDER.indexOf(d.stage) > STAGE_ORDER.indexOf(stage)) stage = d.stage;
  // The ISO band of the overall velocity follows the measured speed when the model's range spans 600 rpm.
  if (stage === 'spectrum' && model && bandFollowsMeasuredSpeed(model, options.speedRpm)) stage = 'analysis';

  if (stage === 'envelope' || stage === 'analysis') {
    // The envelope level needs the speed and the envelope stage, not the fault hypotheses.
    const a = analyseRecording(recording, { ...options, maxPlotPoints: 16, ...(stage === 'envelope' ? { hypotheses: false } : {}) });
    return pick(names, a.indicators, a.indicatorUnits ?? {}, stage, a.warnings);
  }

  const warnings: string[] = [];
  // The same channel, point and unit as analyseRecording.
  const { sampleRateHz: fs, samples, point, unit } = readChannel(recording, model, options, warnings);
  const at: IndicatorPoint = { unit: point ? pointUnit(point) : unit };
  const sources: IndicatorSources = {};
  if (descriptors.some((d) => d.stage === 'time')) {
    const acceleration = accelerationSignal(samples, fs, unit);
    sources.time = timeIndicators(acceleration.samples);
    sources.accelerationUnit = acceleration.unit;
  }
  if (stage === 'spectrum') sources.velocityRmsMmPerS = overallVelocity(samples, fs, unit, model, options.speedRpm);
  const values: Record<string, number> = {};
  const units: Record<string, string> = {};
  for (const d of descriptors) {
    Object.assign(values, d.values(sources, at));
  }
  for (const d of descriptors) for (const n of names) if (d.matches(n)) units[n] = d.unit(at);
  return pick(names, values, units, stage, warnings);
}

function pick(names: readonly string[], values: Record<string, number>, units: Record<string, string>, stage: IndicatorStage, warnings: string[]): ComputedIndicators {
  const out: ComputedIndicators = { values: {}, units: {}, stage, warnings };
  for (const n of names) {
    if (values[n] !== undefined) out.values[n] = values[n]!;
    out.units[n] = units[n] ?? indicatorDescriptor(n).unit({ unit: null });
  }
  return out;
}

function bandFollowsMeasuredSpeed(model: MachineModel, speedRpm: number | undefined): boolean {
  // analyseRecording searches ±3 % around a given speed, else the model's whole range
  const range = speedRangeRpm(model);
  const [lo, hi] = speedRpm !== undefined ? [speedRpm * 0.97, speedRpm * 1.03] : [range.minRpm * 0.97, range.maxRpm * 1.03];
  return lo < SLOW_MACHINE_RPM && hi >= SLOW_MACHINE_RPM;
}

/** The overall r.m.s. velocity as analyseRecording computes it (same segment length, same band), mm/s; null for displacement. */
function overallVelocity(samples: Float64Array, fs: number, unit: string, model: MachineModel | null, speedRpm: number | undefined): number | null {
  const quantity = quantityOfUnit(unit);
  if (quantity === 'displacement') return null;
  const ratios = model ? shaftRatios(model) : [];
  const slowestHz = model && ratios.length > 0 ? Math.min(...ratios.map((r) => r.ratio)) * (speedRangeRpm(model).minRpm / 60) : null;
  const segmentLength = chooseSegmentLength(samples.length, fs, slowestHz);
  const spectrum = welchSpectrum(samples, fs, { segmentLength, overlapFraction: 0.5, scaling: 'peak', unit, window: 'hann' });
  const velocitySpectrum = quantity === 'velocity' ? velocityPsdMmPerS(spectrum, unit) : integrateSpectrum(withScaling(spectrum, 'psd'), 'mm/s');
  const bandHz = isoBandHz(speedRpm ?? (model ? speedRangeRpm(model).nominalRpm : null));
  const top = spectrum.frequenciesHz[spectrum.frequenciesHz.length - 1]!;
  return bandRms(velocitySpectrum, [bandHz[0], Math.min(bandHz[1], top)]);
}
