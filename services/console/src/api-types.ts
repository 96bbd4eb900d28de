// Shapes the console reads from the HTTP API v1 (see the OpenAPI document at /openapi.json).
// Fields the console does not use are left out; optional ones are read defensively.

export type Zone = 'A' | 'B' | 'C' | 'D';

export interface DemoStatus {
  state: 'seeding' | 'done' | 'failed';
  recordingsDone: number;
  recordingsTotal: number;
  error?: string;
}

export interface Site {
  id: string;
  name: string;
  role?: 'logger' | 'engineer' | 'admin';
  /** while the demo's recordings are analysed in the background */
  demo?: DemoStatus | null;
}

export interface HypothesisRef {
  fault: string;
  component: string;
  score: number;
}

export interface SparklineBucket {
  start: string;
  mean: number;
}

export interface MachineSummary {
  id: string;
  name: string;
  modelVersion: number | string | null;
  worstZone: Zone | null;
  topHypothesis: HypothesisRef | null;
  lastMeasuredAt: string | null;
  activeAlarms: number;
  mainIndicator: { indicator: string; unit: string; sparkline: SparklineBucket[] } | null;
  /** The soonest crossing foreseen for the main indicator over the machine's points (absent from older services). */
  soonestCrossing?: SoonestCrossing | null;
}

export type ForecastLevel = 'zone B' | 'zone C' | 'zone D' | 'alarm' | 'trip' | 'value';

export interface SoonestCrossing {
  pointId: string;
  indicator: string;
  unit: string;
  level: ForecastLevel;
  threshold: number;
  crossingAt: string;
  remainingS: number;
  lowS: number | null;
  highS: number | null;
}

export interface LevelForecast {
  level: ForecastLevel;
  threshold: number;
  status: 'crossing' | 'crossed' | 'no-crossing';
  reason: string;
  crossingAt: string | null;
  remainingS: number | null;
  lowS: number | null;
  highS: number | null;
}

export interface TrendForecast {
  method: string;
  onsetAt: string | null;
  level: number;
  values: number;
  forecasts: LevelForecast[];
}

export interface MeasurementPoint {
  id: string;
  quantity: string;
  unit?: string;
  near?: string;
  shaft?: string;
  direction?: string;
  alarmLevel?: number | null;
  tripLevel?: number | null;
}

export interface MachineDetail {
  id: string;
  name: string;
  modelVersion: number | string | null;
  model: unknown;
  points: MeasurementPoint[];
}

export interface RecordingRow {
  id: string;
  recordedAt: string;
  sampleRateHz: number;
  sampleCount: number;
  channels: number;
  analysisId: string | null;
  velocityRmsMmPerS: number | null;
  zone: Zone | null;
  topHypothesis: HypothesisRef | null;
}

export interface Evidence {
  label: string;
  frequencyHz: number;
  predicted: number;
  measured: number | null;
  snrDb: number | null;
  matched: boolean;
  ambiguous?: boolean;
  /** labels of the other lines of the model that fall on the same peak */
  ambiguousWith?: string[];
  measuredFrequencyHz?: number | null;
  /** the prediction scaled to the measurement by the hypothesis's fitted level, in the hypothesis's unit */
  predictedScaled?: number | null;
}

export type EvidenceDomain = 'spectrum' | 'envelope' | 'order';

export interface Hypothesis {
  fault: string;
  component: string;
  /** The fault kind's title from the diagnosis (absent in analyses stored before it). */
  title?: string;
  score: number;
  reason: string;
  domain: EvidenceDomain;
  evidence: Evidence[];
  /** the unit of predicted (scaled) and measured amplitudes */
  unit?: string;
  /** the counts the reason sentence uses */
  linesMatched?: number;
  linesPredicted?: number;
  /** one sentence: how the prediction was scaled to the measurement */
  scaleNote?: string;
}

export interface SpectrumData {
  quantity: 'acceleration' | 'velocity';
  unit: string;
  scaling: 'peak' | 'rms' | 'psd';
  frequencyResolutionHz: number;
  frequenciesHz: number[];
  values: number[];
}

export interface RecordingAnalysis {
  id: string;
  recordingId: string;
  modelVersion: number | string | null;
  createdAt: string;
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
    envelopeRmsUnit?: string;
  };
  indicators: Record<string, number>;
  spectrum: SpectrumData;
  envelopeSpectrum?: { bandHz: [number, number]; unit: string; frequenciesHz: number[]; values: number[] };
  orderSpectrum?: { shaft: string; orders: number[]; values: number[] };
  hypotheses: Hypothesis[];
  unexplainedPeaks: Array<{ frequencyHz: number; amplitude: number; snrDb: number }>;
  warnings: string[];
  /** the channel analysed (0-based, as the analysis counts) and the point */
  channel?: number;
  pointId?: string | null;
}

/** GET /api/v1/recordings/:id */
export interface RecordingMeta {
  id: string;
  machineId: string;
  pointId: string;
  recordedAt: string;
  receivedAt: string;
  sampleRateHz: number;
  sampleCount: number;
  channels: number;
  channelInfo: Array<{ name: string; unit: string }>;
  durationS: number;
  sourceFormat: string;
  speedRpm: number | null;
  metadata: Record<string, string>;
  /** the decoder's warnings about the file */
  warnings?: string[];
}

export interface AuditEntry {
  id: string;
  recordingId: string;
  action: 'delete' | 'move';
  at: string;
  by: string;
  reason: string;
  before: { machineId: string; pointId: string; recordedAt: string; contentSha256: string; sourceFormat: string; sampleCount: number; sampleRateHz: number; zone: Zone | null; velocityRmsMmPerS: number | null };
  after: { machineId: string; pointId: string; recordedAt: string } | null;
}

export interface IndicatorRow {
  indicator: string;
  unit: string;
  count: number;
}

export interface TrendBucket {
  start: string;
  count: number;
  min: number;
  mean: number;
  max: number;
  last: number;
  zone: Zone | null;
  alarmState: string | null;
}

export interface Trend {
  machineId: string;
  pointId: string;
  indicator: string;
  unit: string;
  bucket: 'day' | 'week' | 'month';
  zoneBoundaries?: { ab: number; bc: number; cd: number } | null;
  alarmLevel?: number | null;
  tripLevel?: number | null;
  buckets: TrendBucket[];
  forecast?: TrendForecast | null;
}

export interface RankingRow {
  machineId: string;
  pointId: string;
  indicator: string;
  before: number;
  after: number;
  rise: number;
  risePercent: number;
}

export interface Alarm {
  id: string;
  machineId: string;
  pointId: string;
  indicator: string;
  level: 'alarm' | 'trip';
  value: number;
  threshold: number;
  raisedAt: string;
  acknowledgedAt: string | null;
  acknowledgedBy: string | null;
  clearedAt: string | null;
  /** The newest value of the indicator at the point (absent from older services). */
  currentValue?: number | null;
  currentAt?: string | null;
}

export interface FaultCandidate {
  fault: string;
  component: string;
}

export interface AnalysisSummary {
  analysisId: string;
  velocityRmsMmPerS: number | null;
  zone: Zone | null;
  speedHz: number | null;
  speedSource: string | null;
  topHypotheses: Array<{ fault: string; component: string; score: number; reason: string }>;
  warnings?: string[];
  analysedChannel?: number | null;
  channels?: Array<{ name: string; unit: string }>;
}

export interface UploadResult {
  recordingId: string;
  duplicate: boolean;
  /** 'queued' (answer 202) until a worker has stored the analysis: poll GET /api/v1/recordings/{id}/analysis */
  analysisState?: 'queued' | 'done';
  analysis: AnalysisSummary | null;
}

/** The predicted signature the explorer draws. Line fields beyond frequency and amplitude are optional. */
export interface SignatureLine {
  frequencyHz: number;
  amplitude?: number;
  order?: number;
  label?: string;
  harmonic?: number;
  /** 0 for a line of the excitation itself, ±k for the k-th sideband */
  sideband?: number;
  magnification?: number | null;
  family?: string;
  kind?: string;
  [key: string]: unknown;
}

export interface SignatureWarning {
  kind?: string;
  message: string;
}

export interface SignatureResponse {
  lines: SignatureLine[];
  naturalFrequenciesHz?: number[];
  warnings?: Array<string | SignatureWarning>;
  assumptions?: string[];
  amplitudeBasis?: 'model' | 'relative';
  unit?: string;
  quantity?: string;
  domain?: 'spectrum' | 'envelope';
  excitation?: {
    template?: string;
    formula?: string;
    reference?: string;
    fundamentalOrder?: number | null;
    /** the shaft whose revolutions angleRev counts */
    shaft?: string;
    /** one period of the excitation in revolutions of that shaft */
    periodRev?: number | null;
    angleRev?: number[];
    /** the excitation evaluated exactly at angleRev */
    waveform?: number[];
    /** partial sums of its Fourier series at angleRev, keyed by the number of harmonics */
    partialSums?: Record<string, number[]>;
  };
  /** one entry per line, in the order of `lines` */
  magnification?: Array<{ harmonic: number; sideband?: number; frequencyHz: number; factor: number; torsional?: number | null; structural?: number | null }>;
  campbell?: unknown;
  [key: string]: unknown;
}
