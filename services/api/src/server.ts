import { isAbsolute, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyInstance } from 'fastify';
import { pino, type Logger } from 'pino';
import { buildApp } from './app.js';
import { bootstrap } from './bootstrap.js';
import type { ServiceConfig } from './config.js';
import { openDatabase, type Database } from './database.js';
import { DEMO_SITE_NAME, prepareDemo, type DemoStatus } from './demo-seed.js';
import { terminalLogStream } from './log-format.js';
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
  /** Settles when the demo's recordings are in (at once when there is no demo to seed). */
  demoSeeded: Promise<void>;
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
  // JSON lines for a collector; readable lines on a terminal
  const logger =
    options.logger === undefined
      ? pino({ level: config.logLevel, name: 'kinespec' }, process.stdout.isTTY ? terminalLogStream(process.stdout) : process.stdout)
      : options.logger;
  const db = await openDatabase({ databaseUrl: config.databaseUrl, dataDir: config.dataDir, poolMax: config.dbPoolMax });
  let demo: DemoStatus | null = null;
  let stopping = false;
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
      readiness: () => (demo?.state === 'seeding' ? `the demo site is still being seeded (${demo.recordingsDone} of ${demo.recordingsTotal} recordings)` : null),
      demoStatus: () => demo,
    });
    const stopRetention = scheduleSampleRetention(db.sql, config.sampleRetentionDays, (err) => logger && logger.warn({ err: String(err) }, 'sample retention'));
    app.addHook('onClose', async () => stopRetention());
    await app.listen({ port: config.port, host: config.host });
    const address = app.server.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    const host = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host;
    const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;

    // The demo's keys and models go in at once, so the banner can print them; its twelve weeks of recordings
    // are analysed in the background while the console already answers (and shows how far they are).
    let demoKeys: { engineer: string; logger: string } | null = null;
    let demoSeeded: Promise<void> = Promise.resolve();
    if (boot.createdSite && demoWanted) {
      const prepared = await prepareDemo(app, { adminKey: boot.generatedAdminKey ?? config.adminKey!, parallel: config.analysisThreads + 1 });
      demoKeys = prepared;
      const status: DemoStatus = { state: 'seeding', recordingsDone: 0, recordingsTotal: prepared.total };
      demo = status;
      const started = Date.now();
      demoSeeded = prepared
        .run((done) => (status.recordingsDone = done), () => stopping)
        .then(
          (done) => {
            status.state = stopping && done < status.recordingsTotal ? 'failed' : 'done';
            if (status.state === 'failed') status.error = 'the service stopped before the demo was complete';
            else out(`Kinespec: demo ready: ${done} recordings analysed in ${((Date.now() - started) / 1000).toFixed(0)} s.`);
          },
          (err: unknown) => {
            status.state = 'failed';
            status.error = err instanceof Error ? err.message : String(err);
            if (logger) logger.error({ err }, 'demo seeding failed');
          },
        );
    }

    out(banner({ url, db, boot, demoKeys, demoTotal: demo?.recordingsTotal ?? null }));
    return {
      app,
      db,
      url,
      demoSeeded,
      async close() {
        // the demo stops between two recordings; what is in stays
        stopping = true;
        await demoSeeded;
        await app.close();
        await db.close();
      },
    };
  } catch (err) {
    await db.close().catch(() => {});
    throw err;
  }
}

function banner(b: { url: string; db: Database; boot: Awaited<ReturnType<typeof bootstrap>>; demoKeys: { engineer: string; logger: string } | null; demoTotal: number | null }): string {
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
      `  engineer  ${b.demoKeys.engineer}   (open the console with this one)`,
      `  logger    ${b.demoKeys.logger}`,
      '',
      `The demo's twelve weeks of simulated recordings (${b.demoTotal ?? 'its'} files) are being analysed in the background,`,
      'about a minute on two cores; the console shows how far it is, and "Kinespec: demo ready" follows here.',
      '',
      'Try:',
      `  curl -H "Authorization: Bearer ${b.demoKeys.engineer}" ${b.url}/api/v1/machines`,
    );
  }
  if (!b.boot.createdSite) lines.push('', 'Keys were printed on the first start; set KINESPEC_ADMIN_KEY to add an admin key.');
  return lines.join('\n');
}
