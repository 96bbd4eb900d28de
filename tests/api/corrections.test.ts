import { readFileSync } from 'node:fs';
import { encodeWav } from '@kinespec/signal';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, OMEGA_RAD_PER_S, POINT, SAMPLE_COUNT, SAMPLE_RATE_HZ, wav } from './fixtures.js';

/*
 * Corrections: a recording uploaded by mistake is deleted, one filed under the wrong point or time is moved;
 * the trends and alarms of every point it leaves or joins follow, and each change is in the audit log.
 * Recordings are sines of known r.m.s. velocity: an acceleration sine of amplitude A at omega rad/s reads
 * A / (omega sqrt 2) (common practice). The mixer's model is ISO 10816-3 group 2, rigid: ALARM 2.8 mm/s (B/C),
 * TRIP 4.5 mm/s (C/D) without point levels (see trends.test.ts).
 */

const OTHER_POINT = 'gb-output-v';
const model = JSON.parse(modelText) as { points: unknown[] };
model.points.push({ id: OTHER_POINT, near: 'output-nde', direction: 'vertical', quantity: 'velocity', unit: 'mm/s' });
const PUMP = 'skelmere-feed-pump-3';
const pumpText = readFileSync(new URL('../../fixtures/machines/skelmere-feed-pump-3.json', import.meta.url), 'utf8');

function accelerationWithVelocityRms(v: number): Buffer {
  const amplitude = (v * Math.SQRT2 * OMEGA_RAD_PER_S) / 1000;
  const x = new Float64Array(SAMPLE_COUNT);
  for (let i = 0; i < x.length; i++) x[i] = amplitude * Math.sin((OMEGA_RAD_PER_S * i) / SAMPLE_RATE_HZ);
  return wav(x);
}

const near = (actual: number, expected: number) => expect(Math.abs(actual / expected - 1), `${actual} vs ${expected}`).toBeLessThan(0.02);

for (const target of targets) {
  describe(`deleting and moving recordings on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    const ids: Record<string, string> = {};

    const request = async (method: 'GET' | 'DELETE' | 'PATCH' | 'POST' | 'PUT', url: string, key: string, payload?: unknown) =>
      svc.app.inject({ method, url, headers: { ...auth(key), ...(payload !== undefined ? { 'content-type': 'application/json' } : {}) }, ...(payload !== undefined ? { payload: JSON.stringify(payload) } : {}) });
    const get = async (url: string) => {
      const res = await request('GET', url, site.keys.engineer);
      expect(res.statusCode, res.body).toBe(200);
      return res.json();
    };
    const series = async (machine: string, point: string) =>
      (await get(`/api/v1/trends?machine=${machine}&point=${point}&indicator=velocity_rms_mm_per_s&bucket=day&from=2025-03-01&to=2025-04-01`)).buckets as Array<{ start: string; count: number; max: number }>;
    const openAlarms = async (point: string) =>
      (await get('/api/v1/alarms')).filter((a: { pointId: string; indicator: string }) => a.pointId === point && a.indicator === 'velocity_rms_mm_per_s');

    async function upload(name: string, at: string, velocityRms: number) {
      const res = await svc.app.inject({
        method: 'POST',
        url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?recordedAt=${at}&unit=m/s%5E2`,
        headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' },
        payload: accelerationWithVelocityRms(velocityRms),
      });
      expect(res.statusCode, res.body).toBe(201);
      ids[name] = res.json().recordingId;
    }

    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'corrections');
      for (const [id, text] of [[MACHINE, JSON.stringify(model)], [PUMP, pumpText]] as const) {
        const res = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${id}/model?validFrom=2024-01-01T00:00:00Z`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: text });
        expect(res.statusCode, res.body).toBe(200);
      }
      // three days of one point, the last one by mistake from another, badly vibrating machine
      await upload('monday', '2025-03-10T08:00:00Z', 1.0);
      await upload('tuesday', '2025-03-11T08:00:00Z', 1.2);
      await upload('mistake', '2025-03-12T08:00:00Z', 5.0);
    });
    afterAll(async () => svc?.close());

    it('raised a trip on the mistaken recording, as the rule says', async () => {
      const open = await openAlarms(POINT);
      expect(open).toHaveLength(1);
      expect(open[0]).toMatchObject({ level: 'trip', recordingId: ids.mistake });
    });

    it('refuses corrections to a logger key and hides other sites\' recordings', async () => {
      expect((await request('DELETE', `/api/v1/recordings/${ids.mistake}`, site.keys.logger)).statusCode).toBe(403);
      const other = await makeSite(svc.db, 'elsewhere');
      const del = await request('DELETE', `/api/v1/recordings/${ids.mistake}`, other.keys.engineer);
      expect(del.statusCode, del.body).toBe(404);
      const patch = await request('PATCH', `/api/v1/recordings/${ids.mistake}`, other.keys.engineer, { pointId: OTHER_POINT });
      expect(patch.statusCode, patch.body).toBe(404);
    });

    it('deletes the mistaken recording: its trend value goes, the alarm clears on the newest left, the audit log keeps who, what and why', async () => {
      const res = await svc.app.inject({
        method: 'DELETE',
        url: `/api/v1/recordings/${ids.mistake}`,
        headers: { ...auth(site.keys.engineer), 'content-type': 'application/json' },
        payload: JSON.stringify({ reason: 'logger was on the wrong machine' }),
      });
      expect(res.statusCode, res.body).toBe(200);
      const { audit } = res.json();
      expect(audit).toMatchObject({ action: 'delete', recordingId: ids.mistake, reason: 'logger was on the wrong machine', after: null });
      expect(audit.by).toBe(`corrections engineer (${(await svc.db.sql<{ id: string }[]>`select id from api_keys where label = 'corrections engineer'`)[0]!.id})`);
      expect(audit.before).toMatchObject({ machineId: MACHINE, pointId: POINT, recordedAt: '2025-03-12T08:00:00.000Z', zone: 'D' });
      near(audit.before.velocityRmsMmPerS, 5.0);
      expect(audit.before.contentSha256).toMatch(/^[0-9a-f]{64}$/);

      expect((await request('GET', `/api/v1/recordings/${ids.mistake}`, site.keys.engineer)).statusCode).toBe(404);
      const buckets = await series(MACHINE, POINT);
      expect(buckets.map((b) => b.start.slice(0, 10))).toEqual(['2025-03-10', '2025-03-11']);
      // the newest left reads 1.2 mm/s, below ALARM (2.8): the trip clears
      expect(await openAlarms(POINT)).toEqual([]);
      const cleared = (await get('/api/v1/alarms?state=all')).find((a: { recordingId: string | null; level: string }) => a.level === 'trip');
      expect(cleared.clearedAt).not.toBeNull();
      // the daily roll-up the fleet ranking reads lost the day as well
      const days = await svc.db.sql<{ day: string }[]>`select day::text from trend_daily d join points p on p.id = d.point_id where p.point_key = ${POINT} and d.indicator = 'velocity_rms_mm_per_s' order by day`;
      expect(days.map((d) => d.day)).toEqual(['2025-03-10', '2025-03-11']);
      // a second delete finds nothing
      expect((await request('DELETE', `/api/v1/recordings/${ids.mistake}`, site.keys.engineer)).statusCode).toBe(404);
    });

    it('moves a recording to the day it was really taken: both days of the roll-up follow', async () => {
      const res = await request('PATCH', `/api/v1/recordings/${ids.tuesday}`, site.keys.engineer, { recordedAt: '2025-03-13T09:30:00Z', reason: 'logger clock was a day behind' });
      expect(res.statusCode, res.body).toBe(200);
      expect(res.json().audit).toMatchObject({ action: 'move', before: { recordedAt: '2025-03-11T08:00:00.000Z' }, after: { machineId: MACHINE, pointId: POINT, recordedAt: '2025-03-13T09:30:00.000Z' } });
      const buckets = await series(MACHINE, POINT);
      expect(buckets.map((b) => [b.start.slice(0, 10), b.count])).toEqual([['2025-03-10', 1], ['2025-03-13', 1]]);
      near(buckets[1]!.max, 1.2);
      const meta = await get(`/api/v1/recordings/${ids.tuesday}`);
      expect(meta.recordedAt).toBe('2025-03-13T09:30:00.000Z');
    });

    it('moves a recording to a point of another machine, analyses it there, and follows with both series and the alarms', async () => {
      const res = await request('PATCH', `/api/v1/recordings/${ids.tuesday}`, site.keys.admin, { machineId: PUMP, pointId: 'motor-de-h', reason: 'filed under the wrong machine' });
      expect(res.statusCode, res.body).toBe(200);
      const body = res.json();
      expect(body.audit.after).toMatchObject({ machineId: PUMP, pointId: 'motor-de-h' });
      near(body.analysis.velocityRmsMmPerS, 1.2);
      const analysis = await get(`/api/v1/recordings/${ids.tuesday}/analysis`);
      expect(analysis.pointId).toBe('motor-de-h');
      expect((await get(`/api/v1/recordings/${ids.tuesday}/analyses`)).length).toBe(3);
      expect((await series(MACHINE, POINT)).map((b) => b.start.slice(0, 10))).toEqual(['2025-03-10']);
      expect((await series(PUMP, 'motor-de-h')).map((b) => b.start.slice(0, 10))).toEqual(['2025-03-13']);
      const meta = await get(`/api/v1/recordings/${ids.tuesday}`);
      expect([meta.machineId, meta.pointId]).toEqual([PUMP, 'motor-de-h']);
    });

    it('takes an alarm along when the recording that raised it moves: cleared where it left, raised where it is newest now', async () => {
      // 6 mm/s is over both points' trip levels (mixer C/D 4.5; pump-de-h's own 5.6), which the rule raises at once
      await upload('loud', '2025-03-20T08:00:00Z', 6.0);
      expect((await openAlarms(POINT)).map((a: { level: string }) => a.level)).toEqual(['trip']);
      const res = await request('PATCH', `/api/v1/recordings/${ids.loud}`, site.keys.engineer, { machineId: PUMP, pointId: 'pump-de-h', reason: 'pump reading' });
      expect(res.statusCode, res.body).toBe(200);
      expect(await openAlarms(POINT)).toEqual([]);
      const pump = await openAlarms('pump-de-h');
      expect(pump).toHaveLength(1);
      expect(pump[0]).toMatchObject({ machineId: PUMP, recordingId: ids.loud });
    });

    it('refuses a move with nothing to change, to a tach point, or to a point that does not exist', async () => {
      const same = await request('PATCH', `/api/v1/recordings/${ids.monday}`, site.keys.engineer, { recordedAt: '2025-03-10T08:00:00Z' });
      expect([same.statusCode, same.json().type]).toEqual([400, 'urn:kinespec:problem:validation-failed']);
      const empty = await request('PATCH', `/api/v1/recordings/${ids.monday}`, site.keys.engineer, { reason: 'x' });
      expect(empty.statusCode).toBe(400);
      const tach = await request('PATCH', `/api/v1/recordings/${ids.monday}`, site.keys.engineer, { pointId: 'input-encoder' });
      expect(tach.statusCode).toBe(400);
      expect(tach.json().detail).toMatch(/encoder point/);
      const missing = await request('PATCH', `/api/v1/recordings/${ids.monday}`, site.keys.engineer, { machineId: PUMP });
      expect(missing.statusCode).toBe(400);
      const nowhere = await request('PATCH', `/api/v1/recordings/${ids.monday}`, site.keys.engineer, { pointId: 'nowhere' });
      expect(nowhere.statusCode).toBe(404);
    });

    it('lists the corrections newest first, by machine (before or after) and by recording', async () => {
      const all = await get('/api/v1/audit');
      expect(all.map((e: { action: string }) => e.action)).toEqual(['move', 'move', 'move', 'delete']);
      expect((await get(`/api/v1/audit?machine=${PUMP}`)).length).toBe(2);
      expect((await get(`/api/v1/audit?machine=${MACHINE}`)).length).toBe(4);
      expect((await get(`/api/v1/audit?recording=${ids.mistake}`)).map((e: { action: string }) => e.action)).toEqual(['delete']);
      expect(await get('/api/v1/audit?recording=not-a-uuid')).toEqual([]);
    });

    it('analyses the channel an upload names, and keeps it through a re-analysis', async () => {
      const x = new Float64Array(SAMPLE_COUNT);
      const y = new Float64Array(SAMPLE_COUNT);
      for (let i = 0; i < x.length; i++) {
        x[i] = 0.1 * Math.sin((OMEGA_RAD_PER_S * i) / SAMPLE_RATE_HZ);
        y[i] = ((2 * Math.SQRT2 * OMEGA_RAD_PER_S) / 1000) * Math.sin((OMEGA_RAD_PER_S * i) / SAMPLE_RATE_HZ);
      }
      const body = Buffer.from(encodeWav({ sampleRateHz: SAMPLE_RATE_HZ, channels: [{ name: 'axial', unit: 'm/s^2', samples: x }, { name: 'radial', unit: 'm/s^2', samples: y }], metadata: {} }, { format: 'float32' }));
      const bad = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?channel=3&unit=m/s%5E2`, headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: body });
      expect(bad.statusCode).toBe(400);
      expect(bad.json().detail).toBe("query.channel: '3' names no channel; the recording has 1 'ch1', 2 'ch2'");
      const res = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?channel=2&unit=m/s%5E2&recordedAt=2025-03-14T08:00:00Z`, headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: body });
      expect(res.statusCode, res.body).toBe(201);
      expect(res.json().analysis).toMatchObject({ analysedChannel: 2, channels: [{ name: 'ch1', unit: 'm/s^2' }, { name: 'ch2', unit: 'm/s^2' }] });
      near(res.json().analysis.velocityRmsMmPerS, 2);
      const again = await request('POST', `/api/v1/machines/${MACHINE}/reanalyse`, site.keys.admin);
      expect(again.statusCode, again.body).toBe(200);
      const analysis = await get(`/api/v1/recordings/${res.json().recordingId}/analysis`);
      expect(analysis.channel).toBe(1);
      near(analysis.overall.velocityRmsMmPerS, 2);
    });
  });
}
