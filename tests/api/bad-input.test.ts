import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { json as jsonRecording, MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * Findings of the hardening review (issue "A service a plant can leave running"), each a request that
 * answered 500, was stored unchecked or slipped a limit before: every one must now answer its problem
 * type and store nothing.
 */

const url = `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`;
const FILE_HEAD = `--abc\r\nContent-Disposition: form-data; name="file"; filename="a.wav"\r\nContent-Type: audio/wav\r\n\r\n`;

function recordingJson(amplitude: number, metadata: Record<string, string>): string {
  const doc = JSON.parse(jsonRecording(sine(amplitude, 4096))) as Record<string, unknown>;
  doc['metadata'] = metadata;
  return JSON.stringify(doc);
}

function csvWithComment(amplitude: number, comment: string): string {
  return `# sampleRateHz=25600\n# unit=m/s^2\n# ${comment}\nacc\n${Array.from(sine(amplitude, 4096), (v) => v.toPrecision(7)).join('\n')}\n`;
}

for (const target of targets) {
  describe(`bad input on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;

    async function recordings(): Promise<number> {
      const [row] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`;
      return row!.n;
    }

    function upload(headers: Record<string, string>, payload: Buffer | string, query = '') {
      return svc.app.inject({ method: 'POST', url: url + query, headers: { ...auth(site.keys.logger), ...headers }, payload });
    }

    async function expectProblem(res: { statusCode: number; headers: Record<string, unknown>; json(): any }, status: number, type: string) {
      expect(res.statusCode, JSON.stringify(res.json())).toBe(status);
      expect(String(res.headers['content-type'])).toMatch(/^application\/problem\+json/);
      expect(res.json().type).toBe(`urn:kinespec:problem:${type}`);
    }

    beforeAll(async () => {
      svc = await startTestService(target, { maxUploadBytes: 400_000 });
      site = await makeSite(svc.db, 'bad input');
      const put = await svc.app.inject({
        method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText,
      });
      expect(put.statusCode).toBe(200);
    });
    afterAll(async () => svc?.close());

    describe('a recording dated in the future from any source', () => {
      const sources: Array<[string, () => Promise<Awaited<ReturnType<typeof upload>>>]> = [
        ['the JSON metadata.recordedAt', () => upload({ 'content-type': 'application/json' }, recordingJson(2, { recordedAt: '2999-01-01T00:00:00Z' }))],
        ['a CSV # recordedAt= comment', () => upload({ 'content-type': 'text/csv' }, csvWithComment(2.1, 'recordedAt=2999-01-01T00:00:00Z'))],
        ['a CSV # timestamp= comment', () => upload({ 'content-type': 'text/csv' }, csvWithComment(2.2, 'timestamp=2999-06-01'))],
        ['?recordedAt=', () => upload({ 'content-type': 'audio/wav' }, wav(sine(2.3, 4096)), '?unit=m/s%5E2&recordedAt=2999-01-01T00:00:00Z')],
        ['X-Recorded-At', () => upload({ 'content-type': 'audio/wav', 'x-recorded-at': '2999-01-01T00:00:00Z' }, wav(sine(2.4, 4096)), '?unit=m/s%5E2')],
      ];
      for (const [name, send] of sources) {
        it(`is refused with 422 when the time comes from ${name}`, async () => {
          const before = await recordings();
          await expectProblem(await send(), 422, 'recorded-in-future');
          expect(await recordings()).toBe(before);
        });
      }

      it('still takes a file dated within the day of clock skew allowed', async () => {
        const soon = new Date(Date.now() + 3_600_000).toISOString();
        const res = await upload({ 'content-type': 'application/json' }, recordingJson(2.5, { recordedAt: soon }));
        expect(res.statusCode, res.body).toBe(201);
      });

      it('lets a later zone-D upload raise the alarm that a far-future file would have frozen', async () => {
        // the far-future file is refused, so the point's newest recording stays in the present
        await upload({ 'content-type': 'application/json' }, recordingJson(2.6, { recordedAt: '2999-01-01T00:00:00Z' }));
        // 400 m/s^2 at omega = 1000 rad/s: 283 mm/s r.m.s., far into zone D (fixtures.ts)
        const later = encodeURIComponent(new Date(Date.now() + 2 * 3_600_000).toISOString());
        const loud = await upload({ 'content-type': 'audio/wav' }, wav(sine(400, 8192)), `?unit=m/s%5E2&recordedAt=${later}`);
        expect(loud.statusCode, loud.body).toBe(201);
        const alarms = await svc.app.inject({ method: 'GET', url: '/api/v1/alarms', headers: auth(site.keys.engineer) });
        const velocity = (alarms.json() as Array<{ indicator: string; level: string; pointId: string }>).filter((a) => a.indicator === 'velocity_rms_mm_per_s' && a.pointId === POINT);
        expect(velocity.map((a) => a.level)).toEqual(['trip']);
      });
    });

    describe('times out of range', () => {
      it('answers 400 for a file dated before 1900', async () => {
        const before = await recordings();
        await expectProblem(await upload({ 'content-type': 'application/json' }, recordingJson(3, { recordedAt: '1066-10-14T00:00:00Z' })), 400, 'time-out-of-range');
        expect(await recordings()).toBe(before);
      });
      it('answers 400 for a file date beyond what PostgreSQL stores', async () => {
        const before = await recordings();
        const res = await upload({ 'content-type': 'application/json' }, recordingJson(3.1, { recordedAt: '+200000-01-01T00:00:00Z' }));
        expect([400, 422]).toContain(res.statusCode);
        expect(res.statusCode).not.toBe(500);
        expect(await recordings()).toBe(before);
      });
      it('answers 400 for ?recordedAt= with a six-digit negative year', async () => {
        await expectProblem(await upload({ 'content-type': 'audio/wav' }, wav(sine(3.2, 4096)), '?recordedAt=-100000-01-01T00:00:00Z'), 400, 'validation-failed');
      });
      it('answers 400 for ?before= out of range', async () => {
        const res = await svc.app.inject({ method: 'GET', url: `${url}?before=-100000-01-01T00:00:00Z`, headers: auth(site.keys.engineer) });
        await expectProblem(res, 400, 'validation-failed');
      });
      it('answers 400 for trend ?from= out of range', async () => {
        const res = await svc.app.inject({ method: 'GET', url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}&from=%2B275000-01-01`, headers: auth(site.keys.engineer) });
        await expectProblem(res, 400, 'validation-failed');
      });
      it('answers 400 for a model ?validFrom= out of range', async () => {
        const res = await svc.app.inject({
          method: 'PUT', url: `/api/v1/machines/${MACHINE}/model?validFrom=-099999-01-01`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText,
        });
        await expectProblem(res, 400, 'validation-failed');
      });
    });

    describe('broken multipart', () => {
      const bodies: Array<[string, string, Buffer | string]> = [
        ['without a closing boundary', 'multipart/form-data; boundary=abc', `${FILE_HEAD}xxxx`],
        ['without a boundary parameter', 'multipart/form-data', '--abc\r\n'],
        ['with a boundary the body never uses', 'multipart/form-data; boundary=zzz', `${FILE_HEAD}xxxx\r\n--abc--\r\n`],
        ['that is not multipart at all', 'multipart/form-data; boundary=abc', 'hello world'],
      ];
      for (const [name, type, body] of bodies) {
        it(`answers a form ${name} with 400 and stores nothing`, async () => {
          const before = await recordings();
          await expectProblem(await upload({ 'content-type': type }, body), 400, 'bad-request');
          expect(await recordings()).toBe(before);
        });
      }

      it('refuses a form with two file parts instead of dropping the second', async () => {
        const body = Buffer.concat([Buffer.from(FILE_HEAD), wav(sine(4, 4096)), Buffer.from(`\r\n${FILE_HEAD}`), wav(sine(4.1, 4096)), Buffer.from('\r\n--abc--\r\n')]);
        const before = await recordings();
        await expectProblem(await upload({ 'content-type': 'multipart/form-data; boundary=abc' }, body), 400, 'bad-request');
        expect(await recordings()).toBe(before);
      });

      it('refuses a form with 25 fields when 20 are allowed', async () => {
        let fields = '';
        for (let i = 0; i < 25; i++) fields += `--abc\r\nContent-Disposition: form-data; name="f${i}"\r\n\r\nv\r\n`;
        const body = Buffer.concat([Buffer.from(fields + FILE_HEAD), wav(sine(4.2, 4096)), Buffer.from('\r\n--abc--\r\n')]);
        const before = await recordings();
        const res = await upload({ 'content-type': 'multipart/form-data; boundary=abc' }, body);
        expect(res.statusCode).toBe(400);
        expect(res.json().detail).toMatch(/more than 20 fields/);
        expect(await recordings()).toBe(before);
      });
    });

    it('answers an over-long path segment with a 414 problem', async () => {
      const res = await svc.app.inject({ method: 'GET', url: `/api/v1/recordings/${'a'.repeat(300)}`, headers: auth(site.keys.engineer) });
      await expectProblem(res, 414, 'uri-too-long');
    });
  });
}

describe('rate limits without a valid key', () => {
  let svc: TestService;
  let site: TestSite;
  beforeAll(async () => {
    svc = await startTestService(targets[0]!, { rateLimitMax: 5, rateLimitWindowMs: 60_000 });
    site = await makeSite(svc.db, 'limits');
  });
  afterAll(async () => svc?.close());

  it('counts random bearer tokens against their address, not one budget each', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) {
      const res = await svc.app.inject({ method: 'GET', url: '/api/v1/machines', headers: auth(`ksk_${randomBytes(32).toString('base64url')}`), remoteAddress: '10.1.2.3' });
      statuses.push(res.statusCode);
      if (res.statusCode === 429) {
        expect(res.headers['retry-after']).toBeDefined();
        expect(res.json().type).toBe('urn:kinespec:problem:rate-limited');
      }
    }
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    expect(statuses.slice(5).every((s) => s === 429)).toBe(true);
  });

  it('keeps a key in use on its own budget while its address is flooded with bad ones', async () => {
    const first = await svc.app.inject({ method: 'GET', url: '/api/v1/machines', headers: auth(site.keys.engineer), remoteAddress: '10.9.9.9' });
    expect(first.statusCode).toBe(200);
    for (let i = 0; i < 8; i++) {
      await svc.app.inject({ method: 'GET', url: '/api/v1/machines', headers: auth('ksk_guess'), remoteAddress: '10.9.9.9' });
    }
    const res = await svc.app.inject({ method: 'GET', url: '/api/v1/machines', headers: auth(site.keys.engineer), remoteAddress: '10.9.9.9' });
    expect(res.statusCode).toBe(200);
  });
});
