import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bootstrap } from '../../services/api/src/bootstrap.js';
import { DEMO_RECORDINGS_PER_WEEK, DEMO_WEEKS, demoSeverity, seedDemo } from '../../services/api/src/demo-seed.js';
import { auth, startTestService, targets, type TestService } from './harness.js';

/*
 * The demo's faults are built into the simulated vibration only; the recordings reach the service as
 * WAV files (which carry no fault information) through the real upload. This seeds the first and the
 * last slot of the two machines that develop faults and checks that the analysis, not the seeding,
 * tells them apart. (The full twelve weeks are what `npm start` seeds; too slow for the unit suite.)
 */

const ADMIN = 'demo-test-admin-key-0123456789';
const LAST = DEMO_WEEKS * DEMO_RECORDINGS_PER_WEEK - 1;

describe('the demo site', () => {
  let svc: TestService;
  let engineer: string;
  const now = new Date('2025-06-30T12:00:00Z');
  beforeAll(async () => {
    svc = await startTestService(targets[0]!);
    const boot = await bootstrap(svc.db.sql, { adminKey: ADMIN, siteName: 'demo' });
    const keys = await seedDemo(svc.app, svc.db.sql, boot.siteId, {
      adminKey: ADMIN, now, slots: [0, LAST], machines: ['skelmere-conveyor-drive-2', 'skelmere-id-fan-1'],
    });
    expect(keys.recordings).toBe(12);
    engineer = keys.engineer;
  });
  afterAll(async () => svc?.close());

  const scoreAt = async (machine: string, point: string, indicator: string) => {
    const res = await svc.app.inject({ url: `/api/v1/trends?machine=${machine}&point=${point}&indicator=${encodeURIComponent(indicator)}&bucket=day&from=2025-01-01&to=2025-07-01`, headers: auth(engineer) });
    return (res.json().buckets as Array<{ max: number }>).map((b) => b.max);
  };

  it('develops the faults only in the simulation schedule', () => {
    expect(demoSeverity({ fault: 'gear-broken-tooth', component: 'hs-pinion', onsetWeek: 3, finalSeverity: 1 }, 0)).toBe(0);
    expect(demoSeverity({ fault: 'gear-broken-tooth', component: 'hs-pinion', onsetWeek: 3, finalSeverity: 1 }, LAST / 2)).toBeGreaterThan(0.8);
  });

  it('finds the broken pinion tooth in the last recordings and not in the first', async () => {
    const scores = await scoreAt('skelmere-conveyor-drive-2', 'gb-input-h', 'score:gear-broken-tooth:hs-pinion');
    expect(scores).toHaveLength(2);
    expect(scores[0]).toBeLessThan(0.5);
    expect(scores[1]).toBeGreaterThanOrEqual(0.5);
  });

  it("finds the fan bearing's outer-race defect in the last recordings and not in the first", async () => {
    const scores = await scoreAt('skelmere-id-fan-1', 'fan-de-h', 'score:bearing-outer-race:fan-de');
    expect(scores[0]).toBeLessThan(0.5);
    expect(scores[1]).toBeGreaterThanOrEqual(0.5);
  });
});
