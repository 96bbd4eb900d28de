// Public surface of @kinespec/diagnosis: running speed, line matching, hypothesis scores, ISO severity,
// and the whole-recording analysis the service stores. Other packages import only from here.
export { analyseRecording, SOFTWARE_VERSION, type AnalyseOptions } from './analyse-recording.js';
export type { Evidence, Hypothesis, HypothesisDomain, PlotSpectrum, RecordingAnalysis, SpeedSource } from './recording-analysis.js';
export { DiagnosisInputError, diagnosisErrorCodes, type DiagnosisErrorCode } from './errors.js';
export {
  ISO_10816_3_ZONE_TABLE,
  gradeSeverity,
  isoBandHz,
  isoZone,
  isoZoneBoundaries,
  type AlarmState,
  type IsoFoundation,
  type IsoGroup,
  type IsoZone,
  type SeverityLevels,
  type SeverityOptions,
  type ZoneBoundaries,
} from './iso-zones.js';
export { timeIndicators, type TimeIndicators } from './time-indicators.js';
export { accelerationSignal, DIFFERENTIATION_TOP_HZ } from './acceleration-signal.js';
export { spectralKurtosis, type SpectralKurtosis, type SpectralKurtosisOptions } from './spectral-kurtosis.js';
export { fastKurtogram, type Kurtogram, type KurtogramBand, type KurtogramOptions } from './kurtogram.js';
export { envelopeStage, type EnvelopeStage } from './envelope-stage.js';
export { powerCepstrum, cepstralPeak, type Cepstrum, type CepstralPeak } from './cepstrum.js';
export {
  lineToleranceHz,
  matchLine,
  matchableSpectrum,
  type ExpectedLine,
  type LineMatch,
  type MatchableSpectrum,
  type ToleranceOptions,
} from './line-matching.js';
export { speedFromSpectrum, type SpectrumSpeed, type SpectrumSpeedOptions } from './running-speed.js';
export { speedFromTach, type TachSpeed } from './tach-speed.js';
export { LineCatalogue, type CatalogueLine } from './ambiguity.js';
export { judgeHypotheses, pathShape, predictionScale, type Judged, type JudgedLine, type JudgeInputs, type ScoreParts } from './hypotheses.js';
export { buildCandidates, type Candidate, type CandidateLimits } from './candidates.js';
export { faultDescriptors, TOOTH_DROP_DEPTH, MESH_RIPPLE_FRACTION } from './faults/descriptors.js';
export type { FaultDescriptor, GateName, LevelRule, BearingCombRule } from './faults/fault-descriptor.js';
export { gates, GATE_CLOSED_FACTOR } from './faults/gates.js';
export { bayesFactorBound, chanceModel, chanceOfPeak, correctedForSearch, evidenceOf, fisherCombined, EVIDENCE_HALF_BAYES_FACTOR } from './evidence/chance.js';
export { claimShared, searchCombs, type BearingComb, type CombEvidence, type BandSource } from './evidence/bearing-comb.js';
export { weighPattern, type LinePattern, type WeighedLine } from './evidence/line-evidence.js';
export { gearSynchronousAverages, gearTsaIndicators, TSA_MESH_HARMONICS, type GearTsa } from './gear-tsa.js';
export {
  indicatorDescriptors,
  indicatorDescriptor,
  findIndicator,
  indicatorUnit,
  indicatorQuantity,
  indicatorsOf,
  accelerationTrendUnit,
  envelopeLevel,
  scoreIndicator,
  scoreIndicatorName,
  indicatorLevels,
  levelPointOf,
  thresholdOf,
  type ThresholdChoice,
  FAULT_SHOWN_SCORE,
  type IndicatorDescriptor,
  type IndicatorLevels,
  type IndicatorLevelRule,
  type LevelPoint,
  type IndicatorPoint,
  type IndicatorQuantity,
  type IndicatorSources,
  type IndicatorStage,
} from './indicators/indicator-registry.js';
export { computeIndicators, type ComputedIndicators, type IndicatorOptions } from './indicators/compute-indicators.js';
