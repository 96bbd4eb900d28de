import { bandRms, convertUnit, isMotionUnit, quantityOfUnit, type Spectrum } from '@kinespec/signal';
import type { MachineModel } from '@kinespec/kinematics';
import { DiagnosisInputError } from '../errors.js';
import { gradeSeverity, type IsoFoundation, type IsoGroup } from '../iso-zones.js';
import type { GearTsa } from '../gear-tsa.js';
import type { Hypothesis } from '../recording-analysis.js';
import type { TimeIndicators } from '../time-indicators.js';

/*
 * The trend indicators: one descriptor per indicator (or per family, such as one score per fault hypothesis),
 * the one home of each indicator's name, unit, quantity, title and computation. analyseRecording, the
 * standalone computeIndicators, the service (units, trends, alarms) and the console read them from here.
 *
 * What each indicator means at points of each quantity (argued once, here):
 * - A point measures one quantity. Time-domain indicators (peak, r.m.s., crest factor, kurtosis) describe the
 *   acceleration: on an acceleration point the signal as measured; on a velocity or displacement point the
 *   acceleration the measurement covers, i.e. differentiated only up to DIFFERENTIATION_TOP_HZ (1 kHz, the
 *   top of the ISO 20816-1 velocity band). Differentiating the whole band multiplies by 2πf whatever the channel
 *   holds above the band a velocity measurement covers, and read 366 m/s² and a kurtosis of 241 on a demo velocity
 *   point (44 m/s² and 23 band-limited); bearing impacts above 1 kHz are left to acceleration points.
 * - Acceleration indicators are trended in the point's unit when the point measures acceleration (g stays g
 *   whatever unit a recording came in), else in m/s² (the SI unit; no point unit to follow).
 * - The envelope r.m.s. is a level of the signal as measured (the envelope of the band-passed channel), so it
 *   is in the point's own unit whatever its quantity: g on an accelerometer, mm/s on a velocity point: the root of
 *   the r.m.s. of the squared envelope's fluctuation (envelopeLevel). It used to be that r.m.s. itself, a value in
 *   g² labelled g and scaled by the service as if it were g. Its band is the default one (the point's resonance,
 *   else the most impulsive band), not the band a shown hypothesis chose, so that a trend keeps one band.
 * - Crest factor, kurtosis, the kurtogram's kurtosis and the gear indicators are ratios (unit '1'); fault
 *   scores are dimensionless 0..1; speed is in rpm; the overall velocity is in mm/s whatever the point measures
 *   (ISO 20816 grades it so).
 */

/** What an indicator measures. */
export type IndicatorQuantity = 'acceleration' | 'velocity' | 'displacement' | 'rotational-speed' | 'ratio' | 'score';

/**
 * What must be computed before an indicator can be read, cheapest first: `time` the acceleration time signal,
 * `spectrum` a Welch spectrum, `envelope` the demodulation band and the envelope, `analysis` the whole
 * analysis (running speed from the model, fault hypotheses, gear synchronous averages).
 */
export type IndicatorStage = 'time' | 'spectrum' | 'envelope' | 'analysis';

/** The point an indicator is trended at. */
export interface IndicatorPoint {
  /**
   * The unit the point's samples are in (`pointUnit` of @kinespec/kinematics); without a machine model, the unit
   * the channel was read in; null for a point that measures no vibration (tach, encoder).
   */
  unit: string | null;
}

/** What a recording's analysis has computed, from which the indicators are read. */
export interface IndicatorSources {
  /** Time indicators of the acceleration signal (accelerationSignal), in `accelerationUnit`. */
  time?: TimeIndicators | null;
  accelerationUnit?: string;
  /** Overall r.m.s. velocity over the ISO band, mm/s. */
  velocityRmsMmPerS?: number | null;
  /** Running speed of the reference shaft, Hz. */
  speedHz?: number | null;
  /**
   * The envelope analysis of the trend's band: the Welch spectrum of the band's squared envelope (peak scaling, in
   * the channel's unit squared, mean removed), the channel's unit, and the kurtogram's kurtosis when it chose the band.
   */
  envelope?: { spectrum: Spectrum; unit: string; kurtogramKurtosis?: number } | null;
  hypotheses?: readonly Pick<Hypothesis, 'fault' | 'component' | 'score'>[] | null;
  gearTsa?: readonly GearTsa[] | null;
}

/** What sets an indicator's alarm and trip levels: the ISO severity rule, the fault-score rule, or nothing. */
export type IndicatorLevelRule = 'iso-velocity' | 'fault-score' | 'none';

export interface IndicatorDescriptor {
  /** The stable name, or for a family its pattern with <placeholders> (`score:<fault>:<component>`). */
  name: string;
  /** A short title for tables and chart axes. */
  title: string;
  quantity: IndicatorQuantity | ((point: IndicatorPoint) => IndicatorQuantity);
  /** What the value is and how it is computed, with the source. */
  description: string;
  stage: IndicatorStage;
  /**
   * The direction in which a value means a worse condition: 'up' (levels, scores), or 'none' (speed, whose
   * change is an operating condition, not wear). Forecasts and alarms look only at 'up' indicators.
   */
  worseWhen: 'up' | 'none';
  /** Where its alarm and trip levels come from (levels belong to vibration points only: see indicatorLevels). */
  levels: IndicatorLevelRule;
  /** Whether `name` belongs to this descriptor (a family matches many names). */
  matches(name: string): boolean;
  /** The unit of the values at a point. */
  unit(point: IndicatorPoint): string;
  /** The values of this descriptor (one, or one per member of a family) from what was computed, in `unit(point)`. */
  values(sources: IndicatorSources, point: IndicatorPoint): Record<string, number>;
}

const ACCELERATION = 'acceleration';

/** The unit acceleration indicators are trended in at a point: the point's own when it is an acceleration unit, else m/s². */
export function accelerationTrendUnit(point: IndicatorPoint): string {
  return point.unit !== null && isMotionUnit(point.unit) && quantityOfUnit(point.unit) === ACCELERATION ? point.unit : 'm/s^2';
}

/** The quantity of a point's unit, or null (no unit, or not a vibration unit). */
function pointQuantity(point: IndicatorPoint): 'acceleration' | 'velocity' | 'displacement' | null {
  return point.unit !== null && isMotionUnit(point.unit) ? quantityOfUnit(point.unit) : null;
}

function one(name: string, value: number | null | undefined): Record<string, number> {
  return value !== null && value !== undefined && Number.isFinite(value) ? { [name]: value } : {};
}

function exactly(name: string): (n: string) => boolean {
  return (n) => n === name;
}

/** A time-domain acceleration level converted from the acceleration signal's unit to the trend unit. */
function accelerationLevel(sources: IndicatorSources, point: IndicatorPoint, pick: (t: TimeIndicators) => number): number | null {
  if (!sources.time || !sources.accelerationUnit) return null;
  return convertUnit(pick(sources.time), sources.accelerationUnit, accelerationTrendUnit(point));
}

/**
 * The envelope level of a band: the square root of the r.m.s. of its squared envelope's fluctuation (the squared-
 * envelope spectrum above DC, up to the band's width; bandRms). The squared envelope is what the bearing analysis
 * demodulates (Randall & Antoni 2011, MSSP 25:485, §3); its r.m.s. is in the channel's unit squared, and the root
 * makes a level that grows in proportion to the signal, in the channel's unit. A steady tone in the band has a
 * constant envelope (0); a carrier of amplitude A modulated 1 + m·cos ωt has e² = A²(1 + m²/2 + 2m cos ωt +
 * (m²/2) cos 2ωt), whose fluctuation has r.m.s. A²·√(2m² + m⁴/8).
 */
export function envelopeLevel(squaredEnvelopeSpectrum: Spectrum): number {
  const f = squaredEnvelopeSpectrum.frequenciesHz;
  if (f.length < 2) return 0;
  return Math.sqrt(bandRms(squaredEnvelopeSpectrum, [squaredEnvelopeSpectrum.frequencyResolutionHz, f[f.length - 1]!]));
}

const SCORE_NAME = /^score:([^:]+):(.+)$/;
const TSA_NAME = /^tsa:(fm0|fm4|na4):(.+)$/;

/** Every trend indicator, in the order tables list them. */
export const indicatorDescriptors: readonly IndicatorDescriptor[] = [
  {
    name: 'velocity_rms_mm_per_s',
    title: 'Overall velocity r.m.s.',
    quantity: 'velocity',
    description:
      'Broadband r.m.s. velocity over 10–1000 Hz (2–1000 Hz below 600 rpm), the ISO 20816-1/-3 severity measure: ' +
      "the channel's Welch PSD integrated line by line to velocity (÷(2πf)² for acceleration) and summed over the band.",
    stage: 'spectrum',
    worseWhen: 'up',
    levels: 'iso-velocity',
    matches: exactly('velocity_rms_mm_per_s'),
    unit: () => 'mm/s',
    values: (s) => one('velocity_rms_mm_per_s', s.velocityRmsMmPerS),
  },
  {
    name: 'acceleration_peak',
    title: 'Peak acceleration',
    quantity: ACCELERATION,
    description:
      'Largest absolute acceleration in the record after mean removal (0-to-peak). On a velocity or displacement point, ' +
      'of the acceleration differentiated up to 1 kHz (the velocity band), not of the whole band.',
    stage: 'time',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('acceleration_peak'),
    unit: accelerationTrendUnit,
    values: (s, p) => one('acceleration_peak', accelerationLevel(s, p, (t) => t.peak)),
  },
  {
    name: 'acceleration_rms',
    title: 'Acceleration r.m.s.',
    quantity: ACCELERATION,
    description: 'R.m.s. of the acceleration after mean removal, over the whole record band (a velocity or displacement point: up to 1 kHz).',
    stage: 'time',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('acceleration_rms'),
    unit: accelerationTrendUnit,
    values: (s, p) => one('acceleration_rms', accelerationLevel(s, p, (t) => t.rms)),
  },
  {
    name: 'crest_factor',
    title: 'Crest factor',
    quantity: 'ratio',
    description: 'Peak over r.m.s. of the acceleration (a sine √2; impacts raise it; common practice).',
    stage: 'time',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('crest_factor'),
    unit: () => '1',
    values: (s) => one('crest_factor', s.time?.crestFactor),
  },
  {
    name: 'kurtosis',
    title: 'Kurtosis',
    quantity: 'ratio',
    description: 'Pearson kurtosis m4/m2² of the acceleration (Gaussian 3, sine 1.5; impacts raise it; Pearson 1905).',
    stage: 'time',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('kurtosis'),
    unit: () => '1',
    values: (s) => one('kurtosis', s.time?.kurtosis),
  },
  {
    name: 'envelope_rms',
    title: 'Envelope r.m.s.',
    quantity: (p) => pointQuantity(p) ?? ACCELERATION,
    description:
      "Square root of the r.m.s. of the squared envelope's fluctuation in the default demodulation band (the point's resonance, " +
      'else the most impulsive band): how strongly impacts modulate the band, in the unit the point measures (0 for a steady tone).',
    stage: 'envelope',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('envelope_rms'),
    unit: (p) => p.unit ?? accelerationTrendUnit(p),
    values: (s, p) => {
      if (!s.envelope) return {};
      const level = envelopeLevel(s.envelope.spectrum);
      const to = p.unit ?? s.envelope.unit;
      return one('envelope_rms', to === s.envelope.unit ? level : convertUnit(level, s.envelope.unit, to));
    },
  },
  {
    name: 'kurtogram_kurtosis',
    title: 'Kurtogram kurtosis',
    quantity: 'ratio',
    description: "Kurtosis of the complex envelope of the most impulsive band, when no resonance of the point gives the band (spectral kurtosis: Antoni 2007, MSSP 21:108).",
    stage: 'envelope',
    worseWhen: 'up',
    levels: 'none',
    matches: exactly('kurtogram_kurtosis'),
    unit: () => '1',
    values: (s) => one('kurtogram_kurtosis', s.envelope?.kurtogramKurtosis),
  },
  {
    name: 'speed_rpm',
    title: 'Running speed',
    quantity: 'rotational-speed',
    description: "Speed of the model's reference shaft: from a tach or encoder channel, else the comb search of the running lines in the spectrum.",
    stage: 'analysis',
    worseWhen: 'none',
    levels: 'none',
    matches: exactly('speed_rpm'),
    unit: () => 'rpm',
    values: (s) => one('speed_rpm', s.speedHz !== null && s.speedHz !== undefined ? s.speedHz * 60 : null),
  },
  {
    name: 'tsa:<fm0|fm4|na4>:<gear>',
    title: 'Gear synchronous-average indicator',
    quantity: 'ratio',
    description:
      "FM0 (Stewart 1977), FM4 and NA4 (Zakrajsek, Townsend & Decker, NASA TM-105950, 1993) of each gear's time-synchronous " +
      'average over its own shaft, when a tach or encoder channel gives the angle.',
    stage: 'analysis',
    worseWhen: 'up',
    levels: 'none',
    matches: (n) => TSA_NAME.test(n),
    unit: () => '1',
    values: (s) => {
      const out: Record<string, number> = {};
      for (const g of s.gearTsa ?? []) {
        for (const [name, value] of [['fm0', g.fm0], ['fm4', g.fm4], ['na4', g.na4]] as const) {
          if (value !== null && Number.isFinite(value)) out[`tsa:${name}:${g.gear}`] = value;
        }
      }
      return out;
    },
  },
  {
    name: 'score:<fault>:<component>',
    title: 'Fault score',
    quantity: 'score',
    description: 'Score 0..1 of one fault hypothesis of the model (0.5 or more: the recording shows it); packages/diagnosis/README.md.',
    stage: 'analysis',
    worseWhen: 'up',
    levels: 'fault-score',
    matches: (n) => SCORE_NAME.test(n),
    unit: () => '1',
    values: (s) => {
      const out: Record<string, number> = {};
      for (const h of s.hypotheses ?? []) out[`score:${h.fault}:${h.component}`] = h.score;
      return out;
    },
  },
];

/** The descriptor of an indicator name, or null when no descriptor claims it. */
export function findIndicator(name: string): IndicatorDescriptor | null {
  return indicatorDescriptors.find((d) => d.matches(name)) ?? null;
}

/** The descriptor of an indicator name; an unknown name is a DiagnosisInputError listing the known ones. */
export function indicatorDescriptor(name: string): IndicatorDescriptor {
  const d = findIndicator(name);
  if (!d) {
    throw new DiagnosisInputError('unknown_indicator', `indicator '${name}' is not known (indicators: ${indicatorDescriptors.map((x) => x.name).join(', ')})`);
  }
  return d;
}

/** The unit of an indicator's values at a point ('1' for a name no descriptor claims: nothing is known of it). */
export function indicatorUnit(name: string, point: IndicatorPoint): string {
  return findIndicator(name)?.unit(point) ?? '1';
}

/** The quantity an indicator measures at a point. */
export function indicatorQuantity(name: string, point: IndicatorPoint): IndicatorQuantity {
  const q = indicatorDescriptor(name).quantity;
  return typeof q === 'function' ? q(point) : q;
}

/** A fault score indicator `score:<fault>:<component>` split into its parts, or null. */
export function scoreIndicator(name: string): { fault: string; component: string } | null {
  const m = SCORE_NAME.exec(name);
  return m ? { fault: m[1]!, component: m[2]! } : null;
}

/** The name of a fault hypothesis's score indicator. */
export function scoreIndicatorName(fault: string, component: string): string {
  return `score:${fault}:${component}`;
}

/** Every indicator the sources give, with its unit at the point: what analyseRecording reports. */
export function indicatorsOf(sources: IndicatorSources, point: IndicatorPoint): { values: Record<string, number>; units: Record<string, string> } {
  const values: Record<string, number> = {};
  const units: Record<string, string> = {};
  for (const d of indicatorDescriptors) {
    const v = d.values(sources, point);
    for (const name of Object.keys(v)) {
      values[name] = v[name]!;
      units[name] = d.unit(point);
    }
  }
  return { values, units };
}

/** A fault score at or above this says the recording shows the fault (packages/diagnosis/README.md): its alarm level. */
export const FAULT_SHOWN_SCORE = 0.5;

/** What the levels of an indicator at a point depend on: its quantity and its ISO class and own levels. */
export interface LevelPoint {
  /** The point's quantity; 'tach' and 'encoder' points have no vibration levels. */
  quantity: 'acceleration' | 'velocity' | 'displacement' | 'tach' | 'encoder';
  iso: { group: IsoGroup; foundation: IsoFoundation } | null;
  alarmVelocityRmsMmPerS: number | null;
  tripVelocityRmsMmPerS: number | null;
  baselineVelocityRmsMmPerS: number | null;
}

export interface IndicatorLevels {
  alarmLevel: number | null;
  tripLevel: number | null;
  /** ISO zone boundaries A/B, B/C, C/D in the indicator's unit, when the indicator is graded in zones. */
  zoneBoundaries: { ab: number; bc: number; cd: number } | null;
}

const NO_LEVELS: IndicatorLevels = { alarmLevel: null, tripLevel: null, zoneBoundaries: null };

/**
 * The alarm and trip levels (and ISO zone boundaries) of an indicator at a point. Levels belong to vibration
 * points: a tach or encoder point has none. The overall velocity follows gradeSeverity (the point's own levels,
 * else ALARM = baseline + 0.25 × B/C at most 1.25 × B/C, or B/C, and TRIP = C/D; ISO 10816-3 §6.3); a fault score
 * alarms at FAULT_SHOWN_SCORE and has no trip; other indicators have no levels of their own (a value given).
 */
export function indicatorLevels(name: string, point: LevelPoint): IndicatorLevels {
  if (point.quantity === 'tach' || point.quantity === 'encoder') return NO_LEVELS;
  const rule = findIndicator(name)?.levels ?? 'none';
  if (rule === 'fault-score') return { alarmLevel: FAULT_SHOWN_SCORE, tripLevel: null, zoneBoundaries: null };
  if (rule !== 'iso-velocity') return NO_LEVELS;
  const g = gradeSeverity(0, {
    iso: point.iso,
    alarmVelocityRmsMmPerS: point.alarmVelocityRmsMmPerS,
    tripVelocityRmsMmPerS: point.tripVelocityRmsMmPerS,
    baselineVelocityRmsMmPerS: point.baselineVelocityRmsMmPerS,
  });
  return {
    alarmLevel: g.alarmLevelMmPerS,
    tripLevel: g.tripLevelMmPerS,
    zoneBoundaries: g.boundaries ? { ab: g.boundaries.abMmPerS, bc: g.boundaries.bcMmPerS, cd: g.boundaries.cdMmPerS } : null,
  };
}

/** The level inputs of a model's point (its own ISO class, else the machine's), or null when the model has no such point. */
export function levelPointOf(model: MachineModel, pointId: string): LevelPoint | null {
  const p = model.points.find((x) => x.id === pointId);
  if (!p) return null;
  return {
    quantity: p.quantity,
    iso: (p.iso ?? model.iso ?? null) as LevelPoint['iso'],
    alarmVelocityRmsMmPerS: p.alarmVelocityRmsMmPerS ?? null,
    tripVelocityRmsMmPerS: p.tripVelocityRmsMmPerS ?? null,
    baselineVelocityRmsMmPerS: p.baseline?.velocityRmsMmPerS ?? null,
  };
}

/** Which level a forecast is made against: a value, the lower boundary of an ISO zone, or the point's alarm or trip level. */
export type ThresholdChoice = { value: number } | { zone: 'B' | 'C' | 'D' } | { level: 'alarm' | 'trip' };

/**
 * The threshold a choice names for an indicator at a point, with words for it ("zone C boundary", "the alarm level").
 * A zone, an alarm or a trip the indicator does not have at that point is a DiagnosisInputError that says so.
 */
export function thresholdOf(name: string, point: LevelPoint, choice: ThresholdChoice): { value: number; label: string } {
  if ('value' in choice) {
    if (!Number.isFinite(choice.value)) throw new DiagnosisInputError('invalid_argument', `threshold (${choice.value}) must be a finite number`);
    return { value: choice.value, label: 'the value given' };
  }
  const levels = indicatorLevels(name, point);
  if ('zone' in choice) {
    const b = levels.zoneBoundaries;
    if (!b) throw new DiagnosisInputError('invalid_argument', `indicator '${name}' has no ISO zones at this point (only velocity_rms_mm_per_s at a vibration point with an ISO class)`);
    const value = choice.zone === 'B' ? b.ab : choice.zone === 'C' ? b.bc : b.cd;
    return { value, label: `the zone ${choice.zone} boundary` };
  }
  const value = choice.level === 'alarm' ? levels.alarmLevel : levels.tripLevel;
  if (value === null) {
    const why = point.quantity === 'tach' || point.quantity === 'encoder' ? `a ${point.quantity} point has no vibration levels` : `indicator '${name}' has no ${choice.level} level here`;
    throw new DiagnosisInputError('invalid_argument', `no ${choice.level} level: ${why}; give a threshold value`);
  }
  return { value, label: `the ${choice.level} level` };
}
