import { readFileSync } from 'node:fs';
import { decodeErrorCodes } from '@kinespec/signal';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../services/api/src/config.js';
import { problemTypes, problemUri, recordingProblemByCode } from '../../services/api/src/problems.js';
import { startService, type RunningService } from '../../services/api/src/server.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

const readme = readFileSync('README.md', 'utf8');

describe('the problem registry', () => {
  it('documents every problem type in the README', () => {
    const missing = problemTypes.filter((p) => !readme.includes(`| \`${problemUri(p.slug)}\` | ${p.status} |`));
    expect(missing.map((p) => p.slug)).toEqual([]);
  });

  it("gives every decoder error code of @kinespec/signal a problem type of its own", () => {
    expect(decodeErrorCodes.filter((code) => !(code in recordingProblemByCode))).toEqual([]);
  });

  it('uses each type URI once', () => {
    const uris = problemTypes.map((p) => problemUri(p.slug));
    expect(new Set(uris).size).toBe(uris.length);
  });
});

describe('the HTTP service', () => {
  let svc: TestService;
  let site: TestSite;
  beforeAll(async () => {
    svc = await startTestService(targets[0]!, { rateLimitMax: 20, rateLimitWindowMs: 60_000 });
    site = await makeSite(svc.db, 'service');
  });
  afterAll(async () => svc?.close());

  it('answers /health and /ready', async () => {
    expect((await svc.app.inject('/health')).json()).toEqual({ status: 'ok' });
    expect((await svc.app.inject('/ready')).json()).toEqual({ status: 'ready' });
  });

  it('publishes an OpenAPI 3.1 document with every route of the contract and every problem type', async () => {
    const doc = (await svc.app.inject('/openapi.json')).json();
    expect(doc.openapi).toBe('3.1.0');
    const paths = Object.keys(doc.paths);
    for (const path of [
      '/api/v1/site', '/api/v1/machines', '/api/v1/machines/{machineId}', '/api/v1/machines/{machineId}/model', '/api/v1/models/validate',
      '/api/v1/machines/{machineId}/points/{pointId}/recordings', '/api/v1/recordings/{recordingId}', '/api/v1/recordings/{recordingId}/analysis',
      '/api/v1/recordings/{recordingId}/analyses', '/api/v1/machines/{machineId}/reanalyse', '/api/v1/trends', '/api/v1/indicators',
      '/api/v1/fleet/ranking', '/api/v1/alarms', '/api/v1/alarms/{alarmId}/acknowledge', '/api/v1/signatures', '/api/v1/faults', '/api/v1/keys',
      '/health', '/ready',
    ]) {
      expect(paths, path).toContain(path);
    }
    const upload = doc.paths['/api/v1/machines/{machineId}/points/{pointId}/recordings'].post;
    expect(Object.keys(upload.requestBody.content)).toEqual(expect.arrayContaining(['audio/wav', 'text/csv', 'application/json', 'application/octet-stream', 'multipart/form-data']));
    for (const p of problemTypes) expect(doc.info.description).toContain(problemUri(p.slug));
    const docs = await svc.app.inject('/docs/');
    expect(docs.statusCode).toBe(200);
    expect(docs.headers['content-type']).toMatch(/text\/html/);
  });

  it('answers unknown routes with a not-found problem', async () => {
    const res = await svc.app.inject('/api/v1/no-such-thing');
    expect(res.statusCode).toBe(404);
    expect(res.json().type).toBe('urn:kinespec:problem:not-found');
  });

  it('answers bad query parameters with the field path', async () => {
    const res = await svc.app.inject({ url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=fortnight`, headers: auth(site.keys.engineer) });
    expect(res.statusCode).toBe(400);
    const body = res.json();
    expect(body.type).toBe('urn:kinespec:problem:validation-failed');
    expect(body.errors[0].path).toBe('query.bucket');
  });

  it('lists fault candidates and predicts a signature with its excitation, magnification and Campbell data', async () => {
    const headers = auth(site.keys.engineer);
    await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    const faults = (await svc.app.inject({ url: `/api/v1/faults?machine=${MACHINE}`, headers })).json();
    expect(faults).toContainEqual(expect.objectContaining({ fault: 'gear-missing-tooth', component: 'pinion-1' }));
    const res = await svc.app.inject({ url: `/api/v1/signatures?machine=${MACHINE}&fault=gear-missing-tooth&component=pinion-1&speedRpm=1480`, headers });
    expect(res.statusCode, res.body).toBe(200);
    const sig = res.json();
    // pinion-1 turns with the input shaft: 1480 rpm x 180/250 (sheave pitch diameters) x (1 - 1 % slip) = 1054.94 rpm,
    // 17.582 Hz (belt ratio, common practice); a tooth fault's lines are harmonics of that shaft
    expect(sig.lines[0].frequencyHz).toBeCloseTo((1480 * (180 / 250) * 0.99) / 60, 2);
    expect(sig.excitation.angleRev).toHaveLength(1024);
    expect(sig.excitation.waveform).toHaveLength(1024);
    expect(sig.magnification).toHaveLength(sig.lines.length);
    expect(sig.campbell.orders.length).toBeGreaterThan(0);
    // partial sums converge on the waveform (Fourier series in mean square, common practice)
    const sums = sig.excitation.partialSums as Record<string, number[]>;
    const ns = Object.keys(sums).map(Number).sort((a, b) => a - b);
    const msError = (y: number[]) => y.reduce((acc, v, i) => acc + (v - sig.excitation.waveform[i]) ** 2, 0) / y.length;
    expect(msError(sums[String(ns.at(-1))]!)).toBeLessThan(msError(sums[String(ns[0])]!));
    const bad = await svc.app.inject({ url: `/api/v1/signatures?machine=${MACHINE}&fault=gear-missing-tooth&component=no-such-gear`, headers });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().detail).toMatch(/no-such-gear/);
  });

  it('rate-limits a key with 429 and Retry-After', async () => {
    const key = (await makeSite(svc.db, 'busy')).keys.engineer;
    const codes: number[] = [];
    let last;
    for (let i = 0; i < 22; i++) {
      last = await svc.app.inject({ url: '/api/v1/site', headers: auth(key) });
      codes.push(last.statusCode);
    }
    expect(codes).toEqual([...Array(20).fill(200), 429, 429]);
    expect(Number(last!.headers['retry-after'])).toBeGreaterThan(0);
    expect(last!.json().type).toBe('urn:kinespec:problem:rate-limited');
    // the process's own requests (demo seeding) carry its internal token and pass; a guessed token does not
    expect((await svc.app.inject({ url: '/api/v1/site', headers: { ...auth(key), 'x-kinespec-internal': svc.app.internalToken } })).statusCode).toBe(200);
    expect((await svc.app.inject({ url: '/api/v1/site', headers: { ...auth(key), 'x-kinespec-internal': 'guess' } })).statusCode).toBe(429);
    // another key keeps its own budget
    expect((await svc.app.inject({ url: '/api/v1/site', headers: auth(site.keys.admin) })).statusCode).toBe(200);
  });
});

describe('when the database fails', () => {
  it('answers a lost database with 503 and Retry-After, without a stack trace or driver message, and /ready says 503', async () => {
    const svc = await startTestService(targets[0]!);
    const site = await makeSite(svc.db, 'failing');
    await svc.db.sql.end();
    const res = await svc.app.inject({ url: '/api/v1/machines', headers: auth(site.keys.engineer) });
    // a database that does not answer is the service's condition for now, not a fault: retry later
    expect(res.statusCode).toBe(503);
    expect(res.headers['retry-after']).toMatch(/^\d+$/);
    const body = res.json();
    expect(body.type).toBe('urn:kinespec:problem:service-unavailable');
    expect(JSON.stringify(body)).not.toMatch(/\n\s+at |CONNECTION|postgres|\.ts:\d+/i);
    expect((await svc.app.inject('/ready')).statusCode).toBe(503);
    await svc.app.close();
    await svc.db.drop().catch(() => {});
  });
});

describe('startService', () => {
  let service: RunningService;
  const banner: string[] = [];
  beforeAll(async () => {
    const config = loadConfig({ KINESPEC_DATA_DIR: 'memory://', KINESPEC_PORT: '0', KINESPEC_DEMO: 'off', KINESPEC_ADMIN_KEY: 'test-admin-key-0123456789', KINESPEC_ANALYSIS_THREADS: '0' });
    service = await startService(config, { out: (t) => banner.push(t), logger: false });
  });

  it('prints where it listens and creates the bootstrap admin from KINESPEC_ADMIN_KEY', async () => {
    expect(banner.join('\n')).toContain(`Kinespec is listening on ${service.url}`);
    expect(banner.join('\n')).not.toContain('test-admin-key');
    const res = await fetch(`${service.url}/api/v1/site`, { headers: auth('test-admin-key-0123456789') });
    expect(await res.json()).toMatchObject({ name: 'Kinespec site', role: 'admin' });
  });

  it('finishes an in-flight upload before it closes, then refuses connections', async () => {
    const admin = auth('test-admin-key-0123456789');
    await fetch(`${service.url}/api/v1/machines/${MACHINE}/model`, { method: 'PUT', headers: { ...admin, 'content-type': 'application/json' }, body: modelText });
    const upload = fetch(`${service.url}/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`, {
      method: 'POST', headers: { ...admin, 'content-type': 'audio/wav' }, body: wav(sine(3)),
    });
    await new Promise((r) => setTimeout(r, 20));
    const closing = service.close();
    const res = await upload;
    expect(res.status).toBe(201);
    await closing;
    await expect(fetch(`${service.url}/health`)).rejects.toThrow();
  });
});

describe('startService with the demo', () => {
  it('prints the address and the demo keys at once and seeds the recordings in the background, with its progress on /api/v1/site', async () => {
    const banner: string[] = [];
    const config = loadConfig({ KINESPEC_DATA_DIR: 'memory://', KINESPEC_PORT: '0', KINESPEC_DEMO: 'on', KINESPEC_ANALYSIS_THREADS: '0', KINESPEC_RATE_LIMIT_MAX: '0' });
    const service = await startService(config, { out: (t) => banner.push(t), logger: false });
    try {
      const text = banner.join('\n');
      expect(text).toContain(`Kinespec is listening on ${service.url}`);
      const engineer = /engineer\s+(ksk_\S+)/.exec(text)?.[1];
      expect(engineer).toBeDefined();
      expect(text).toMatch(/being analysed in the background/);
      const site = await (await fetch(`${service.url}/api/v1/site`, { headers: auth(engineer!) })).json();
      expect(site.demo).toMatchObject({ state: 'seeding', recordingsTotal: 288 });
      expect(site.demo.recordingsDone).toBeLessThan(288);
      const ready = await fetch(`${service.url}/ready`);
      expect(ready.status).toBe(503);
      expect((await ready.json()).detail).toMatch(/^the demo site is still being seeded \(\d+ of 288 recordings\)$/);
    } finally {
      // close stops the demo between two recordings
      await service.close();
    }
    await service.demoSeeded;
  }, 120_000);
});

describe('documentation and favicon', () => {
  it("serves the API documentation under Kinespec's name and mark, and the favicon every console page links", async () => {
    const svc = await startTestService(targets[0]!);
    try {
      const docs = await svc.app.inject('/docs/');
      expect(docs.body).toContain('<title>Kinespec API documentation</title>');
      expect(docs.body).not.toMatch(/<title>[^<]*Swagger/i);
      const icon = await svc.app.inject('/favicon.svg');
      expect([icon.statusCode, icon.headers['content-type']]).toEqual([200, 'image/svg+xml']);
      expect(icon.body).toMatch(/^<svg /);
    } finally {
      await svc.close();
    }
  });
});
