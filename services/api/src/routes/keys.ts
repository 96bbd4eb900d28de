import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { hashApiKey, newApiKey, roles } from '../auth.js';
import { problem } from '../problems.js';
import { iso } from '../schemas.js';
import { createSite, insertApiKey, listApiKeys, revokeApiKey, type ApiKeyListRow } from '../store.js';

/*
 * Keys of the admin's own site: create, list (with last use), revoke, rotate. A key is shown once, when it is
 * made; the store keeps its SHA-256. Sites: a platform key (KINESPEC_PLATFORM_KEY, off by default) creates a
 * site with its first admin key and sees nothing of any site.
 */

const keySchema = z.object({
  id: z.string(),
  role: z.enum(roles),
  label: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
  replacedBy: z.string().nullable(),
});

const newKeySchema = z.object({ key: z.string(), id: z.string(), role: z.enum(roles), siteId: z.string(), label: z.string() });

function keyBody(k: ApiKeyListRow): z.infer<typeof keySchema> {
  return {
    id: k.id,
    role: k.role as (typeof roles)[number],
    label: k.label,
    createdAt: iso(k.createdAt),
    lastUsedAt: iso(k.lastUsedAt),
    revokedAt: iso(k.revokedAt),
    replacedBy: k.replacedBy,
  };
}

const keyParams = z.object({ keyId: z.string().max(64) });

export const keyRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  const { sql } = services;

  app.post('/keys', {
    config: { permission: 'manage' },
    schema: {
      summary: "Create an API key for the admin's site (the key is shown once; only its hash is kept)",
      tags: ['keys'],
      body: z.object({
        role: z.enum(roles),
        label: z.string().max(200).default(''),
      }),
      response: { 201: newKeySchema },
    },
  }, async (request, reply) => {
    const key = newApiKey();
    const row = await insertApiKey(sql, {
      siteId: request.apiKey!.siteId,
      role: request.body.role,
      label: request.body.label,
      keyHash: hashApiKey(key),
    });
    return reply.code(201).send({ key, id: row.id, role: row.role as (typeof roles)[number], siteId: row.siteId, label: row.label });
  });

  app.get('/keys', {
    config: { permission: 'manage' },
    schema: {
      summary: "The keys of the admin's site, newest first, with when each was last used (to the minute) and whether it is revoked",
      tags: ['keys'],
      response: { 200: z.array(keySchema) },
    },
  }, async (request) => (await listApiKeys(sql, request.apiKey!.siteId)).filter((k) => k.role !== 'platform').map(keyBody));

  app.delete('/keys/:keyId', {
    config: { permission: 'manage' },
    schema: {
      summary: 'Revoke a key of the site: it stops working at once on this replica, within 10 s on the others',
      tags: ['keys'],
      params: keyParams,
      response: { 200: keySchema },
    },
  }, async (request) => {
    const row = await revokeApiKey(sql, request.apiKey!.siteId, request.params.keyId);
    if (!row || row.role === 'platform') throw problem('not-found', `no key '${request.params.keyId}' on this site`);
    services.keys.forget(row.id);
    return keyBody(row);
  });

  app.post('/keys/:keyId/rotate', {
    config: { permission: 'manage' },
    schema: {
      summary: 'Replace a key by a new one with the same role and label (shown once); the old key is revoked',
      tags: ['keys'],
      params: keyParams,
      response: { 201: newKeySchema },
    },
  }, async (request, reply) => {
    const siteId = request.apiKey!.siteId;
    const result = await sql.begin(async (tx) => {
      const [old] = (await listApiKeys(tx, siteId)).filter((k) => k.id === request.params.keyId && k.role !== 'platform');
      if (!old) throw problem('not-found', `no key '${request.params.keyId}' on this site`);
      if (old.revokedAt) throw problem('not-found', `key '${old.id}' is revoked; create a new key instead`);
      const key = newApiKey();
      const row = await insertApiKey(tx, { siteId, role: old.role, label: old.label, keyHash: hashApiKey(key) });
      await revokeApiKey(tx, siteId, old.id, row.id);
      return { key, row, oldId: old.id };
    });
    services.keys.forget(result.oldId);
    return reply.code(201).send({ key: result.key, id: result.row.id, role: result.row.role as (typeof roles)[number], siteId, label: result.row.label });
  });

  app.post('/sites', {
    config: { permission: 'platform' },
    schema: {
      summary: 'Create a site and its first admin key (shown once); platform keys only (KINESPEC_PLATFORM_KEY)',
      tags: ['keys'],
      body: z.object({ name: z.string().trim().min(1).max(200) }),
      response: { 201: z.object({ siteId: z.string(), name: z.string(), adminKey: z.string(), adminKeyId: z.string() }) },
    },
  }, async (request, reply) => {
    const created = await sql.begin(async (tx) => {
      const site = await createSite(tx, request.body.name);
      const key = newApiKey();
      const row = await insertApiKey(tx, { siteId: site.id, role: 'admin', label: 'first admin', keyHash: hashApiKey(key) });
      return { siteId: site.id, name: site.name, adminKey: key, adminKeyId: row.id };
    });
    return reply.code(201).send(created);
  });
};
