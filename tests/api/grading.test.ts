import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * Grade once, in the analysis: the zone, alarm state and alarm/trip levels the analysis graded the overall
 * velocity with are stored with it, and the alarm rule and the trends read those, never a second grading
 * from the point's columns (before: three gradings from two sources).
 */

for (const target of targets) {
  describe(`one grading on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'grading');
      const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
      expect(put.statusCode).toBe(200);
    });
    afterAll(async () => svc?.close());

    const upload = (amplitude: number, at: string) => svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2&recordedAt=${at}`,
      headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(amplitude, 8192)),
    });

    it('stores the grading with the analysis and raises alarms from it, not from the point columns', async () => {
      // a point column that disagrees with the model the analysis graded against: a second grading would alarm
      await svc.db.sql`update points set alarm_velocity_rms_mm_per_s = 0.001, trip_velocity_rms_mm_per_s = 0.002 where point_key = ${POINT}`;
      const res = await upload(2, '2025-01-06T08:00:00Z');
      expect(res.statusCode).toBe(201);
      const [row] = await svc.db.sql<{ zone: string; alarmState: string; alarmLevel: number; tripLevel: number }[]>`
        select zone, alarm_state as "alarmState", alarm_level_mm_per_s as "alarmLevel", trip_level_mm_per_s as "tripLevel"
        from analyses where recording_id = ${res.json().recordingId}`;
      const analysis = (await svc.app.inject({ url: `/api/v1/recordings/${res.json().recordingId}/analysis`, headers: auth(site.keys.engineer) })).json();
      expect(row).toEqual({
        zone: analysis.overall.zone,
        alarmState: analysis.overall.alarmState,
        alarmLevel: analysis.overall.alarmLevelMmPerS,
        tripLevel: analysis.overall.tripLevelMmPerS,
      });
      expect(row!.alarmState).toBe('normal');
      const alarms = (await svc.app.inject({ url: '/api/v1/alarms', headers: auth(site.keys.engineer) })).json() as Array<{ indicator: string }>;
      expect(alarms.filter((a) => a.indicator === 'velocity_rms_mm_per_s')).toEqual([]);
    });

    it("reports each trend bucket's zone and alarm state as the analysis of its largest value graded them", async () => {
      const res = await upload(3, '2025-01-07T08:00:00Z');
      // a stored grading that no re-derivation from the value and the point's columns would give
      await svc.db.sql`update analyses set zone = 'D', alarm_state = 'trip', alarm_level_mm_per_s = 1.5, trip_level_mm_per_s = 1.75 where recording_id = ${res.json().recordingId}`;
      const trend = await svc.app.inject({
        url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=week&from=2025-01-06&to=2025-01-13`, headers: auth(site.keys.engineer),
      });
      expect(trend.statusCode).toBe(200);
      const body = trend.json();
      expect(body.buckets).toHaveLength(1);
      expect(body.buckets[0]).toMatchObject({ count: 2, zone: 'D', alarmState: 'trip' });
      expect([body.alarmLevel, body.tripLevel]).toEqual([1.5, 1.75]);
      // the forecast is made against the same levels, and the zone boundaries are the registry's for the model the
      // analysis graded against (ISO 10816-3 group 2, rigid: 1.4, 2.8, 4.5 mm/s), not the point's columns
      await svc.db.sql`update points set iso_group = 1, iso_foundation = 'flexible' where point_key = ${POINT}`;
      const again = (await svc.app.inject({
        url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=week&from=2025-01-06&to=2025-01-13`, headers: auth(site.keys.engineer),
      })).json();
      expect(again.zoneBoundaries).toEqual({ ab: 1.4, bc: 2.8, cd: 4.5 });
      const thresholds = Object.fromEntries((again.forecast.forecasts as Array<{ level: string; threshold: number }>).map((f) => [f.level, f.threshold]));
      expect(thresholds).toMatchObject({ 'zone B': 1.4, 'zone C': 2.8, 'zone D': 4.5, alarm: 1.5, trip: 1.75 });
      // the machine's page shows each point's levels as its newest analysis graded them
      const machine = (await svc.app.inject({ url: `/api/v1/machines/${MACHINE}`, headers: auth(site.keys.engineer) })).json();
      expect(machine.points.find((p: { id: string }) => p.id === POINT)).toMatchObject({ alarmLevel: 1.5, tripLevel: 1.75 });
    });

    it('grades a moved recording once, in its new analysis, and a correction re-applies the rule with the stored levels', async () => {
      // the point columns still disagree with the model (a second grading from them would raise TRIP at once)
      await svc.db.sql`update points set alarm_velocity_rms_mm_per_s = 0.001, trip_velocity_rms_mm_per_s = 0.002 where point_key = ${POINT}`;
      const kept = await upload(2.2, '2025-01-08T08:00:00Z');
      const gone = await upload(2.3, '2025-01-09T08:00:00Z');
      expect([kept.statusCode, gone.statusCode]).toEqual([201, 201]);
      const del = await svc.app.inject({ method: 'DELETE', url: `/api/v1/recordings/${gone.json().recordingId}?reason=test`, headers: auth(site.keys.engineer) });
      expect(del.statusCode, del.body).toBe(200);
      const move = await svc.app.inject({
        method: 'PATCH', url: `/api/v1/recordings/${kept.json().recordingId}`, headers: { ...auth(site.keys.engineer), 'content-type': 'application/json' },
        payload: { recordedAt: '2025-01-10T08:00:00Z', reason: 'logger clock a day slow' },
      });
      expect(move.statusCode, move.body).toBe(200);
      const [row] = await svc.db.sql<{ state: string; alarmState: string; alarmLevel: number; tripLevel: number; n: number }[]>`
        select r.analysis_state as state, a.alarm_state as "alarmState", a.alarm_level_mm_per_s as "alarmLevel", a.trip_level_mm_per_s as "tripLevel",
          (select count(*)::int from analyses x where x.recording_id = r.id) as n
        from recordings r join analyses a on a.recording_id = r.id and a.is_current where r.id = ${kept.json().recordingId}`;
      const analysis = (await svc.app.inject({ url: `/api/v1/recordings/${kept.json().recordingId}/analysis`, headers: auth(site.keys.engineer) })).json();
      expect(row).toEqual({ state: 'done', alarmState: 'normal', alarmLevel: analysis.overall.alarmLevelMmPerS, tripLevel: analysis.overall.tripLevelMmPerS, n: 2 });
      expect(analysis.overall.alarmLevelMmPerS).toBeGreaterThan(0.001);
      const alarms = (await svc.app.inject({ url: '/api/v1/alarms', headers: auth(site.keys.engineer) })).json() as Array<{ indicator: string }>;
      expect(alarms.filter((a) => a.indicator === 'velocity_rms_mm_per_s')).toEqual([]);
    });
  });
}

for (const target of targets) {
  describe(`trend values partitioned by month on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'partitions');
      await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    });
    afterAll(async () => svc?.close());

    it("keeps each month's values in that month's partition and answers the same trend query across them", async () => {
      const ids: string[] = [];
      for (const [i, at] of ['2025-01-20T08:00:00Z', '2025-02-03T08:00:00Z'].entries()) {
        const res = await svc.app.inject({
          method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2&recordedAt=${at}`,
          headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(2 + i, 8192)),
        });
        expect(res.statusCode).toBe(201);
        ids.push(res.json().recordingId);
      }
      const parts = await svc.db.sql<{ part: string }[]>`
        select distinct tableoid::regclass::text as part from trend_values where recording_id in ${svc.db.sql(ids)} order by 1`;
      expect(parts.map((p) => p.part)).toEqual(['trend_values_2025_01', 'trend_values_2025_02']);
      const [kind] = await svc.db.sql<{ kind: string }[]>`select relkind::text as kind from pg_class where relname = 'trend_values'`;
      expect(kind!.kind).toBe('p');
      const trend = await svc.app.inject({ url: `/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=month&from=2025-01-01&to=2025-03-01`, headers: auth(site.keys.engineer) });
      expect((trend.json().buckets as Array<{ count: number }>).map((b) => b.count)).toEqual([1, 1]);
    });
  });
}
