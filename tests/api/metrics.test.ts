import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/** The value of one sample line of the Prometheus text format, e.g. kinespec_uploads_total{outcome="stored"}. */
function sample(text: string, series: string): number | null {
  const line = text.split('\n').find((l) => l.startsWith(`${series} `));
  return line ? Number(line.slice(series.length + 1)) : null;
}

describe('GET /metrics', () => {
  let svc: TestService;
  let site: TestSite;
  beforeAll(async () => {
    svc = await startTestService(targets[0]!);
    site = await makeSite(svc.db, 'metrics');
    await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
  });
  afterAll(async () => svc?.close());

  it('counts uploads by outcome, analysis time, requests by route, and reports the database and queue', async () => {
    const upload = (payload: Buffer, key?: string) => svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`,
      headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav', ...(key ? { 'idempotency-key': key } : {}) }, payload,
    });
    const body = wav(sine(2, 8192));
    expect((await upload(body, 'm-1')).statusCode).toBe(201);
    expect((await upload(body, 'm-1')).statusCode).toBe(200);
    expect((await upload(Buffer.from('not a wav'))).statusCode).toBe(400);
    const res = await svc.app.inject({ url: '/metrics' });
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/plain; version=0\.0\.4/);
    const text = res.body;
    expect(sample(text, 'kinespec_uploads_total{outcome="stored"}')).toBe(1);
    expect(sample(text, 'kinespec_uploads_total{outcome="duplicate"}')).toBe(1);
    expect(sample(text, 'kinespec_uploads_total{outcome="refused"}')).toBe(1);
    expect(sample(text, 'kinespec_analysis_duration_seconds_count')).toBe(1);
    expect(sample(text, 'kinespec_http_requests_total{method="POST",route="/api/v1/machines/:machineId/points/:pointId/recordings",status="201"}')).toBe(1);
    expect(sample(text, 'kinespec_db_up')).toBe(1);
    expect(sample(text, 'kinespec_analysis_queue_depth{state="waiting"}')).toBe(0);
    expect(sample(text, 'kinespec_process_resident_memory_bytes')).toBeGreaterThan(0);
    // nothing of a site in a label
    expect(text).not.toContain(MACHINE);
    expect(text).not.toContain(site.siteId);
  });
});
