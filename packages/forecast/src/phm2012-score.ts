/*
 * The scoring of the IEEE PHM 2012 prognostic challenge (P. Nectoux et al., "PRONOSTIA: an experimental platform
 * for bearings accelerated degradation tests", IEEE PHM 2012; the challenge details, eq. 1-2): percent error of a
 * remaining-life estimate, and its accuracy, which punishes a late estimate four times harder than an early one.
 */

/** Er = 100 (actual − estimate) / actual: positive when the estimate is early (shorter than the truth). */
export function percentError(actualS: number, estimateS: number): number {
  if (!(actualS > 0)) throw new RangeError(`actualS (${actualS}) must be > 0`);
  return (100 * (actualS - estimateS)) / actualS;
}

/** A = exp(−ln(0.5)·Er/5) for Er ≤ 0 (late), exp(+ln(0.5)·Er/20) for Er > 0 (early): 1 when exact, 0.5 at −5 % or +20 %. */
export function phmAccuracy(percentErrorValue: number): number {
  return percentErrorValue <= 0 ? Math.exp((-Math.log(0.5) * percentErrorValue) / 5) : Math.exp((Math.log(0.5) * percentErrorValue) / 20);
}

/**
 * The estimate that maximises the expected accuracy when the remaining life is distributed as `quantile`
 * (the Bayes decision under the challenge's own score; J. O. Berger, Statistical Decision Theory, 1985, ch. 4):
 * the expectation over `samples` equally likely quantiles, maximised over a grid of candidate estimates
 * spanning them. Null when the distribution has no finite quantiles.
 */
export function bestPhmEstimate(quantile: (q: number) => number | null, samples = 99): number | null {
  const lives: number[] = [];
  for (let i = 0; i < samples; i++) {
    const v = quantile((i + 0.5) / samples);
    // beyond the table: count the remaining mass as lives longer than any tabulated one, at the last tabulated value
    if (v === null) {
      if (lives.length === 0) return null;
      lives.push(lives[lives.length - 1]!);
    } else {
      lives.push(v);
    }
  }
  let best: number | null = null;
  let bestValue = -1;
  const lo = Math.log(Math.max(lives[0]!, 1e-9));
  const hi = Math.log(Math.max(lives[lives.length - 1]!, 1e-9));
  for (let k = 0; k <= 400; k++) {
    const e = Math.exp(lo + ((hi - lo) * k) / 400);
    let sum = 0;
    for (const life of lives) sum += life > 0 ? phmAccuracy(percentError(life, e)) : 0;
    if (sum > bestValue) {
      bestValue = sum;
      best = e;
    }
  }
  return best;
}
