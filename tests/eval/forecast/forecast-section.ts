// The forecast section of `npm run eval`: femto-learning runs to failure, leave one bearing out.
import { FORECAST_METHOD } from '@kinespec/forecast';
import { femtoAvailable, femtoDir } from './femto-data.js';
import { CARRYING_INDICATOR, evaluateFemtoForecasts, FAILURE_PEAK_G, femtoSeries, FORECAST_GOAL_MEAN_A, type FemtoForecastReport } from './femto-forecast.js';

const s = (x: number | null) => (x === null ? '-' : x < 100 ? `${x.toFixed(0)} s` : `${Math.round(x)} s`);

export function printForecastReport(r: FemtoForecastReport): void {
  console.log(`\nForecast: time left until the rig stopped the run (vibration past ${FAILURE_PEAK_G} g), femto-learning (6 runs to failure), leave one bearing out`);
  console.log(`  carried by ${r.indicator} of both points against the lasting level the other five runs were stopped at; the bearing's estimate is its sooner point`);
  console.log(`  method: ${FORECAST_METHOD}`);
  for (const b of r.bearings) {
    const onset = b.onsetS === null ? 'no onset' : `onset ${Math.round(b.lifeS - b.onsetS)} s before the end`;
    const prior = b.prior ? `drift prior ${(b.prior.meanPerS * 3600).toFixed(2)} ± ${(b.prior.sdPerS * 3600).toFixed(2)} ln/h` : 'no prior';
    console.log(`  ${b.bearing}: life ${Math.round(b.lifeS)} s, ${onset}, threshold ${b.thresholdG.toFixed(2)} g (this run stopped at ${b.stopLevelG.toFixed(2)} g r.m.s., lasting peak ${b.stopPeakG.toFixed(1)} g), ${prior}`);
    console.log(`    mean A ${b.meanAccuracy.toFixed(3)} (median estimate ${b.meanAccuracyOfMedian.toFixed(3)}); crossings foreseen before the onset: ${b.healthyForeseen}`);
    for (const c of b.cuts) {
      console.log(`    cut ${String(c.fraction).padEnd(4)} at ${s(c.cutS).padStart(8)}: actual ${s(c.actualS).padStart(8)}, estimate ${s(c.estimateS).padStart(8)} (median ${s(c.medianS)}, 10-90 % ${s(c.lowS)}..${s(c.highS)}, ${c.pointId ?? c.status}), A ${c.accuracy.toFixed(3)}`);
    }
  }
  console.log(`  mean A over ${r.bearings.length * r.bearings[0]!.cuts.length} cuts: ${r.meanAccuracy.toFixed(3)}   (goal >= ${FORECAST_GOAL_MEAN_A}); scoring each forecast's median instead: ${r.meanAccuracyOfMedian.toFixed(3)}`);
  console.log(`  healthy part (cuts between the first hour and the onset): a crossing foreseen at ${r.healthyForeseen} of ${r.healthyCuts} cuts`);
}

/** Runs the section; returns the goals missed (empty when met or when the data set is absent). */
export function forecastSection(): string[] {
  if (!femtoAvailable()) {
    console.log(`\nForecast: skipped, the femto-learning data set is not at ${femtoDir()}`);
    return [];
  }
  const t0 = performance.now();
  const report = evaluateFemtoForecasts(femtoSeries(CARRYING_INDICATOR));
  printForecastReport(report);
  console.log(`  (${((performance.now() - t0) / 1000).toFixed(1)} s)`);
  return report.meanAccuracy >= FORECAST_GOAL_MEAN_A ? [] : [`forecast mean A ${report.meanAccuracy.toFixed(3)} < ${FORECAST_GOAL_MEAN_A}`];
}
