import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { pendingMigrations } from '../migrate.js';
import { DATABASE_RETRY_AFTER_S } from '../database-errors.js';
import { problem } from '../problems.js';
import { ping } from '../store.js';

/** Extra readiness conditions of the process (e.g. the demo still seeding); null when ready. */
export type Readiness = () => string | null;

export const healthRoutes: FastifyPluginAsyncZod<{ services: Services; readiness?: Readiness }> = async (app, { services, readiness }) => {
  app.get('/health', {
    schema: {
      summary: 'The process is up',
      tags: ['health'],
      security: [],
      response: { 200: z.object({ status: z.literal('ok') }) },
    },
  }, async () => ({ status: 'ok' as const }));

  app.get('/ready', {
    schema: {
      summary: 'The database is reachable and its migrations are current',
      tags: ['health'],
      security: [],
      response: { 200: z.object({ status: z.literal('ready') }) },
    },
  }, async () => {
    const away = () => problem('service-unavailable', 'the database does not answer', { headers: { 'retry-after': String(DATABASE_RETRY_AFTER_S) } });
    let pending: string[];
    try {
      await ping(services.sql);
      pending = await pendingMigrations(services.sql);
    } catch {
      // any failure of these two reads means "not ready", never a 500
      throw away();
    }
    if (pending.length > 0) throw problem('service-unavailable', `migrations not applied yet: ${pending.join(', ')}`);
    const waiting = readiness?.() ?? null;
    if (waiting) throw problem('service-unavailable', waiting);
    return { status: 'ready' as const };
  });
};
