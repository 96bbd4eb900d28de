import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dropExpiredSamples } from '../../services/api/src/sample-retention.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

for (const target of targets) {
  describe(`raw sample retention on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'retention');
      await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    });
    afterAll(async () => svc?.close());

    const upload = (amplitude: number, at: string) => svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2&recordedAt=${at}`,
      headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, payload: wav(sine(amplitude, 8192)),
    });

    it('drops the samples of recordings older than the setting and keeps their analysis, trends and the rest', async () => {
      const old = (await upload(2, new Date(Date.now() - 400 * 86_400_000).toISOString())).json().recordingId;
      const recent = (await upload(3, new Date(Date.now() - 10 * 86_400_000).toISOString())).json().recordingId;
      expect(await dropExpiredSamples(svc.db.sql, 365)).toBe(1);
      expect(await dropExpiredSamples(svc.db.sql, 365)).toBe(0);
      const sizes = await svc.db.sql<{ id: string; bytes: number }[]>`select id, octet_length(samples) as bytes from recordings order by recorded_at`;
      expect(sizes.map((r) => [r.id, r.bytes])).toEqual([[old, 0], [recent, 4 * 8192]]);
      const meta = (await svc.app.inject({ url: `/api/v1/recordings/${old}`, headers: auth(site.keys.engineer) })).json();
      expect(meta.samplesPurgedAt).not.toBeNull();
      expect((await svc.app.inject({ url: `/api/v1/recordings/${old}/analysis`, headers: auth(site.keys.engineer) })).statusCode).toBe(200);
      const [trend] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from trend_values where recording_id = ${old}`;
      expect(trend!.n).toBeGreaterThan(0);
      // a re-analysis cannot use it, says why, and leaves its analysis current
      const re = (await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(site.keys.admin) })).json();
      expect(re.failed).toEqual([expect.objectContaining({ recordingId: old, reason: expect.stringMatching(/dropped/) })]);
      expect(re.analysed).toBe(1);
      // nor can a move, which would need a new analysis where it goes: 409, the recording left where it was
      const move = await svc.app.inject({
        method: 'PATCH', url: `/api/v1/recordings/${old}`, headers: { ...auth(site.keys.engineer), 'content-type': 'application/json' },
        payload: { recordedAt: new Date(Date.now() - 300 * 86_400_000).toISOString(), reason: 'test' },
      });
      expect(move.statusCode, move.body).toBe(409);
      expect(move.json().detail).toMatch(/raw samples were dropped/);
      expect((await svc.app.inject({ url: `/api/v1/recordings/${old}`, headers: auth(site.keys.engineer) })).json().recordedAt).toBe(meta.recordedAt);
    });

    it('keeps everything when the setting is 0', async () => {
      expect(await dropExpiredSamples(svc.db.sql, 0)).toBe(0);
    });
  });
}
