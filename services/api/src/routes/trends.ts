import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { alarmState } from '../alarms.js';
import type { Services } from '../app.js';
import { FORECAST_HISTORY_MS, forecastTrend, levelsToForecast } from '../forecasts.js';
import { indicatorUnit, INDICATOR_PATTERN, MAIN_INDICATOR } from '../indicators.js';
import { levelsAt, pointLevels } from '../point-levels.js';
import { problem } from '../problems.js';
import { idParam, iso, isoTime, parseTime, zoneSchema } from '../schemas.js';
import { findMachine, findPoint, fleetRanking, listIndicators, listPoints, trendBuckets, trendSeries } from '../store.js';

const indicatorParam = z.string().regex(INDICATOR_PATTERN, 'must be an indicator name such as velocity_rms_mm_per_s or score:bearing-outer-race:input-de');

const YEAR_MS = 366 * 86_400_000;

export const trendRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  const { sql } = services;

  async function machineOf(siteId: string, machineKey: string) {
    const machine = await findMachine(sql, siteId, machineKey);
    if (!machine) throw problem('not-found', `no machine '${machineKey}' on this site`);
    return machine;
  }

  app.get('/trends', {
    config: { permission: 'read' },
    schema: {
      summary: 'One indicator of one point, bucketed by UTC day, ISO week (Monday to Sunday) or calendar month',
      description:
        'Each bucket holds the count, min, mean, max and last value of the recordings taken in it (recordedAt in [from, to)). ' +
        "`zone` is the ISO zone of the bucket's largest overall velocity and `alarmState` the alarm state that value reaches " +
        '(normal, alarm, trip; null where the indicator has no levels). `forecast` says when the lasting level of the series ' +
        "(every value of the year before `to`) is foreseen to cross each of the point's zone boundaries, its alarm and trip " +
        'levels and `threshold` when given (packages/forecast/README.md): `status` crossing, crossed or no-crossing, the median ' +
        '`remainingS` from the last value with `lowS`/`highS` (10 % and 90 %), `crossingAt`, and the `onsetAt` of the current rise.',
      tags: ['trends'],
      querystring: z.object({
        machine: idParam,
        point: idParam,
        indicator: indicatorParam.default(MAIN_INDICATOR),
        bucket: z.enum(['day', 'week', 'month']).default('week'),
        from: isoTime.optional().describe('Start, inclusive (default: one year before `to`)'),
        to: isoTime.optional().describe('End, exclusive (default: now)'),
        threshold: z.coerce.number().finite().optional().describe("A level to forecast the crossing of, in the indicator's unit"),
      }),
      response: {
        200: z.object({
          machineId: z.string(),
          pointId: z.string(),
          indicator: z.string(),
          unit: z.string(),
          bucket: z.enum(['day', 'week', 'month']),
          from: z.string(),
          to: z.string(),
          zoneBoundaries: z.object({ ab: z.number(), bc: z.number(), cd: z.number() }).nullable(),
          alarmLevel: z.number().nullable(),
          tripLevel: z.number().nullable(),
          buckets: z.array(z.object({
            start: z.string(),
            count: z.number(),
            min: z.number(),
            mean: z.number(),
            max: z.number(),
            last: z.number(),
            zone: zoneSchema,
            alarmState: z.enum(['normal', 'alarm', 'trip']).nullable(),
          })),
          forecast: z.object({
            method: z.string(),
            onsetAt: z.string().nullable(),
            level: z.number(),
            values: z.number(),
            forecasts: z.array(z.object({
              level: z.enum(['zone B', 'zone C', 'zone D', 'alarm', 'trip', 'value']),
              threshold: z.number(),
              status: z.enum(['crossing', 'crossed', 'no-crossing']),
              reason: z.string(),
              crossingAt: z.string().nullable(),
              remainingS: z.number().nullable(),
              lowS: z.number().nullable(),
              highS: z.number().nullable(),
            })),
          }).nullable(),
        }),
      },
    },
  }, async (request) => {
    const q = request.query;
    const machine = await machineOf(request.apiKey!.siteId, q.machine);
    const point = await findPoint(sql, machine.id, q.point);
    if (!point) throw problem('not-found', `machine '${q.machine}' has no point '${q.point}'`);
    const to = q.to ? parseTime(q.to) : new Date(Date.now() + 1);
    const from = q.from ? parseTime(q.from) : new Date(to.getTime() - YEAR_MS);
    if (!(from < to)) {
      throw problem('validation-failed', 'query.from: must lie before query.to', { errors: [{ path: 'query.from', message: 'must lie before query.to' }] });
    }
    const velocity = q.indicator === MAIN_INDICATOR;
    // the overall velocity is graded once, by the analysis: each bucket reads the zone and alarm state stored
    // with the analysis of its largest value; the levels and zone boundaries are those of the newest analysis
    // (point-levels.ts), and the forecast is made against the same
    const [rows, series, levelsOfPoint] = await Promise.all([
      trendBuckets(sql, { pointId: point.id, indicator: q.indicator, bucket: q.bucket, from, to, graded: velocity }),
      trendSeries(sql, { pointId: point.id, indicator: q.indicator, from: new Date(to.getTime() - FORECAST_HISTORY_MS), to }),
      pointLevels(services, [point], to),
    ]);
    const levels = levelsAt(point, levelsOfPoint.get(point.id), q.indicator);
    return {
      machineId: machine.machineKey,
      pointId: point.pointKey,
      indicator: q.indicator,
      unit: indicatorUnit(q.indicator, point.unit),
      bucket: q.bucket,
      from: iso(from),
      to: iso(to),
      zoneBoundaries: levels.zoneBoundaries,
      alarmLevel: levels.alarmLevel,
      tripLevel: levels.tripLevel,
      buckets: rows.map((b) => ({
        start: iso(b.start),
        count: b.count,
        min: b.min,
        mean: b.mean,
        max: b.max,
        last: b.last,
        zone: velocity ? b.maxZone ?? null : null,
        alarmState: velocity ? b.maxAlarmState ?? null : alarmState(b.max, levels),
      })),
      forecast: forecastTrend(series, levelsToForecast(q.indicator, levels, q.threshold ?? null)),
    };
  });

  app.get('/indicators', {
    config: { permission: 'read' },
    schema: {
      summary: 'The indicators trended at a point (or at every point of a machine) and how many values each has',
      tags: ['trends'],
      querystring: z.object({ machine: idParam, point: idParam.optional() }),
      response: {
        200: z.array(z.object({ pointId: z.string(), indicator: z.string(), unit: z.string(), count: z.number() })),
      },
    },
  }, async (request) => {
    const machine = await machineOf(request.apiKey!.siteId, request.query.machine);
    const points = await listPoints(sql, machine.id, true);
    let pointId: number | null = null;
    if (request.query.point !== undefined) {
      const point = points.find((p) => p.pointKey === request.query.point);
      if (!point) throw problem('not-found', `machine '${request.query.machine}' has no point '${request.query.point}'`);
      pointId = point.id;
    }
    const rows = await listIndicators(sql, { machineId: machine.id, pointId });
    const byId = new Map(points.map((p) => [p.id, p]));
    return rows.map((r) => {
      const p = byId.get(r.pointId)!;
      return { pointId: p.pointKey, indicator: r.indicator, unit: indicatorUnit(r.indicator, p.unit), count: r.count };
    });
  });

  app.get('/fleet/ranking', {
    config: { permission: 'read' },
    schema: {
      summary: 'Machines whose indicator rose most over the last N weeks, biggest relative rise first',
      description:
        'For each machine, the point whose mean over the last seven days (ending today, UTC) rose most against the ' +
        'mean over the seven days ending N weeks earlier. `risePercent` is null when the earlier mean is 0.',
      tags: ['trends'],
      querystring: z.object({
        weeks: z.coerce.number().int().min(1).max(104).default(4),
        limit: z.coerce.number().int().min(1).max(1000).default(20),
        indicator: indicatorParam.default(MAIN_INDICATOR),
        asOf: isoTime.optional().describe('Rank as of this time instead of now'),
      }),
      response: {
        200: z.array(z.object({
          machineId: z.string(),
          pointId: z.string(),
          indicator: z.string(),
          before: z.number(),
          after: z.number(),
          rise: z.number(),
          risePercent: z.number().nullable(),
        })),
      },
    },
  }, async (request) => {
    const q = request.query;
    const rows = await fleetRanking(sql, {
      siteId: request.apiKey!.siteId,
      indicators: [q.indicator],
      weeks: q.weeks,
      asOf: q.asOf ? parseTime(q.asOf) : new Date(),
      limit: q.limit,
    });
    return rows.map((r) => ({
      machineId: r.machineKey,
      pointId: r.pointKey,
      indicator: r.indicator,
      before: r.before,
      after: r.after,
      rise: r.rise,
      risePercent: r.risePercent,
    }));
  });
};
