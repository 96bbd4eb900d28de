import { parentPort } from 'node:worker_threads';
import type { Recording } from '@kinespec/signal';
import { analyse } from './analysis.js';

/*
 * One analysis thread of the pool (analysis-pool.ts): takes a recording and its options, answers the
 * analysis or the error as plain data (name, code, message, where) so the caller can map it as usual.
 */

interface Job {
  id: number;
  recording: Recording;
  options: Parameters<typeof analyse>[1];
}

parentPort!.on('message', (job: Job) => {
  try {
    parentPort!.postMessage({ id: job.id, result: analyse(job.recording, job.options) });
  } catch (err) {
    const e = err as { name?: string; code?: unknown; message?: string; where?: string };
    parentPort!.postMessage({
      id: job.id,
      error: { name: e?.name ?? 'Error', code: typeof e?.code === 'string' ? e.code : undefined, message: e?.message ?? String(err), where: e?.where },
    });
  }
});
