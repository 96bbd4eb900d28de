import type { HypothesisRef, Zone } from './api-types.js';
import { faultScoreThreshold } from './fleet-order.js';
import { zoneRank } from './zone.js';

// Which point a machine page opens on when the link names none: the one that matters most now. Pure, so
// the machine page and its test share it.

export interface PointLatest {
  pointId: string;
  zone: Zone | null;
  velocityRmsMmPerS: number | null;
  topHypothesis: HypothesisRef | null;
}

/**
 * The point whose newest recording is worst: the highest ISO zone first (zone D is the risk of damage), then the
 * strongest fault hypothesis shown (score from 0.5), then the highest overall velocity. With it, the hypothesis to
 * draw: that recording's strongest, when the recording shows it. Null when no point has a recording.
 */
export function landingPoint(latest: readonly PointLatest[]): { pointId: string; hypothesis: string | null } | null {
  const shown = (p: PointLatest) => (p.topHypothesis && p.topHypothesis.score >= faultScoreThreshold ? p.topHypothesis.score : 0);
  const ranked = [...latest].sort(
    (a, b) =>
      zoneRank(b.zone) - zoneRank(a.zone) ||
      shown(b) - shown(a) ||
      (b.velocityRmsMmPerS ?? -1) - (a.velocityRmsMmPerS ?? -1) ||
      a.pointId.localeCompare(b.pointId),
  );
  const best = ranked[0];
  if (!best) return null;
  const top = best.topHypothesis;
  return { pointId: best.pointId, hypothesis: top && top.score >= faultScoreThreshold ? `${top.fault}:${top.component}` : null };
}
