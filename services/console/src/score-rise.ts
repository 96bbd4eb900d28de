import type { TrendBucket } from './api-types.js';
import { faultScoreThreshold } from './fleet-order.js';

// Which hypothesis scores are developing: a score that has climbed to the fault threshold over the
// weeks shown is what the engineer must plan for, even when another hypothesis scores higher now.

export interface ScoreRise {
  indicator: string;
  fault: string;
  component: string;
  pointId: string;
  first: number;
  last: number;
  rise: number;
  means: number[];
}

/** Parses "score:<fault>:<component>"; null for other indicators. */
export function scoreIndicator(indicator: string): { fault: string; component: string } | null {
  const m = /^score:([^:]+):(.+)$/.exec(indicator);
  return m ? { fault: m[1]!, component: m[2]! } : null;
}

/**
 * @param minimumRise how much the score must have grown from the first to the last bucket
 * @returns null unless the score ends at or above the fault threshold after rising by `minimumRise`
 */
export function scoreRise(pointId: string, indicator: string, buckets: readonly TrendBucket[], minimumRise = 0.25): ScoreRise | null {
  const parsed = scoreIndicator(indicator);
  const means = buckets.map((b) => b.mean).filter((v) => Number.isFinite(v));
  if (!parsed || means.length < 2) return null;
  const first = means[0]!;
  const last = means[means.length - 1]!;
  const rise = last - first;
  if (last < faultScoreThreshold || rise < minimumRise) return null;
  return { indicator, ...parsed, pointId, first, last, rise, means };
}

/** Strongest rise first; one entry per (fault, component), at the point where it rose most. */
export function developingFaults(rises: ReadonlyArray<ScoreRise | null>): ScoreRise[] {
  const best = new Map<string, ScoreRise>();
  for (const r of rises) {
    if (!r) continue;
    const key = `${r.fault}:${r.component}`;
    const seen = best.get(key);
    if (!seen || r.rise > seen.rise) best.set(key, r);
  }
  return [...best.values()].sort((a, b) => b.rise - a.rise || b.last - a.last);
}
