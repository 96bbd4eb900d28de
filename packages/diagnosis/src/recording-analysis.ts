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
  /** The parts of the score, for engineers who want to see how it was made. */
  parts: { detection: number; shape: number; level: number; exclusivity: number; support: number; explainedAway: number; explainedBy?: string };
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
  envelopeSpectrum?: { bandHz: [number, number]; unit: string; frequenciesHz: number[]; values: number[]; bandSource?: 'resonance' | 'kurtogram' };
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
