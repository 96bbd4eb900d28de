import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import postgres from 'postgres';
import type { FastifyInstance } from 'fastify';
import { buildApp } from '../../services/api/src/app.js';
import { hashApiKey, newApiKey } from '../../services/api/src/auth.js';
import { openDatabase, type Database } from '../../services/api/src/database.js';
import { migrate } from '../../services/api/src/migrate.js';
import { createSite, insertApiKey, type Role } from '../../services/api/src/store.js';

/*
 * Test databases: embedded PGlite (in memory) always; the PostgreSQL server too when TEST_DATABASE_URL
 * is set (.ci/run sets it). On the server each test file gets a database of its own, created from
 * TEST_DATABASE_URL and dropped afterwards, so files running in parallel never share tables.
 * Without TEST_DATABASE_URL, a PostgreSQL container (testcontainers) is started where a Docker engine
 * answers (a socket at /var/run/docker.sock or DOCKER_HOST); where none does, as here, that target is
 * left out without trying.
 */

export interface TestTarget {
  name: 'pglite' | 'postgresql';
  open(): Promise<Database & { drop(): Promise<void> }>;
}

const serverUrl = process.env.TEST_DATABASE_URL;
const dockerAnswers = !serverUrl && (Boolean(process.env.DOCKER_HOST) || existsSync('/var/run/docker.sock'));

export const targets: TestTarget[] = [
  {
    name: 'pglite',
    async open() {
      const db = await openDatabase({ databaseUrl: null, dataDir: 'memory://' });
      return { ...db, drop: () => db.close() };
    },
  },
  ...(serverUrl
    ? [{
        name: 'postgresql' as const,
        async open() {
          // named after the base database when it is a kinespec_* one (each engineer or CI run keeps to its own names)
          const base = new URL(serverUrl).pathname.slice(1);
          const prefix = /^kinespec_[a-z0-9_]+$/.test(base) ? base : 'kinespec_test';
          const name = `${prefix}_${Date.now()}_${randomBytes(3).toString('hex')}`;
          const admin = postgres(serverUrl, { max: 1, onnotice: () => {} });
          await admin.unsafe(`create database ${name}`);
          const url = new URL(serverUrl);
          url.pathname = `/${name}`;
          const db = await openDatabase({ databaseUrl: url.toString(), dataDir: '', poolMax: 4 });
          return {
            ...db,
            async drop() {
              await db.close();
              await admin.unsafe(`drop database if exists ${name} with (force)`);
              await admin.end();
            },
          };
        },
      }]
    : []),
  ...(dockerAnswers
    ? [{
        name: 'postgresql' as const,
        async open() {
          const { PostgreSqlContainer } = await import('@testcontainers/postgresql');
          const container = await new PostgreSqlContainer('postgres:16-alpine').start();
          const db = await openDatabase({ databaseUrl: container.getConnectionUri(), dataDir: '', poolMax: 4 });
          return {
            ...db,
            async drop() {
              await db.close();
              await container.stop();
            },
          };
        },
      }]
    : []),
];

export interface TestSite {
  siteId: string;
  keys: Record<Role, string>;
}

/** A site with one key of each role. */
export async function makeSite(db: Database, name: string): Promise<TestSite> {
  const site = await createSite(db.sql, name);
  const keys = {} as Record<Role, string>;
  for (const role of ['logger', 'engineer', 'admin'] as const) {
    keys[role] = newApiKey();
    await insertApiKey(db.sql, { siteId: site.id, role, label: `${name} ${role}`, keyHash: hashApiKey(keys[role]) });
  }
  return { siteId: site.id, keys };
}

export interface TestService {
  db: Database & { drop(): Promise<void> };
  app: FastifyInstance;
  close(): Promise<void>;
}

export async function startTestService(
  target: TestTarget,
  config: Partial<{ maxUploadBytes: number; rateLimitMax: number; rateLimitWindowMs: number; maxAnalysisSamples: number; maxEventLoopDelayMs: number; uploadWaitMs: number; queueWorkers: number }> = {},
): Promise<TestService> {
  const db = await target.open();
  await migrate(db.sql);
  const app = await buildApp({
    sql: db.sql,
    connectionString: db.connectionString,
    logger: false,
    // load shedding off unless a test asks for it: inline analyses on a busy test machine lag the loop
    config: { maxUploadBytes: 8 * 1024 * 1024, rateLimitMax: 0, rateLimitWindowMs: 60_000, consoleDir: '', maxEventLoopDelayMs: 0, uploadWaitMs: 60_000, ...config },
  });
  await app.ready();
  return {
    db,
    app,
    async close() {
      await app.close();
      await db.drop();
    },
  };
}

export const auth = (key: string) => ({ authorization: `Bearer ${key}` });
