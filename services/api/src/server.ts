import { isAbsolute, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { pino, type Logger } from 'pino';
import { buildApp } from './app.js';
import { bootstrap } from './bootstrap.js';
import type { ServiceConfig } from './config.js';
import { openDatabase, type Database } from './database.js';
import { DEMO_SITE_NAME, seedDemo, type DemoKeys } from './demo-seed.js';
import { migrate } from './migrate.js';
import { scheduleSampleRetention } from './sample-retention.js';

/*
 * The running service: database (server or embedded), migrations, the first site and its admin key,
 * the HTTP app listening, the demo seeded on an empty database, and an orderly close.
 */

export interface RunningService {
  app: FastifyInstance;
  db: Database;
  url: string;
  /** Stops accepting, lets in-flight requests finish, closes the pool (and the embedded database). */
  close(): Promise<void>;
}

export interface StartOptions {
  /** Where the banner goes (URL, keys); default stdout. */
  out?: (text: string) => void;
  logger?: Logger | false;
}

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

function consoleDir(configured: string): string {
  return isAbsolute(configured) ? configured : resolve(configured === 'services/console/dist' ? repoRoot : process.cwd(), configured);
}

export async function startService(config: ServiceConfig, options: StartOptions = {}): Promise<RunningService> {
  const out = options.out ?? ((text: string) => process.stdout.write(`${text}\n`));
  const logger = options.logger === undefined ? pino({ level: config.logLevel, name: 'kinespec' }) : options.logger;
  const db = await openDatabase({ databaseUrl: config.databaseUrl, dataDir: config.dataDir, poolMax: config.dbPoolMax });
  let seeding: string | null = null;
  try {
    const applied = await migrate(db.sql);
    if (logger && applied.length) logger.info({ applied }, 'migrations applied');
    const demoWanted = config.demo === 'on' || (config.demo === 'auto' && db.mode === 'embedded');
    const boot = await bootstrap(db.sql, { adminKey: config.adminKey, platformKey: config.platformKey, siteName: demoWanted ? DEMO_SITE_NAME : 'Kinespec site' });
    const app = await buildApp({
      sql: db.sql,
      connectionString: db.connectionString,
      config: { ...config, consoleDir: consoleDir(config.consoleDir), dbPoolMax: db.mode === 'embedded' ? 1 : config.dbPoolMax },
      logger: logger || false,
      readiness: () => seeding,
    });
    const stopRetention = scheduleSampleRetention(db.sql, config.sampleRetentionDays, (err) => logger && logger.warn({ err: String(err) }, 'sample retention'));
    app.addHook('onClose', async () => stopRetention());
    await app.listen({ port: config.port, host: config.host });
    const address = app.server.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    const host = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host;
    const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;

    let demoKeys: DemoKeys | null = null;
    if (boot.createdSite && demoWanted) {
      seeding = 'the demo site is still being seeded';
      out(`Kinespec: seeding the demo site "${DEMO_SITE_NAME}" (twelve weeks of simulated recordings)...`);
      const started = Date.now();
      demoKeys = await seedDemo(app, db.sql, boot.siteId, { adminKey: boot.generatedAdminKey ?? config.adminKey!, parallel: config.analysisThreads + 1 });
      seeding = null;
      out(`Kinespec: demo seeded in ${((Date.now() - started) / 1000).toFixed(1)} s (${demoKeys.recordings} recordings analysed).`);
    }

    out(banner({ url, db, boot, demoKeys }));
    return {
      app,
      db,
      url,
      async close() {
        await app.close();
        await db.close();
      },
    };
  } catch (err) {
    await db.close().catch(() => {});
    throw err;
  }
}

function banner(b: { url: string; db: Database; boot: Awaited<ReturnType<typeof bootstrap>>; demoKeys: DemoKeys | null }): string {
  const lines = [
    '',
    `Kinespec is listening on ${b.url}`,
    `  console   ${b.url}/`,
    `  API docs  ${b.url}/docs   (OpenAPI: ${b.url}/openapi.json)`,
    `  database  ${b.db.mode === 'embedded' ? `embedded PGlite in ${b.db.location}` : b.db.location}`,
    `  site      ${b.boot.siteName}`,
  ];
  if (b.boot.generatedAdminKey) {
    lines.push('', 'Admin key of this site (shown this once; only its hash is stored):', `  ${b.boot.generatedAdminKey}`);
  }
  if (b.demoKeys) {
    lines.push(
      '',
      'Demo keys (shown this once):',
      `  engineer  ${b.demoKeys.engineer}`,
      `  logger    ${b.demoKeys.logger}`,
      '',
      'Try:',
      `  curl -H "Authorization: Bearer ${b.demoKeys.engineer}" ${b.url}/api/v1/machines`,
    );
  }
  if (!b.boot.createdSite) lines.push('', 'Keys were printed on the first start; set KINESPEC_ADMIN_KEY to add an admin key.');
  return lines.join('\n');
}
