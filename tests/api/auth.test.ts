import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * Every rule of the coordination contract: keys are scoped to a site and a role; a logger only writes
 * recordings; an engineer reads and acknowledges; an admin manages; another site's data answers 404.
 */

describe('authentication and authorisation', () => {
  let svc: TestService;
  let a: TestSite;
  let b: TestSite;
  let recordingId: string;
  let alarmId: string;

  const get = (key: string | null, url: string) => svc.app.inject({ method: 'GET', url, headers: key ? auth(key) : {} });
  const uploadUrl = `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`;

  beforeAll(async () => {
    svc = await startTestService(targets[0]!);
    a = await makeSite(svc.db, 'site A');
    b = await makeSite(svc.db, 'site B');
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(a.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(200);
    // 40 m/s^2 at omega = 1000 rad/s is 28 mm/s r.m.s.: past the group 2 C/D boundary (ISO 10816-3), so an alarm opens
    const up = await svc.app.inject({ method: 'POST', url: uploadUrl, headers: { ...auth(a.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(40)) });
    expect(up.statusCode).toBe(201);
    recordingId = up.json().recordingId;
    const alarms = await get(a.keys.engineer, '/api/v1/alarms');
    alarmId = alarms.json().find((x: { indicator: string }) => x.indicator === 'velocity_rms_mm_per_s').id;
  });
  afterAll(async () => svc?.close());

  it('answers 401 without a key, with a Bearer challenge', async () => {
    const res = await get(null, '/api/v1/machines');
    expect(res.statusCode).toBe(401);
    expect(res.headers['www-authenticate']).toMatch(/^Bearer/);
    expect(res.json().type).toBe('urn:kinespec:problem:unauthorized');
  });

  it('answers 401 for a key it does not know', async () => {
    const res = await get('ksk_not-a-key-of-this-service-at-all-00000000', '/api/v1/site');
    expect(res.statusCode).toBe(401);
  });

  it('lets any key read its own site', async () => {
    for (const role of ['logger', 'engineer', 'admin'] as const) {
      const res = await get(a.keys[role], '/api/v1/site');
      expect(res.json()).toMatchObject({ id: a.siteId, name: 'site A', role });
    }
  });

  it('lets a logger write recordings but read nothing', async () => {
    for (const url of [
      '/api/v1/machines',
      `/api/v1/machines/${MACHINE}`,
      `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`,
      `/api/v1/recordings/${recordingId}`,
      `/api/v1/recordings/${recordingId}/analysis`,
      `/api/v1/trends?machine=${MACHINE}&point=${POINT}`,
      `/api/v1/indicators?machine=${MACHINE}`,
      '/api/v1/fleet/ranking',
      '/api/v1/alarms',
    ]) {
      const res = await get(a.keys.logger, url);
      expect(res.statusCode, url).toBe(403);
      expect(res.json().type).toBe('urn:kinespec:problem:forbidden');
    }
    const ack = await svc.app.inject({ method: 'POST', url: `/api/v1/alarms/${alarmId}/acknowledge`, headers: auth(a.keys.logger) });
    expect(ack.statusCode).toBe(403);
  });

  it('lets an engineer read and acknowledge, but not manage models or keys', async () => {
    expect((await get(a.keys.engineer, '/api/v1/machines')).statusCode).toBe(200);
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(a.keys.engineer), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(403);
    const key = await svc.app.inject({ method: 'POST', url: '/api/v1/keys', headers: auth(a.keys.engineer), payload: { role: 'admin' } });
    expect(key.statusCode).toBe(403);
    const re = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(a.keys.engineer) });
    expect(re.statusCode).toBe(403);
    const ack = await svc.app.inject({ method: 'POST', url: `/api/v1/alarms/${alarmId}/acknowledge`, headers: auth(a.keys.engineer) });
    expect(ack.statusCode).toBe(200);
    expect(ack.json().acknowledgedBy).toMatch(/site A engineer/);
    expect(ack.json().acknowledgedAt).not.toBeNull();
  });

  it('lets an admin create keys that work at once and are stored only as hashes', async () => {
    const res = await svc.app.inject({ method: 'POST', url: '/api/v1/keys', headers: auth(a.keys.admin), payload: { role: 'engineer', label: 'night shift' } });
    expect(res.statusCode).toBe(201);
    const { key, siteId, role } = res.json();
    expect([siteId, role]).toEqual([a.siteId, 'engineer']);
    expect((await get(key, '/api/v1/machines')).statusCode).toBe(200);
    const [row] = await svc.db.sql<Record<string, unknown>[]>`select * from api_keys where id = ${res.json().id}`;
    // the row holds SHA-256(key) (FIPS 180-4, node:crypto) and nowhere the key itself
    expect((row!['key_hash'] as Buffer).toString('hex')).toBe(createHash('sha256').update(key).digest('hex'));
    expect(JSON.stringify(row)).not.toContain(key.slice(4));
  });

  it("shows a site B key nothing of site A: lists are empty, direct ids answer 404", async () => {
    expect((await get(b.keys.engineer, '/api/v1/machines')).json()).toEqual([]);
    expect((await get(b.keys.engineer, '/api/v1/alarms?state=all')).json()).toEqual([]);
    expect((await get(b.keys.engineer, '/api/v1/fleet/ranking?weeks=1')).json()).toEqual([]);
    for (const url of [
      `/api/v1/machines/${MACHINE}`,
      `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`,
      `/api/v1/recordings/${recordingId}`,
      `/api/v1/recordings/${recordingId}/analysis`,
      `/api/v1/recordings/${recordingId}/analyses`,
      `/api/v1/trends?machine=${MACHINE}&point=${POINT}`,
      `/api/v1/indicators?machine=${MACHINE}`,
      `/api/v1/faults?machine=${MACHINE}`,
    ]) {
      const res = await get(b.keys.admin, url);
      expect(res.statusCode, url).toBe(404);
      expect(res.json().type).toBe('urn:kinespec:problem:not-found');
    }
    const up = await svc.app.inject({ method: 'POST', url: uploadUrl, headers: { ...auth(b.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(2)) });
    expect(up.statusCode).toBe(404);
    const ack = await svc.app.inject({ method: 'POST', url: `/api/v1/alarms/${alarmId}/acknowledge`, headers: auth(b.keys.engineer) });
    expect(ack.statusCode).toBe(404);
    const re = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(b.keys.admin) });
    expect(re.statusCode).toBe(404);
  });

  it("gives site B its own machine of the same id without touching site A's", async () => {
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(b.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.json()).toEqual({ machineId: MACHINE, version: 1 });
    const listB = (await get(b.keys.engineer, '/api/v1/machines')).json();
    expect(listB.map((m: { id: string; lastMeasuredAt: string | null }) => [m.id, m.lastMeasuredAt])).toEqual([[MACHINE, null]]);
    const listA = (await get(a.keys.engineer, '/api/v1/machines')).json();
    expect(listA[0].lastMeasuredAt).not.toBeNull();
  });
});
