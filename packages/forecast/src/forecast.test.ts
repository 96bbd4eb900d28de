import { describe, expect, it } from 'vitest';
import { findOnset } from './change-point.js';
import { ForecastInputError } from './errors.js';
import { forecastCrossing, remainingQuantile, type TrendValue } from './forecast.js';
import { lastingLevel } from './lasting-level.js';

/** Standard normal deviates from a Park–Miller generator (Park & Miller 1988, CACM 31:1192) through Box & Muller (1958). */
function normals(count: number, seed: number): number[] {
  let s = seed;
  const u = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return Array.from({ length: count }, () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()));
}

/** Every 10 s: level 1 until t0, then e^(r·(t − t0)), times lognormal noise of `sigma` (ln units). */
function exponentialRun(count: number, t0S: number, ratePerS: number, sigma: number, seed: number): TrendValue[] {
  const z = normals(count, seed);
  return Array.from({ length: count }, (_, i) => {
    const t = 10 * i;
    return { tS: t, value: Math.exp((t > t0S ? ratePerS * (t - t0S) : 0) + sigma * z[i]!) };
  });
}

describe('forecastCrossing on an exponential with known rate and noise (closed form: t0 + ln(D)/r)', () => {
  // r = 1e-3 /s from t0 = 3000 s; D = e^1.5, crossed at 4500 s. Forecast made at 4000 s: 500 s remain.
  const run = exponentialRun(501, 3000, 1e-3, 0.03, 11);
  const threshold = Math.exp(1.5);
  const f = forecastCrossing(run.slice(0, 401), threshold, { baselineCount: 200 });

  it('finds the onset near t0 (Page 1954 change-point estimate)', () => {
    expect(f.onset).not.toBeNull();
    expect(Math.abs(f.onset!.tS - 3000)).toBeLessThanOrEqual(60);
  });

  it('foresees the crossing 500 s ahead within 20 %, the truth inside the 10-90 % interval', () => {
    expect(f.status).toBe('crossing');
    expect(f.remainingS! / 500).toBeGreaterThan(0.8);
    expect(f.remainingS! / 500).toBeLessThan(1.2);
    expect(f.lowS!).toBeLessThan(500);
    expect(f.highS!).toBeGreaterThan(500);
    expect(f.crossingTS).toBeCloseTo(4000 + f.remainingS!, 9);
    // the drift is the rate itself on the log scale
    expect(f.scale).toBe('log');
    expect(f.drift!.meanPerS / 1e-3).toBeGreaterThan(0.85);
    expect(f.drift!.meanPerS / 1e-3).toBeLessThan(1.15);
  });

  it('gives its median and interval ends through remainingQuantile too (for other decision rules)', () => {
    const q = remainingQuantile(f);
    expect(q(0.5)).toBeCloseTo(f.remainingS!, 6);
    expect(q(0.1)).toBeCloseTo(f.lowS!, 6);
    expect(q(0.9)).toBeCloseTo(f.highS!, 6);
    // the lasting level (median of three values 10 s apart) stands for the value 10 s before the last
    expect(f.levelLagS).toBe(10);
  });

  it('narrows as the crossing nears: the interval at 4300 s is narrower than at 3800 s', () => {
    const early = forecastCrossing(run.slice(0, 381), threshold, { baselineCount: 200 });
    const late = forecastCrossing(run.slice(0, 431), threshold, { baselineCount: 200 });
    expect(late.highS! - late.lowS!).toBeLessThan(early.highS! - early.lowS!);
    expect(Math.abs(late.remainingS! - 200) / 200).toBeLessThan(0.3);
  });

  it('takes a population prior into account: a prior at half the rate pulls the drift down, never past it', () => {
    const withPrior = forecastCrossing(run.slice(0, 401), threshold, { baselineCount: 200, driftPrior: { meanPerS: 0.5e-3, sdPerS: 0.1e-3 } });
    expect(withPrior.drift!.meanPerS).toBeLessThan(f.drift!.meanPerS);
    expect(withPrior.drift!.meanPerS).toBeGreaterThan(0.5e-3);
    expect(withPrior.remainingS!).toBeGreaterThan(f.remainingS!);
  });
});

describe('forecastCrossing says "no crossing foreseen" rather than extrapolate', () => {
  it('on a flat noisy series: no onset', () => {
    const flat = exponentialRun(300, Infinity, 0, 0.05, 3);
    const f = forecastCrossing(flat, 2);
    expect(f.status).toBe('no-crossing');
    expect(f.onset).toBeNull();
    expect(f.remainingS).toBeNull();
    expect(f.reason).toMatch(/not left its healthy baseline/);
  });

  it('on a step that then holds still: the onset is at the step, but no credible growth', () => {
    const z = normals(200, 5);
    const step = z.map((e, i) => ({ tS: 86400 * i, value: (i >= 120 ? 2 : 1) * Math.exp(0.02 * e) }));
    const f = forecastCrossing(step.slice(0, 160), 4, { baselineCount: 60 });
    expect(f.status).toBe('no-crossing');
    // Page's estimate is the last zero of the sum: noise before the step can move it a few values early
    expect(f.onset!.index).toBeGreaterThanOrEqual(109);
    expect(f.onset!.index).toBeLessThanOrEqual(120);
    expect(f.reason).toMatch(/not credibly growing/);
  });

  it('absorbs a step that held for a baseline of values into a new baseline (a level shift)', () => {
    const z = normals(300, 8);
    const step = z.map((e, i) => ({ tS: 10 * i, value: (i >= 100 ? 2 : 1) * Math.exp(0.02 * e) }));
    const raw = step.map((v) => Math.log(v.value));
    expect(findOnset(step.map((v) => v.tS), lastingLevel(raw, 3), raw, 300, 60, 0.01)).toBeNull();
    expect(forecastCrossing(step, 4, { baselineCount: 60 }).status).toBe('no-crossing');
  });

  it('ignores an isolated spike over the threshold (the lasting level is a trailing median)', () => {
    const flat = exponentialRun(100, Infinity, 0, 0.02, 4);
    flat[99] = { tS: flat[99]!.tS, value: 50 };
    const f = forecastCrossing(flat, 20);
    expect(f.status).toBe('no-crossing');
    expect(f.level).toBeLessThan(1.2);
  });

  it('when the crossing is further off than the history behind it (the horizon)', () => {
    // a slow rise: 0.5e-3 /s from 3000 s; at 4000 s the crossing of e^3 is 4000 s away, the history is 4000 s long
    const slow = exponentialRun(401, 3000, 0.5e-3, 0.01, 13);
    const f = forecastCrossing(slow, Math.exp(3.5), { baselineCount: 200 });
    expect(f.status).toBe('no-crossing');
    expect(f.reason).toMatch(/within the horizon/);
    expect(forecastCrossing(slow, Math.exp(3.5), { baselineCount: 200, horizonS: 20000 }).status).toBe('crossing');
  });
});

describe('forecastCrossing, other cases', () => {
  it('reports a lasting level over the threshold as crossed, with nothing remaining', () => {
    const run = exponentialRun(401, 3000, 1e-3, 0.01, 2);
    const f = forecastCrossing(run, 2, { baselineCount: 200 });
    expect(f.status).toBe('crossed');
    expect(f.remainingS).toBe(0);
  });

  it('models a series with zeros (a fault score) on the linear scale: 0.01 a day from 0.1, 0.5 reached 20 days on', () => {
    const z = normals(80, 21);
    const score = z.map((e, i) => ({ tS: 86400 * i, value: Math.max(0, (i < 50 ? 0.1 : 0.1 + 0.01 * (i - 50)) + 0.005 * e) }));
    score[3] = { tS: score[3]!.tS, value: 0 };
    const f = forecastCrossing(score.slice(0, 80), 0.5, { baselineCount: 40 });
    expect(f.scale).toBe('linear');
    expect(f.status).toBe('crossing');
    // level 0.39 at day 79, rising 0.01 a day: 0.5 about 11 days on
    expect(f.remainingS! / 86400).toBeGreaterThan(8);
    expect(f.remainingS! / 86400).toBeLessThan(14);
  });

  it('refuses bad input with a typed error naming the parameter', () => {
    expect(() => forecastCrossing([{ tS: 0, value: 1 }], 2)).toThrow(ForecastInputError);
    expect(() => forecastCrossing([{ tS: 0, value: 1 }, { tS: 0, value: 1 }], 2)).toThrow(/later than/);
    expect(() => forecastCrossing([{ tS: 0, value: 1 }, { tS: 1, value: NaN }], 2)).toThrow(/finite/);
    expect(() => forecastCrossing([{ tS: 0, value: 1 }, { tS: 1, value: 1 }], NaN)).toThrow(/threshold/);
    expect(() => forecastCrossing([{ tS: 0, value: 1 }, { tS: 1, value: 1 }], 2, { baselineCount: 1 })).toThrow(/baselineCount/);
    expect(() => forecastCrossing([{ tS: 0, value: 0 }, { tS: 1, value: 1 }], 2, { scale: 'log' })).toThrow(/scale/);
  });

  it('needs a baseline and two values after it', () => {
    const f = forecastCrossing(exponentialRun(9, 0, 0.1, 0, 1), 1e9);
    expect(f.status).toBe('no-crossing');
    expect(f.reason).toMatch(/needs/);
  });
});
