import type { InjectOptions } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allowed, allRoles, hashApiKey } from '../../services/api/src/auth.js';
import { insertApiKey, type Role } from '../../services/api/src/store.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * The authorization matrix, generated from the service's own route table (app.routeTable): every route x
 * every role x the key's own site and another site. A key without the permission gets 403, no key 401, and
 * another site's key never sees site A: 404 for anything named by id, and no trace of A in lists. A new
 * route fails here until it has a request below (REQUESTS), so no route goes untested.
 */

const PLATFORM_KEY = 'matrix-platform-key-0123456789abcdefghij';

interface Ids {
  reanalysisId: string;
  recordingId: string;
  alarmId: string;
  keyId: string;
  /** Recordings of site A for the corrections, one per request: each is still there when a key tries it. */
  spare: string[];
}

/** A recording of site A no request has touched yet (a deletion or move by one role must not hide another's answer). */
function spareOf(ids: Ids): string {
  const id = ids.spare.pop();
  if (!id) throw new Error('the matrix ran out of spare recordings: upload more in beforeAll');
  return id;
}

const SPARE_RECORDINGS = 8;

/** The request each route is exercised with, naming site A's resources. */
const REQUESTS: Record<string, (ids: Ids) => Omit<InjectOptions, 'headers'> & { headers?: Record<string, string> }> = {
  'GET /api/v1/site': () => ({ url: '/api/v1/site' }),
  'GET /api/v1/machines': () => ({ url: '/api/v1/machines' }),
  'GET /api/v1/machines/:machineId': () => ({ url: `/api/v1/machines/${MACHINE}` }),
  'PUT /api/v1/machines/:machineId/model': () => ({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { 'content-type': 'application/json' }, payload: modelText }),
  'POST /api/v1/models/validate': () => ({ method: 'POST', url: '/api/v1/models/validate', headers: { 'content-type': 'application/json' }, payload: modelText }),
  'POST /api/v1/machines/:machineId/reanalyse': () => ({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse` }),
  'GET /api/v1/reanalyses/:reanalysisId': (ids) => ({ url: `/api/v1/reanalyses/${ids.reanalysisId}` }),
  'POST /api/v1/machines/:machineId/points/:pointId/recordings': () => ({
    method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`, headers: { 'content-type': 'audio/wav' }, payload: wav(sine(1, 4096)),
  }),
  'GET /api/v1/machines/:machineId/points/:pointId/recordings': () => ({ url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings` }),
  'GET /api/v1/recordings/:recordingId': (ids) => ({ url: `/api/v1/recordings/${ids.recordingId}` }),
  'GET /api/v1/recordings/:recordingId/analysis': (ids) => ({ url: `/api/v1/recordings/${ids.recordingId}/analysis` }),
  'GET /api/v1/recordings/:recordingId/analyses': (ids) => ({ url: `/api/v1/recordings/${ids.recordingId}/analyses` }),
  'GET /api/v1/trends': () => ({ url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}` }),
  'GET /api/v1/indicators': () => ({ url: `/api/v1/indicators?machine=${MACHINE}` }),
  'GET /api/v1/fleet/ranking': () => ({ url: '/api/v1/fleet/ranking' }),
  'GET /api/v1/alarms': () => ({ url: '/api/v1/alarms?state=all' }),
  'POST /api/v1/alarms/:alarmId/acknowledge': (ids) => ({ method: 'POST', url: `/api/v1/alarms/${ids.alarmId}/acknowledge` }),
  'POST /api/v1/keys': () => ({ method: 'POST', url: '/api/v1/keys', payload: { role: 'logger', label: 'matrix' } }),
  'GET /api/v1/keys': () => ({ url: '/api/v1/keys' }),
  'DELETE /api/v1/keys/:keyId': (ids) => ({ method: 'DELETE', url: `/api/v1/keys/${ids.keyId}` }),
  'POST /api/v1/keys/:keyId/rotate': (ids) => ({ method: 'POST', url: `/api/v1/keys/${ids.keyId}/rotate` }),
  'POST /api/v1/sites': () => ({ method: 'POST', url: '/api/v1/sites', payload: { name: 'matrix site' } }),
  'GET /api/v1/faults': () => ({ url: `/api/v1/faults?machine=${MACHINE}` }),
  'GET /api/v1/signatures': () => ({ url: `/api/v1/signatures?machine=${MACHINE}&fault=unbalance&component=input` }),
  'DELETE /api/v1/recordings/:recordingId': (ids) => ({ method: 'DELETE', url: `/api/v1/recordings/${spareOf(ids)}?reason=matrix` }),
  'PATCH /api/v1/recordings/:recordingId': (ids) => ({ method: 'PATCH', url: `/api/v1/recordings/${spareOf(ids)}`, payload: { recordedAt: '2021-06-01T00:00:00Z', reason: 'matrix' } }),
  'GET /api/v1/audit': () => ({ url: '/api/v1/audit' }),
};

/** Routes whose answer to another site is a list or a result of its own (no id of site A in the path). */
const SITE_SCOPED_LISTS = new Set(['GET /api/v1/site', 'GET /api/v1/machines', 'GET /api/v1/fleet/ranking', 'GET /api/v1/alarms', 'GET /api/v1/keys', 'POST /api/v1/keys', 'POST /api/v1/models/validate', 'POST /api/v1/sites', 'GET /api/v1/audit']);

describe('authorization matrix', () => {
  const target = targets[targets.length - 1]!;
  let svc: TestService;
  let a: TestSite;
  let b: TestSite;
  let ids: Ids;
  const keyOf = (site: TestSite, role: Role) => (role === 'platform' ? PLATFORM_KEY : site.keys[role as Exclude<Role, 'platform'>]);

  beforeAll(async () => {
    svc = await startTestService(target);
    a = await makeSite(svc.db, 'site A');
    b = await makeSite(svc.db, 'site B');
    await insertApiKey(svc.db.sql, { siteId: b.siteId, role: 'platform', label: 'platform', keyHash: hashApiKey(PLATFORM_KEY) });
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(a.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(200);
    // a zone-D recording: a recording id and a TRIP alarm of site A
    const loud = await svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`,
      headers: { ...auth(a.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(400, 8192)),
    });
    expect(loud.statusCode).toBe(201);
    const alarms = (await svc.app.inject({ url: '/api/v1/alarms', headers: auth(a.keys.engineer) })).json() as Array<{ id: string }>;
    const victim = (await svc.app.inject({ method: "POST", url: "/api/v1/keys", headers: auth(a.keys.admin), payload: { role: "logger", label: "matrix target" } })).json();
    const reanalysis = (await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(a.keys.admin) })).json();
    // older recordings for the corrections (never the point's newest, so the alarm above stays as it is)
    const spare: string[] = [];
    for (let i = 0; i < SPARE_RECORDINGS * 2; i++) {
      const res = await svc.app.inject({
        method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2&recordedAt=2020-01-${String(i + 1).padStart(2, '0')}T00:00:00Z`,
        headers: { ...auth(a.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(1 + i / 10, 4096)),
      });
      expect(res.statusCode).toBe(201);
      spare.push(res.json().recordingId);
    }
    ids = { reanalysisId: reanalysis.reanalysisId, recordingId: loud.json().recordingId, alarmId: alarms[0]!.id, keyId: victim.id, spare };
  });
  afterAll(async () => svc?.close());

  it('has a request for every route that needs a key', () => {
    const missing = (svc.app.routeTable ?? [])
      .filter((r) => r.permission !== null)
      .map((r) => `${r.method} ${r.url}`)
      .filter((name) => !(name in REQUESTS));
    expect(missing).toEqual([]);
    expect(svc.app.routeTable.filter((r) => r.permission !== null).length).toBe(Object.keys(REQUESTS).length);
  });

  it('answers 401 without a key, 403 to a role without the permission, and lets each allowed role through on its own site', async () => {
    const failures: string[] = [];
    for (const route of svc.app.routeTable.filter((r) => r.permission !== null)) {
      const name = `${route.method} ${route.url}`;
      const make = REQUESTS[name]!;
      const none = await svc.app.inject(make(ids) as InjectOptions);
      if (none.statusCode !== 401) failures.push(`${name} without a key: ${none.statusCode}`);
      for (const role of allRoles) {
        const request = make(ids);
        const res = await svc.app.inject({ ...request, headers: { ...request.headers, ...auth(keyOf(a, role)) } } as InjectOptions);
        const mayPass = allowed[route.permission!].includes(role);
        if (mayPass && (res.statusCode === 401 || res.statusCode === 403)) failures.push(`${name} as ${role} of the own site: ${res.statusCode}`);
        if (!mayPass && res.statusCode !== 403) failures.push(`${name} as ${role}: ${res.statusCode}, expected 403`);
      }
    }
    expect(failures).toEqual([]);
  });

  it("never shows site A to another site's keys: 404 by id, nothing of A in lists", async () => {
    const failures: string[] = [];
    for (const route of svc.app.routeTable.filter((r) => r.permission !== null)) {
      const name = `${route.method} ${route.url}`;
      // B may describe a machine of the same id on its own site (ids are per site): that is not a look at A
      if (name === 'PUT /api/v1/machines/:machineId/model') continue;
      for (const role of allRoles.filter((r) => allowed[route.permission!].includes(r))) {
        const request = REQUESTS[name]!(ids);
        const res = await svc.app.inject({ ...request, headers: { ...request.headers, ...auth(keyOf(b, role)) } } as InjectOptions);
        if (SITE_SCOPED_LISTS.has(name)) {
          if (res.statusCode >= 400) failures.push(`${name} as ${role} of site B: ${res.statusCode}`);
          for (const secret of [a.siteId, ids.recordingId, ids.alarmId, ids.keyId]) {
            if (res.body.includes(secret)) failures.push(`${name} as ${role} of site B shows ${secret} of site A`);
          }
        } else if (res.statusCode !== 404) {
          failures.push(`${name} as ${role} of site B: ${res.statusCode}, expected 404`);
        }
      }
    }
    expect(failures).toEqual([]);
    // nothing B did reached A: every recording belongs to the site of its machine
    const [mixed] = await svc.db.sql<{ n: number }[]>`
      select count(*)::int as n from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
      where r.site_id <> m.site_id`;
    expect(mixed!.n).toBe(0);
  });
});
