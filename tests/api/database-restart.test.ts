import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../services/api/src/config.js';
import { startService, type RunningService } from '../../services/api/src/server.js';
import { postgresBinDir, startPgCluster, type PgCluster } from '../support/pg-cluster.js';
import { MACHINE, modelText, POINT, sine, wav } from './fixtures.js';

/*
 * PostgreSQL restarts under a running service (finding 2 of the hardening review): the process crashed in
 * 2 of 3 tries (an uncaught TypeError from the driver's batched write after its socket closed), uploads
 * answered 500 without Retry-After, and /ready once answered 500. Here a cluster of the test's own (never
 * the machine's PostgreSQL) is stopped and started three times under a stream of uploads.
 */

const bin = postgresBinDir();
const ADMIN_KEY = 'restart-test-admin-key-0123456789';
const port = 55_400 + (process.pid % 90);

describe.skipIf(!bin)('a PostgreSQL restart under load', () => {
  let cluster: PgCluster;
  let svc: RunningService;
  const headers = { authorization: `Bearer ${ADMIN_KEY}` };

  beforeAll(async () => {
    cluster = startPgCluster(port);
    svc = await startService(
      loadConfig({
        DATABASE_URL: cluster.url, KINESPEC_PORT: '0', KINESPEC_ADMIN_KEY: ADMIN_KEY, KINESPEC_DEMO: 'off',
        KINESPEC_ANALYSIS_THREADS: '0', KINESPEC_RATE_LIMIT_MAX: '0', KINESPEC_DB_POOL_MAX: '4',
      }),
      { out: () => {}, logger: false },
    );
    const put = await fetch(`${svc.url}/api/v1/machines/${MACHINE}/model`, { method: 'PUT', headers: { ...headers, 'content-type': 'application/json' }, body: modelText });
    expect(put.status).toBe(200);
  });
  afterAll(async () => {
    await svc?.close().catch(() => {});
    cluster?.destroy();
  });

  async function uploadOnce(key: string): Promise<{ status: number; retryAfter: string | null; type?: string }> {
    try {
      const res = await fetch(`${svc.url}/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`, {
        method: 'POST', headers: { ...headers, 'content-type': 'audio/wav', 'idempotency-key': key }, body: wav(sine(1 + Math.random(), 4096)),
      });
      const body = (await res.json()) as { type?: string };
      return { status: res.status, retryAfter: res.headers.get('retry-after'), ...(body.type ? { type: body.type } : {}) };
    } catch {
      return { status: 0, retryAfter: null };
    }
  }

  it('answers 503 with Retry-After while the database is away and recovers without a process restart', async () => {
    const answers: Array<{ status: number; retryAfter: string | null; type?: string }> = [];
    let stop = false;
    let n = 0;
    const loops = Array.from({ length: 3 }, async () => {
      while (!stop) answers.push(await uploadOnce(`restart-${n++}`));
    });
    const recoveriesMs: number[] = [];
    for (let round = 0; round < 3; round++) {
      await new Promise((r) => setTimeout(r, 700));
      cluster.stop('fast');
      const ready = await fetch(`${svc.url}/ready`);
      expect(ready.status).toBe(503);
      expect(ready.headers.get('retry-after')).toMatch(/^\d+$/);
      expect(ready.headers.get('content-type')).toMatch(/^application\/problem\+json/);
      await new Promise((r) => setTimeout(r, 800));
      cluster.start();
      const back = Date.now();
      for (;;) {
        const probe = await uploadOnce(`probe-${round}-${n++}`);
        if (probe.status === 201) break;
        if (Date.now() - back > 15_000) throw new Error(`no upload succeeded 15 s after the database came back (last ${probe.status})`);
        await new Promise((r) => setTimeout(r, 100));
      }
      recoveriesMs.push(Date.now() - back);
    }
    stop = true;
    await Promise.all(loops);
    expect((await fetch(`${svc.url}/ready`)).status).toBe(200);
    const unavailable = answers.filter((a) => a.status === 503);
    expect(answers.filter((a) => a.status !== 201 && a.status !== 503)).toEqual([]);
    for (const a of unavailable) {
      expect(a.retryAfter).toMatch(/^\d+$/);
      expect(a.type).toBe('urn:kinespec:problem:service-unavailable');
    }
    // recovery within the 5 s the review asks for, measured from the database's return
    expect(Math.max(...recoveriesMs)).toBeLessThan(5_000);
  });
});
