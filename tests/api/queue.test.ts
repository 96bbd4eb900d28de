import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runAnalysisJob } from '../../services/api/src/analysis-job.js';
import { AnalysisPool } from '../../services/api/src/analysis-pool.js';
import { AnalysisQueue } from '../../services/api/src/analysis-queue.js';
import { ModelCache } from '../../services/api/src/model-cache.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText, POINT, sine, sineVelocityRmsMmPerS, wav } from './fixtures.js';

/*
 * Analysis off the request path: an API process with no workers of its own stores the recording and answers
 * 202 with a link to poll; a worker (here a second queue client on the same database, as `kinespec worker`
 * is) analyses it; the recording was durable from the 202 on.
 */

for (const target of targets) {
  describe(`the analysis queue on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;
    beforeAll(async () => {
      svc = await startTestService(target, { queueWorkers: 0, uploadWaitMs: 300 });
      site = await makeSite(svc.db, 'queue');
      const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
      expect(put.statusCode).toBe(200);
    });
    afterAll(async () => svc?.close());

    const upload = (payload: Buffer, key: string) => svc.app.inject({
      method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`,
      headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav', 'idempotency-key': key }, payload,
    });

    it('answers 202 with a link to poll when no worker analyses in time, and the worker then stores the analysis', async () => {
      const res = await upload(wav(sine(5, 8192)), 'queued-1');
      expect(res.statusCode).toBe(202);
      const { recordingId, analysisState } = res.json();
      expect(analysisState).toBe('queued');
      expect(res.headers.location).toBe(`/api/v1/recordings/${recordingId}/analysis`);
      expect(res.headers['retry-after']).toBe('1');
      const poll = () => svc.app.inject({ url: `/api/v1/recordings/${recordingId}/analysis`, headers: auth(site.keys.engineer) });
      expect((await poll()).statusCode).toBe(202);
      // the retry of the same upload is the same recording, still queued
      const again = await upload(wav(sine(5, 8192)), 'queued-1');
      expect([again.statusCode, again.json().recordingId]).toEqual([202, recordingId]);

      // a worker process of its own: its own queue client and analysis pool on the same database
      const worker = await AnalysisQueue.start(svc.db, { expireInSeconds: 60 });
      const pool = new AnalysisPool(0);
      worker.startWorkers(1, (job, context) => runAnalysisJob({ sql: svc.db.sql, models: new ModelCache(), analysis: pool }, job, context), 100);
      try {
        let answer = await poll();
        for (let i = 0; i < 100 && answer.statusCode === 202; i++) {
          await new Promise((r) => setTimeout(r, 100));
          answer = await poll();
        }
        expect(answer.statusCode).toBe(200);
        // A / (2 pi f sqrt 2): 5 m/s^2 at omega = 1000 rad/s (fixtures.ts), within 2 %
        expect(Math.abs(answer.json().overall.velocityRmsMmPerS / sineVelocityRmsMmPerS(5) - 1)).toBeLessThan(0.02);
        const done = await upload(wav(sine(5, 8192)), 'queued-1');
        expect([done.statusCode, done.json().analysisState]).toEqual([200, 'done']);
      } finally {
        await worker.close();
      }
    });

    it('runs a re-analysis as jobs: 202 with a progress link, then every recording analysed again', async () => {
      const started = await svc.app.inject({ method: 'POST', url: `/api/v1/machines/${MACHINE}/reanalyse`, headers: auth(site.keys.admin) });
      expect(started.statusCode).toBe(202);
      const { reanalysisId, total } = started.json();
      expect(started.headers.location).toBe(`/api/v1/reanalyses/${reanalysisId}`);
      const [count] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`;
      expect(total).toBe(count!.n);
      const progress = () => svc.app.inject({ url: `/api/v1/reanalyses/${reanalysisId}`, headers: auth(site.keys.engineer) });
      expect((await progress()).json()).toMatchObject({ analysed: 0, finishedAt: null });
      const worker = await AnalysisQueue.start(svc.db, { expireInSeconds: 60 });
      const pool = new AnalysisPool(0);
      worker.startWorkers(1, (job, context) => runAnalysisJob({ sql: svc.db.sql, models: new ModelCache(), analysis: pool }, job, context), 100);
      try {
        let body = (await progress()).json();
        for (let i = 0; i < 150 && body.finishedAt === null; i++) {
          await new Promise((r) => setTimeout(r, 100));
          body = (await progress()).json();
        }
        expect(body.finishedAt).not.toBeNull();
        expect(body.analysed + body.failed.length).toBe(total);
        const [versions] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from analyses where is_current`;
        expect(versions!.n).toBe(body.analysed);
      } finally {
        await worker.close();
      }
    });

    it('keeps a recording the analysis cannot use and answers its 422 with the recording id', async () => {
      const worker = await AnalysisQueue.start(svc.db, { expireInSeconds: 60 });
      const pool = new AnalysisPool(0);
      worker.startWorkers(1, (job, context) => runAnalysisJob({ sql: svc.db.sql, models: new ModelCache(), analysis: pool }, job, context), 100);
      try {
        // 600 samples: an analysis needs at least 1024
        const res = await svc.app.inject({
          method: 'POST', url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?unit=m/s%5E2`,
          headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav', prefer: 'wait=30' }, payload: wav(sine(1, 600)),
        });
        expect(res.statusCode).toBe(422);
        const problem = res.json();
        expect(problem.type).toBe('urn:kinespec:problem:analysis-failed');
        const meta = await svc.app.inject({ url: `/api/v1/recordings/${problem.recordingId}`, headers: auth(site.keys.engineer) });
        expect(meta.json().sampleCount).toBe(600);
      } finally {
        await worker.close();
      }
    });
  });
}
