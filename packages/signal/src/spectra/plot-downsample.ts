import { spectraError } from './spectra-error.js';

export interface PlotSeries {
  frequenciesHz: Float64Array;
  values: Float64Array;
}

/**
 * At most maxPoints (frequency, value) pairs for drawing: the bins are split into maxPoints/2
 * equal buckets and each bucket keeps its minimum and its maximum, in frequency order, so no peak
 * (and no notch) disappears from the plot. Short spectra come back unchanged (copied).
 */
export function downsampleForPlot(spectrum: PlotSeries, maxPoints: number): PlotSeries {
  if (!(Number.isInteger(maxPoints) && maxPoints >= 2)) {
    throw spectraError('invalid_max_points', `maxPoints (${maxPoints}) must be an integer >= 2`);
  }
  const { frequenciesHz: f, values: v } = spectrum;
  const n = v.length;
  if (n <= maxPoints) return { frequenciesHz: f.slice(), values: v.slice() };
  const buckets = Math.floor(maxPoints / 2);
  const outF = new Float64Array(2 * buckets);
  const outV = new Float64Array(2 * buckets);
  let m = 0;
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    let iMin = start;
    let iMax = start;
    let lowest = v[start];
    let highest = lowest;
    for (let i = start + 1; i < end; i++) {
      const x = v[i];
      if (x < lowest) {
        lowest = x;
        iMin = i;
      }
      if (x > highest) {
        highest = x;
        iMax = i;
      }
    }
    const first = Math.min(iMin, iMax);
    const second = Math.max(iMin, iMax);
    outF[m] = f[first];
    outV[m++] = v[first];
    if (second !== first) {
      outF[m] = f[second];
      outV[m++] = v[second];
    }
  }
  return { frequenciesHz: outF.slice(0, m), values: outV.slice(0, m) };
}
