import fc from 'fast-check';
import type { InjectOptions } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * Malformed requests over the whole HTTP surface (fast-check): routes from the service's own table with
 * random path segments, queries, headers, content types, keys and bodies that are broken on purpose
 * (random bytes, cut WAV files, CSV with a non-numeric cell, JSON of the wrong shape, broken multipart).
 * Every answer is below 500, every error is problem+json, nothing is written, and the process's memory
 * stays bounded. FUZZ_RUNS requests (1,000 in CI; `npm run soak` sends 10,000).
 */

const RUNS = Number(process.env.FUZZ_RUNS ?? 1000);

describe('fuzzing the HTTP surface with malformed requests', () => {
  let svc: TestService;
  let site: TestSite;
  let counts: () => Promise<string>;

  beforeAll(async () => {
    svc = await startTestService(targets[0]!, { maxUploadBytes: 256 * 1024 });
    site = await makeSite(svc.db, 'fuzz');
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(200);
    counts = async () => {
      const [row] = await svc.db.sql<Record<string, number>[]>`
        select (select count(*)::int from recordings) as recordings, (select count(*)::int from analyses) as analyses,
          (select count(*)::int from alarms) as alarms, (select count(*)::int from api_keys) as keys,
          (select count(*)::int from machine_models) as models, (select count(*)::int from sites) as sites`;
      return JSON.stringify(row);
    };
  });
  afterAll(async () => svc?.close());

  it(`answers ${RUNS} malformed requests below 500, as problem+json, writing nothing`, async () => {
    const before = await counts();
    const routes = svc.app.routeTable.map((r) => r.url);
    const segment = fc.oneof(
      fc.constantFrom(MACHINE, POINT, '00000000-0000-0000-0000-000000000000', '..', '%00', '%ZZ', 'a'.repeat(80), ''),
      fc.string({ maxLength: 40 }).map(encodeURIComponent),
    );
    const path = fc.tuple(fc.constantFrom(...routes), fc.array(segment, { minLength: 4, maxLength: 4 })).map(([url, segs]) => {
      let i = 0;
      return url.replace(/:[A-Za-z]+/g, () => segs[i++ % segs.length]!);
    });
    const query = fc.dictionary(
      fc.constantFrom('recordedAt', 'before', 'from', 'to', 'limit', 'unit', 'sampleRateHz', 'machine', 'point', 'indicator', 'bucket', 'weeks', 'fault', 'component', 'state', 'validFrom', 'channels'),
      fc.oneof(fc.string({ maxLength: 30 }), fc.constantFrom('-100000-01-01', '+275760-09-13', '2999-01-01', 'NaN', '-1', '1e309', '0', '99999999999')),
      { maxKeys: 4 },
    ).map((q) => new URLSearchParams(q).toString());
    const contentType = fc.constantFrom(
      'audio/wav', 'text/csv', 'application/json', 'application/octet-stream', 'multipart/form-data; boundary=zz', 'multipart/form-data',
      'application/yaml', 'text/plain', 'image/png', 'application/x-www-form-urlencoded', ';;;', '',
    );
    const validWav = wav(sine(1, 2048));
    const body = fc.oneof(
      fc.uint8Array({ maxLength: 2048 }).map((b) => Buffer.from(b)),
      fc.integer({ min: 0, max: validWav.length - 1 }).map((n) => validWav.subarray(0, Math.min(n, 44 + (n % 64)))),
      fc.array(fc.double({ noNaN: false }), { maxLength: 50 }).map((xs) => `acc\n${xs.join('\n')}\nx\n`),
      fc.json().map((j) => j),
      fc.constant('--zz\r\nContent-Disposition: form-data; name="file"; filename="a.wav"\r\n\r\nRIFF'),
      fc.constant(''),
    );
    const key = fc.constantFrom<string | null>(null, 'garbage', 'ksk_' + 'A'.repeat(43), site.keys.logger, site.keys.engineer, site.keys.admin);
    const request = fc.record({
      method: fc.constantFrom('GET', 'POST', 'PUT', 'DELETE', 'PATCH'),
      path,
      query,
      contentType,
      body,
      key,
      extra: fc.dictionary(fc.constantFrom('idempotency-key', 'x-recorded-at', 'x-sample-rate-hz', 'x-unit', 'prefer', 'x-channels'), fc.string({ maxLength: 30 }), { maxKeys: 2 }),
    });
    const rss0 = process.memoryUsage().rss;
    await fc.assert(
      fc.asyncProperty(request, async (r) => {
        // a write that a valid request could make (a model, a key, a site, an acknowledgement) is not fuzzed:
        // only bodies broken on purpose reach the write routes
        const headers: Record<string, string> = { ...r.extra };
        if (r.contentType) headers['content-type'] = r.contentType;
        if (r.key) Object.assign(headers, auth(r.key));
        const res = await svc.app.inject({ method: r.method, url: r.query ? `${r.path}?${r.query}` : r.path, headers, payload: r.body } as InjectOptions);
        if (res.statusCode >= 500) throw new Error(`${r.method} ${r.path}?${r.query} answered ${res.statusCode}: ${res.body.slice(0, 300)}`);
        if (res.statusCode >= 400) {
          expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
          const p = res.json() as { type: string; status: number };
          expect(p.type).toMatch(/^urn:kinespec:problem:/);
          expect(p.status).toBe(res.statusCode);
        }
      }),
      { numRuns: RUNS, seed: Number(process.env.FUZZ_SEED ?? 20_261_205) },
    );
    expect(await counts()).toBe(before);
    // bounded: the process grew by less than 300 MB over the run (no body is kept)
    expect(process.memoryUsage().rss - rss0).toBeLessThan(300 * 2 ** 20);
  }, 600_000);
});
