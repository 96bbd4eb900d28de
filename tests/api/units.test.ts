import { ACCEPTED_UNITS } from '@kinespec/signal';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

// Nothing silently assumed: an unknown unit is refused with the list to choose from, and what the service
// assumed (the point's unit for a file that states none) or set aside (a mistyped CSV comment key) comes
// back with the upload's answer and the recording, not only inside the stored analysis.

const url = `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`;

for (const target of targets) {
  describe(`units and warnings on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    const recordings = async () => (await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`)[0]!.n;
    const upload = (headers: Record<string, string>, payload: Buffer | string, query = '') =>
      svc.app.inject({ method: 'POST', url: url + query, headers: { ...auth(site.keys.logger), ...headers }, payload });

    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'units');
      const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
      expect(put.statusCode).toBe(200);
    });
    afterAll(async () => svc?.close());

    it('refuses ?unit=furlongs with a problem that lists the accepted units, and stores nothing', async () => {
      const before = await recordings();
      const res = await upload({ 'content-type': 'audio/wav' }, wav(sine(1)), '?unit=furlongs');
      expect(res.statusCode).toBe(400);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
      const body = res.json();
      expect(body).toMatchObject({ type: 'urn:kinespec:problem:recording-unknown-unit', status: 400, code: 'unknown_unit' });
      expect(body.detail).toMatch(/'furlongs' is not a unit Kinespec knows; accepted: g, m\/s\^2/);
      expect(body.acceptedUnits).toEqual([...ACCEPTED_UNITS]);
      expect(await recordings()).toBe(before);
    });

    it('refuses a CSV column whose bracketed unit it does not know, pointing to the likely one', async () => {
      const text = `acc [gg]\n${Array.from(sine(1), (v) => v.toPrecision(6)).join('\n')}\n`;
      const res = await upload({ 'content-type': 'text/csv' }, text, '?sampleRateHz=25600');
      expect(res.statusCode).toBe(400);
      expect(res.json().detail).toMatch(/^column 'acc': 'gg' is not a unit Kinespec knows \(did you mean 'g'\?\)/);
    });

    it("answers an upload with what it assumed: a mistyped comment key and the point's unit for a file that states none", async () => {
      const text = `# sampleRateHz=25600\n# unti=m/s^2\nacc\n${Array.from(sine(2), (v) => v.toPrecision(6)).join('\n')}\n`;
      const res = await upload({ 'content-type': 'text/csv' }, text);
      expect(res.statusCode, res.body).toBe(201);
      const warnings: string[] = res.json().analysis.warnings;
      expect(warnings[0]).toBe("line 2: '# unti=' is not a key Kinespec reads (did you mean 'unit'?), kept as metadata only");
      // the point's unit (g in the model) was used for the unit-less channel, and the analysis says so
      expect(warnings.some((w) => /'unknown'.*point's unit 'g'/.test(w)), warnings.join(' | ')).toBe(true);
      const meta = await svc.app.inject({ method: 'GET', url: `/api/v1/recordings/${res.json().recordingId}`, headers: auth(site.keys.engineer) });
      expect(meta.json().warnings).toEqual([warnings[0]]);
      expect(meta.json().channelInfo).toEqual([{ name: 'acc', unit: 'unknown' }]);
    });

    it('has no warning for a file whose unit is given', async () => {
      const res = await upload({ 'content-type': 'audio/wav' }, wav(sine(3)), '?unit=m/s%5E2');
      expect(res.statusCode).toBe(201);
      expect(res.json().analysis.warnings.filter((w: string) => /unit/.test(w))).toEqual([]);
    });
  });
}
