import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { problem } from '../problems.js';
import { getSite } from '../store.js';

export const siteRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  app.get('/site', {
    config: { permission: 'site' },
    schema: {
      summary: "The key's site, and the key's role",
      description: 'While the demo site is still being seeded in the background, `demo` says how far it is.',
      tags: ['site'],
      response: {
        200: z.object({
          id: z.string(),
          name: z.string(),
          role: z.enum(['logger', 'engineer', 'admin']),
          demo: z
            .object({ state: z.enum(['seeding', 'done', 'failed']), recordingsDone: z.number(), recordingsTotal: z.number(), error: z.string().optional() })
            .nullable(),
        }),
      },
    },
  }, async (request) => {
    const key = request.apiKey!;
    const site = await getSite(services.sql, key.siteId);
    if (!site) throw problem('not-found', 'the site of this key no longer exists');
    return { ...site, role: key.role as 'logger' | 'engineer' | 'admin', demo: services.demoStatus() };
  });
};
