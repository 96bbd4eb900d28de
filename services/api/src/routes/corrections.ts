import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { deleteRecording, moveRecording } from '../corrections.js';
import { problem } from '../problems.js';
import { analysisSummarySchema, idParam, iso, isoTime, parseTime } from '../schemas.js';
import { listAuditEntries, type AuditEntry } from '../store.js';

/*
 * Corrections of stored recordings (an engineer's or admin's key): delete one uploaded by mistake, move one to
 * the point or time it belongs to; and the audit log of both. Trends and alarms follow each change
 * (corrections.ts).
 */

const reason = z.string().max(500).default('').describe('Why: kept in the audit log');

const identitySchema = z.object({
  machineId: z.string(),
  pointId: z.string(),
  recordedAt: z.string(),
  contentSha256: z.string(),
  sourceFormat: z.string(),
  sampleCount: z.number(),
  sampleRateHz: z.number(),
  zone: z.string().nullable(),
  velocityRmsMmPerS: z.number().nullable(),
});

export const auditEntrySchema = z.object({
  id: z.string(),
  recordingId: z.string(),
  action: z.enum(['delete', 'move']),
  at: z.string(),
  by: z.string().describe("The key's label and id"),
  reason: z.string(),
  before: identitySchema,
  after: z.object({ machineId: z.string(), pointId: z.string(), recordedAt: z.string() }).nullable(),
});

function auditBody(e: AuditEntry): z.infer<typeof auditEntrySchema> {
  return { ...e, at: iso(new Date(e.at)) };
}

export const correctionRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  app.delete('/recordings/:recordingId', {
    config: { permission: 'correct' },
    schema: {
      summary: 'Delete a recording uploaded by mistake, with its analyses and trend values; alarms follow the newest recording left',
      description: 'The deletion is kept in the audit log (GET /api/v1/audit): who, when, which recording (point, time, content hash) and why.',
      tags: ['corrections'],
      params: z.object({ recordingId: z.string().max(64) }),
      querystring: z.object({ reason }),
      body: z.object({ reason }).nullish(),
      response: { 200: z.object({ deleted: z.literal(true), audit: auditEntrySchema }) },
    },
  }, async (request) => {
    const why = request.body?.reason || request.query.reason;
    const audit = await deleteRecording(services, request.apiKey!, request.params.recordingId, why);
    return { deleted: true as const, audit: auditBody(audit) };
  });

  app.patch('/recordings/:recordingId', {
    config: { permission: 'correct' },
    schema: {
      summary: 'Move a recording to another point (of any machine of the site) or another time; it is analysed again there',
      description: 'Give `pointId` (and `machineId` for another machine) and/or `recordedAt`. The trends of both points and days and the alarms of both points follow; the move is kept in the audit log.',
      tags: ['corrections'],
      params: z.object({ recordingId: z.string().max(64) }),
      body: z.object({
        machineId: idParam.optional(),
        pointId: idParam.optional(),
        recordedAt: isoTime.optional().describe('When the recording was really taken'),
        reason,
      }),
      response: { 200: z.object({ recordingId: z.string(), audit: auditEntrySchema, analysis: analysisSummarySchema }) },
    },
  }, async (request) => {
    const body = request.body;
    if (body.machineId === undefined && body.pointId === undefined && body.recordedAt === undefined) {
      throw problem('validation-failed', 'body: give pointId (and machineId for another machine) or recordedAt', { errors: [{ path: 'body', message: 'nothing to change' }] });
    }
    let recordedAt: Date | undefined;
    if (body.recordedAt !== undefined) {
      recordedAt = parseTime(body.recordedAt);
      if (recordedAt.getTime() > Date.now() + 86_400_000) {
        throw problem('validation-failed', 'body.recordedAt: lies more than a day in the future', { errors: [{ path: 'body.recordedAt', message: 'lies more than a day in the future' }] });
      }
    }
    const result = await moveRecording(services, request.apiKey!, request.params.recordingId, {
      ...(body.machineId !== undefined ? { machineId: body.machineId } : {}),
      ...(body.pointId !== undefined ? { pointId: body.pointId } : {}),
      ...(recordedAt !== undefined ? { recordedAt } : {}),
      reason: body.reason,
    });
    return { recordingId: request.params.recordingId, audit: auditBody(result.audit), analysis: result.analysis };
  });

  app.get('/audit', {
    config: { permission: 'read' },
    schema: {
      summary: 'The audit log of corrections (deleted and moved recordings), newest first',
      tags: ['corrections'],
      querystring: z.object({
        machine: idParam.optional().describe('Only corrections that took a recording from or to this machine'),
        recording: z.string().max(64).optional(),
        limit: z.coerce.number().int().min(1).max(1000).default(100),
      }),
      response: { 200: z.array(auditEntrySchema) },
    },
  }, async (request) => {
    const q = request.query;
    const rows = await listAuditEntries(services.sql, request.apiKey!.siteId, {
      ...(q.machine !== undefined ? { machineKey: q.machine } : {}),
      ...(q.recording !== undefined ? { recordingId: q.recording } : {}),
      limit: q.limit,
    });
    return rows.map(auditBody);
  });
};
