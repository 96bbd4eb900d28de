// Public surface of @kinespec/forecast: when will a trend series cross a level. Pure functions, no I/O.
export { forecastCrossing, remainingQuantile, runDrift, populationDriftPrior, duration, FORECAST_METHOD, type Forecast, type ForecastOptions, type ForecastStatus, type TrendValue } from './forecast.js';
export { findOnset, CUSUM_DECISION, CUSUM_REFERENCE, GROWTH_Z, type Onset } from './change-point.js';
export { driftPosterior, type DriftPosterior, type DriftPrior } from './drift-model.js';
export { firstPassageDensity, passageTable, passageQuantile, passageProbability, type FirstPassage, type PassageTable } from './first-passage.js';
export { lastingLevel } from './lasting-level.js';
export { robustBaseline, type Baseline } from './baseline.js';
export { normalCdf } from './normal.js';
export { percentError, phmAccuracy, bestPhmEstimate } from './phm2012-score.js';
export { ForecastInputError, forecastErrorCodes, type ForecastErrorCode } from './errors.js';
