import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Sql } from './database.js';

/*
 * The migration runner. Why our own (about sixty lines) and not a library: postgres.js has no built-in
 * migrator, the well-kept migration tools each bring their own driver (pg) or a CLI and config file,
 * and this runner has to behave identically on a PostgreSQL server and on embedded PGlite. Plain SQL
 * files in migrations/ run in name order, each in its own transaction together with the row that
 * records it, so a failed file leaves nothing half-applied. A transaction-scoped advisory lock keeps
 * two replicas starting at once from applying the same file twice. An applied file whose text has
 * changed stops the start-up: migrations are append-only.
 */

/** migrations/ at the repository root (the same depth from src/ and dist/). */
export const migrationsDir = fileURLToPath(new URL('../../../migrations/', import.meta.url));

export interface Migration {
  name: string;
  checksum: string;
  text: string;
}

// An arbitrary constant: the advisory lock key Kinespec's migrations hold.
const MIGRATION_LOCK_KEY = 7_305_017;

export class MigrationError extends Error {
  override readonly name = 'MigrationError';
}

export function readMigrations(dir: string = migrationsDir): Migration[] {
  return readdirSync(dir)
    .filter((f) => /^\d{4}_[a-z0-9_]+\.sql$/.test(f))
    .sort()
    .map((name) => {
      const text = readFileSync(join(dir, name), 'utf8');
      return { name, text, checksum: createHash('sha256').update(text).digest('hex') };
    });
}

async function ensureTable(sql: Sql): Promise<void> {
  await sql`create table if not exists schema_migrations (
    name text primary key, checksum text not null, applied_at timestamptz not null default now())`;
}

/** Applies every migration not yet applied; returns the names it applied. */
export async function migrate(sql: Sql, migrations: Migration[] = readMigrations()): Promise<string[]> {
  await ensureTable(sql);
  const applied: string[] = [];
  for (const m of migrations) {
    const ran = await sql.begin(async (tx) => {
      await tx`select pg_advisory_xact_lock(${MIGRATION_LOCK_KEY})`;
      const [row] = await tx<{ checksum: string }[]>`select checksum from schema_migrations where name = ${m.name}`;
      if (row) {
        if (row.checksum !== m.checksum) {
          throw new MigrationError(`migration ${m.name} was changed after it was applied (add a new migration instead)`);
        }
        return false;
      }
      // a migration file is trusted SQL from the repository, possibly several statements: the simple protocol runs it
      await tx.unsafe(m.text);
      await tx`insert into schema_migrations (name, checksum) values (${m.name}, ${m.checksum})`;
      return true;
    });
    if (ran) applied.push(m.name);
  }
  return applied;
}

/** Names of migrations in the repository that the database has not applied (empty when current). */
export async function pendingMigrations(sql: Sql, migrations: Migration[] = readMigrations()): Promise<string[]> {
  const [exists] = await sql<{ ok: boolean }[]>`select to_regclass('schema_migrations') is not null as ok`;
  if (!exists?.ok) return migrations.map((m) => m.name);
  const rows = await sql<{ name: string }[]>`select name from schema_migrations`;
  const done = new Set(rows.map((r) => r.name));
  return migrations.filter((m) => !done.has(m.name)).map((m) => m.name);
}
