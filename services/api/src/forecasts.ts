import { findIndicator, type IndicatorLevels } from '@kinespec/diagnosis';
import { FORECAST_METHOD, forecastCrossing, type Forecast } from '@kinespec/forecast';

/*
 * Forecasts of a point's trend against its levels: the one door from the service to @kinespec/forecast, used by
 * the trend route and the fleet so that both say the same of the same series.
 */

/** The history a forecast reads: the year before the end of the trend asked for (the trend route's default window). */
export const FORECAST_HISTORY_MS = 366 * 86_400_000;

export type LevelName = 'zone B' | 'zone C' | 'zone D' | 'alarm' | 'trip' | 'value';

export interface LevelForecast {
  level: LevelName;
  threshold: number;
  status: Forecast['status'];
  reason: string;
  crossingAt: string | null;
  remainingS: number | null;
  lowS: number | null;
  highS: number | null;
}

export interface TrendForecast {
  method: string;
  /** When the current rise began (Page's change point), or null. */
  onsetAt: string | null;
  /** The lasting level now (trailing median of the last three values). */
  level: number;
  values: number;
  forecasts: LevelForecast[];
}

/**
 * The levels a trend is forecast against at a point: its zone boundaries, alarm and trip (point-levels.ts levelsAt:
 * the point's stored grading), and a value given.
 */
export function levelsToForecast(indicator: string, l: IndicatorLevels, value: number | null): Array<{ level: LevelName; threshold: number }> {
  const out: Array<{ level: LevelName; threshold: number }> = [];
  // speed and other indicators that do not grow with wear are forecast only against a value given
  if (findIndicator(indicator)?.worseWhen === 'up') {
    if (l.zoneBoundaries) out.push({ level: 'zone B', threshold: l.zoneBoundaries.ab }, { level: 'zone C', threshold: l.zoneBoundaries.bc }, { level: 'zone D', threshold: l.zoneBoundaries.cd });
    if (l.alarmLevel !== null) out.push({ level: 'alarm', threshold: l.alarmLevel });
    if (l.tripLevel !== null) out.push({ level: 'trip', threshold: l.tripLevel });
  }
  if (value !== null) out.push({ level: 'value', threshold: value });
  return out;
}

/** Forecasts of one series (oldest first) against each level; null when the series has fewer than two values. */
export function forecastTrend(
  series: ReadonlyArray<{ recordedAt: Date; value: number }>,
  levels: ReadonlyArray<{ level: LevelName; threshold: number }>,
): TrendForecast | null {
  if (series.length < 2) return null;
  const points = series.map((v) => ({ tS: v.recordedAt.getTime() / 1000, value: v.value }));
  const iso = (tS: number | null) => (tS === null ? null : new Date(Math.round(tS * 1000)).toISOString());
  let onsetAt: string | null = null;
  let level = series[series.length - 1]!.value;
  const forecasts = levels.map(({ level: name, threshold }) => {
    const f = forecastCrossing(points, threshold);
    if (f.onset && onsetAt === null) onsetAt = iso(f.onset.tS);
    level = f.level;
    return {
      level: name,
      threshold,
      status: f.status,
      reason: f.reason,
      crossingAt: iso(f.crossingTS),
      remainingS: f.remainingS,
      lowS: f.lowS,
      highS: f.highS,
    };
  });
  return { method: FORECAST_METHOD, onsetAt, level, values: series.length, forecasts };
}

/** The soonest crossing a forecast foresees (status 'crossing'), or null. */
export function soonest(forecast: TrendForecast | null): LevelForecast | null {
  let best: LevelForecast | null = null;
  for (const f of forecast?.forecasts ?? []) {
    if (f.status === 'crossing' && (best === null || f.remainingS! < best.remainingS!)) best = f;
  }
  return best;
}
