/**
 * The lasting level of a series: at each value, the median of it and the `width − 1` values before it (a
 * trailing running median, J. W. Tukey, Exploratory Data Analysis, 1977, ch. 7). A spike shorter than half the
 * window never moves it, so an isolated reading over a threshold is not a crossing; a level that holds for
 * more than half the window is. Trailing, so that a level at a time depends only on what was known then.
 */
export function lastingLevel(values: ArrayLike<number>, width: number): Float64Array {
  const out = new Float64Array(values.length);
  const window: number[] = [];
  for (let i = 0; i < values.length; i++) {
    window.length = 0;
    for (let j = Math.max(0, i - width + 1); j <= i; j++) window.push(values[j]!);
    window.sort((a, b) => a - b);
    const m = window.length;
    out[i] = m % 2 === 1 ? window[(m - 1) / 2]! : 0.5 * (window[m / 2 - 1]! + window[m / 2]!);
  }
  return out;
}
