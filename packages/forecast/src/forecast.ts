import { robustBaseline, type Baseline } from './baseline.js';
import { findOnset, GROWTH_Z } from './change-point.js';
import { driftPosterior, type DriftPrior } from './drift-model.js';
import { ForecastInputError } from './errors.js';
import { passageProbability, passageQuantile, passageTable, type FirstPassage } from './first-passage.js';
import { lastingLevel } from './lasting-level.js';

/** One value of a trend series at a time in seconds (any origin: Unix seconds, or seconds since the first). */
export interface TrendValue {
  tS: number;
  value: number;
}

export interface ForecastOptions {
  /** Values at the start of the series that show the healthy machine; default max(8, ⌈n/5⌉). */
  baselineCount?: number;
  /** Width of the trailing median that makes the lasting level (default 3: a single reading is ignored). */
  levelWindow?: number;
  /** 'log' models ln(value) (levels that grow in proportion), 'linear' the value; 'auto' (default) is log when every value and the threshold are > 0. */
  scale?: 'auto' | 'log' | 'linear';
  /** A population's drift, in the chosen scale per second; default none (the series alone). */
  driftPrior?: DriftPrior | null;
  /** How far ahead a crossing may be foreseen, s; default the span of the series. */
  horizonS?: number;
  /** Probabilities of the interval's ends; default [0.1, 0.9]. */
  interval?: [number, number];
}

export type ForecastStatus = 'crossing' | 'crossed' | 'no-crossing';

export interface Forecast {
  /** 'crossing': a crossing is foreseen within the horizon; 'crossed': the lasting level is at or over it; 'no-crossing': none foreseen. */
  status: ForecastStatus;
  /** Why, in one plain sentence. */
  reason: string;
  threshold: number;
  scale: 'log' | 'linear';
  /** The lasting level now (trailing median), in the series' unit. */
  level: number;
  baseline: { level: number; spread: number; count: number } | null;
  /** Where the current rise began: the last value at the healthy level (Page's change-point estimate). */
  onset: { tS: number; index: number; levelShifts: number } | null;
  /** Time from the last value to the crossing: the median, and the interval's ends (null: beyond the horizon). */
  remainingS: number | null;
  lowS: number | null;
  highS: number | null;
  /** The last value's time plus remainingS. */
  crossingTS: number | null;
  /** P(crossing within the horizon), when a rise was modelled. */
  probabilityWithinHorizon: number | null;
  horizonS: number;
  /** The drift posterior, per second in the scale (ln units on the log scale). */
  drift: { meanPerS: number; sdPerS: number; diffusionPerS: number } | null;
  /** The first passage that was modelled (for other decision rules than the median: remainingQuantile), or null. */
  passage: FirstPassage | null;
  /** How long before the last value the lasting level stands (the middle of its window): the passage starts there. */
  levelLagS: number;
  method: string;
}

export const FORECAST_METHOD =
  'lasting level (trailing median), CUSUM onset against the healthy baseline (Page 1954), Brownian drift after onset with Bayesian updating (Gebraeel et al. 2005), first passage with a random drift (Si et al. 2012)';

/** Default baseline: a fifth of the series, and never fewer than this many values. */
const MIN_BASELINE = 8;
/** Default width of the trailing median: the shortest whose median ignores one reading. */
const LEVEL_WINDOW = 3;
/**
 * Smallest baseline spread: 1 % of the level (0.01 on the log scale). Changes smaller than that are below the
 * repeatability of an overall vibration level (a few percent, common practice), so they are not an onset.
 */
const MIN_RELATIVE_SPREAD = 0.01;

/**
 * Forecasts when the lasting level of a trend series rises through `threshold`: the healthy baseline, the onset of
 * the current rise (CUSUM, findOnset), the drift since the onset (driftPosterior, with a population prior when one
 * is given), and the first passage of that Brownian drift from the level now to the threshold. "No crossing
 * foreseen" when the series has not left its baseline, when its rise is not credibly growth, or when the crossing
 * is less likely than not within the horizon: a flat or noisy series is never extrapolated.
 */
export function forecastCrossing(series: readonly TrendValue[], threshold: number, options: ForecastOptions = {}): Forecast {
  validate(series, threshold, options);
  const { n, timesS, lasting, levels, raw, scale, to, baselineCount, minSpread } = prepareSeries(series, threshold, options);
  const yThreshold = to(threshold);
  const now = levels[n - 1]!;
  const horizonS = options.horizonS ?? timesS[n - 1]! - timesS[0]!;
  const base: Omit<Forecast, 'status' | 'reason'> = {
    threshold,
    scale,
    level: lasting[n - 1]!,
    baseline: null,
    onset: null,
    remainingS: null,
    lowS: null,
    highS: null,
    crossingTS: null,
    probabilityWithinHorizon: null,
    horizonS,
    drift: null,
    passage: null,
    levelLagS: timesS[n - 1]! - windowCentreS(timesS, options.levelWindow ?? LEVEL_WINDOW),
    method: FORECAST_METHOD,
  };
  const onset = findOnset(timesS, levels, raw, n, baselineCount, minSpread);
  if (onset) {
    base.onset = { tS: timesS[onset.index]!, index: onset.index, levelShifts: onset.levelShifts };
    base.baseline = outward(onset.baseline, scale);
  } else if (n > baselineCount) {
    base.baseline = outward(robustBaseline(raw, 0, baselineCount, minSpread), scale);
  }
  if (now >= yThreshold) {
    return { ...base, status: 'crossed', reason: `the lasting level ${fmt(lasting[n - 1]!)} is at or over the threshold ${fmt(threshold)}`, remainingS: 0, lowS: 0, highS: 0, crossingTS: timesS[n - 1]! };
  }
  if (n <= baselineCount + 1) {
    return { ...base, status: 'no-crossing', reason: `no crossing foreseen: ${n} values, a forecast needs the ${baselineCount} of the baseline and at least two after them` };
  }
  if (!onset) {
    return { ...base, status: 'no-crossing', reason: 'no crossing foreseen: the series has not left its healthy baseline' };
  }
  // The current rise starts at the lowest lasting level since the onset: a level that rose, fell back and rises
  // again is judged by its latest rise (for a steady rise that is the onset itself, at the baseline level).
  let riseStart = onset.index;
  for (let i = onset.index + 1; i < n; i++) if (levels[i]! <= levels[riseStart]!) riseStart = i;
  const startLevel = riseStart === onset.index ? onset.baseline.level : levels[riseStart]!;
  const drift = driftPosterior(timesS, levels, riseStart, n - 1, startLevel, options.driftPrior ?? null);
  const sd = Math.sqrt(drift.varPerS2);
  base.drift = { meanPerS: drift.meanPerS, sdPerS: sd, diffusionPerS: drift.diffusionPerS };
  if (!(drift.meanPerS > GROWTH_Z * sd)) {
    return { ...base, status: 'no-crossing', reason: 'no crossing foreseen: the level has changed since the onset but is not credibly growing' };
  }
  const passage: FirstPassage = { distance: yThreshold - now, driftMeanPerS: drift.meanPerS, driftVarPerS2: drift.varPerS2, diffusionPerS: drift.diffusionPerS };
  base.passage = passage;
  if (!(horizonS > 0)) {
    return { ...base, status: 'no-crossing', reason: 'no crossing foreseen: the horizon is zero' };
  }
  const table = passageTable(passage, horizonS);
  const p = passageProbability(table, horizonS);
  base.probabilityWithinHorizon = p;
  const median50 = passageQuantile(table, 0.5);
  if (median50 === null) {
    return { ...base, status: 'no-crossing', reason: `no crossing foreseen within the horizon of ${duration(horizonS)} (probability ${(100 * p).toFixed(0)} %)` };
  }
  const [qLow, qHigh] = options.interval ?? [0.1, 0.9];
  // The lasting level of a rising series is the value from the middle of its window (a median lags half the
  // window), so its passage is timed from there: the remaining time is counted from the last value.
  const lagS = base.levelLagS;
  const fromNow = (t: number | null) => (t === null ? null : Math.max(0, t - lagS));
  const remainingS = fromNow(median50)!;
  return {
    ...base,
    status: 'crossing',
    reason: `rising since ${duration(timesS[n - 1]! - timesS[onset.index]!)} ago; crossing foreseen in about ${duration(remainingS)}`,
    remainingS,
    lowS: fromNow(passageQuantile(table, qLow)),
    highS: fromNow(passageQuantile(table, qHigh)),
    crossingTS: timesS[n - 1]! + remainingS,
  };
}

/** The series on the model's scale: lasting levels, raw values, the baseline size and the smallest spread. */
function prepareSeries(series: readonly TrendValue[], threshold: number, options: ForecastOptions) {
  const n = series.length;
  const values = series.map((v) => v.value);
  const timesS = Float64Array.from(series, (v) => v.tS);
  const scale: 'log' | 'linear' = options.scale === 'log' || options.scale === 'linear'
    ? options.scale
    : values.every((v) => v > 0) && threshold > 0 ? 'log' : 'linear';
  if (scale === 'log' && !(threshold > 0 && values.every((v) => v > 0))) {
    throw new ForecastInputError('invalid_option', 'scale: log needs every value and the threshold > 0');
  }
  const to = scale === 'log' ? Math.log : (x: number) => x;
  const lasting = lastingLevel(values, options.levelWindow ?? LEVEL_WINDOW);
  const baselineCount = options.baselineCount ?? Math.max(MIN_BASELINE, Math.ceil(n / 5));
  const minSpread = scale === 'log' ? MIN_RELATIVE_SPREAD : MIN_RELATIVE_SPREAD * Math.max(Math.abs(threshold), Math.abs(median(values.slice(0, baselineCount))), 1e-12);
  return { n, timesS, lasting, levels: lasting.map(to), raw: values.map(to), scale, to, baselineCount, minSpread };
}

/**
 * The drift of a whole run to failure, per second on the model's scale: the rise of its lasting level from the
 * baseline at the onset to its last value, over that time (the sufficient statistic of driftPosterior). Null when
 * the run never left its baseline. `threshold` only chooses the scale, as in forecastCrossing.
 */
export function runDrift(series: readonly TrendValue[], threshold: number, options: ForecastOptions = {}): number | null {
  validate(series, threshold, options);
  const { n, timesS, levels, raw, baselineCount, minSpread } = prepareSeries(series, threshold, options);
  const onset = findOnset(timesS, levels, raw, n, baselineCount, minSpread);
  if (!onset) return null;
  const spanS = timesS[n - 1]! - timesS[onset.index]!;
  return spanS > 0 ? (levels[n - 1]! - onset.baseline.level) / spanS : null;
}

/**
 * A drift prior from earlier runs to failure of the same kind of part (Gebraeel et al. 2005 estimate the prior from
 * such a population): the mean and sample standard deviation of their runDrift. Null with fewer than two runs
 * that left their baseline.
 */
export function populationDriftPrior(runs: ReadonlyArray<readonly TrendValue[]>, threshold: number, options: ForecastOptions = {}): DriftPrior | null {
  const drifts = runs.map((r) => runDrift(r, threshold, options)).filter((d): d is number => d !== null && Number.isFinite(d));
  if (drifts.length < 2) return null;
  const mean = drifts.reduce((a, b) => a + b, 0) / drifts.length;
  const variance = drifts.reduce((a, b) => a + (b - mean) ** 2, 0) / (drifts.length - 1);
  return { meanPerS: mean, sdPerS: Math.sqrt(variance) };
}

/**
 * The remaining time, counted from the last value, by which the crossing has happened with probability q (null when
 * beyond the horizon, or when no rise was modelled): the quantiles behind lowS, remainingS and highS, for other
 * decision rules (bestPhmEstimate).
 */
export function remainingQuantile(f: Forecast): (q: number) => number | null {
  if (f.status === 'crossed') return () => 0;
  if (!f.passage) return () => null;
  const table = passageTable(f.passage, f.horizonS);
  return (q) => {
    const t = passageQuantile(table, q);
    return t === null ? null : Math.max(0, t - f.levelLagS);
  };
}

/** The time the last lasting level stands for: the centre of its trailing window (mean of the middle two for an even width). */
function windowCentreS(timesS: Float64Array, width: number): number {
  const n = timesS.length;
  const m = Math.min(width, n);
  const first = n - m;
  return m % 2 === 1 ? timesS[first + (m - 1) / 2]! : 0.5 * (timesS[first + m / 2 - 1]! + timesS[first + m / 2]!);
}

function validate(series: readonly TrendValue[], threshold: number, options: ForecastOptions): void {
  if (!Array.isArray(series) || series.length < 2) throw new ForecastInputError('invalid_series', 'series must hold at least 2 values');
  for (let i = 0; i < series.length; i++) {
    const v = series[i]!;
    if (!Number.isFinite(v.tS) || !Number.isFinite(v.value)) throw new ForecastInputError('invalid_series', `series[${i}] must have a finite tS and value`);
    if (i > 0 && !(v.tS > series[i - 1]!.tS)) throw new ForecastInputError('invalid_series', `series[${i}].tS (${v.tS}) must be later than series[${i - 1}].tS`);
  }
  if (!Number.isFinite(threshold)) throw new ForecastInputError('invalid_threshold', `threshold (${threshold}) must be a finite number`);
  if (options.baselineCount !== undefined && !(Number.isInteger(options.baselineCount) && options.baselineCount >= 2)) {
    throw new ForecastInputError('invalid_option', `baselineCount (${options.baselineCount}) must be a whole number >= 2`);
  }
  if (options.levelWindow !== undefined && !(Number.isInteger(options.levelWindow) && options.levelWindow >= 1)) {
    throw new ForecastInputError('invalid_option', `levelWindow (${options.levelWindow}) must be a whole number >= 1`);
  }
  if (options.horizonS !== undefined && !(options.horizonS > 0 && Number.isFinite(options.horizonS))) {
    throw new ForecastInputError('invalid_option', `horizonS (${options.horizonS}) must be a finite number > 0`);
  }
  const iv = options.interval;
  if (iv !== undefined && !(iv.length === 2 && iv[0] > 0 && iv[0] < 0.5 && iv[1] > 0.5 && iv[1] < 1)) {
    throw new ForecastInputError('invalid_option', 'interval must be [low, high] with 0 < low < 0.5 < high < 1');
  }
}

function outward(b: Baseline, scale: 'log' | 'linear'): { level: number; spread: number; count: number } {
  return { level: scale === 'log' ? Math.exp(b.level) : b.level, spread: b.spread, count: b.count };
}

function median(values: readonly number[]): number {
  const x = [...values].sort((a, b) => a - b);
  const n = x.length;
  if (n === 0) return 0;
  return n % 2 === 1 ? x[(n - 1) / 2]! : 0.5 * (x[n / 2 - 1]! + x[n / 2]!);
}

function fmt(x: number): string {
  return Number(x.toPrecision(3)).toString();
}

/** A duration in words for reasons: seconds, minutes, hours, days or weeks. */
export function duration(s: number): string {
  const a = Math.abs(s);
  if (a < 120) return `${Math.round(s)} s`;
  if (a < 7200) return `${Math.round(s / 60)} min`;
  if (a < 2 * 86400) return `${Math.round(s / 3600)} h`;
  if (a < 14 * 86400) return `${Math.round(s / 86400)} days`;
  return `${Math.round(s / (7 * 86400))} weeks`;
}
