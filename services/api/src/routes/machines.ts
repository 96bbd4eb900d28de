import { parseMachineModel } from '@kinespec/kinematics';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { FORECAST_HISTORY_MS, forecastTrend, levelsToForecast, soonest } from '../forecasts.js';
import { MAIN_INDICATOR } from '../indicators.js';
import { levelsAt, pointLevels, type PointLevels } from '../point-levels.js';
import { parseModelText, storeMachineModel } from '../machine-models.js';
import { problem } from '../problems.js';
import { awaitReanalysis, startReanalysis } from '../reanalysis.js';
import { hypothesisRefSchema, idParam, iso, isoTime, parseTime, preferredWaitMs, zoneSchema } from '../schemas.js';
import {
  countOpenAlarmsByMachine,
  getReanalysis,
  type ReanalysisRow,
  findMachine,
  getModelVersion,
  latestPerPoint,
  listMachineRows,
  listModelVersions,
  listPoints,
  listSitePoints,
  siteSeries,
  weeklySparklines,
  type PointRow,
} from '../store.js';

const MODEL_TYPES = ['application/json', 'application/yaml', 'application/x-yaml', 'text/yaml', 'text/x-yaml', 'text/plain'];
const ZONE_ORDER = ['A', 'B', 'C', 'D'];
const SPARKLINE_WEEKS = 12;

const pointSchema = z.object({
  id: z.string(),
  quantity: z.string(),
  unit: z.string().optional(),
  near: z.string().optional(),
  shaft: z.string().optional(),
  direction: z.string().optional(),
  alarmLevel: z.number().nullable().optional(),
  tripLevel: z.number().nullable().optional(),
});

const machineSummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  modelVersion: z.number().nullable(),
  worstZone: zoneSchema,
  topHypothesis: hypothesisRefSchema.nullable(),
  lastMeasuredAt: z.string().nullable(),
  activeAlarms: z.number(),
  mainIndicator: z.object({
    indicator: z.string(),
    unit: z.string(),
    sparkline: z.array(z.object({ start: z.string(), mean: z.number() })),
  }),
  soonestCrossing: z.object({
    pointId: z.string(),
    indicator: z.string(),
    unit: z.string(),
    level: z.enum(['zone B', 'zone C', 'zone D', 'alarm', 'trip', 'value']),
    threshold: z.number(),
    crossingAt: z.string(),
    remainingS: z.number(),
    lowS: z.number().nullable(),
    highS: z.number().nullable(),
  }).nullable().describe("The soonest crossing of a zone boundary, alarm or trip level foreseen for the main indicator at any of the machine's vibration points (GET /trends: forecast)"),
});

/** The soonest crossing foreseen for the main indicator over a machine's points (the fleet's column), or null. */
function soonestCrossing(points: readonly PointRow[], series: Map<number, Array<{ recordedAt: Date; value: number }>>, levels: Map<number, PointLevels>) {
  let best: { point: PointRow; f: NonNullable<ReturnType<typeof soonest>> } | null = null;
  for (const point of points) {
    const values = series.get(point.id);
    if (!values) continue;
    const f = soonest(forecastTrend(values, levelsToForecast(MAIN_INDICATOR, levelsAt(point, levels.get(point.id), MAIN_INDICATOR), null)));
    if (f && (best === null || f.remainingS! < best.f.remainingS!)) best = { point, f };
  }
  if (!best) return null;
  return {
    pointId: best.point.pointKey,
    indicator: MAIN_INDICATOR,
    unit: 'mm/s',
    level: best.f.level,
    threshold: best.f.threshold,
    crossingAt: best.f.crossingAt!,
    remainingS: best.f.remainingS!,
    lowS: best.f.lowS,
    highS: best.f.highS,
  };
}

function optional<T>(v: T | null): T | undefined {
  return v === null ? undefined : v;
}

export const machineRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  const { sql } = services;

  // model files are read as text (JSON or YAML) and handed to the kinematics validator as they are
  app.removeContentTypeParser(['application/json', 'text/plain']);
  app.addContentTypeParser(MODEL_TYPES, { parseAs: 'string', bodyLimit: 4 * 1024 * 1024 }, (_request, body, done) => done(null, body));

  async function machineOf(siteId: string, machineKey: string) {
    const machine = await findMachine(sql, siteId, machineKey);
    if (!machine) throw problem('not-found', `no machine '${machineKey}' on this site`);
    return machine;
  }

  app.get('/machines', {
    config: { permission: 'read' },
    schema: {
      summary: 'Every machine of the site with its worst zone, best hypothesis, alarms and a weekly sparkline',
      tags: ['machines'],
      response: { 200: z.array(machineSummarySchema) },
    },
  }, async (request) => {
    const siteId = request.apiKey!.siteId;
    const from = new Date(Date.now() - SPARKLINE_WEEKS * 7 * 86_400_000);
    const now = new Date();
    const [machines, latest, alarms, sparks, points, series] = await Promise.all([
      listMachineRows(sql, siteId),
      latestPerPoint(sql, siteId),
      countOpenAlarmsByMachine(sql, siteId),
      weeklySparklines(sql, { siteId, indicator: MAIN_INDICATOR, from }),
      listSitePoints(sql, siteId),
      siteSeries(sql, { siteId, indicator: MAIN_INDICATOR, from: new Date(now.getTime() - FORECAST_HISTORY_MS), to: now }),
    ]);
    // the levels each point's newest analysis graded with, for the points with a series to forecast
    const levels = await pointLevels(services, points.filter((p) => series.has(p.id)), now);
    const soonestOf = (machineId: number) => soonestCrossing(points.filter((p) => p.machineId === machineId), series, levels);
    return machines.map((m) => {
      const mine = latest.filter((l) => l.machineId === m.id);
      const zones = mine.map((l) => l.zone).filter((z): z is 'A' | 'B' | 'C' | 'D' => z !== null);
      const worstZone = zones.length ? zones.reduce((a, b) => (ZONE_ORDER.indexOf(b) > ZONE_ORDER.indexOf(a) ? b : a)) : null;
      const hyps = mine.map((l) => l.topHypothesis).filter((h) => h !== null);
      const top = hyps.length ? hyps.reduce((a, b) => (b.score > a.score ? b : a)) : null;
      const last = mine.reduce<Date | null>((a, l) => (a === null || l.recordedAt > a ? l.recordedAt : a), null);
      return {
        id: m.machineKey,
        name: m.name,
        modelVersion: m.currentModelVersion,
        worstZone,
        topHypothesis: top ? { fault: top.fault, component: top.component, score: top.score } : null,
        lastMeasuredAt: iso(last),
        activeAlarms: alarms.get(m.id) ?? 0,
        mainIndicator: {
          indicator: MAIN_INDICATOR,
          unit: 'mm/s',
          sparkline: sparks.filter((s) => s.machineId === m.id).map((s) => ({ start: iso(s.start), mean: s.mean })),
        },
        soonestCrossing: soonestOf(m.id),
      };
    });
  });

  app.get('/machines/:machineId', {
    config: { permission: 'read' },
    schema: {
      summary: 'A machine: its current model version, the model, its points with alarm and trip levels',
      tags: ['machines'],
      params: z.object({ machineId: idParam }),
      response: {
        200: z.object({
          id: z.string(),
          name: z.string(),
          modelVersion: z.number().nullable(),
          model: z.unknown(),
          modelVersions: z.array(z.object({ version: z.number(), validFrom: z.string(), createdAt: z.string() })),
          points: z.array(pointSchema),
        }),
      },
    },
  }, async (request) => {
    const machine = await machineOf(request.apiKey!.siteId, request.params.machineId);
    const [points, versions, model] = await Promise.all([
      listPoints(sql, machine.id),
      listModelVersions(sql, machine.id),
      machine.currentModelVersion === null ? null : getModelVersion(sql, machine.id, machine.currentModelVersion),
    ]);
    // each point's alarm and trip levels as its newest analysis graded them (the registry's before any analysis)
    const levels = await pointLevels(services, points, new Date(Date.now() + 1));
    return {
      id: machine.machineKey,
      name: machine.name,
      modelVersion: machine.currentModelVersion,
      model: model?.model ?? null,
      modelVersions: versions.map((v) => ({ version: v.version, validFrom: iso(v.validFrom), createdAt: iso(v.createdAt) })),
      points: points.map((p) => {
        const main = levelsAt(p, levels.get(p.id), MAIN_INDICATOR);
        return {
          id: p.pointKey,
          quantity: p.quantity,
          unit: optional(p.unit),
          near: optional(p.near),
          shaft: optional(p.shaft),
          direction: optional(p.direction),
          alarmLevel: main.alarmLevel,
          tripLevel: main.tripLevel,
        };
      }),
    };
  });

  app.put('/machines/:machineId/model', {
    config: { permission: 'manage' },
    schema: {
      summary: 'Store a new version of the machine model (JSON or YAML); creates the machine on its first version',
      description:
        "The body is a machine model file. Invalid models get 422 with every validator problem in `errors` ({ path, code, message }). " +
        'Optional `validFrom` (ISO time): recordings taken from then on are analysed against this version (default: now).',
      tags: ['machines'],
      params: z.object({ machineId: idParam }),
      querystring: z.object({ validFrom: isoTime.optional() }),
      rawBody: { consumes: MODEL_TYPES, description: 'The machine model file, JSON or YAML' },
      response: { 200: z.object({ machineId: z.string(), version: z.number() }) },
    } as Record<string, unknown>,
  }, async (request) => {
    const body = request.body;
    if (typeof body !== 'string' || body.trim() === '') throw problem('bad-request', 'send the machine model file as the body (JSON or YAML)');
    const query = request.query as { validFrom?: string };
    let validFrom: Date | undefined;
    if (query.validFrom !== undefined) validFrom = parseTime(query.validFrom);
    const model = parseModelText(body, request.headers['content-type']);
    const params = request.params as { machineId: string };
    return storeMachineModel(sql, {
      siteId: request.apiKey!.siteId,
      machineKey: params.machineId,
      model,
      sourceText: body,
      createdBy: request.apiKey!.id,
      ...(validFrom ? { validFrom } : {}),
    });
  });

  app.post('/models/validate', {
    config: { permission: 'read' },
    schema: {
      summary: 'Validate a machine model file without storing it; every problem with its JSON path',
      tags: ['machines'],
      rawBody: { consumes: MODEL_TYPES, description: 'The machine model file, JSON or YAML' },
      response: {
        200: z.object({ ok: z.boolean(), problems: z.array(z.object({ path: z.string(), code: z.string(), message: z.string() })) }),
      },
    } as Record<string, unknown>,
  }, async (request) => {
    const body = typeof request.body === 'string' ? request.body : '';
    const type = request.headers['content-type']?.split(';')[0]?.trim().toLowerCase();
    const result = parseMachineModel(body, type === 'application/json' ? 'json' : type && /yaml/.test(type) ? 'yaml' : undefined);
    return result.ok ? { ok: true, problems: [] } : { ok: false, problems: result.problems };
  });

  const reanalysisSchema = z.object({
    reanalysisId: z.string(),
    machineId: z.string(),
    modelVersion: z.number(),
    total: z.number(),
    analysed: z.number(),
    failed: z.array(z.object({ recordingId: z.string(), reason: z.string() })),
    createdAt: z.string(),
    finishedAt: z.string().nullable(),
  });
  const reanalysisBody = (r: ReanalysisRow): z.infer<typeof reanalysisSchema> => ({
    reanalysisId: r.id,
    machineId: r.machineKey,
    modelVersion: r.modelVersion,
    total: r.total,
    analysed: r.analysed,
    failed: r.failed,
    createdAt: iso(r.createdAt),
    finishedAt: iso(r.finishedAt),
  });

  app.post('/machines/:machineId/reanalyse', {
    config: { permission: 'manage' },
    schema: {
      summary: "Analyse the machine's stored recordings again against its current model version, as queued jobs; earlier analyses are kept",
      description:
        'One job per recording. Answers 200 with the outcome when every job is done within the upload wait (or Prefer: wait=N), ' +
        'else 202 with Location /api/v1/reanalyses/{id}, which gives the progress.',
      tags: ['machines'],
      params: z.object({ machineId: idParam }),
      response: { 200: reanalysisSchema, 202: reanalysisSchema },
    },
  }, async (request, reply) => {
    const machine = await machineOf(request.apiKey!.siteId, request.params.machineId);
    const id = await startReanalysis(services, machine, request.apiKey!.id);
    const row = await awaitReanalysis(services, request.apiKey!.siteId, id, preferredWaitMs(request.headers['prefer'], services.config.uploadWaitMs ?? 5_000));
    if (row.finishedAt === null) reply.code(202).header('location', `/api/v1/reanalyses/${id}`).header('retry-after', '1');
    return reanalysisBody(row);
  });

  app.get('/reanalyses/:reanalysisId', {
    config: { permission: 'read' },
    schema: {
      summary: "A re-analysis's progress: recordings analysed again and those that could not be, with the reason",
      tags: ['machines'],
      params: z.object({ reanalysisId: z.string().max(64) }),
      response: { 200: reanalysisSchema },
    },
  }, async (request) => {
    const row = await getReanalysis(sql, request.apiKey!.siteId, request.params.reanalysisId);
    if (!row) throw problem('not-found', `no re-analysis '${request.params.reanalysisId}' on this site`);
    return reanalysisBody(row);
  });
};
