/** A normal prior on the drift, e.g. from a population of earlier runs to failure of the same kind of part. */
export interface DriftPrior {
  /** Mean drift, in the model's scale per second (ln units per second on the log scale). */
  meanPerS: number;
  /** Standard deviation of the drift over the population. */
  sdPerS: number;
}

export interface DriftPosterior {
  /** Posterior mean of the drift μ, per second. */
  meanPerS: number;
  /** Posterior variance of the drift, per s². */
  varPerS2: number;
  /** Diffusion σ² of the Brownian part, per second (estimated from the increments). */
  diffusionPerS: number;
  /** Time over which the drift was measured, s. */
  spanS: number;
  /** Increments the diffusion was estimated from. */
  increments: number;
}

/**
 * Smallest diffusion, per second, relative to the squared rise per second: increments that all equal the drift
 * (a noiseless exponential) would give σ² = 0 and an interval of zero width.
 */
const MIN_RELATIVE_DIFFUSION = 1e-9;

/**
 * The drift of a degradation signal modelled as Brownian motion with drift, y(t) = y0 + μ·(t − t0) + σ·B(t − t0)
 * (N. Z. Gebraeel, M. A. Lawley, R. Li, J. K. Ryan, "Residual-life distributions from component degradation
 * signals: a Bayesian approach", IIE Transactions 37:543–557, 2005: the Brownian-error form of the exponential
 * model on the log scale). From (t0, y0) = (times[from], startLevel) to levels[to]: the rise over the span is the
 * sufficient statistic for μ, σ² is the maximum-likelihood estimate from the increments, and a normal prior on μ
 * (from a population, or none) is updated conjugately: precision 1/v0 + T/σ², mean (m0/v0 + Δy/σ²)/precision.
 */
export function driftPosterior(
  timesS: ArrayLike<number>,
  levels: ArrayLike<number>,
  from: number,
  to: number,
  startLevel: number,
  prior: DriftPrior | null,
): DriftPosterior {
  const spanS = timesS[to]! - timesS[from]!;
  const rise = levels[to]! - startLevel;
  const meanHat = spanS > 0 ? rise / spanS : 0;
  // MLE of σ² for Brownian increments over unequal steps: mean of (Δy − μΔt)²/Δt
  let sum = 0;
  let n = 0;
  let previous = startLevel;
  for (let i = from + 1; i <= to; i++) {
    const dt = timesS[i]! - timesS[i - 1]!;
    const dy = levels[i]! - previous;
    previous = levels[i]!;
    if (dt > 0) {
      sum += (dy - meanHat * dt) ** 2 / dt;
      n++;
    }
  }
  const floor = MIN_RELATIVE_DIFFUSION * Math.max(meanHat * meanHat, 1e-12) * Math.max(spanS, 1);
  const diffusionPerS = Math.max(n > 0 ? sum / n : 0, floor);
  if (!(spanS > 0)) {
    return { meanPerS: prior?.meanPerS ?? 0, varPerS2: prior ? prior.sdPerS ** 2 : Infinity, diffusionPerS, spanS: 0, increments: n };
  }
  const dataPrecision = spanS / diffusionPerS;
  if (!prior || !(prior.sdPerS > 0)) {
    return { meanPerS: meanHat, varPerS2: 1 / dataPrecision, diffusionPerS, spanS, increments: n };
  }
  const priorPrecision = 1 / prior.sdPerS ** 2;
  const precision = priorPrecision + dataPrecision;
  return {
    meanPerS: (prior.meanPerS * priorPrecision + meanHat * dataPrecision) / precision,
    varPerS2: 1 / precision,
    diffusionPerS,
    spanS,
    increments: n,
  };
}
