import type { Sql } from './database.js';
import { purgeSamples } from './store.js';

/*
 * The retention setting for raw samples (KINESPEC_SAMPLE_RETENTION_DAYS): every hour, the samples of
 * recordings taken more than that many days ago are dropped, a batch at a time so that no transaction holds
 * many rows. Analyses, trend values and alarms stay; such a recording can no longer be re-analysed.
 */

const BATCH = 500;
const EVERY_MS = 3_600_000;

/** Drops every sample older than `days` before `now`; returns how many recordings lost theirs. */
export async function dropExpiredSamples(sql: Sql, days: number, now: Date = new Date()): Promise<number> {
  if (days <= 0) return 0;
  const before = new Date(now.getTime() - days * 86_400_000);
  let total = 0;
  for (;;) {
    const n = await purgeSamples(sql, before, BATCH);
    total += n;
    if (n < BATCH) return total;
  }
}

/** Runs dropExpiredSamples now and every hour; the returned function stops it. */
export function scheduleSampleRetention(sql: Sql, days: number, onError: (err: unknown) => void): () => void {
  if (days <= 0) return () => {};
  const run = () => void dropExpiredSamples(sql, days).catch(onError);
  const timer = setInterval(run, EVERY_MS);
  timer.unref();
  setImmediate(run);
  return () => clearInterval(timer);
}
