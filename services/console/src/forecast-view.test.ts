import { describe, expect, it } from 'vitest';
import type { MachineSummary, TrendForecast } from './api-types.js';
import { aheadInWords, boundaryLabels, crossingPhrase, crossingToDraw, levelRange, soonestSeconds } from './forecast-view.js';

const DAY = 86400;

describe('forecast words', () => {
  it('says a time ahead in the unit a planner uses', () => {
    expect(aheadInWords(20 * 60)).toBe('20 minutes');
    expect(aheadInWords(5 * 3600)).toBe('5 hours');
    expect(aheadInWords(3 * DAY)).toBe('3 days');
    expect(aheadInWords(21 * DAY)).toBe('3 weeks');
    expect(aheadInWords(1 * DAY)).toBe('24 hours');
    expect(aheadInWords(200 * DAY)).toBe('7 months');
    expect(aheadInWords(0)).toBe('1 minute');
  });

  it('reads a crossing as "zone C in about 3 weeks"', () => {
    expect(crossingPhrase({ level: 'zone C', remainingS: 21 * DAY })).toBe('zone C in about 3 weeks');
    expect(crossingPhrase({ level: 'trip', remainingS: 2 * DAY })).toBe('trip in about 2 days');
  });
});

describe('forecast choices', () => {
  const f = (level: string, status: string, remainingS: number | null) => ({ level, status, remainingS, threshold: 1, reason: '', crossingAt: null, lowS: null, highS: null });

  it('draws the soonest foreseen crossing and ignores crossed and unforeseen levels', () => {
    const forecast = { method: '', onsetAt: null, level: 1, values: 10, forecasts: [f('zone B', 'crossed', 0), f('zone C', 'crossing', 5 * DAY), f('alarm', 'crossing', 4 * DAY), f('trip', 'no-crossing', null)] } as TrendForecast;
    expect(crossingToDraw(forecast)?.level).toBe('alarm');
    expect(crossingToDraw(null)).toBeNull();
  });

  it('orders machines without a foreseen crossing after those with one', () => {
    const m = (remainingS: number | null) => ({ soonestCrossing: remainingS === null ? null : { remainingS } }) as unknown as MachineSummary;
    expect(soonestSeconds(m(100))).toBe(100);
    expect(soonestSeconds(m(null))).toBe(Infinity);
  });

  it('labels the zone boundaries with their values', () => {
    expect(boundaryLabels({ ab: 1.4, bc: 2.8, cd: 4.5 }, String).map((x) => x.label)).toEqual(['A/B 1.4', 'B/C 2.8', 'C/D 4.5']);
    expect(boundaryLabels(null, String)).toEqual([]);
  });

  it('does not start the speed axis at zero: 1470-1490 rpm spans 1468-1492', () => {
    expect(levelRange(1470, 1490)).toEqual([1468, 1492]);
    const [lo, hi] = levelRange(1480, 1480);
    expect(lo).toBeGreaterThan(1400);
    expect(hi).toBeLessThan(1500);
  });
});
