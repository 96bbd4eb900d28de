import { createHash, randomBytes } from 'node:crypto';
import type { FastifyRequest } from 'fastify';
import type { Queryable } from './database.js';
import { problem } from './problems.js';
import { findApiKey, type ApiKeyRow, type Role } from './store.js';

/*
 * API keys: random 32-byte secrets shown once; the store keeps only their SHA-256. Each key belongs to
 * one site and has one role. What each role may do (the coordination contract):
 *   logger   write recordings to its site's points, and nothing else
 *   engineer read everything of its site, acknowledge alarms, validate models, upload recordings
 *   admin    everything an engineer may, plus machine models, re-analysis and keys
 * A key never sees another site: lookups are by (site, id), so another site's data answers 404.
 */

export const roles = ['logger', 'engineer', 'admin'] as const satisfies readonly Role[];

export type Permission = 'upload' | 'read' | 'acknowledge' | 'correct' | 'manage' | 'site';

const allowed: Record<Permission, readonly Role[]> = {
  site: ['logger', 'engineer', 'admin'],
  upload: ['logger', 'engineer', 'admin'],
  read: ['engineer', 'admin'],
  acknowledge: ['engineer', 'admin'],
  correct: ['engineer', 'admin'],
  manage: ['admin'],
};

const KEY_PREFIX = 'ksk_';

/** A new key: "ksk_" and 43 base64url characters (256 random bits). */
export function newApiKey(): string {
  return KEY_PREFIX + randomBytes(32).toString('base64url');
}

export function hashApiKey(key: string): Buffer {
  return createHash('sha256').update(key, 'utf8').digest();
}

/** The bearer token of a request, or null. */
export function bearerToken(request: FastifyRequest): string | null {
  const header = request.headers.authorization;
  if (typeof header !== 'string') return null;
  const m = /^Bearer\s+(\S+)\s*$/i.exec(header);
  return m ? m[1]! : null;
}

/** The key behind the request, checked against the store; throws 401 when missing or unknown. */
export async function authenticate(sql: Queryable, request: FastifyRequest): Promise<ApiKeyRow> {
  const token = bearerToken(request);
  if (token === null) {
    throw problem('unauthorized', 'send an API key as "Authorization: Bearer <key>"', { headers: { 'www-authenticate': 'Bearer' } });
  }
  const key = await findApiKey(sql, hashApiKey(token));
  if (!key) throw problem('unauthorized', 'the API key is not known or was revoked', { headers: { 'www-authenticate': 'Bearer error="invalid_token"' } });
  return key;
}

/** Throws 403 unless the key's role has the permission. */
export function authorise(key: ApiKeyRow, permission: Permission): void {
  if (!allowed[permission].includes(key.role)) {
    throw problem('forbidden', `a ${key.role} key may not ${describe(permission)}; ask for a key with role ${allowed[permission].join(' or ')}`);
  }
}

function describe(permission: Permission): string {
  switch (permission) {
    case 'upload': return 'upload recordings';
    case 'read': return 'read machines, recordings, trends or alarms';
    case 'acknowledge': return 'acknowledge alarms';
    case 'correct': return 'delete or move recordings';
    case 'manage': return 'manage machines, models or keys';
    case 'site': return 'read the site';
  }
}

/** Who did something, as recorded beside an acknowledgement: the key's label, else its id. */
export function actorName(key: ApiKeyRow): string {
  return key.label ? `${key.label} (${key.id})` : key.id;
}
