/** The healthy level of a series and its spread, both robust to a few outliers. */
export interface Baseline {
  /** Median of the baseline values (in the model's scale). */
  level: number;
  /** 1.4826 × median absolute deviation: the standard deviation for normal data (Hampel 1974, JASA 69:383). */
  spread: number;
  count: number;
}

/**
 * Robust level and spread of `values[from..to)`. The spread is floored at `minSpread`: a baseline of identical
 * readings (quantised, or a simulator's) would otherwise make any change, however small, an onset.
 */
export function robustBaseline(values: ArrayLike<number>, from: number, to: number, minSpread: number): Baseline {
  const x = Array.from({ length: to - from }, (_, i) => values[from + i]!).sort((a, b) => a - b);
  const level = median(x);
  const deviations = x.map((v) => Math.abs(v - level)).sort((a, b) => a - b);
  return { level, spread: Math.max(1.4826 * median(deviations), minSpread), count: x.length };
}

function median(sorted: readonly number[]): number {
  const n = sorted.length;
  return n % 2 === 1 ? sorted[(n - 1) / 2]! : 0.5 * (sorted[n / 2 - 1]! + sorted[n / 2]!);
}
