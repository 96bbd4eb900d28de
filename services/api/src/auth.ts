import { createHash, randomBytes } from 'node:crypto';
import type { FastifyRequest } from 'fastify';
import type { Queryable } from './database.js';
import { problem } from './problems.js';
import { findApiKey, touchApiKey, type ApiKeyRow, type Role } from './store.js';

/*
 * API keys: random 32-byte secrets shown once; the store keeps only their SHA-256. Each key belongs to
 * one site and has one role. What each role may do (the coordination contract):
 *   logger   write recordings to its site's points, and nothing else
 *   engineer read everything of its site, acknowledge alarms, validate models, upload recordings
 *   admin    everything an engineer may, plus machine models, re-analysis and keys
 * A key never sees another site: lookups are by (site, id), so another site's data answers 404.
 */

export const roles = ['logger', 'engineer', 'admin'] as const satisfies readonly Role[];

/** Every role a key can hold: the site roles, and 'platform' (creates sites, sees none; only with KINESPEC_PLATFORM_KEY). */
export const allRoles = [...roles, 'platform'] as const satisfies readonly Role[];

export type Permission = 'upload' | 'read' | 'acknowledge' | 'correct' | 'manage' | 'site' | 'platform';

/** What each permission allows, by role: the one table routes, tests and the README read. */
export const allowed: Record<Permission, readonly Role[]> = {
  site: ['logger', 'engineer', 'admin'],
  upload: ['logger', 'engineer', 'admin'],
  read: ['engineer', 'admin'],
  acknowledge: ['engineer', 'admin'],
  correct: ['engineer', 'admin'],
  manage: ['admin'],
  platform: ['platform'],
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

/**
 * Keys found valid lately, by the base64url of their hash, so that a busy logger does not cost a database
 * look-up per request. An entry lives KEY_CACHE_TTL_MS: a key revoked through this process is dropped at
 * once (forget), one revoked through another replica stops working there within that time. Unknown keys
 * are not remembered (random tokens would only fill the map); the per-address rate limit bounds them.
 */
export const KEY_CACHE_TTL_MS = 10_000;
/** How long a key seen valid is still told apart from a guess when choosing its rate-limit budget. */
const KEY_SEEN_MS = 3_600_000;
const KEY_CACHE_MAX = 10_000;

export class ApiKeyCache {
  private readonly entries = new Map<string, { row: ApiKeyRow; checkedAt: number }>();

  /** The key row of a token, from the cache or the store; null when unknown or revoked. */
  async resolve(sql: Queryable, token: string): Promise<ApiKeyRow | null> {
    const hash = hashApiKey(token);
    const id = hash.toString('base64url');
    const hit = this.entries.get(id);
    const now = Date.now();
    if (hit && now - hit.checkedAt < KEY_CACHE_TTL_MS) return hit.row;
    const row = await findApiKey(sql, hash);
    this.entries.delete(id);
    if (row) {
      // last-used time: at most one write a minute per key (touchApiKey), never holding up the request
      touchApiKey(sql, row.id).catch(() => {});
      if (this.entries.size >= KEY_CACHE_MAX) this.entries.delete(this.entries.keys().next().value!);
      this.entries.set(id, { row, checkedAt: now });
    }
    return row;
  }

  /**
   * The key row of a token this process found valid within the last hour, without asking the store: enough to
   * give a working logger its own rate-limit budget while its address is flooded with guesses, never to
   * authenticate (resolve does that).
   */
  seenValid(token: string): ApiKeyRow | null {
    const hit = this.entries.get(hashApiKey(token).toString('base64url'));
    return hit && Date.now() - hit.checkedAt < KEY_SEEN_MS ? hit.row : null;
  }

  /** Drops every cached entry of a key id (revoked or rotated here). */
  forget(keyId: string): void {
    for (const [id, e] of this.entries) if (e.row.id === keyId) this.entries.delete(id);
  }
}

const noKeyProblem = () => problem('unauthorized', 'send an API key as "Authorization: Bearer <key>"', { headers: { 'www-authenticate': 'Bearer' } });
const unknownKeyProblem = () =>
  problem('unauthorized', 'the API key is not known or was revoked', { headers: { 'www-authenticate': 'Bearer error="invalid_token"' } });

/** The key behind the request, checked against the store (through `cache` when given); throws 401 when missing or unknown. */
export async function authenticate(sql: Queryable, request: FastifyRequest, cache?: ApiKeyCache): Promise<ApiKeyRow> {
  const token = bearerToken(request);
  if (token === null) throw noKeyProblem();
  const key = cache ? await cache.resolve(sql, token) : await findApiKey(sql, hashApiKey(token));
  if (!key) throw unknownKeyProblem();
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
    case 'platform': return 'create sites';
  }
}

/** Who did something, as recorded beside an acknowledgement: the key's label, else its id. */
export function actorName(key: ApiKeyRow): string {
  return key.label ? `${key.label} (${key.id})` : key.id;
}
