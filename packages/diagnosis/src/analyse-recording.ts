import { faultKindFacts, isFaultKind, pointUnit, speedRangeRpm, shaftRatios, type MachineModel } from '@kinespec/kinematics';
import {
  bandRms,
  binPower,
  convertUnit,
  downsampleForPlot,
  integrateSpectrum,
  DEFAULT_NOISE_FLOOR_WIDTH_BINS,
  noiseFloor,
  quantityOfUnit,
  scratchArray,
  welchSpectrum,
  withScaling,
  type Recording,
  type Spectrum,
} from '@kinespec/signal';
import { LineCatalogue, type CatalogueLine } from './ambiguity.js';
import { bearingDefectLines, catalogueLines, runningLines } from './catalogue.js';
import { accelerationSignal } from './acceleration-signal.js';
import { buildCandidates, type CandidateLimits } from './candidates.js';
import { powerCepstrum, type Cepstrum } from './cepstrum.js';
import { readChannel, type ChannelReading } from './channel-selection.js';
import { envelopeStage, type EnvelopeStage } from './envelope-stage.js';
import { judgeHypotheses, predictionScale, type Judged } from './hypotheses.js';
import { gradeSeverity, isoBandHz } from './iso-zones.js';
import { lineToleranceHz, matchableSpectrum, strongPeaks, type MatchableSpectrum } from './line-matching.js';
import { angleSpectra, type AngleSpectra } from './order-tracking.js';
import { gearSynchronousAverages, type GearTsa } from './gear-tsa.js';
import { indicatorsOf } from './indicators/indicator-registry.js';
import { reasonFor } from './reason.js';
import type { Evidence, Hypothesis, RecordingAnalysis, SpeedSource } from './recording-analysis.js';
import { runningSpeed, speedSearchTopHz, type RunningSpeed } from './speed-stage.js';
import { timeIndicators } from './time-indicators.js';

/** Version of the analysis code, stored with every analysis so that results can be told apart after upgrades. */
export const SOFTWARE_VERSION = 'kinespec-diagnosis 0.2.0';

export interface AnalyseOptions {
  model?: MachineModel | null;
  /** The model's measurement point the channel reads; default the point named like the channel, else the first vibration point. */
  pointId?: string;
  /** Reference-shaft speed to start from (refined from the spectrum within ±3 %). */
  speedRpm?: number;
  /** Index (from 0) of the vibration channel; default the first channel in a motion unit. */
  channel?: number;
  /** Index (from 0) of a tach or encoder channel; default one the recording's metadata or channel names point to. */
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
  /**
   * false: stop before the fault hypotheses (no candidates, scores, unexplained peaks): every other indicator is the
   * same, which is all a trend of the envelope level or the speed needs (computeIndicators). Default true.
   */
  hypotheses?: boolean;
}

/** Lines closer than this SNR to the floor are not peaks worth listing or matching. */
const MIN_SNR_DB = 6;
/** Unexplained peaks must stand this far above the floor. */
const UNEXPLAINED_MIN_SNR_DB = 12;
/** Zone boundaries used for levels when the model states no ISO class: group 2, rigid (the smallest machines of ISO 20816-3). */
const DEFAULT_BOUNDARIES = { abMmPerS: 1.4, bcMmPerS: 2.8 };
/** At most this many predicted lines per hypothesis are matched (the strongest). */
const MAX_LINES = 48;

/**
 * Analyses one recording of a machine point, as a pipeline of named stages (each timed into `stageTimesMs`):
 * channel and point → spectrum → running speed → overall severity (ISO 20816-3 zone) → angle domain (with tach or
 * encoder pulses) → envelope bands → hypotheses (candidates predicted from the model, each judged by its fault
 * descriptor) → unexplained peaks → indicators and plots. Pure and deterministic: the same recording and options give
 * the same object.
 */
export function analyseRecording(recording: Recording, options: AnalyseOptions = {}): RecordingAnalysis {
  const lap = stageClock(options.stageTimesMs);
  const warnings: string[] = [];
  const model = options.model ?? null;
  // Stage: channel and point.
  const { sampleRateHz: fs, tachIndex, channelIndex, samples, point, unit } = readChannel(recording, model, options, warnings);
  const quantity = quantityOfUnit(unit);

  // Stage: time-domain indicators, on acceleration.
  const acceleration = accelerationSignal(samples, fs, unit);
  const time = timeIndicators(acceleration.samples.length > 0 ? acceleration.samples : samples);
  lap('time indicators');

  // Stage: the spectrum, fine enough for the slowest shaft's sidebands, at least 3 averages where the record allows.
  const ratios = model ? shaftRatios(model) : [];
  const slowestHz = model && ratios.length > 0 ? Math.min(...ratios.map((r) => r.ratio)) * (speedRangeRpm(model).minRpm / 60) : null;
  const segmentLength = chooseSegmentLength(samples.length, fs, slowestHz);
  const spectrum = welchSpectrum(samples, fs, { segmentLength, overlapFraction: 0.5, scaling: 'peak', unit, window: 'hann' });
  lap('spectrum');
  const measured = matchableSpectrum(spectrum, noiseFloor(spectrum));
  lap('spectrum noise floor');

  // Stage: running speed.
  const speed = model ? runningSpeed(recording, tachIndex, model, options, speedSpectrum(samples, fs, unit, measured, slowestHz, speedSearchTopHz(model, options.speedRpm)), warnings) : null;
  const speedHz = speed?.speedHz ?? (options.speedRpm !== undefined ? options.speedRpm / 60 : null);
  const speedSource: SpeedSource | null = speed?.source ?? (options.speedRpm !== undefined ? 'given' : null);
  lap('running speed');

  // Stage: overall velocity and severity.
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

  // Stage: the angle domain. With tach or encoder pulses, lines are matched in orders of the reference shaft (no
  // speed error, no smearing) and the envelope is analysed on the order-tracked signal.
  const angle = angleStage(samples, fs, unit, model, speed, options, warnings);
  lap('angle domain');

  // Stage: envelope bands, when the machine has rolling bearings (or no model says otherwise).
  let envelope: EnvelopeStage | null = null;
  const unitHz = angle && speedHz !== null ? speedHz : 1;
  if (!model || model.bearings.length > 0 || model.gearMeshes.length > 0) {
    const resolution = envelopeResolution(model, speedHz) / unitHz;
    envelope = angle
      ? envelopeStage(angle.resampled.samples, angle.resampled.samplesPerRev, model, point, { referenceHz: 1, unitHz }, { resolution, unit, warnings })
      : envelopeStage(samples, fs, model, point, { referenceHz: speedHz, unitHz: 1 }, { resolution, unit, warnings });
  }
  lap('envelope bands');

  // Stage: hypotheses.
  let judged: Judged[] = [];
  let catalogue: CatalogueLine[] = [];
  if (options.hypotheses === false) {
    // no hypotheses asked for: the indicators below do not read them
  } else if (model && speedHz !== null && point && speed) {
    catalogue = catalogueLines(model, speedHz);
    judged = hypothesesStage(model, point, speed, speedHz, unit, quantity, measured, angle, envelope, severity.boundaries ?? DEFAULT_BOUNDARIES, options, warnings, lap);
  } else if (model && !point) {
    warnings.push('the model has no vibration point for this channel; no fault hypotheses scored');
  }
  const hypotheses = judged.map((j) => hypothesisOf(j, unit, unitHz, angle !== null)).sort(
    (a, b) => b.score - a.score || a.fault.localeCompare(b.fault) || a.component.localeCompare(b.component),
  );
  lap('hypotheses');

  // Peaks a hypothesis explains: every spectrum-domain match, and the lines of a shown envelope hypothesis
  // (bearing impacts put their defect harmonics into the ordinary spectrum as well).
  const matchedHz: number[] = [];
  for (const j of judged) {
    if (j.candidate.domain !== 'spectrum' && j.score < 0.5) continue;
    for (const l of j.lines) if (l.matched && l.measuredHz !== null) matchedHz.push(l.measuredHz * unitHz);
  }
  const unexplainedPeaks = options.hypotheses === false ? [] : unexplained(spectrum, measured, catalogue.filter((l) => !(l as { bearing?: boolean }).bearing), matchedHz, speedHz, speed?.uncertaintyHz ?? 0);
  lap('unexplained peaks');

  // The envelope shown: the band of the strongest shown bearing hypothesis (its proof), else the default band.
  const shownBearing = judged.filter((j) => j.band && j.score >= 0.5).sort((a, b) => b.score - a.score)[0];
  const plotted = envelope
    ? shownBearing
      ? { band: shownBearing.band!, source: 'hypothesis' as const, hypothesis: `${shownBearing.candidate.fault}:${shownBearing.candidate.component}`, kurtosis: undefined }
      : { band: envelope.defaultBand, source: envelope.defaultBand.source, hypothesis: undefined, kurtosis: envelope.defaultBand.kurtosis }
    : null;
  const plottedEnvelope = plotted && envelope ? envelope.band(plotted.band) : null;

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
      // the trend's band is the same every time: the default band (the point's resonance, else the most impulsive)
      envelope: envelope ? { spectrum: envelope.band(envelope.defaultBand).spectrum, unit, kurtogramKurtosis: envelope.defaultBand.kurtosis } : null,
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
  if (plotted && plottedEnvelope) {
    const s = plottedEnvelope.spectrum;
    const p = downsampleForPlot({ frequenciesHz: s.frequenciesHz.map((f) => f * unitHz), values: s.values }, maxPlotPoints);
    analysis.envelopeSpectrum = {
      bandHz: [plotted.band.lowHz * unitHz, plotted.band.highHz * unitHz],
      unit: s.valueUnit,
      frequenciesHz: Array.from(p.frequenciesHz),
      values: Array.from(p.values),
      bandSource: plotted.source,
      ...(plotted.hypothesis ? { hypothesis: plotted.hypothesis } : {}),
    };
  }
  lap('plots and result');
  return analysis;
}

/** Bins per turn of the slowest shaft at which the analysis' own spectrum is fine enough for the speed. */
const SPEED_BINS_PER_SHAFT = 16;
/** Longest segment the speed's own spectrum uses: 2^18 samples (5.5 s at 48 kHz, a bin of 0.18 Hz). */
const SPEED_SEGMENT_LIMIT = 1 << 18;

/**
 * The spectrum the running speed is read from: the record's longest power-of-two segment (up to SPEED_SEGMENT_LIMIT),
 * one Hann-windowed periodogram. The analysis' own spectrum averages several segments for steady levels; the speed
 * needs resolution instead: in bins of 3 Hz a belt-driven fan's 1× can stand within a bin of its motor's at a speed
 * 40 % off, and the comb search cannot tell them apart. Running lines are strong tones, so one segment's variance does
 * not hide them. Reused when the analysis' spectrum is already as fine. Cut above the highest frequency the search
 * reads (plus a noise-floor window, so that the floor under the top lines is a full running median): the floor is
 * the costly part, and a 2^16-point periodogram holds ten times more bins than the running lines reach.
 */
function speedSpectrum(
  samples: Float64Array, fs: number, unit: string, measured: MatchableSpectrum, slowestShaftHz: number | null, searchTopHz: number,
): MatchableSpectrum {
  // Bins of a sixteenth of the slowest shaft's speed already separate every shaft's comb.
  if (slowestShaftHz !== null && measured.spectrum.frequencyResolutionHz <= slowestShaftHz / SPEED_BINS_PER_SHAFT) return measured;
  let segment = 1;
  while (segment * 2 <= Math.min(samples.length, SPEED_SEGMENT_LIMIT)) segment *= 2;
  if (segment <= measured.spectrum.segmentLength) return measured;
  const full = welchSpectrum(samples, fs, { segmentLength: segment, overlapFraction: 0, scaling: 'peak', unit, window: 'hann' });
  const bins = Math.min(full.values.length, Math.ceil(searchTopHz / full.frequencyResolutionHz) + 2 * DEFAULT_NOISE_FLOOR_WIDTH_BINS);
  const fine = bins < full.values.length ? { ...full, frequenciesHz: full.frequenciesHz.subarray(0, bins), values: full.values.subarray(0, bins) } : full;
  return matchableSpectrum(fine, noiseFloor(fine));
}

/** The order-tracked spectra, when the recording's tach or encoder gives pulses and the frequency domain is not forced. */
function angleStage(
  samples: Float64Array, fs: number, unit: string, model: MachineModel | null, speed: RunningSpeed | null,
  options: AnalyseOptions, warnings: string[],
): AngleSpectra | null {
  const wantAngle = options.domain === 'angle' || (options.domain !== 'frequency' && speed?.pulses !== undefined);
  if (wantAngle && model && speed?.pulses) {
    const ratios = shaftRatios(model).map((r) => r.ratio);
    try {
      const angle = angleSpectra(samples, fs, unit, speed.pulses, { slowestOrder: Math.min(1, ...ratios) });
      if (!angle) warnings.push('the record holds fewer than 4 revolutions: analysed in the frequency domain');
      return angle;
    } catch (err) {
      warnings.push(`order tracking failed (${err instanceof Error ? err.message : String(err)}): analysed in the frequency domain`);
      return null;
    }
  }
  if (options.domain === 'angle') warnings.push('the angle domain needs a tach or encoder channel: analysed in the frequency domain');
  return null;
}

/**
 * Resolution of the envelope spectra: a quarter of the slowest bearing shaft's speed (its sidebands, and the cage's),
 * and at most 0.5 % of the lowest defect rate (a rolling element's slip of 1–2 % spreads a line over about that).
 */
function envelopeResolution(model: MachineModel | null, speedHz: number | null): number {
  if (!model || speedHz === null || model.bearings.length === 0) return 1;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  let slowestShaftHz = Infinity;
  for (const b of model.bearings) slowestShaftHz = Math.min(slowestShaftHz, ratio.get(b.shaft)! * speedHz);
  let lowestDefectHz = Infinity;
  for (const l of bearingDefectLines(model, speedHz)) if (l.family !== 'bearing-ftf') lowestDefectHz = Math.min(lowestDefectHz, l.frequencyHz);
  return Math.min(slowestShaftHz / 4, Number.isFinite(lowestDefectHz) ? 0.005 * lowestDefectHz : Infinity);
}

function hypothesesStage(
  model: MachineModel, point: NonNullable<ChannelReading['point']>, speed: RunningSpeed, speedHz: number, unit: string,
  quantity: 'acceleration' | 'velocity' | 'displacement', measured: MatchableSpectrum, angle: AngleSpectra | null,
  envelope: EnvelopeStage | null, iso: { abMmPerS: number; bcMmPerS: number }, options: AnalyseOptions, warnings: string[], lap: (stage: string) => void,
): Judged[] {
  const spectrum = measured.spectrum;
  // In the angle domain every frequency is an order (Hz of the reference shaft = 1) and converts back by the mean speed.
  const unitHz = angle ? speedHz : 1;
  const lineSpeed = angle ? 1 : speedHz;
  const main = angle ? angle.measured : measured;
  const limits: CandidateLimits = {
    spectrumTopHz: spectrum.frequenciesHz[spectrum.frequenciesHz.length - 2]!,
    spectrumLowHz: 2 * spectrum.frequencyResolutionHz,
    spectrumResolutionHz: spectrum.frequencyResolutionHz,
    envelopeTopHz: envelope ? Infinity : 0,
    envelopeLowHz: 0,
    maxLines: MAX_LINES,
  };
  const candidates = buildCandidates(model, point, speedHz, unit, limits, warnings).map((c) => (angle
    ? {
      ...c,
      lines: c.lines.map((l) => ({
        ...l,
        frequencyHz: l.frequencyHz / speedHz,
        // A fixed-frequency line (2 × line frequency) wanders in orders as the speed does.
        relativeSpreadFraction: (l.relativeSpreadFraction ?? 0) + (l.order === 0 ? (speed.spreadHz ?? 0) / speedHz : 0),
      })),
    }
    : c));
  lap('candidates');
  const lineCatalogue = angle ? catalogueLines(model, 1) : catalogueLines(model, speedHz);
  let cepstrum: Cepstrum | null = null;
  const judged = judgeHypotheses({
    model, point, candidates, main, unit, quantity, unitHz, lineSpeedHz: lineSpeed, referenceSpeedHz: speedHz,
    speedUncertaintyHz: angle ? 0 : speed.uncertaintyHz,
    speed: { source: speed.source, supportOrders: speed.supportOrders, givenAgrees: speed.givenAgrees },
    minSnrDb: MIN_SNR_DB, isoAbMmPerS: iso.abMmPerS, isoBcMmPerS: iso.bcMmPerS, baseline: options.baseline ?? null, baselineOrders: point.baseline?.orders ?? null, pointUnit: point.unit ?? null,
    catalogue: new LineCatalogue(lineCatalogue.filter((l) => !l.bearing)),
    runningLines: new LineCatalogue(runningLines(model, lineSpeed)),
    envelope: envelope ? { source: envelope.source, speedUncertaintyFraction: angle ? 0 : speed.uncertaintyHz / speedHz, band: (b) => envelope!.band(b).measured, topHz: envelope.topHz } : null,
    cepstrum: () => (cepstrum ??= powerCepstrumOf(main.spectrum)),
  });
  lap('scoring');
  return judged;
}

/** The stored hypothesis of a judged candidate: score, reason, evidence rows with the prediction scaled to the measurement. */
function hypothesisOf(j: Judged, unit: string, unitHz: number, angleDomain: boolean): Hypothesis {
  const domain = angleDomain && j.candidate.domain === 'spectrum' ? 'order' : j.candidate.domain;
  const score = Math.round(j.score * 1000) / 1000;
  const scale = predictionScale(j.lines);
  const hypothesisUnit = j.candidate.domain === 'envelope' ? `${unit}^2` : unit;
  const evidence: Evidence[] = [...j.lines]
    .sort((a, b) => Number(b.counted) - Number(a.counted) || b.predictedAmplitude - a.predictedAmplitude || a.predictedHz - b.predictedHz)
    .map((l) => ({
      label: l.label,
      frequencyHz: l.predictedHz * unitHz,
      predicted: l.predictedAmplitude,
      predictedScaled: scale && l.predictedAmplitude > 0 ? l.predictedAmplitude * scale.factor : null,
      measured: l.measuredAmplitude,
      measuredFrequencyHz: l.measuredHz === null ? null : l.measuredHz * unitHz,
      snrDb: l.snrDb === null ? null : Math.round(l.snrDb * 10) / 10,
      matched: l.matched,
      chance: Number(l.chance.toPrecision(3)),
      counted: l.counted && !l.synchronous,
      ...(l.ambiguous ? { ambiguous: true, ambiguousWith: l.ambiguousWith.slice(0, 3) } : {}),
    }));
  const r = (x: number) => Math.round(x * 1000) / 1000;
  const p = j.parts;
  return {
    fault: j.candidate.fault,
    component: j.candidate.component,
    ...(isFaultKind(j.candidate.fault) ? { title: faultKindFacts[j.candidate.fault].title } : {}),
    score,
    reason: reasonFor(j, score, unitHz, domain),
    domain,
    evidence,
    parts: {
      detection: r(p.detection), shape: r(p.shape), level: r(p.level), exclusivity: r(p.exclusivity), support: r(p.support),
      explainedAway: r(p.explainedAway), ...(p.explainedBy !== undefined ? { explainedBy: p.explainedBy } : {}),
      chance: Number(p.chance.toPrecision(3)), gate: r(p.gate), ...(j.gateReasons.length > 0 ? { gateReasons: j.gateReasons } : {}),
    },
    unit: hypothesisUnit,
    linesMatched: j.linesFound,
    linesPredicted: j.linesCounted,
    scaleNote: scale
      ? `predicted amplitudes × ${scale.factor.toPrecision(3)}: one factor fitted to the ${scale.lines} found line${scale.lines === 1 ? '' : 's'} (least squares on log amplitude); the model's absolute level assumes a nominal excitation`
      : 'no line was found to scale the prediction on: predicted amplitudes are the model\'s, for a nominal excitation',
    ...(j.band ? { bandHz: [j.band.lowHz * unitHz, j.band.highHz * unitHz] as [number, number] } : {}),
    ...(j.candidate.twins.length > 0 ? { twins: j.candidate.twins } : {}),
  };
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

function powerCepstrumOf(spectrum: Spectrum): Cepstrum {
  const power = scratchArray('diagnosis:cepstrum-power', spectrum.values.length);
  for (let k = 0; k < power.length; k++) power[k] = binPower(spectrum, k);
  return powerCepstrum(power, spectrum.frequencyResolutionHz);
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
