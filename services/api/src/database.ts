import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import postgres from 'postgres';

/** The one driver: postgres.js, whether the server is PostgreSQL or the embedded PGlite behind its socket. */
export type Sql = postgres.Sql;
/** A pool or a transaction: every query function takes either. */
export type Queryable = postgres.ISql;

export interface Database {
  sql: Sql;
  mode: 'server' | 'embedded';
  /** Where the data lives, for the start-up banner (password removed). */
  location: string;
  /** The server's connection string (server mode), for libraries that open their own pool (the job queue). */
  connectionString: string | null;
  close(): Promise<void>;
}

export interface OpenDatabaseOptions {
  databaseUrl: string | null;
  /** Embedded mode only; 'memory://' keeps the database in memory (tests). */
  dataDir: string;
  poolMax?: number;
}

// (counts are cast to int in the queries, so no bigint strings come back)
const commonOptions = {
  // NOTICEs (e.g. "relation already exists, skipping") are not errors; keep them out of the logs
  onnotice: () => {},
  // every timestamp is compared and bucketed in UTC, whatever the server's default
  connection: { TimeZone: 'UTC', application_name: 'kinespec' },
  // After a lost connection, try again within a second at most (the driver's default backs off to 20 s),
  // so that the service is back within a few seconds of its database; each try costs one TCP connect.
  backoff: (retries: number) => Math.min(0.05 * 2 ** retries, 1),
  connect_timeout: 10,
};

function redact(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return '(unparsable DATABASE_URL)';
  }
}

/**
 * Opens the store. With a server URL: a postgres.js pool. Without: PGlite in `dataDir`, served through
 * pglite-socket on a private Unix socket so that the same driver and queries run on both.
 * PGlite is single-user and concurrent socket connections can interleave queries, so the embedded
 * pool holds one connection; postgres.js queues the rest.
 */
export async function openDatabase(options: OpenDatabaseOptions): Promise<Database> {
  if (options.databaseUrl) {
    const sql = postgres(options.databaseUrl, { ...commonOptions, max: options.poolMax ?? 10 }) as unknown as Sql;
    return { sql, mode: 'server', location: redact(options.databaseUrl), connectionString: options.databaseUrl, close: () => sql.end({ timeout: 5 }) };
  }
  const [{ PGlite }, { PGLiteSocketServer }] = await Promise.all([
    import('@electric-sql/pglite'),
    import('@electric-sql/pglite-socket'),
  ]);
  const inMemory = options.dataDir.startsWith('memory://');
  const location = inMemory ? options.dataDir : resolve(options.dataDir);
  if (!inMemory) mkdirSync(location, { recursive: true });
  const pglite = await PGlite.create(location);
  // a Unix socket in a fresh 0700 directory: only this user can reach the database (no password on it);
  // Windows has no such sockets, so there it is loopback TCP on a random port
  const socketDir = process.platform === 'win32' ? null : mkdtempSync(join(tmpdir(), 'kinespec-db-'));
  const socketPath = socketDir ? join(socketDir, '.s.PGSQL.5432') : null;
  const server = new PGLiteSocketServer(socketPath ? { db: pglite, path: socketPath } : { db: pglite, host: '127.0.0.1', port: 0 });
  await server.start();
  const connection = { user: 'postgres', database: 'postgres', ssl: false as const, max: 1 };
  const sql = (socketPath
    ? postgres({ ...commonOptions, ...connection, path: socketPath })
    : postgres(`postgres://postgres@${server.getServerConn()}/postgres`, { ...commonOptions, ...connection })) as unknown as Sql;
  return {
    sql,
    mode: 'embedded',
    location,
    connectionString: null,
    async close() {
      try {
        await sql.end({ timeout: 5 });
        await server.stop();
        await pglite.close();
      } finally {
        if (socketDir) rmSync(socketDir, { recursive: true, force: true });
      }
    },
  };
}
