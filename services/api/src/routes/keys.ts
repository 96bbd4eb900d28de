import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { hashApiKey, newApiKey, roles } from '../auth.js';
import { insertApiKey } from '../store.js';

export const keyRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  app.post('/keys', {
    config: { permission: 'manage' },
    schema: {
      summary: "Create an API key for the admin's site (the key is shown once; only its hash is kept)",
      tags: ['keys'],
      body: z.object({
        role: z.enum(roles),
        label: z.string().max(200).default(''),
      }),
      response: {
        201: z.object({ key: z.string(), id: z.string(), role: z.enum(roles), siteId: z.string(), label: z.string() }),
      },
    },
  }, async (request, reply) => {
    const key = newApiKey();
    const row = await insertApiKey(services.sql, {
      siteId: request.apiKey!.siteId,
      role: request.body.role,
      label: request.body.label,
      keyHash: hashApiKey(key),
    });
    return reply.code(201).send({ key, id: row.id, role: row.role, siteId: row.siteId, label: row.label });
  });
};
