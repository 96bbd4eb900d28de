import type { IsoZone } from './iso-zones.js';
import type { GearTsa } from './gear-tsa.js';

/** Where the running speed came from. */
export type SpeedSource = 'tach' | 'encoder' | 'spectrum' | 'given';

/** Which spectrum a hypothesis was scored on. */
export type HypothesisDomain = 'spectrum' | 'envelope' | 'order';

/** One predicted line of a hypothesis and what the measurement showed there. */
export interface Evidence {
  label: string;
  /** Predicted frequency, Hz (for order-domain evidence: the order times the mean speed). */
  frequencyHz: number;
  /** Predicted amplitude, in the unit of the spectrum it was matched on. */
  predicted: number;
  /** Interpolated amplitude of the peak found, or null when none stood above the noise. */
  measured: number | null;
  /** Interpolated frequency of the peak found, or null. */
  measuredFrequencyHz: number | null;
  /** Power over the local noise floor, dB, at the best peak within the tolerance (also for unmatched lines). */
  snrDb: number | null;
  matched: boolean;
  /** The line also belongs to another component (within the tolerance), so it cannot prove this one. */
  ambiguous?: boolean;
  ambiguousWith?: string[];
  /**
   * The prediction scaled to the measurement by the hypothesis' one fitted factor (`Hypothesis.scaleNote`), in the
   * hypothesis' unit, so that predicted and measured compare; null when no line was found to fit it on.
   */
  predictedScaled?: number | null;
  /** Probability of meeting a peak this strong in the line's window by chance in this spectrum (1 when none was found). */
  chance?: number;
  /** The line is one of those counted in `linesPredicted` (false: a running line, another component's line, or not separable from a shaft harmonic). */
  counted?: boolean;
}

export interface Hypothesis {
  fault: string;
  component: string;
  /** 0..1; 0.5 or more means the recording shows the fault (see packages/diagnosis/README.md). */
  score: number;
  /** One sentence in plain language. */
  reason: string;
  domain: HypothesisDomain;
  evidence: Evidence[];
  /** The parts of the score, for engineers who want to see how it was made (packages/diagnosis/README.md, "Score"). */
  parts: {
    detection: number; shape: number; level: number; exclusivity: number; support: number; explainedAway: number; explainedBy?: string;
    /** Probability of the pattern by chance in this spectrum, corrected for the bands and slips searched. */
    chance?: number;
    /** Product of the fault kind's requirements (1 when all are met), and why one was not. */
    gate?: number;
    gateReasons?: string[];
  };
  /** Unit of `predicted`, `predictedScaled` and `measured` in the evidence rows (the envelope's is the square of the channel's). */
  unit?: string;
  /** Lines that can tell this fault apart that were found, and how many were looked for (the reason's "N of M"). */
  linesMatched?: number;
  linesPredicted?: number;
  /** How the prediction was scaled to the measurement for `predictedScaled`. */
  scaleNote?: string;
  /** Envelope hypotheses: the demodulation band the pattern was found in, Hz. */
  bandHz?: [number, number];
  /** Other components that are the same physical part or identical to it here (a rotor's shaft, twin bearings on one shaft). */
  twins?: string[];
}

export interface PlotSpectrum {
  quantity: 'acceleration' | 'velocity' | 'displacement';
  unit: string;
  scaling: 'peak' | 'rms' | 'psd';
  frequencyResolutionHz: number;
  frequenciesHz: number[];
  values: number[];
}

export interface RecordingAnalysis {
  softwareVersion: string;
  speedHz: number | null;
  speedSource: SpeedSource | null;
  speedUncertaintyHz?: number;
  domain: 'frequency' | 'angle';
  overall: {
    velocityRmsMmPerS: number;
    bandHz: [number, number];
    zone: IsoZone | null;
    accelerationPeak: number;
    accelerationUnit: string;
    crestFactor: number;
    kurtosis: number;
    envelopeRms?: number;
    alarmState?: 'normal' | 'alarm' | 'trip' | null;
    alarmLevelMmPerS?: number | null;
    tripLevelMmPerS?: number | null;
  };
  /** Every trend indicator of this recording by a stable name (indicators/indicator-registry.ts), in `indicatorUnits`. */
  indicators: Record<string, number>;
  /** The unit of each indicator at the point (the registry's rule); absent from analyses made before it was added. */
  indicatorUnits?: Record<string, string>;
  spectrum: PlotSpectrum;
  envelopeSpectrum?: { bandHz: [number, number]; unit: string; frequenciesHz: number[]; values: number[]; bandSource?: 'resonance' | 'kurtogram' | 'hypothesis'; hypothesis?: string };
  orderSpectrum?: { shaft: string; orders: number[]; values: number[] };
  /** Every candidate of the model, highest score first. */
  hypotheses: Hypothesis[];
  unexplainedPeaks: Array<{ frequencyHz: number; amplitude: number; snrDb: number }>;
  warnings: string[];
  /** Time-synchronous average indicators of every gear, when the recording had a tach or encoder channel (angle domain). */
  gearTsa?: GearTsa[];
  /** The channel and point analysed. */
  channel?: number;
  pointId?: string | null;
}
