import type { MachineSummary, Zone } from './api-types.js';
import { soonestSeconds } from './forecast-view.js';
import { zoneRank } from './zone.js';

// How the fleet table orders and filters machines. Pure: the fleet page and its tests share it.

/** A hypothesis at or above this score means the recording shows that fault (machine-model.md). */
export const faultScoreThreshold = 0.5;

export type ConcernLevel = 0 | 1 | 2 | 3;
export const concernWord: Record<ConcernLevel, string> = { 0: 'no data', 1: 'normal', 2: 'watch', 3: 'act' };

/**
 * 3 act: zone D or an active alarm; 2 watch: zone C or a fault hypothesis at or above the threshold;
 * 1 normal: measured, nothing of the above; 0: never measured.
 */
export function concernLevel(m: MachineSummary): ConcernLevel {
  if (m.worstZone === 'D' || m.activeAlarms > 0) return 3;
  if (m.worstZone === 'C' || (m.topHypothesis !== null && m.topHypothesis.score >= faultScoreThreshold)) return 2;
  if (m.lastMeasuredAt === null && m.worstZone === null) return 0;
  return 1;
}

/** Whole weeks between the first and the last bucket of the main indicator's sparkline (the period of indicatorRise). */
export function sparklineWeeks(m: MachineSummary): number | null {
  const line = m.mainIndicator?.sparkline ?? [];
  if (line.length < 2) return null;
  const ms = new Date(line[line.length - 1]!.start).getTime() - new Date(line[0]!.start).getTime();
  return Number.isFinite(ms) ? Math.round(ms / (7 * 86_400_000)) : null;
}

/**
 * The rows of the "rising fastest" table that deserve a place: machines the fleet filter shows, whose indicator
 * rose by at least half a per cent (less rounds to "+0 %", which is no rise at all).
 */
export function risingRows<R extends { machineId: string; risePercent: number }>(rows: readonly R[], shown: ReadonlySet<string>): R[] {
  return rows.filter((r) => shown.has(r.machineId) && Number.isFinite(r.risePercent) && r.risePercent >= 0.5);
}

/** Relative change of the main indicator over its sparkline (last bucket against the first), or null. */
export function indicatorRise(m: MachineSummary): number | null {
  const line = m.mainIndicator?.sparkline ?? [];
  if (line.length < 2) return null;
  const first = line[0]!.mean;
  const last = line[line.length - 1]!.mean;
  if (!Number.isFinite(first) || !Number.isFinite(last) || first === 0) return null;
  return (last - first) / Math.abs(first);
}

export type SortKey = 'concern' | 'name' | 'zone' | 'score' | 'lastMeasured' | 'alarms' | 'rise' | 'crossing';
export type SortDirection = 'asc' | 'desc';

const score = (m: MachineSummary) => m.topHypothesis?.score ?? -1;
const time = (m: MachineSummary) => (m.lastMeasuredAt ? new Date(m.lastMeasuredAt).getTime() : -Infinity);
const byName = (a: MachineSummary, b: MachineSummary) => a.name.localeCompare(b.name) || a.id.localeCompare(b.id);

const keyOf: Record<SortKey, (m: MachineSummary) => number | string> = {
  concern: (m) => concernLevel(m),
  name: (m) => m.name.toLowerCase(),
  zone: (m) => zoneRank(m.worstZone),
  score,
  lastMeasured: time,
  alarms: (m) => m.activeAlarms,
  rise: (m) => indicatorRise(m) ?? -Infinity,
  // soonest first when ascending; machines with no foreseen crossing last
  crossing: soonestSeconds,
};

/**
 * Sorts a copy. Ties fall back to the concern order (level, then score, then zone), then the name,
 * so the same fleet always reads in the same order.
 */
export function sortMachines(machines: readonly MachineSummary[], key: SortKey = 'concern', direction: SortDirection = 'desc'): MachineSummary[] {
  const sign = direction === 'asc' ? 1 : -1;
  const concernTie = (a: MachineSummary, b: MachineSummary) =>
    concernLevel(b) - concernLevel(a) || score(b) - score(a) || zoneRank(b.worstZone) - zoneRank(a.worstZone) || byName(a, b);
  return [...machines].sort((a, b) => {
    const ka = keyOf[key](a);
    const kb = keyOf[key](b);
    const primary = typeof ka === 'string' ? ka.localeCompare(kb as string) : ka === kb ? 0 : (ka as number) - (kb as number);
    return primary !== 0 ? sign * primary : concernTie(a, b);
  });
}

export interface FleetFilter {
  /** matched against machine name and id, hypothesis fault and component */
  text: string;
  /** only machines in this zone or worse */
  minZone: Zone | null;
  /** only machines whose strongest hypothesis reaches the fault threshold */
  faultsOnly: boolean;
}

export function filterMachines(machines: readonly MachineSummary[], filter: FleetFilter): MachineSummary[] {
  const words = filter.text.toLowerCase().split(/\s+/).filter(Boolean);
  return machines.filter((m) => {
    if (filter.minZone && zoneRank(m.worstZone) < zoneRank(filter.minZone)) return false;
    if (filter.faultsOnly && !(m.topHypothesis && m.topHypothesis.score >= faultScoreThreshold)) return false;
    if (words.length === 0) return true;
    const haystack = [m.name, m.id, m.topHypothesis?.fault ?? '', m.topHypothesis?.component ?? ''].join(' ').toLowerCase();
    return words.every((w) => haystack.includes(w));
  });
}
