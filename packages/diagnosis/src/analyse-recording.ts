import {
  pointUnit,
  speedRangeRpm,
  shaftRatios,
  type MachineModel,
  type Point,
} from '@kinespec/kinematics';
import {
  bandRms,
  binPower,
  convertUnit,
  downsampleForPlot,
  hilbertEnvelope,
  spectrumOfEnvelope,
  integrateSpectrum,
  isMotionUnit,
  noiseFloor,
  quantityOfUnit,
  scratchArray,
  welchSpectrum,
  withScaling,
  type PulseSpeed,
  type Recording,
  type Spectrum,
} from '@kinespec/signal';
import { LineCatalogue, type CatalogueLine } from './ambiguity.js';
import { bearingDefectLines, catalogueLines, runningLines } from './catalogue.js';
import { accelerationSignal } from './acceleration-signal.js';
import { buildCandidates, TOOTH_DROP_DEPTH, type CandidateLimits } from './candidates.js';
import { cepstralPeak, powerCepstrum, type Cepstrum } from './cepstrum.js';
import { envelopeBand, type EnvelopeBand } from './envelope-band.js';
import { DiagnosisInputError } from './errors.js';
import { evidenceOf, scoreCandidates, type Candidate } from './hypothesis-score.js';
import { gradeSeverity, isoBandHz } from './iso-zones.js';
import { lineToleranceHz, matchableSpectrum, matchLine, peakAt, strongPeaks, type LineMatch, type MatchableSpectrum } from './line-matching.js';
import { angleSpectra, type AngleSpectra } from './order-tracking.js';
import { gearSynchronousAverages, type GearTsa } from './gear-tsa.js';
import { indicatorsOf } from './indicators/indicator-registry.js';
import { reasonFor } from './reason.js';
import type { Hypothesis, RecordingAnalysis, SpeedSource } from './recording-analysis.js';
import { speedFromSpectrum } from './running-speed.js';
import { speedFromTach } from './tach-speed.js';
import { timeIndicators } from './time-indicators.js';

/** Version of the analysis code, stored with every analysis so that results can be told apart after upgrades. */
export const SOFTWARE_VERSION = 'kinespec-diagnosis 0.1.0';

export interface AnalyseOptions {
  model?: MachineModel | null;
  /** The model's measurement point the channel reads; default the point named like the channel, else the first vibration point. */
  pointId?: string;
  /** Reference-shaft speed to start from (refined from the spectrum within ±3 %). */
  speedRpm?: number;
  /** Index of the vibration channel; default the first channel in a motion unit. */
  channel?: number;
  /** Index of a tach or encoder channel; default one the recording's metadata or channel names point to. */
  tachChannel?: number;
  pulsesPerRev?: number;
  /** An earlier analysis of the same point on the healthy machine: levels are judged against it. */
  baseline?: RecordingAnalysis | null;
  /** Most points of each plotted spectrum (default 2048). */
  maxPlotPoints?: number;
  /** 'auto' (default): the angle domain when a tach or encoder channel gives pulses; 'frequency' forces the frequency domain. */
  domain?: 'auto' | 'frequency' | 'angle';
  /** When given, each stage of the analysis adds its wall time here (ms, keyed by stage), for benchmarks; never changes the result. */
  stageTimesMs?: Record<string, number>;
}

/** Lines closer than this SNR to the floor are not peaks worth listing or matching. */
const MIN_SNR_DB = 6;
/** Unexplained peaks must stand this far above the floor. */
const UNEXPLAINED_MIN_SNR_DB = 12;

/**
 * Analyses one recording of a machine point: overall severity (ISO 20816-3 zone), time indicators, the
 * spectrum, the running speed, the envelope spectrum, and a score with evidence for every fault candidate of
 * the machine model. Pure and deterministic: the same recording and options give the same object.
 */
export function analyseRecording(recording: Recording, options: AnalyseOptions = {}): RecordingAnalysis {
  const lap = stageClock(options.stageTimesMs);
  const warnings: string[] = [];
  const model = options.model ?? null;
  if (!recording || !Array.isArray(recording.channels) || recording.channels.length === 0) {
    throw new DiagnosisInputError('empty_recording', 'recording must hold at least one channel');
  }
  const fs = recording.sampleRateHz;
  if (!(Number.isFinite(fs) && fs > 0)) throw new DiagnosisInputError('invalid_argument', `sampleRateHz (${fs}) must be a finite number > 0`);
  const tachIndex = tachChannelOf(recording, model, options);
  const channelIndex = vibrationChannelOf(recording, options.channel, tachIndex);
  const channel = recording.channels[channelIndex]!;
  const point = pointOf(model, options.pointId, channel.name, warnings);
  let unit = channel.unit;
  if (!isMotionUnit(unit)) {
    const fallback = point?.unit ?? (point && point.quantity !== 'tach' && point.quantity !== 'encoder' ? defaultUnit(point.quantity) : null);
    if (!fallback) {
      throw new DiagnosisInputError('invalid_argument', `channel ${channelIndex} ('${channel.name}') has unit '${unit}', which is not a vibration unit; give the unit when uploading`);
    }
    warnings.push(`channel ${channelIndex} has unit '${unit}'; read as the point's unit '${fallback}'`);
    unit = fallback;
  }
  const samples = channel.samples;
  if (samples.length < 1024) {
    throw new DiagnosisInputError('invalid_argument', `channel ${channelIndex} has ${samples.length} samples; an analysis needs at least 1024`);
  }
  const quantity = quantityOfUnit(unit);

  // Time-domain indicators, on acceleration.
  const acceleration = accelerationSignal(samples, fs, unit);
  const time = timeIndicators(acceleration.samples.length > 0 ? acceleration.samples : samples);
  lap('time indicators');

  // The spectrum: resolution fine enough for the slowest shaft's sidebands, at least 3 averages where the record allows.
  const ratios = model ? shaftRatios(model) : [];
  const nominalHz = model ? model.speed.nominalRpm / 60 : null;
  const slowestHz = nominalHz !== null && ratios.length > 0 ? Math.min(...ratios.map((r) => r.ratio)) * (speedRangeRpm(model!).minRpm / 60) : null;
  const segmentLength = chooseSegmentLength(samples.length, fs, slowestHz);
  const spectrum = welchSpectrum(samples, fs, { segmentLength, overlapFraction: 0.5, scaling: 'peak', unit, window: 'hann' });
  lap('spectrum');
  const measured = matchableSpectrum(spectrum, noiseFloor(spectrum));
  lap('spectrum noise floor');

  // Running speed.
  const speed = model ? runningSpeed(recording, tachIndex, model, options, measured, warnings) : null;
  const speedHz = speed?.speedHz ?? (options.speedRpm !== undefined ? options.speedRpm / 60 : null);
  const speedSource: SpeedSource | null = speed?.source ?? (options.speedRpm !== undefined ? 'given' : null);
  lap('running speed');

  // Overall velocity and severity.
  const bandHz = isoBandHz(speedHz !== null ? speedHz * 60 : null);
  const velocitySpectrum = quantity === 'velocity'
    ? velocityPsdMmPerS(spectrum, unit)
    : quantity === 'acceleration'
      ? integrateSpectrum(withScaling(spectrum, 'psd'), 'mm/s')
      : null;
  if (!velocitySpectrum) warnings.push('a displacement channel has no velocity level; overall velocity is 0');
  const band: [number, number] = [bandHz[0], Math.min(bandHz[1], spectrum.frequenciesHz[spectrum.frequenciesHz.length - 1]!)];
  if (band[1] < bandHz[1]) warnings.push(`the recording reaches only ${band[1].toFixed(0)} Hz; overall level taken over ${band[0]}–${band[1].toFixed(0)} Hz`);
  const velocityRmsMmPerS = velocitySpectrum ? bandRms(velocitySpectrum, band) : 0;
  const baselineVelocity = point?.baseline?.velocityRmsMmPerS ?? options.baseline?.overall.velocityRmsMmPerS ?? null;
  const severity = gradeSeverity(velocityRmsMmPerS, {
    iso: point?.iso ?? model?.iso ?? null,
    alarmVelocityRmsMmPerS: point?.alarmVelocityRmsMmPerS ?? null,
    tripVelocityRmsMmPerS: point?.tripVelocityRmsMmPerS ?? null,
    baselineVelocityRmsMmPerS: baselineVelocity,
  });
  lap('overall velocity');

  // Envelope spectrum, when the machine has rolling bearings (or no model says otherwise).
  let envelope: ReturnType<typeof envelopeAnalysis> = null;
  if (!model || model.bearings.length > 0) {
    envelope = envelopeAnalysis(samples, fs, unit, model, point, speedHz, warnings, lap);
  }

  // The angle domain: with tach or encoder pulses, match in orders of the reference shaft (no speed error, no smearing).
  const wantAngle = options.domain === 'angle' || (options.domain !== 'frequency' && speed?.pulses !== undefined);
  let angle: AngleSpectra | null = null;
  if (wantAngle && model && speed?.pulses) {
    const ratios = shaftRatios(model).map((r) => r.ratio);
    try {
      angle = angleSpectra(samples, fs, unit, speed.pulses, { envelopeBandHz: envelope?.band.bandHz ?? null, squaredEnvelope: envelope?.squaredEnvelope, slowestOrder: Math.min(1, ...ratios) }, lap);
      if (!angle) warnings.push('the record holds fewer than 4 revolutions: analysed in the frequency domain');
    } catch (err) {
      warnings.push(`order tracking failed (${err instanceof Error ? err.message : String(err)}): analysed in the frequency domain`);
    }
  } else if (options.domain === 'angle') {
    warnings.push('the angle domain needs a tach or encoder channel: analysed in the frequency domain');
  }
  lap('angle domain');

  // Hypotheses.
  let hypotheses: Hypothesis[] = [];
  const matchedHz: number[] = [];
  let catalogue: ReturnType<typeof catalogueLines> = [];
  if (model && speedHz !== null && point) {
    const uncertaintyHz = speed?.uncertaintyHz ?? 0.02 * speedHz;
    catalogue = catalogueLines(model, speedHz);
    lap('catalogue');
    const limits: CandidateLimits = {
      spectrumTopHz: spectrum.frequenciesHz[spectrum.frequenciesHz.length - 2]!,
      spectrumLowHz: 2 * spectrum.frequencyResolutionHz,
      envelopeTopHz: envelope ? envelope.spectrum.frequenciesHz[envelope.spectrum.frequenciesHz.length - 2]! : 0,
      envelopeLowHz: envelope ? 2 * envelope.spectrum.frequencyResolutionHz : 0,
      maxLines: 48,
    };
    const candidates = buildCandidates(model, point, speedHz, unit, limits, warnings);
    lap('candidates');
    const isoAb = severity.boundaries?.abMmPerS ?? 1.4;
    // In the angle domain every frequency is an order (Hz of the reference shaft = 1) and converts back by the mean speed.
    const unitHz = angle ? speedHz : 1;
    const lineSpeed = angle ? 1 : speedHz;
    const lineCatalogue = angle ? catalogueLines(model, 1) : catalogue;
    const main = angle ? angle.measured : measured;
    const envelopeMeasured = angle ? angle.envelope?.measured ?? null : envelope?.measured ?? null;
    const speedSpread = speed?.spreadHz ?? 0;
    const scoringCandidates: Candidate[] = angle
      ? candidates.map((c) => ({
        ...c,
        lines: c.lines.map((l) => ({
          ...l,
          frequencyHz: l.frequencyHz / speedHz,
          // A fixed-frequency line (2 × line frequency) wanders in orders as the speed does.
          relativeSpreadFraction: (l.relativeSpreadFraction ?? 0) + (l.order === 0 ? speedSpread / speedHz : 0),
        })),
      }))
      : candidates;
    lap('candidates');
    // The cepstrum only supports gear faults: computed when the first one asks (scoring), once. Gear faults
    // of one gear ask for the same shaft period: each period's peak is looked up once.
    let cepstrum: Cepstrum | null = null;
    const cepstrumOf = () => (cepstrum ??= powerCepstrumOf(main.spectrum));
    const cepstralPeaks = new Map<number, ReturnType<typeof cepstralPeak>>();
    const scored = scoreCandidates(scoringCandidates, {
      spectra: { spectrum: main, envelope: envelopeMeasured },
      speedUncertaintyHz: angle ? 0 : uncertaintyHz,
      catalogue: {
        spectrum: new LineCatalogue(lineCatalogue.filter((l) => !l.bearing)),
        envelope: new LineCatalogue(lineCatalogue.filter((l) => l.bearing || l.shaftHarmonic)),
      },
      runningLines: new LineCatalogue(runningLines(model, lineSpeed)),
      minSnrDb: MIN_SNR_DB,
      level: (c, matches) =>
        levelOf(c, matches, unit, isoAb, options.baseline ?? null, {
          model, speedHz: lineSpeed, measured: main, uncertaintyHz: angle ? 0 : uncertaintyHz, unitHz,
          referenceSpeedHz: speedHz, baselineOrders: point.baseline?.orders ?? null, pointUnit: point.unit ?? null,
        }),
      support: (c) => supportOf(c, model, lineSpeed, cepstrumOf, cepstralPeaks),
    });
    lap('scoring');
    hypotheses = scored
      .map((s) => {
        const domain = angle && s.candidate.domain === 'spectrum' ? 'order' : s.candidate.domain;
        const hypothesis: Hypothesis = {
          fault: s.candidate.fault,
          component: s.candidate.component,
          score: Math.round(s.score * 1000) / 1000,
          reason: '',
          domain,
          evidence: evidenceOf(s, unitHz),
          parts: roundParts(s.parts),
        };
        hypothesis.reason = reasonFor(hypothesis, s.matches, unitHz);
        return hypothesis;
      })
      .sort((a, b) => b.score - a.score || a.fault.localeCompare(b.fault) || a.component.localeCompare(b.component));
    // Peaks a hypothesis explains: every spectrum-domain match, and the lines of a shown envelope hypothesis
    // (bearing impacts put their defect harmonics into the ordinary spectrum as well).
    for (const s of scored) {
      for (const m of s.matches) if (m.matched && (s.candidate.domain === 'spectrum' || s.score >= 0.5)) matchedHz.push(m.measuredHz! * unitHz);
    }
    lap('hypotheses');
  } else if (model && !point) {
    warnings.push('the model has no vibration point for this channel; no fault hypotheses scored');
  }

  const unexplainedPeaks = unexplained(spectrum, measured, catalogue.filter((l) => !l.bearing), matchedHz, speedHz, speed?.uncertaintyHz ?? 0);
  lap('unexplained peaks');
  const maxPlotPoints = options.maxPlotPoints ?? 2048;
  const plot = downsampleForPlot(spectrum, maxPlotPoints);
  // With the shaft angle known, every gear's synchronous average and its FM0/FM4/NA4 (trended by the service).
  let gearTsa: GearTsa[] | undefined;
  if (angle && model && model.gearMeshes.length > 0) {
    const ratioOf = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
    gearTsa = gearSynchronousAverages(samples, fs, angle.shaftAngle, model, (shaft) => ratioOf.get(shaft)!);
    lap('gear synchronous averages');
  }
  // Trend indicators: read from the registry (indicators/indicator-registry.ts), in the units it gives at this point.
  const { values: indicators, units: indicatorUnits } = indicatorsOf(
    {
      time,
      accelerationUnit: acceleration.unit,
      // a displacement channel is not integrated to velocity here: no overall velocity to trend
      velocityRmsMmPerS: velocitySpectrum ? velocityRmsMmPerS : null,
      speedHz,
      envelope: envelope ? { squaredEnvelope: envelope.squaredEnvelope, unit, kurtogramKurtosis: envelope.band.kurtosis } : null,
      hypotheses,
      gearTsa: gearTsa ?? null,
    },
    { unit: point ? pointUnit(point) : unit },
  );
  const envelopeRms = indicators.envelope_rms;

  const analysis: RecordingAnalysis = {
    softwareVersion: SOFTWARE_VERSION,
    speedHz,
    speedSource,
    ...(speed ? { speedUncertaintyHz: speed.uncertaintyHz } : {}),
    domain: angle ? 'angle' : 'frequency',
    overall: {
      velocityRmsMmPerS,
      bandHz: band,
      zone: severity.zone,
      accelerationPeak: time.peak,
      accelerationUnit: acceleration.unit,
      crestFactor: time.crestFactor,
      kurtosis: time.kurtosis,
      ...(envelopeRms !== undefined ? { envelopeRms } : {}),
      alarmState: severity.alarmState,
      alarmLevelMmPerS: severity.alarmLevelMmPerS,
      tripLevelMmPerS: severity.tripLevelMmPerS,
    },
    indicators,
    indicatorUnits,
    spectrum: {
      quantity,
      unit,
      scaling: 'peak',
      frequencyResolutionHz: spectrum.frequencyResolutionHz,
      frequenciesHz: Array.from(plot.frequenciesHz),
      values: Array.from(plot.values),
    },
    hypotheses,
    unexplainedPeaks,
    warnings,
    ...(gearTsa ? { gearTsa } : {}),
    channel: channelIndex,
    pointId: point?.id ?? null,
  };
  if (angle) {
    const p = downsampleForPlot({ frequenciesHz: angle.orders.orders, values: angle.orders.values }, maxPlotPoints);
    analysis.orderSpectrum = { shaft: model!.speed.shaft, orders: Array.from(p.frequenciesHz), values: Array.from(p.values) };
  }
  if (envelope) {
    const p = downsampleForPlot(envelope.spectrum, maxPlotPoints);
    analysis.envelopeSpectrum = {
      bandHz: envelope.band.bandHz,
      unit: envelope.spectrum.valueUnit,
      frequenciesHz: Array.from(p.frequenciesHz),
      values: Array.from(p.values),
      bandSource: envelope.band.source,
    };
  }
  lap('plots and result');
  return analysis;
}

/** A lap timer adding each stage's wall time to `into` (a no-op without it). */
function stageClock(into: Record<string, number> | undefined): (stage: string) => void {
  if (!into) return () => {};
  let last = performance.now();
  return (stage) => {
    const now = performance.now();
    into[stage] = (into[stage] ?? 0) + (now - last);
    last = now;
  };
}

/** The PSD of a velocity channel's spectrum in (mm/s)²/Hz: one scaling pass, one unit factor. */
export function velocityPsdMmPerS(spectrum: Spectrum, unit: string): Spectrum {
  const psd = withScaling(spectrum, 'psd');
  const squaredFactor = convertUnit(1, unit, 'mm/s') ** 2;
  return { ...psd, values: psd.values.map((v) => v * squaredFactor), unit: 'mm/s' };
}

export function defaultUnit(quantity: 'acceleration' | 'velocity' | 'displacement'): string {
  return quantity === 'acceleration' ? 'g' : quantity === 'velocity' ? 'mm/s' : 'um';
}

export function tachChannelOf(recording: Recording, model: MachineModel | null, options: AnalyseOptions): number | null {
  const n = recording.channels.length;
  if (options.tachChannel !== undefined) {
    if (!(Number.isInteger(options.tachChannel) && options.tachChannel >= 0 && options.tachChannel < n)) {
      throw new DiagnosisInputError('unknown_channel', `tachChannel (${options.tachChannel}) must be a channel index 0..${n - 1}`);
    }
    return options.tachChannel;
  }
  for (const key of ['tachChannel', 'encoderChannel']) {
    const v = recording.metadata?.[key];
    if (v !== undefined && /^\d+$/.test(v) && Number(v) < n && Number(v) !== options.channel) return Number(v);
  }
  if (model) {
    const pulsePoints = new Set(model.points.filter((p) => p.quantity === 'tach' || p.quantity === 'encoder').map((p) => p.id));
    const i = recording.channels.findIndex((c, k) => k !== options.channel && pulsePoints.has(c.name));
    if (i >= 0) return i;
  }
  return null;
}

export function vibrationChannelOf(recording: Recording, channel: number | undefined, tachIndex: number | null): number {
  const n = recording.channels.length;
  if (channel !== undefined) {
    if (!(Number.isInteger(channel) && channel >= 0 && channel < n)) {
      throw new DiagnosisInputError('unknown_channel', `channel (${channel}) must be a channel index 0..${n - 1}`);
    }
    if (channel === tachIndex) throw new DiagnosisInputError('unknown_channel', `channel (${channel}) is the tach channel; give the vibration channel`);
    return channel;
  }
  const i = recording.channels.findIndex((c, k) => k !== tachIndex && isMotionUnit(c.unit));
  if (i >= 0) return i;
  const j = recording.channels.findIndex((_, k) => k !== tachIndex);
  if (j < 0) throw new DiagnosisInputError('unknown_channel', 'the recording has no vibration channel besides the tach channel');
  return j;
}

export function pointOf(model: MachineModel | null, pointId: string | undefined, channelName: string, warnings: string[]): Point | null {
  if (!model) return null;
  const vibration = model.points.filter((p) => p.quantity !== 'tach' && p.quantity !== 'encoder');
  if (pointId !== undefined) {
    const p = model.points.find((q) => q.id === pointId);
    if (!p) throw new DiagnosisInputError('unknown_point', `pointId '${pointId}' is not a point of machine '${model.id}' (points: ${model.points.map((q) => q.id).join(', ')})`);
    if (p.quantity === 'tach' || p.quantity === 'encoder') throw new DiagnosisInputError('unknown_point', `pointId '${pointId}' is a ${p.quantity} point; give a vibration point`);
    return p;
  }
  const named = vibration.find((p) => p.id === channelName);
  if (named) return named;
  if (vibration.length === 0) return null;
  if (vibration.length > 1) warnings.push(`no point given; analysed as point '${vibration[0]!.id}' (the model's first vibration point)`);
  return vibration[0]!;
}

/**
 * Segment length: the power of two giving a bin of at most a quarter of the slowest shaft's speed and at most
 * 0.5 Hz (so that twice line frequency and twice running speed of a two-pole motor, about 1 Hz apart, separate),
 * 4096..65536 samples, at most half the record (at least three averages with 50 % overlap).
 */
export function chooseSegmentLength(length: number, sampleRateHz: number, slowestShaftHz: number | null): number {
  let largest = 1;
  while (largest * 2 <= length) largest *= 2;
  const cap = largest >= 16384 ? largest / 2 : largest;
  let n = 4096;
  const wantHz = Math.min(0.5, slowestShaftHz !== null ? slowestShaftHz / 4 : 0.5);
  while (n < 65536 && sampleRateHz / n > wantHz) n *= 2;
  return Math.max(Math.min(n, cap), Math.min(largest, 1024));
}

interface RunningSpeed {
  speedHz: number;
  uncertaintyHz: number;
  source: SpeedSource;
  /** Pulses of a tach or encoder channel, for order tracking. */
  pulses?: PulseSpeed;
  /** Spread (max − min) of the smoothed speed over the record, Hz. */
  spreadHz?: number;
}

function runningSpeed(
  recording: Recording,
  tachIndex: number | null,
  model: MachineModel,
  options: AnalyseOptions,
  measured: MatchableSpectrum,
  warnings: string[],
): RunningSpeed {
  if (tachIndex !== null) {
    const tach = speedFromTach(recording, tachIndex, model, options.pulsesPerRev, warnings);
    if (tach) return { speedHz: tach.speedHz, uncertaintyHz: tach.uncertaintyHz, source: tach.source, pulses: tach.pulses, spreadHz: tach.spreadHz };
  }
  const range = speedRangeRpm(model);
  const searchRpm: [number, number] = options.speedRpm !== undefined
    ? [options.speedRpm * 0.97, options.speedRpm * 1.03]
    : [range.minRpm, range.maxRpm];
  // A model with a single speed still runs off nameplate by a few percent (common practice: slip, drives).
  if (searchRpm[1] - searchRpm[0] < 0.06 * searchRpm[0]) {
    const mid = (searchRpm[0] + searchRpm[1]) / 2;
    searchRpm[0] = Math.min(searchRpm[0], mid * 0.97);
    searchRpm[1] = Math.max(searchRpm[1], mid * 1.03);
  }
  const found = speedFromSpectrum(measured, model, {
    searchRangeHz: [searchRpm[0] / 60, searchRpm[1] / 60],
    minSnrDb: MIN_SNR_DB,
    preferredHz: (options.speedRpm ?? range.nominalRpm) / 60,
  });
  if (found && found.support.length >= 2) {
    const smeared = smearedOrder(measured, found.support);
    if (smeared !== null) {
      warnings.push(
        `the speed varied during the record: the ${smeared.label} line (order ${smeared.order.toFixed(1)}) is smeared over more than its matching tolerance; ` +
          'high-order patterns score low, record a tach or encoder channel so that the recording can be order-tracked',
      );
    }
    if (options.speedRpm !== undefined && Math.abs(found.speedHz * 60 - options.speedRpm) > 0.002 * options.speedRpm) {
      warnings.push(`speed refined from the given ${options.speedRpm} rpm to ${(found.speedHz * 60).toFixed(1)} rpm by ${found.support.length} running lines`);
    }
    return { speedHz: found.speedHz, uncertaintyHz: found.uncertaintyHz, source: 'spectrum' };
  }
  const fallbackRpm = options.speedRpm ?? range.nominalRpm;
  warnings.push(`the spectrum does not show the running speed; using the ${options.speedRpm !== undefined ? 'given' : "model's nominal"} ${fallbackRpm} rpm`);
  return { speedHz: fallbackRpm / 60, uncertaintyHz: (0.01 * fallbackRpm) / 60, source: 'given' };
}

/**
 * The highest-order running line (20 dB over the floor or more) whose power is spread beyond the window's main lobe:
 * the power in ±3 bins over 1.5 × the interpolated tone power (a steady tone gives about 1 with the Hann window, whose
 * noise bandwidth is 1.5 bins, Harris 1978); above 2, most of the line lies outside its main lobe, so the speed moved
 * by more than the matching tolerance during the record. Null when every line is sharp.
 */
function smearedOrder(measured: MatchableSpectrum, support: ReadonlyArray<{ label: string; order: number; frequencyHz: number; snrDb: number }>): { label: string; order: number } | null {
  const { spectrum } = measured;
  if (spectrum.window !== 'hann') return null;
  const df = spectrum.frequencyResolutionHz;
  const strong = support.filter((s) => s.snrDb >= 20).sort((a, b) => b.order - a.order);
  for (const s of strong.slice(0, 3)) {
    const k = Math.round(s.frequencyHz / df);
    if (k < 4 || k > spectrum.values.length - 5) continue;
    let peakBin = k;
    for (let j = k - 1; j <= k + 1; j++) if (spectrum.values[j]! > spectrum.values[peakBin]!) peakBin = j;
    const tone = peakAt(measured, peakBin);
    let power = 0;
    for (let j = peakBin - 3; j <= peakBin + 3; j++) power += binPower(spectrum, j);
    const tonePower = (tone.rmsAmplitude * tone.rmsAmplitude);
    if (tonePower > 0 && power / (1.5 * tonePower) > 2) return { label: s.label, order: s.order };
  }
  return null;
}

function envelopeAnalysis(
  samples: Float64Array,
  fs: number,
  unit: string,
  model: MachineModel | null,
  point: Point | null,
  speedHz: number | null,
  warnings: string[],
  lap: (stage: string) => void = () => {},
): { band: EnvelopeBand; spectrum: Spectrum; measured: MatchableSpectrum; squaredEnvelope: Float64Array } | null {
  // The band must hold the fault lines and their sidebands: 3.5 × the highest first-order defect frequency.
  let highestDefectHz = 0;
  let slowestBearingShaftHz = Infinity;
  if (model && speedHz !== null) {
    for (const line of bearingDefectLines(model, speedHz)) {
      highestDefectHz = Math.max(highestDefectHz, line.family === 'bearing-bsf' ? 2 * line.frequencyHz : line.frequencyHz);
    }
    const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
    for (const b of model.bearings) slowestBearingShaftHz = Math.min(slowestBearingShaftHz, ratio.get(b.shaft)! * speedHz);
  }
  const minBandwidthHz = Math.max(3.5 * highestDefectHz, 400);
  if (minBandwidthHz > 0.2 * fs) {
    warnings.push(`the sample rate (${fs} Hz) is too low for envelope analysis of this machine's bearings`);
    return null;
  }
  const band = envelopeBand(samples, fs, { resonances: point?.resonances ?? [], minBandwidthHz });
  lap(band.source === 'kurtogram' ? 'envelope band (kurtogram)' : 'envelope band (resonance)');
  // Envelope resolution: a quarter of the slowest bearing shaft's speed (sidebands at shaft speed and FTF).
  const wantHz = Number.isFinite(slowestBearingShaftHz) ? slowestBearingShaftHz / 4 : 1;
  let segment = 4096;
  while (segment < 65536 && fs / segment > wantHz) segment *= 2;
  let largest = 1;
  while (largest * 2 <= samples.length) largest *= 2;
  segment = Math.min(segment, largest >= 16384 ? largest / 2 : largest);
  // The squared envelope is kept: the angle domain order-tracks the same one.
  const squaredEnvelope = hilbertEnvelope(samples, { bandHz: band.bandHz, sampleRateHz: fs, squared: true });
  const spectrum = spectrumOfEnvelope(squaredEnvelope, fs, { bandHz: band.bandHz, squared: true, segmentLength: segment, scaling: 'peak', unit, window: 'hann' });
  lap('envelope spectrum');
  const measured = matchableSpectrum(spectrum, noiseFloor(spectrum));
  lap('envelope noise floor');
  return { band, spectrum, measured, squaredEnvelope };
}

function powerCepstrumOf(spectrum: Spectrum): Cepstrum {
  const power = scratchArray('diagnosis:cepstrum-power', spectrum.values.length);
  for (let k = 0; k < power.length; k++) power[k] = binPower(spectrum, k);
  return powerCepstrum(power, spectrum.frequencyResolutionHz);
}

/** Level of a candidate: against the baseline analysis when there is one, else an absolute reference for its family. */
function levelOf(
  candidate: Candidate,
  matches: readonly LineMatch[],
  unit: string,
  isoAbMmPerS: number,
  baseline: RecordingAnalysis | null,
  context: {
    model: MachineModel; speedHz: number; measured: MatchableSpectrum; uncertaintyHz: number; unitHz: number;
    referenceSpeedHz: number; baselineOrders: ReadonlyArray<{ order: number; amplitude: number }> | null; pointUnit: string | null;
  },
): number {
  // The model's own healthy amplitudes at chosen orders of the reference shaft (point.baseline.orders, peak amplitudes
  // in the point's unit): the rise of the matched lines found there, +12 dB counting fully, as against a baseline analysis.
  // Only for faults judged by the size of lines every machine shows (a defect line's presence needs no baseline),
  // and only when the baseline orders hold most of the candidate's matched power.
  if (!baseline && context.baselineOrders && context.baselineOrders.length > 0 && candidate.domain === 'spectrum' && candidate.ownsRunningLines) {
    const scale = context.pointUnit && context.pointUnit !== unit ? safeScale(context.pointUnit, unit) : 1;
    let now = 0;
    let then = 0;
    const all = energy(matches.filter((m) => m.matched).map((m) => m.measuredAmplitude!));
    for (const m of matches) {
      if (!m.matched) continue;
      const order = (m.measuredHz! * context.unitHz) / context.referenceSpeedHz;
      const tolOrders = (m.toleranceHz * context.unitHz) / context.referenceSpeedHz;
      const b = context.baselineOrders.find((x) => Math.abs(x.order - order) <= tolOrders);
      if (!b) continue;
      now += m.measuredAmplitude! ** 2;
      then += (b.amplitude * scale) ** 2;
    }
    if (then > 0 && now >= 0.5 * all) return Math.max(0, Math.min(1, (10 * Math.log10(now / then)) / 12));
  }
  if (baseline) {
    const before = baseline.hypotheses.find((h) => h.fault === candidate.fault && h.component === candidate.component);
    if (before) {
      // ISO 10816-3 criterion II in spirit: a rise matters, not the level itself. +12 dB (×4) in the matched lines counts fully.
      const now = energy(matches.filter((m) => m.matched).map((m) => m.measuredAmplitude!));
      const then = energy(before.evidence.filter((e) => e.matched && e.measured !== null).map((e) => e.measured!));
      if (then > 0) return Math.max(0, Math.min(1, (10 * Math.log10(now / then)) / 12));
      return now > 0 ? 1 : 0;
    }
  }
  if (candidate.fault === 'gear-wear') return wearLevel(matches);
  if (candidate.fault === 'gear-missing-tooth' || candidate.fault === 'gear-broken-tooth') {
    return toothDropLevel(candidate, TOOTH_DROP_DEPTH[candidate.fault], context);
  }
  if (candidate.domain !== 'spectrum' || !['unbalance', 'misalignment', 'looseness', 'electrical'].includes(candidate.fault)) return 1;
  // Faults that every running machine shows a little of (residual unbalance, 1× and 2×, twice line frequency) count
  // only when their lines carry real vibration: from a quarter of the ISO A/B boundary (nothing) to the boundary itself (all).
  const velocities = matches.filter((m) => m.matched).map((m) => velocityRmsOfLine(m.measuredAmplitude!, m.measuredHz! * context.unitHz, unit));
  const v = Math.sqrt(energy(velocities));
  if (!(v > 0)) return 0;
  return Math.max(0, Math.min(1, Math.log(v / (0.25 * isoAbMmPerS)) / Math.log(4)));
}

/**
 * Wear without a baseline: a healthy mesh's fundamental dominates its harmonics; wear of the profile raises 2× and
 * 3× mesh frequency (common practice, Randall 2011 ch. 2, from memory). Nothing counts while the larger harmonic is
 * 6 dB or more under the fundamental, everything once it reaches it (a judgement of this package, not a standard).
 */
function wearLevel(matches: readonly LineMatch[]): number {
  const byFrequency = [...matches].sort((a, b) => a.predictedHz - b.predictedHz);
  const first = byFrequency[0];
  if (!first || !first.matched) return byFrequency.some((m) => m.matched) ? 1 : 0;
  const harmonics = byFrequency.slice(1).map((m) => m.measuredAmplitude ?? 0);
  const largest = Math.max(0, ...harmonics);
  if (!(largest > 0)) return 0;
  const db = 20 * Math.log10(largest / first.measuredAmplitude!);
  return Math.max(0, Math.min(1, (db + 6) / 6));
}

/** Spread allowed between the measured and the predicted depth of a tooth drop (natural-log units, a factor 2). */
const DEPTH_SPREAD_LN = 0.7;
/** Depth (fraction of a full drop) from which the gear's own mesh counts as fully modulated. */
const OWN_MESH_DEPTH = 0.1;
/** Sidebands each side of the mesh line used for the depth, at most (and at most Z/2). */
const DEPTH_SIDEBANDS = 12;

/**
 * Which of the two tooth faults the depth of the mesh-torque drop fits better. A drop of depth d over one tooth
 * pitch (1/Z rev) of a gear amplitude-modulates its mesh line A: the k-th sidebands are A·d·sinc(k/Z)/Z (Fourier
 * series of a one-pitch rectangular gate, check-values §6; modulation sidebands, Randall 2011 ch. 2, from memory).
 * d̂ is the least-squares fit of that family to the sidebands k = 1..min(Z/2, 12) on both sides (an energy fit, so
 * that families of neighbouring mesh harmonics, which overlap with random phases, average out rather than decide).
 * fit = exp(−ln²(d̂/d)/(2·0.7²)) for d = 1 (missing) and 0.5 (broken, the depths of @kinespec/signatures); each
 * hypothesis keeps fit/max(fit of both): the depth chooses between them and never lowers the better of the two;
 * both are scaled by min(1, d̂/0.1), since a tooth fault must modulate its own mesh (a gear's comb of shaft
 * harmonics is shared with every other gear on the same shaft), and by its sideband-to-mesh-line ratio d̂/Z over
 * the largest of the gears on that shaft (the most deeply modulated mesh holds the fault). Without a measured mesh line it is 1.
 */
function toothDropLevel(
  candidate: Candidate,
  depth: number,
  context: { model: MachineModel; speedHz: number; measured: MatchableSpectrum; uncertaintyHz: number },
): number {
  const measuredDepth = toothDropDepth(candidate.component, context);
  if (measuredDepth === null) return 1;
  const fit = (d: number) => {
    const ln = Math.log(Math.max(measuredDepth, 1e-6) / d);
    return Math.exp(-(ln * ln) / (2 * DEPTH_SPREAD_LN * DEPTH_SPREAD_LN));
  };
  const best = Math.max(fit(TOOTH_DROP_DEPTH['gear-missing-tooth']), fit(TOOTH_DROP_DEPTH['gear-broken-tooth']));
  // A tooth fault modulates its own mesh: with next to no sidebands there (d̂ under a tenth of a full drop),
  // lines elsewhere on the same shaft belong to another gear on it.
  // Of several gears on one shaft, the one whose mesh is modulated most deeply is the likelier.
  const { model } = context;
  const shaft = model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === candidate.component)?.shaft;
  const siblings = model.gearMeshes.flatMap((m) => [m.driver, m.driven]).filter((g) => g.shaft === shaft && g.gear !== candidate.component);
  // Compared as sideband-to-mesh-line ratios (d̂/Z): a gear with many teeth would otherwise win on its tooth count.
  const own = measuredDepth / teethOf(model, candidate.component);
  const deepest = Math.max(own, ...siblings.map((g) => (toothDropDepth(g.gear, context) ?? 0) / g.teeth));
  const onOwnMesh = Math.min(1, measuredDepth / OWN_MESH_DEPTH) * (deepest > 0 ? own / deepest : 1);
  return (fit(depth) / best) * onOwnMesh;
}

function teethOf(model: MachineModel, gearId: string): number {
  return model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === gearId)?.teeth ?? 1;
}

/** The depth d̂ of a gear's tooth drop read from the sidebands of its mesh line (see toothDropLevel), or null. */
function toothDropDepth(gearId: string, context: { model: MachineModel; speedHz: number; measured: MatchableSpectrum; uncertaintyHz: number }): number | null {
  const { model, speedHz, measured, uncertaintyHz } = context;
  const memo = depthMemo.get(measured) ?? new Map<string, number | null>();
  depthMemo.set(measured, memo);
  if (memo.has(gearId)) return memo.get(gearId)!;
  let result: number | null = null;
  const mesh = model.gearMeshes.find((m) => m.driver.gear === gearId || m.driven.gear === gearId);
  if (mesh) {
    const gear = mesh.driver.gear === gearId ? mesh.driver : mesh.driven;
    const ratio = shaftRatios(model).find((r) => r.shaft === gear.shaft)!.ratio;
    const shaftHz = ratio * speedHz;
    const meshHz = gear.teeth * shaftHz;
    const df = measured.spectrum.frequencyResolutionHz;
    const match = (frequencyHz: number, order: number) => {
      const line = { frequencyHz, amplitude: 1, label: '', order };
      return matchLine(measured, line, lineToleranceHz(line, { frequencyResolutionHz: df, speedUncertaintyHz: uncertaintyHz }));
    };
    const carrier = match(meshHz, gear.teeth * ratio);
    if (carrier.matched) {
      let found = 0;
      let predicted = 0;
      for (let k = 1; k <= Math.min(DEPTH_SIDEBANDS, Math.floor(gear.teeth / 2)); k++) {
        const x = k / gear.teeth;
        const sinc = Math.sin(Math.PI * x) / (Math.PI * x);
        for (const sign of [-1, 1]) {
          const f = meshHz + sign * k * shaftHz;
          if (f <= 2 * df) continue;
          const m = match(f, (gear.teeth + sign * k) * ratio);
          const a = m.measuredAmplitude ?? 0;
          found += a * a;
          predicted += ((carrier.measuredAmplitude! * sinc) / gear.teeth) ** 2;
        }
      }
      if (predicted > 0 && found > 0) result = Math.sqrt(found / predicted);
    }
  }
  memo.set(gearId, result);
  return result;
}

const depthMemo = new WeakMap<MatchableSpectrum, Map<string, number | null>>();

function safeScale(from: string, to: string): number {
  try {
    return convertUnit(1, from, to);
  } catch {
    return 1;
  }
}

function energy(amplitudes: readonly number[]): number {
  let s = 0;
  for (const a of amplitudes) s += a * a;
  return s;
}

/** RMS velocity (mm/s) of a line of peak amplitude `amplitude` in `unit` at `frequencyHz` (v = a/(2πf), common practice). */
function velocityRmsOfLine(amplitude: number, frequencyHz: number, unit: string): number {
  const q = quantityOfUnit(unit);
  const rms = amplitude / Math.SQRT2;
  if (q === 'velocity') return convertUnit(rms, unit, 'mm/s');
  if (q === 'acceleration') return (convertUnit(rms, unit, 'm/s^2') / (2 * Math.PI * frequencyHz)) * 1000;
  return convertUnit(rms, unit, 'm') * 2 * Math.PI * frequencyHz * 1000;
}

/** Cepstral support of a gear fault: a rahmonic at the period of the gear's shaft (common practice). */
function supportOf(candidate: Candidate, model: MachineModel, speedHz: number, cepstrum: () => Cepstrum, memo: Map<number, ReturnType<typeof cepstralPeak>>): number {
  if (!candidate.fault.startsWith('gear-') || candidate.fault === 'gear-wear') return 1;
  const gear = model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === candidate.component);
  if (!gear) return 1;
  const ratio = shaftRatios(model).find((r) => r.shaft === gear.shaft)!.ratio;
  const periodS = 1 / (ratio * speedHz);
  let peak = memo.get(periodS);
  if (peak === undefined) {
    peak = cepstralPeak(cepstrum(), periodS, 0.02);
    memo.set(periodS, peak);
  }
  const prominence = peak?.prominence ?? 0;
  // A prominence of 3 robust deviations says nothing, 8 or more is clear; without it the score keeps 85 %.
  return 0.85 + 0.15 * Math.max(0, Math.min(1, (prominence - 3) / 5));
}

function roundParts(p: Hypothesis['parts']): Hypothesis['parts'] {
  const r = (x: number) => Math.round(x * 1000) / 1000;
  return {
    detection: r(p.detection), shape: r(p.shape), level: r(p.level), exclusivity: r(p.exclusivity), support: r(p.support),
    explainedAway: r(p.explainedAway), ...(p.explainedBy !== undefined ? { explainedBy: p.explainedBy } : {}),
  };
}

/** Strong peaks that neither the catalogue of component lines nor any hypothesis accounts for. */
function unexplained(
  spectrum: Spectrum,
  measured: MatchableSpectrum,
  catalogue: readonly CatalogueLine[],
  matchedHz: readonly number[],
  speedHz: number | null,
  speedUncertaintyHz: number,
): RecordingAnalysis['unexplainedPeaks'] {
  const peaks = strongPeaks(measured, UNEXPLAINED_MIN_SNR_DB, 40);
  const df = spectrum.frequencyResolutionHz;
  const known = new LineCatalogue(catalogue);
  const out: RecordingAnalysis['unexplainedPeaks'] = [];
  for (const p of peaks) {
    if (p.frequencyHz < 2 * df) continue;
    const order = speedHz ? p.frequencyHz / speedHz : 0;
    const tol = lineToleranceHz({ frequencyHz: p.frequencyHz, order }, { frequencyResolutionHz: df, speedUncertaintyHz });
    if (known.foreignNear(p.frequencyHz, tol, new Set()).length > 0) continue;
    if (matchedHz.some((hz) => Math.abs(hz - p.frequencyHz) <= tol)) continue;
    out.push({ frequencyHz: p.frequencyHz, amplitude: p.amplitude, snrDb: Math.round(measured.snrDb[p.bin]! * 10) / 10 });
    if (out.length >= 10) break;
  }
  return out;
}
