import { describe, expect, it } from 'vitest';
import type { TrendBucket } from './api-types.js';
import { developingFaults, scoreIndicator, scoreRise } from './score-rise.js';

// Invented weekly score trends; expectations worked out by hand from the 0.5 threshold and the rise.
const weeks = (means: number[]): TrendBucket[] =>
  means.map((mean, i) => ({ start: `2025-01-${String(6 + 7 * i).padStart(2, '0')}`, count: 2, min: mean, mean, max: mean, last: mean, zone: null, alarmState: null }));

describe('scoreIndicator', () => {
  it('reads fault and component, keeping colons out of the fault', () => {
    expect(scoreIndicator('score:gear-broken-tooth:hs-pinion')).toEqual({ fault: 'gear-broken-tooth', component: 'hs-pinion' });
    expect(scoreIndicator('velocity_rms_mm_per_s')).toBeNull();
  });
});

describe('scoreRise', () => {
  it('keeps a score that climbed past 0.5', () => {
    const r = scoreRise('gb-output-v', 'score:gear-broken-tooth:hs-pinion', weeks([0.05, 0.05, 0.35, 0.88, 0.97]));
    expect(r).toMatchObject({ first: 0.05, last: 0.97, pointId: 'gb-output-v' });
    expect(r!.rise).toBeCloseTo(0.92, 12);
  });

  it('drops a score that was always high or never reached 0.5', () => {
    expect(scoreRise('p', 'score:gear-wear:hs-mesh', weeks([0.97, 0.96, 0.97]))).toBeNull();
    expect(scoreRise('p', 'score:unbalance:fan', weeks([0.05, 0.3, 0.45]))).toBeNull();
    expect(scoreRise('p', 'score:unbalance:fan', weeks([0.6]))).toBeNull();
  });
});

describe('developingFaults', () => {
  it('keeps the point where each fault rose most, strongest rise first', () => {
    const list = developingFaults([
      scoreRise('a', 'score:bearing-outer-race:fan-de', weeks([0.1, 0.9])),
      scoreRise('b', 'score:bearing-outer-race:fan-de', weeks([0.2, 0.7])),
      scoreRise('b', 'score:gear-eccentricity:hs-pinion', weeks([0.52, 0.93])),
      null,
    ]);
    expect(list.map((r) => [r.fault, r.pointId])).toEqual([
      ['bearing-outer-race', 'a'],
      ['gear-eccentricity', 'b'],
    ]);
  });
});
