import { indicatorLevels, levelPointOf, type IndicatorLevels as RegistryLevels, type LevelPoint } from '@kinespec/diagnosis';
import { levelPointOfRow, type IndicatorLevels } from './alarms.js';
import type { Queryable } from './database.js';
import { MAIN_INDICATOR } from './indicators.js';
import type { ModelCache } from './model-cache.js';
import { latestGradedLevels, type GradedLevels, type PointRow } from './store.js';

/*
 * The levels a point's readings are shown and forecast against, from the one grading the analysis made: the alarm
 * and trip levels of the overall velocity stored with the point's newest analysis (analysis-row.ts), and the ISO
 * zone boundaries (and every other indicator's levels) by the indicator registry of @kinespec/diagnosis for the
 * point as the model version of that analysis describes it, the same rule and inputs the analysis graded with. A
 * point with no analysed recording yet, or whose newest analysis stored no levels, falls back to the registry over
 * the point's columns (the current model's copy).
 */

export interface PointLevels {
  /** The registry's inputs: the point in the model version its newest analysis graded against. */
  levelPoint: LevelPoint;
  /** The alarm and trip levels stored with the newest analysis, or null (the registry's then). */
  graded: IndicatorLevels | null;
}

/** The levels of each point as of `to` (its newest analysis taken before then), by point id. */
export async function pointLevels(
  services: { sql: Queryable; models: ModelCache },
  points: readonly PointRow[],
  to: Date,
): Promise<Map<number, PointLevels>> {
  const graded = await latestGradedLevels(services.sql, points.map((p) => p.id), to);
  const out = new Map<number, PointLevels>();
  for (const point of points) {
    const g = graded.get(point.id);
    out.set(point.id, { levelPoint: await gradedLevelPoint(services, point, g), graded: g?.levels ?? null });
  }
  return out;
}

async function gradedLevelPoint(services: { sql: Queryable; models: ModelCache }, point: PointRow, g: GradedLevels | undefined): Promise<LevelPoint> {
  if (g?.modelVersion != null) {
    const model = await services.models.get(services.sql, point.machineId, g.modelVersion);
    const levelPoint = model ? levelPointOf(model, point.pointKey) : null;
    if (levelPoint) return levelPoint;
  }
  return levelPointOfRow(point);
}

/** An indicator's alarm and trip levels and zone boundaries at a point: the stored grading's for the overall velocity. */
export function levelsAt(point: PointRow, levels: PointLevels | undefined, indicator: string): RegistryLevels {
  const registry = indicatorLevels(indicator, levels?.levelPoint ?? levelPointOfRow(point));
  const graded = indicator === MAIN_INDICATOR ? levels?.graded ?? null : null;
  return graded ? { ...registry, alarmLevel: graded.alarmLevel, tripLevel: graded.tripLevel } : registry;
}
