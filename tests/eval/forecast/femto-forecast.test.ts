import { forecastCrossing } from '@kinespec/forecast';
import { describe, expect, it } from 'vitest';
import { femtoAvailable, femtoDir, femtoRig, FEMTO_BEARINGS, loadFemtoRun } from './femto-data.js';
import { BASELINE_SNAPSHOTS, indicatorSeries } from './femto-forecast.js';

// The femto-learning runs (../shared/datasets/femto-learning; P. Nectoux et al., IEEE PHM 2012). `npm run eval`
// runs the whole leave-one-out evaluation; these checks keep the reader and the healthy hour honest in CI.
const present = femtoAvailable();
if (!present) console.log(`femto-learning not found at ${femtoDir()}: its forecast checks are skipped`);

describe.skipIf(!present)('femto-learning runs to failure', () => {
  it('reads Bearing1_2 as the data set README describes it: first over 20 g at snapshot 127 of 871', () => {
    const run = loadFemtoRun('Bearing1_2');
    expect(run.snapshotStartS).toHaveLength(871);
    const peakOf = (i: number) => Math.max(...run.snapshot(i).channels.map((c) => Math.max(...c.samples.map(Math.abs))));
    expect(peakOf(127)).toBeGreaterThanOrEqual(20);
    for (let i = 0; i < 127; i++) expect(peakOf(i)).toBeLessThan(20);
  });

  it('foresees no crossing at the end of the healthy first hour of any run, at either point', () => {
    const rig = femtoRig();
    for (const bearing of FEMTO_BEARINGS) {
      for (const point of indicatorSeries(bearing, rig, 'acceleration_rms', BASELINE_SNAPSHOTS + 60)) {
        // threshold: a tenfold rise of the r.m.s., far beyond any healthy wander
        const f = forecastCrossing(point.series, 10 * point.series[0]!.value, { baselineCount: BASELINE_SNAPSHOTS });
        expect(f.status, `${bearing} ${point.pointId}: ${f.reason}`).toBe('no-crossing');
      }
    }
  });
});
