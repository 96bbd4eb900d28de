import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { actorName } from '../auth.js';
import { problem } from '../problems.js';
import { alarmSchema, iso } from '../schemas.js';
import { acknowledgeAlarm, listAlarms, type AlarmRow } from '../store.js';

function alarmBody(a: AlarmRow): z.infer<typeof alarmSchema> {
  return {
    ...a,
    raisedAt: iso(a.raisedAt),
    acknowledgedAt: iso(a.acknowledgedAt),
    clearedAt: iso(a.clearedAt),
    currentAt: iso(a.currentAt),
  };
}

export const alarmRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  app.get('/alarms', {
    config: { permission: 'read' },
    schema: {
      summary: 'Alarms of the site, newest first: open ones (active) or all',
      description:
        'An alarm is raised when an indicator stays at or over its alarm level for two recordings in a row, or reaches its trip level ' +
        '(README, "Alarms"); it clears after two recordings in a row under its clear level. `value` is the value that raised it (or ' +
        'escalated it to trip), `currentValue` the newest value of the same indicator at the point.',
      tags: ['alarms'],
      querystring: z.object({
        state: z.enum(['active', 'all']).default('active'),
        limit: z.coerce.number().int().min(1).max(1000).default(200),
      }),
      response: { 200: z.array(alarmSchema) },
    },
  }, async (request) => {
    const rows = await listAlarms(services.sql, request.apiKey!.siteId, request.query.state, request.query.limit);
    return rows.map(alarmBody);
  });

  app.post('/alarms/:alarmId/acknowledge', {
    config: { permission: 'acknowledge' },
    schema: {
      summary: 'Acknowledge an alarm (records who and when; acknowledging again changes nothing)',
      tags: ['alarms'],
      params: z.object({ alarmId: z.string().max(64) }),
      response: { 200: alarmSchema },
    },
  }, async (request) => {
    const key = request.apiKey!;
    const row = await acknowledgeAlarm(services.sql, key.siteId, request.params.alarmId, actorName(key));
    if (!row) throw problem('not-found', `no alarm '${request.params.alarmId}' on this site`);
    return alarmBody(row);
  });
};
