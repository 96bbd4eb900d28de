import { describe, expect, it } from 'vitest';
import { postgresBinDir } from '../support/pg-cluster.js';
import { formatReport, serviceIsBuilt, soak } from './soak.js';

/*
 * The short soak CI runs (60 s; `npm run soak` runs 10 minutes): two API replicas and two workers on a
 * PostgreSQL cluster of the test's own, a database restart and a kill -9 of an API replica and of a worker
 * in the middle. Every acknowledged upload is found by its hash, once, analysed.
 */

const ready = serviceIsBuilt() && postgresBinDir() !== null;
if (!ready) console.log('soak skipped: needs the built service (npm run build) and PostgreSQL server binaries');

describe.skipIf(!ready)('soak (short)', () => {
  it('loses and duplicates nothing acknowledged through a database restart and two kill -9s', async () => {
    const report = await soak({ seconds: Number(process.env.SOAK_SECONDS ?? 60), ratePerS: 4, port: 55_480 + (process.pid % 9) });
    console.log(formatReport(report));
    expect(report.acknowledged).toBeGreaterThan(0);
    expect(report.found).toBe(report.acknowledged);
    expect(report.duplicates).toBe(0);
    expect(report.notAnalysed).toBe(0);
    // the service answers again within 5 s of its database's return
    expect(report.recoveryMs.databaseRestart).not.toBeNull();
    expect(report.recoveryMs.databaseRestart!).toBeLessThan(5_000);
    expect(Object.keys(report.statuses).filter((s) => s !== '200' && s !== '201' && s !== '202' && s !== '503' && s !== 'network')).toEqual([]);
  }, 600_000);
});
