import { existsSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import fastifyRateLimit from '@fastify/rate-limit';
import underPressure from '@fastify/under-pressure';
import fastifyStatic from '@fastify/static';
import fastifySwagger from '@fastify/swagger';
import fastifySwaggerUi from '@fastify/swagger-ui';
import Fastify, { LogController, type FastifyBaseLogger, type FastifyInstance } from 'fastify';
import { serializerCompiler, validatorCompiler, type ZodTypeProvider } from 'fastify-type-provider-zod';
import { AnalysisPool } from './analysis-pool.js';
import { runAnalysisJob } from './analysis-job.js';
import { AnalysisQueue } from './analysis-queue.js';
import { createMetrics, type ServiceMetrics } from './metrics.js';
import { SampleBudget } from './sample-budget.js';
import { BRAND_LOGO_SVG, BRAND_MARK_SVG, BRAND_NAME } from './brand.js';
import { ApiKeyCache, authenticate, authorise, bearerToken, type Permission } from './auth.js';
import type { ServiceConfig } from './config.js';
import type { Sql } from './database.js';
import type { DemoStatus } from './demo-seed.js';
import { clientErrorHandler, frameworkErrors, registerProblemHandlers, sendProblem } from './http-errors.js';
import { ModelCache } from './model-cache.js';
import { openApiTransform } from './openapi.js';
import { problem, problemTypes, problemUri } from './problems.js';
import { alarmRoutes } from './routes/alarms.js';
import { correctionRoutes } from './routes/corrections.js';
import { healthRoutes, type Readiness } from './routes/health.js';
import { keyRoutes } from './routes/keys.js';
import { machineRoutes } from './routes/machines.js';
import { recordingRoutes } from './routes/recordings.js';
import { signatureRoutes } from './routes/signatures.js';
import { siteRoutes } from './routes/site.js';
import { trendRoutes } from './routes/trends.js';
import type { ApiKeyRow } from './store.js';
import { serviceVersion } from './version.js';

declare module 'fastify' {
  interface FastifyInstance {
    /** Sent as X-Kinespec-Internal by the process's own in-process requests (demo seeding): not rate-limited. */
    internalToken: string;
    /** Every route with the permission its key needs (none: public), for the authorization matrix test. */
    routeTable: Array<{ method: string; url: string; permission: Permission | null }>;
  }
  interface FastifyRequest {
    apiKey: ApiKeyRow | null;
  }
  interface FastifyContextConfig {
    /** What the caller's key must allow; routes without it are public. */
    permission?: Permission;
  }
}

/** What every route plugin receives. */
export interface Services {
  sql: Sql;
  models: ModelCache;
  analysis: AnalysisPool;
  /** Keys found valid lately (auth.ts); key routes drop revoked ones from it. */
  keys: ApiKeyCache;
  /** Samples admitted into analysis at once (sample-budget.ts). */
  budget: SampleBudget;
  metrics: ServiceMetrics;
  /** The analysis queue (pg-boss) and this process's workers on it. */
  queue: AnalysisQueue;
  config: AppConfig;
  /** The demo's progress while its recordings go in, null when there is no demo being seeded by this process. */
  demoStatus: () => DemoStatus | null;
}

export type AppConfig = Pick<ServiceConfig, 'maxUploadBytes' | 'rateLimitMax' | 'rateLimitWindowMs' | 'consoleDir'> &
  Partial<Pick<ServiceConfig, 'analysisThreads' | 'analysisTimeoutMs' | 'maxAnalysisSamples' | 'maxEventLoopDelayMs' | 'dbPoolMax' | 'queueWorkers' | 'uploadWaitMs'>>;

export interface BuildAppOptions {
  sql: Sql;
  /** The server's connection string (server mode): the job queue opens its own small pool there. Null: embedded. */
  connectionString?: string | null;
  config: AppConfig;
  /** A pino logger, or false for none (tests). */
  logger?: FastifyBaseLogger | false;
  readiness?: Readiness;
  demoStatus?: () => DemoStatus | null;
}

/** Builds the HTTP application (not listening). */
export async function buildApp(options: BuildAppOptions): Promise<FastifyInstance> {
  const app = Fastify({
    ...(options.logger ? { loggerInstance: options.logger } : { logger: false }),
    bodyLimit: options.config.maxUploadBytes,
    // keep-alive connections must not hold a graceful shutdown open
    forceCloseConnections: 'idle',
    return503OnClosing: true,
    // one line per request (below), not two, and none for the demo's in-process requests
    logController: new LogController({ disableRequestLogging: true }),
    ajv: { customOptions: { coerceTypes: false } },
    frameworkErrors,
    clientErrorHandler,
  }).withTypeProvider<ZodTypeProvider>();
  app.setValidatorCompiler(validatorCompiler);
  app.setSerializerCompiler(serializerCompiler);
  app.decorateRequest('apiKey', null);
  const internalToken = randomBytes(24).toString('base64url');
  app.decorate('internalToken', internalToken);
  const routeTable: FastifyInstance['routeTable'] = [];
  app.decorate('routeTable', routeTable);
  app.addHook('onRoute', (route) => {
    for (const method of [route.method].flat()) {
      if (method === 'HEAD') continue;
      routeTable.push({ method, url: route.url, permission: (route.config as { permission?: Permission } | undefined)?.permission ?? null });
    }
  });
  registerProblemHandlers(app);

  const analysis = new AnalysisPool(options.config.analysisThreads ?? 0, 256, options.config.analysisTimeoutMs ?? 60_000);
  const budget = new SampleBudget(options.config.maxAnalysisSamples ?? 2 ** 26);
  const logError = (err: Error) => (options.logger ? options.logger.warn({ err: err.message }, 'analysis queue') : undefined);
  const queue = await AnalysisQueue.start(
    { sql: options.sql, connectionString: options.connectionString ?? null },
    { expireInSeconds: Math.ceil((options.config.analysisTimeoutMs ?? 60_000) / 1000) + 30, onError: logError },
  );
  const services: Services = {
    sql: options.sql,
    models: new ModelCache(),
    analysis,
    budget,
    keys: new ApiKeyCache(),
    metrics: createMetrics({ sql: options.sql, analysis, budget, queue, dbPoolMax: options.config.dbPoolMax ?? 10 }),
    queue,
    config: options.config,
    demoStatus: options.demoStatus ?? (() => null),
  };
  const workers = options.config.queueWorkers ?? Math.max(1, options.config.analysisThreads ?? 1);
  if (workers > 0) queue.startWorkers(workers, (job, context) => runAnalysisJob(services, job, context));
  // the queue's workers stop before the analysis threads and the database pool
  app.addHook('onClose', async () => queue.close());
  app.addHook('onClose', async () => services.analysis.close());

  // graceful shutdown: idle keep-alive connections close at once, busy ones right after their answer
  let closing = false;
  app.addHook('preClose', async () => {
    closing = true;
    app.server.closeIdleConnections?.();
  });
  app.addHook('onSend', async (_request, reply) => {
    if (closing) reply.header('connection', 'close');
  });

  await app.register(fastifySwagger, {
    openapi: {
      openapi: '3.1.0',
      info: {
        title: 'Kinespec API',
        version: serviceVersion(),
        description:
          'Condition monitoring for rotating machinery: recordings in, analyses, trends and alarms out. ' +
          'Authenticate with `Authorization: Bearer <key>`. Errors are RFC 9457 problem details; their types:\n\n' +
          problemTypes.map((p) => `- \`${problemUri(p.slug)}\` (${p.status}): ${p.title}`).join('\n'),
      },
      components: { securitySchemes: { apiKey: { type: 'http', scheme: 'bearer' } } },
      security: [{ apiKey: [] }],
    },
    transform: openApiTransform,
  });
  // the documentation under Kinespec's own name and mark, not the framework's
  await app.register(fastifySwaggerUi, {
    routePrefix: '/docs',
    logo: { type: 'image/svg+xml', content: Buffer.from(BRAND_LOGO_SVG), href: '/docs', target: '_self' },
    theme: {
      title: `${BRAND_NAME} API documentation`,
      favicon: [{ filename: 'favicon.svg', rel: 'icon', sizes: 'any', type: 'image/svg+xml', content: Buffer.from(BRAND_MARK_SVG) }],
      css: [{ filename: 'kinespec.css', content: '.swagger-ui .topbar { background-color: #1c2530; }' }],
    },
  });
  app.get('/favicon.svg', { schema: { hide: true } }, async (_request, reply) =>
    reply.type('image/svg+xml').header('cache-control', 'public, max-age=86400').send(BRAND_MARK_SVG),
  );

  // Load shedding: while the event loop lags (every core busy, a flood of requests) new requests answer 503
  // with Retry-After at once rather than queueing behind the lag; /health keeps answering.
  const maxDelay = options.config.maxEventLoopDelayMs ?? 1000;
  if (maxDelay > 0) {
    await app.register(underPressure, {
      maxEventLoopDelay: maxDelay,
      retryAfter: 5,
      pressureHandler: (request, reply, type, value) => {
        if (request.url === '/health') {
          void reply.send({ status: 'ok' });
          return;
        }
        sendProblem(reply, request, problem('service-unavailable', `the service is overloaded (${type} ${typeof value === 'number' ? Math.round(value) : value}); retry after the time given`, {
          headers: { 'retry-after': '5' },
        }));
      },
    });
  }

  const keys = services.keys;
  if (options.config.rateLimitMax > 0) {
    // Addresses whose requests carried keys that are not valid, counted per window: once an address has
    // spent its budget on bad keys, its further tokens are not even looked up (no database work for guesses).
    const badKeys = new Map<string, { count: number; resetAt: number }>();
    const badKeysOf = (ip: string, now: number) => {
      const entry = badKeys.get(ip);
      if (entry && entry.resetAt > now) return entry;
      if (badKeys.size >= 10_000) for (const [k, e] of badKeys) if (e.resetAt <= now) badKeys.delete(k);
      const fresh = { count: 0, resetAt: now + options.config.rateLimitWindowMs };
      badKeys.set(ip, fresh);
      return fresh;
    };
    await app.register(fastifyRateLimit, {
      global: true,
      max: options.config.rateLimitMax,
      timeWindow: options.config.rateLimitWindowMs,
      // One budget per valid key (by its id), else one per client address: without a valid key, random
      // tokens share their address's budget instead of each getting one of its own. The key found here is
      // kept for the authentication hook, so a request is looked up once.
      keyGenerator: async (request) => {
        const token = bearerToken(request);
        if (token === null) return `ip:${request.ip}`;
        const bad = badKeysOf(request.ip, Date.now());
        if (bad.count >= options.config.rateLimitMax) {
          const seen = keys.seenValid(token);
          return seen ? `key:${seen.id}` : `ip:${request.ip}`;
        }
        let key: ApiKeyRow | null;
        try {
          key = await keys.resolve(options.sql, token);
        } catch {
          // the database is away: the authentication hook answers 503; count the request to the address
          return `ip:${request.ip}`;
        }
        if (!key) {
          bad.count++;
          return `ip:${request.ip}`;
        }
        request.apiKey = key;
        return `key:${key.id}`;
      },
      allowList: (request) =>
        request.url === '/health' || request.url === '/ready' || request.url === '/metrics' || request.headers['x-kinespec-internal'] === internalToken,
      errorResponseBuilder: (_request, context) =>
        problem('rate-limited', `rate limit of ${context.max} requests per window reached; retry in ${context.after}`),
    });
  }

  app.addHook('onResponse', async (request, reply) => {
    services.metrics.requests.inc({ method: request.method, route: request.routeOptions.url ?? 'unmatched', status: String(reply.statusCode) });
    if (request.headers['user-agent'] === 'lightMyRequest') return;
    request.log.info({ method: request.method, url: request.url, status: reply.statusCode, ms: Math.round(reply.elapsedTime) }, 'request');
  });

  // Authentication before the body is read (an unknown caller cannot make the service buffer an upload), and
  // after the rate limit (its onRequest hook, which may already have found the key).
  app.addHook('preParsing', async (request) => {
    const permission = request.routeOptions.config.permission;
    if (!permission) return;
    const key = request.apiKey ?? (await authenticate(services.sql, request, keys));
    authorise(key, permission);
    request.apiKey = key;
  });

  await app.register(healthRoutes, { services, readiness: options.readiness });
  app.get('/metrics', {
    schema: { summary: 'Prometheus metrics of this process (text exposition format); no key needed, no site data', tags: ['health'], security: [] },
  }, async (_request, reply) => {
    const text = await services.metrics.registry.metrics();
    return reply.type(services.metrics.registry.contentType).send(text);
  });
  await app.register(
    async (api) => {
      await api.register(siteRoutes, { services });
      await api.register(machineRoutes, { services });
      await api.register(recordingRoutes, { services });
      await api.register(trendRoutes, { services });
      await api.register(alarmRoutes, { services });
      await api.register(keyRoutes, { services });
      await api.register(signatureRoutes, { services });
      await api.register(correctionRoutes, { services });
    },
    { prefix: '/api/v1' },
  );

  app.get('/openapi.json', { schema: { hide: true } }, async () => app.swagger());

  if (options.config.consoleDir && existsSync(options.config.consoleDir)) {
    await app.register(fastifyStatic, { root: options.config.consoleDir, prefix: '/', wildcard: false, index: ['index.html'] });
  } else {
    app.get('/', { schema: { hide: true } }, async (_request, reply) =>
      reply.type('text/html').send(
        '<!doctype html><title>Kinespec</title><p>The Kinespec API is running. The web console is not built ' +
          '(<code>npm run build -w services/console</code>). API documentation: <a href="/docs">/docs</a>.</p>',
      ),
    );
  }
  return app;
}
