import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { accelerationWithVelocityRms, MACHINE, modelText, OMEGA_RAD_PER_S, SAMPLE_COUNT, SAMPLE_RATE_HZ, POINT } from './fixtures.js';
import { encodeWav } from '@kinespec/signal';

/*
 * Trends, alarms and re-analysis through HTTP, every expected number computed by hand in this file.
 * Recordings are sines whose r.m.s. velocity is known in closed form: an acceleration sine of amplitude
 * A at omega rad/s reads A / (omega sqrt 2) (common practice); a velocity sine of amplitude V reads V / sqrt 2.
 * The model is ISO 10816-3 group 2 on a rigid foundation: zone boundaries 1.4 / 2.8 / 4.5 mm/s (Table A.1,
 * from memory, see packages/diagnosis/src/iso-zones.ts), so without point levels ALARM = 2.8 (B/C) and
 * TRIP = 4.5 (C/D).
 */

const VELOCITY_POINT = 'gb-output-v';
const model = JSON.parse(modelText) as { points: unknown[] };
model.points.push({ id: VELOCITY_POINT, near: 'output-nde', direction: 'vertical', quantity: 'velocity', unit: 'mm/s', alarmVelocityRmsMmPerS: 3, tripVelocityRmsMmPerS: 6 });
const testModelText = JSON.stringify(model);

function velocityWithRms(v: number): Buffer {
  const x = new Float64Array(SAMPLE_COUNT);
  for (let i = 0; i < x.length; i++) x[i] = v * Math.SQRT2 * Math.sin((OMEGA_RAD_PER_S * i) / SAMPLE_RATE_HZ);
  return Buffer.from(encodeWav({ sampleRateHz: SAMPLE_RATE_HZ, channels: [{ name: 'vel', unit: 'mm/s', samples: x }], metadata: {} }, { format: 'float32' }));
}

const near = (actual: number, expected: number) => expect(Math.abs(actual / expected - 1), `${actual} vs ${expected}`).toBeLessThan(0.02);

for (const target of targets) {
  describe(`trends, alarms and re-analysis on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;

    async function upload(point: string, at: string, body: Buffer, unit: string) {
      const res = await svc.app.inject({
        method: 'POST',
        url: `/api/v1/machines/${MACHINE}/points/${point}/recordings?recordedAt=${at}&unit=${encodeURIComponent(unit)}`,
        headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' },
        payload: body,
      });
      expect(res.statusCode, res.body).toBe(201);
      return res.json() as { recordingId: string };
    }
    const get = async (url: string) => {
      const res = await svc.app.inject({ method: 'GET', url, headers: auth(site.keys.engineer) });
      expect(res.statusCode, res.body).toBe(200);
      return res.json();
    };

    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'trends');
      const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: testModelText });
      expect(put.statusCode).toBe(200);
      // in time order, as a logger sends them (alarms follow the newest recording)
      await upload(POINT, '2025-01-06T08:00:00Z', accelerationWithVelocityRms(1.0), 'm/s^2'); // Monday
      await upload(POINT, '2025-01-08T08:00:00Z', accelerationWithVelocityRms(2.0), 'm/s^2');
      await upload(POINT, '2025-01-12T23:00:00Z', accelerationWithVelocityRms(3.5), 'm/s^2'); // Sunday, same ISO week
      await upload(POINT, '2025-01-13T01:00:00Z', accelerationWithVelocityRms(5.0), 'm/s^2'); // Monday of the next week
      await upload(POINT, '2025-02-03T12:00:00Z', accelerationWithVelocityRms(1.2), 'm/s^2');
      // history uploaded late: older than the newest recording, so it moves no alarm (4.99, not 5.0: the
      // same bytes twice at one point read as a retry)
      await upload(POINT, '2025-01-01T00:00:00Z', accelerationWithVelocityRms(4.99), 'm/s^2');
      await upload(VELOCITY_POINT, '2025-01-06T09:00:00Z', velocityWithRms(2.9), 'mm/s');
      await upload(VELOCITY_POINT, '2025-01-07T09:00:00Z', velocityWithRms(6.5), 'mm/s');
    });
    afterAll(async () => svc?.close());

    const range = '&from=2025-01-02&to=2025-03-01';

    it('buckets by ISO week (Monday to Sunday) with values computed by hand', async () => {
      const t = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=week${range}`);
      expect(t).toMatchObject({ machineId: MACHINE, pointId: POINT, indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', bucket: 'week', alarmLevel: 2.8, tripLevel: 4.5 });
      expect(t.zoneBoundaries).toEqual({ ab: 1.4, bc: 2.8, cd: 4.5 });
      expect(t.buckets.map((b: { start: string }) => b.start)).toEqual(['2025-01-06T00:00:00.000Z', '2025-01-13T00:00:00.000Z', '2025-02-03T00:00:00.000Z']);
      const [w1, w2, w3] = t.buckets;
      // week of 6 Jan: 1.0, 2.0, 3.5 -> count 3, mean 6.5 / 3, max 3.5 (zone C: 2.8 <= 3.5 < 4.5), last 3.5
      expect([w1.count, w1.zone, w1.alarmState]).toEqual([3, 'C', 'alarm']);
      near(w1.min, 1.0);
      near(w1.mean, 6.5 / 3);
      near(w1.max, 3.5);
      near(w1.last, 3.5);
      expect([w2.count, w2.zone, w2.alarmState]).toEqual([1, 'D', 'trip']);
      near(w2.mean, 5.0);
      expect([w3.count, w3.zone, w3.alarmState]).toEqual([1, 'A', 'normal']);
      near(w3.last, 1.2);
    });

    it('buckets by month and by day with values computed by hand', async () => {
      const months = (await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=month${range}`)).buckets;
      expect(months.map((b: { start: string; count: number }) => [b.start.slice(0, 10), b.count])).toEqual([['2025-01-01', 4], ['2025-02-01', 1]]);
      near(months[0].mean, (1 + 2 + 3.5 + 5) / 4);
      near(months[0].last, 5.0);
      expect(months[0].zone).toBe('D');
      const days = (await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=day${range}`)).buckets;
      expect(days.map((b: { start: string }) => b.start.slice(0, 10))).toEqual(['2025-01-06', '2025-01-08', '2025-01-12', '2025-01-13', '2025-02-03']);
      // the late upload of 1 Jan is in the series; from=2025-01-02 leaves it out, from=2025-01-01 takes it
      const all = (await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=month&from=2025-01-01&to=2025-03-01`)).buckets;
      expect(all[0].count).toBe(5);
    });

    it("uses the point's own alarm and trip levels where the model sets them", async () => {
      const t = await get(`/api/v1/trends?machine=${MACHINE}&point=${VELOCITY_POINT}&bucket=day${range}`);
      expect([t.alarmLevel, t.tripLevel]).toEqual([3, 6]);
      expect(t.buckets.map((b: { alarmState: string }) => b.alarmState)).toEqual(['normal', 'trip']);
    });

    it('raises and clears alarms by the documented rule: trip at once, alarm after two recordings, clear after two under the clear level', async () => {
      const alarms = (await get('/api/v1/alarms?state=all')).filter((a: { indicator: string }) => a.indicator === 'velocity_rms_mm_per_s');
      const byPoint = Object.fromEntries(alarms.map((a: { pointId: string }) => [a.pointId, a]));
      expect(alarms).toHaveLength(2);
      // 3.5 >= 2.8 on 12 Jan is one recording over ALARM: not yet raised (persistence); 5.0 >= 4.5 on 13 Jan raises
      // TRIP at once; 1.2 on 3 Feb is the first recording under the clear level 0.9 x 2.8 = 2.52: still open
      expect(byPoint[POINT]).toMatchObject({ machineId: MACHINE, level: 'trip', threshold: 4.5, raisedAt: '2025-01-13T01:00:00.000Z', clearedAt: null });
      near(byPoint[POINT].value, 5.0);
      // the value now beside the value that raised it: the newest recording (3 Feb), not the late upload of 1 Jan
      near(byPoint[POINT].currentValue, 1.2);
      expect(byPoint[POINT].currentAt).toBe('2025-02-03T12:00:00.000Z');
      expect(byPoint[VELOCITY_POINT]).toMatchObject({ level: 'trip', threshold: 6, clearedAt: null });
      const active = (await get('/api/v1/alarms')).filter((a: { indicator: string }) => a.indicator === 'velocity_rms_mm_per_s');
      expect(active.map((a: { pointId: string }) => a.pointId).sort()).toEqual([POINT, VELOCITY_POINT].sort());
    });

    it('lists the indicators of a point with their units and counts', async () => {
      const rows = await get(`/api/v1/indicators?machine=${MACHINE}&point=${POINT}`);
      expect(rows).toContainEqual({ pointId: POINT, indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', count: 6 });
      // recordings came in m/s^2, the point is in g: the acceleration indicators are trended in the point's unit
      expect(rows).toContainEqual({ pointId: POINT, indicator: 'acceleration_peak', unit: 'g', count: 6 });
      const peak = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&indicator=acceleration_peak&bucket=day&from=2025-01-06&to=2025-01-07`);
      // 6 Jan: A = 1.0 x sqrt 2 x 1000 / 1000 = 1.41421 m/s^2 = 0.144210 g (standard gravity 9.80665 m/s^2, CGPM 1901)
      expect(peak.unit).toBe('g');
      near(peak.buckets[0].max, Math.SQRT2 / 9.80665);
    });

    it('ranks the machine by the rise of its worst point', async () => {
      // as of 14 Jan, weeks = 1: days 8-14 Jan against 1-7 Jan. gb-input-h: mean(2, 3.5, 5) = 3.5 against
      // mean(4.99, 1) = 2.995 (+16.9 %); gb-output-v has nothing after 7 Jan, so gb-input-h is the machine's row
      const rows = await get('/api/v1/fleet/ranking?weeks=1&asOf=2025-01-14T12:00:00Z');
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({ machineId: MACHINE, pointId: POINT, indicator: 'velocity_rms_mm_per_s' });
      near(rows[0].before, 2.995);
      near(rows[0].after, 3.5);
      near(rows[0].risePercent, (100 * (3.5 - 2.995)) / 2.995);
    });

    it('re-analyses against a new model version and keeps the old analyses', async () => {
      const v2 = JSON.parse(testModelText);
      v2.name = 'Lakemoor aeration mixer 2, after the gearbox overhaul';
      const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: JSON.stringify(v2) });
      expect(put.json()).toEqual({ machineId: MACHINE, version: 2 });
      const trendBefore = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=month${range}`);
      const res = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(site.keys.admin) });
      expect(res.statusCode, res.body).toBe(200);
      expect(res.json()).toMatchObject({ analysed: 8, modelVersion: 2, failed: [] });
      const [latest] = await get(`/api/v1/machines/${MACHINE}/points/${POINT}/recordings?limit=1`);
      const versions = await get(`/api/v1/recordings/${latest.id}/analyses`);
      expect(versions.map((v: { modelVersion: number; current: boolean }) => [v.modelVersion, v.current])).toEqual([[1, false], [2, true]]);
      expect((await get(`/api/v1/recordings/${latest.id}/analysis`)).modelVersion).toBe(2);
      // one trend value per recording still: the same buckets, not twice as many values
      const trendAfter = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=month${range}`);
      expect(trendAfter.buckets.map((b: { count: number }) => b.count)).toEqual(trendBefore.buckets.map((b: { count: number }) => b.count));
      const machine = await get(`/api/v1/machines/${MACHINE}`);
      expect(machine.modelVersions.map((v: { version: number }) => v.version)).toEqual([1, 2]);
      expect(machine.points.find((p: { id: string }) => p.id === VELOCITY_POINT)).toMatchObject({ quantity: 'velocity', alarmLevel: 3, tripLevel: 6 });
    });

    it('answers an invalid model with every validator problem', async () => {
      const bad = JSON.parse(testModelText);
      bad.gearMeshes[0].driver.teeth = 0;
      delete bad.speed;
      const res = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: JSON.stringify(bad) });
      expect(res.statusCode).toBe(422);
      const body = res.json();
      expect(body.type).toBe('urn:kinespec:problem:invalid-machine-model');
      expect(body.errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(['speed', 'gearMeshes[0].driver.teeth']));
      const check = await svc.app.inject({ method: 'POST', url: '/api/v1/models/validate', headers: { ...auth(site.keys.engineer), 'content-type': 'application/json' }, payload: JSON.stringify(bad) });
      expect(check.json().ok).toBe(false);
      expect(check.json().problems.length).toBe(body.errors.length);
      const yaml = await svc.app.inject({ method: 'POST', url: '/api/v1/models/validate', headers: { ...auth(site.keys.engineer), 'content-type': 'application/yaml' }, payload: 'id: m\nspeed: { shaft: a, nominalRpm: 1500 }\nshafts: [{ id: a }]\n' });
      expect(yaml.json()).toEqual({ ok: true, problems: [] });
    });
  });
}
