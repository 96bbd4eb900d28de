import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * Under load the service used to only slow down (64 concurrent uploads: p99 10-15 s, no 503, no
 * Retry-After). Now a lagging event loop sheds new requests with 503 and Retry-After, and the samples in
 * analysis at once are bounded (sample-budget.ts).
 */

describe('load shedding', () => {
  let svc: TestService;
  let site: TestSite;
  beforeAll(async () => {
    svc = await startTestService(targets[0]!, { maxEventLoopDelayMs: 30, maxAnalysisSamples: 16_384 });
    site = await makeSite(svc.db, 'shedding');
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(200);
  });
  afterAll(async () => svc?.close());

  it('answers 503 problem+json with Retry-After while the event loop lags, and serves again after', async () => {
    // hold the loop busy in 150 ms slices for about 2 s: the mean lag far above the 30 ms allowed
    const until = Date.now() + 2_000;
    await new Promise<void>((resolve) => {
      const block = () => {
        const end = Date.now() + 150;
        while (Date.now() < end) { /* busy */ }
        if (Date.now() < until) setTimeout(block, 1);
        else resolve();
      };
      block();
    });
    const res = await svc.app.inject({ url: '/api/v1/machines', headers: auth(site.keys.engineer) });
    expect(res.statusCode).toBe(503);
    expect(res.headers['retry-after']).toMatch(/^\d+$/);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.json().type).toBe('urn:kinespec:problem:service-unavailable');
    // once the loop is idle again the next samples clear the pressure
    let status = 503;
    for (let i = 0; i < 50 && status === 503; i++) {
      await new Promise((r) => setTimeout(r, 100));
      status = (await svc.app.inject({ url: '/api/v1/machines', headers: auth(site.keys.engineer) })).statusCode;
    }
    expect(status).toBe(200);
  });

  it('answers a recording larger than the whole analysis budget with 413, storing nothing', async () => {
    const res = await svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`,
      headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(1, 32_768)),
    });
    expect(res.statusCode).toBe(413);
    expect(res.json().type).toBe('urn:kinespec:problem:recording-too-large');
    const [row] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`;
    expect(row!.n).toBe(0);
  });
});
