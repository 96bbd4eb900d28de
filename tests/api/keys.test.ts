import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashApiKey } from '../../services/api/src/auth.js';
import { insertApiKey } from '../../services/api/src/store.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';

const PLATFORM_KEY = 'platform-key-for-tests-0123456789abcdef';

for (const target of targets) {
  describe(`keys and sites on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    let other: TestSite;
    beforeAll(async () => {
      svc = await startTestService(target);
      site = await makeSite(svc.db, 'keys');
      other = await makeSite(svc.db, 'other');
      await insertApiKey(svc.db.sql, { siteId: other.siteId, role: 'platform', label: 'platform', keyHash: hashApiKey(PLATFORM_KEY) });
    });
    afterAll(async () => svc?.close());

    const list = async (key: string) => svc.app.inject({ url: '/api/v1/keys', headers: auth(key) });

    it("lists the admin's own site's keys with their last use, and none of another site", async () => {
      await svc.app.inject({ url: '/api/v1/site', headers: auth(site.keys.logger) });
      const res = await list(site.keys.admin);
      expect(res.statusCode).toBe(200);
      const keys = res.json() as Array<{ role: string; lastUsedAt: string | null; revokedAt: string | null }>;
      expect(keys.map((k) => k.role).sort()).toEqual(['admin', 'engineer', 'logger']);
      const logger = keys.find((k) => k.role === 'logger')!;
      expect(Date.now() - Date.parse(logger.lastUsedAt!)).toBeLessThan(60_000);
      expect(keys.find((k) => k.role === 'engineer')!.lastUsedAt).toBeNull();
      expect(JSON.stringify(keys)).not.toContain('hash');
    });

    it('revokes a key at once, and answers 404 for a key of another site', async () => {
      const made = (await svc.app.inject({ method: 'POST', url: '/api/v1/keys', headers: auth(site.keys.admin), payload: { role: 'logger', label: 'press logger' } })).json();
      expect((await svc.app.inject({ url: '/api/v1/site', headers: auth(made.key) })).statusCode).toBe(200);
      const revoked = await svc.app.inject({ method: 'DELETE', url: `/api/v1/keys/${made.id}`, headers: auth(site.keys.admin) });
      expect(revoked.statusCode).toBe(200);
      expect(revoked.json().revokedAt).not.toBeNull();
      expect((await svc.app.inject({ url: '/api/v1/site', headers: auth(made.key) })).statusCode).toBe(401);
      const otherKeys = (await list(other.keys.admin)).json() as Array<{ id: string }>;
      const foreign = await svc.app.inject({ method: 'DELETE', url: `/api/v1/keys/${otherKeys[0]!.id}`, headers: auth(site.keys.admin) });
      expect(foreign.statusCode).toBe(404);
    });

    it('rotates a key: a new key with the same role and label, the old one revoked and pointing at it', async () => {
      const made = (await svc.app.inject({ method: 'POST', url: '/api/v1/keys', headers: auth(site.keys.admin), payload: { role: 'engineer', label: 'night shift' } })).json();
      const rotated = await svc.app.inject({ method: 'POST', url: `/api/v1/keys/${made.id}/rotate`, headers: auth(site.keys.admin) });
      expect(rotated.statusCode).toBe(201);
      const fresh = rotated.json();
      expect(fresh).toMatchObject({ role: 'engineer', label: 'night shift' });
      expect(fresh.key).not.toBe(made.key);
      expect((await svc.app.inject({ url: '/api/v1/machines', headers: auth(made.key) })).statusCode).toBe(401);
      expect((await svc.app.inject({ url: '/api/v1/machines', headers: auth(fresh.key) })).statusCode).toBe(200);
      const old = ((await list(site.keys.admin)).json() as Array<{ id: string; replacedBy: string | null }>).find((k) => k.id === made.id)!;
      expect(old.replacedBy).toBe(fresh.id);
    });

    it('lets only a platform key create a site, whose admin sees only the new site', async () => {
      expect((await svc.app.inject({ method: 'POST', url: '/api/v1/sites', headers: auth(site.keys.admin), payload: { name: 'x' } })).statusCode).toBe(403);
      const res = await svc.app.inject({ method: 'POST', url: '/api/v1/sites', headers: auth(PLATFORM_KEY), payload: { name: 'Harbour pumping station' } });
      expect(res.statusCode).toBe(201);
      const created = res.json();
      const who = await svc.app.inject({ url: '/api/v1/site', headers: auth(created.adminKey) });
      expect(who.json()).toMatchObject({ id: created.siteId, name: 'Harbour pumping station', role: 'admin' });
      expect((await svc.app.inject({ url: '/api/v1/machines', headers: auth(PLATFORM_KEY) })).statusCode).toBe(403);
    });
  });
}
