import type { LevelForecast, MachineSummary, SoonestCrossing, TrendForecast } from './api-types.js';

// How forecasts read in the console: the fleet's "zone C in about 3 weeks", the order by soonest crossing,
// and which crossing a trend chart draws. Pure: the pages and their tests share it.

/** A time ahead in words a planner uses: minutes, hours, days, weeks or months ("about 3 weeks"). */
export function aheadInWords(seconds: number): string {
  const s = Math.max(0, seconds);
  const round = (x: number, unit: string) => `${Math.max(1, Math.round(x))} ${unit}${Math.max(1, Math.round(x)) === 1 ? '' : 's'}`;
  if (s < 3600) return round(s / 60, 'minute');
  if (s < 2 * 86400) return round(s / 3600, 'hour');
  if (s < 14 * 86400) return round(s / 86400, 'day');
  if (s < 90 * 86400) return round(s / (7 * 86400), 'week');
  return round(s / (30.44 * 86400), 'month');
}

/** "zone C in about 3 weeks", "trip in about 2 days". */
export function crossingPhrase(c: Pick<SoonestCrossing, 'level' | 'remainingS'>): string {
  const what = c.level === 'value' ? 'the level' : c.level;
  return `${what} in about ${aheadInWords(c.remainingS)}`;
}

/** Seconds to the machine's soonest foreseen crossing; machines with none sort after every one that has one. */
export function soonestSeconds(m: MachineSummary): number {
  return m.soonestCrossing ? m.soonestCrossing.remainingS : Infinity;
}

/**
 * The crossing a trend chart draws: the soonest foreseen one among the zone boundaries, alarm and trip levels
 * and a value given; null when none is foreseen.
 */
export function crossingToDraw(forecast: TrendForecast | null | undefined): LevelForecast | null {
  let best: LevelForecast | null = null;
  for (const f of forecast?.forecasts ?? []) {
    if (f.status === 'crossing' && f.remainingS !== null && (best === null || f.remainingS < best.remainingS!)) best = f;
  }
  return best;
}

/** Labels of the zone boundaries as drawn at their lines: "A/B 1.4", "B/C 2.8", "C/D 4.5". */
export function boundaryLabels(b: { ab: number; bc: number; cd: number } | null | undefined, format: (x: number) => string): Array<{ value: number; label: string }> {
  if (!b) return [];
  return [
    { value: b.ab, label: `A/B ${format(b.ab)}` },
    { value: b.bc, label: `B/C ${format(b.bc)}` },
    { value: b.cd, label: `C/D ${format(b.cd)}` },
  ];
}

/**
 * The value range of a trend that is not graded from zero (the running speed): the data's own range with a
 * tenth of it as margin each side, so that a 1 % speed change is visible rather than a flat line near the top.
 */
export function levelRange(min: number, max: number): [number, number] {
  const span = max - min;
  const margin = span > 0 ? 0.1 * span : Math.max(Math.abs(max) * 0.01, 1e-6);
  return [min - margin, max + margin];
}
