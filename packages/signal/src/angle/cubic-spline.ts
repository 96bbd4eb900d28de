import { SignalInputError } from '../errors.js';

/** A C²-continuous piecewise cubic through given knots, with its first derivative. */
export interface CubicSpline {
  knotsX: Float64Array;
  knotsY: Float64Array;
  /** Second derivatives at the knots. */
  curvatures: Float64Array;
}

/**
 * Clamped cubic spline whose end slopes are those of the cubic through the first (last) four knots,
 * so that any cubic, and in particular the quadratic angle of a shaft under constant acceleration, is
 * reproduced exactly. Knots must increase strictly.
 */
// de Boor, A Practical Guide to Splines (1978), ch. IV: the complete (clamped) cubic spline interpolant, second-derivative form.
export function cubicSpline(x: Float64Array, y: Float64Array): CubicSpline {
  const n = x.length;
  if (n !== y.length || n < 2) throw new SignalInputError('invalid_knots', `a spline needs at least 2 knots with one value each (got ${n} and ${y.length})`);
  for (let i = 1; i < n; i++) {
    if (!(x[i]! > x[i - 1]!)) throw new SignalInputError('invalid_knots', `spline knots must increase strictly (knot ${i} is ${x[i]}, knot ${i - 1} is ${x[i - 1]})`);
  }
  const m = new Float64Array(n);
  if (n === 2) return { knotsX: x, knotsY: y, curvatures: m };
  const s0 = endSlope(x, y, 0);
  const s1 = endSlope(x, y, n - 1);
  // Tridiagonal system for the curvatures, solved by the Thomas algorithm.
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  const c = new Float64Array(n);
  const d = new Float64Array(n);
  const h0 = x[1]! - x[0]!;
  b[0] = 2 * h0;
  c[0] = h0;
  d[0] = 6 * ((y[1]! - y[0]!) / h0 - s0);
  for (let i = 1; i < n - 1; i++) {
    const hl = x[i]! - x[i - 1]!;
    const hr = x[i + 1]! - x[i]!;
    a[i] = hl;
    b[i] = 2 * (hl + hr);
    c[i] = hr;
    d[i] = 6 * ((y[i + 1]! - y[i]!) / hr - (y[i]! - y[i - 1]!) / hl);
  }
  const hn = x[n - 1]! - x[n - 2]!;
  a[n - 1] = hn;
  b[n - 1] = 2 * hn;
  d[n - 1] = 6 * (s1 - (y[n - 1]! - y[n - 2]!) / hn);
  for (let i = 1; i < n; i++) {
    const w = a[i]! / b[i - 1]!;
    b[i] -= w * c[i - 1]!;
    d[i] -= w * d[i - 1]!;
  }
  m[n - 1] = d[n - 1]! / b[n - 1]!;
  for (let i = n - 2; i >= 0; i--) m[i] = (d[i]! - c[i]! * m[i + 1]!) / b[i]!;
  return { knotsX: x, knotsY: y, curvatures: m };
}

/** Slope at knot `at` (first or last) of the interpolating polynomial through the nearest four (or three) knots. */
function endSlope(x: Float64Array, y: Float64Array, at: number): number {
  const n = x.length;
  const count = Math.min(4, n);
  const idx = at === 0 ? Array.from({ length: count }, (_, k) => k) : Array.from({ length: count }, (_, k) => n - 1 - k);
  const x0 = x[at]!;
  // Derivative of the Lagrange form at one of its own nodes.
  let slope = 0;
  for (const j of idx) {
    let lj: number;
    if (j === at) {
      lj = 0;
      for (const k of idx) if (k !== at) lj += 1 / (x0 - x[k]!);
    } else {
      let num = 1;
      let den = 1;
      for (const k of idx) {
        if (k === j) continue;
        den *= x[j]! - x[k]!;
        if (k !== at) num *= x0 - x[k]!;
      }
      lj = num / den;
    }
    slope += y[j]! * lj;
  }
  return slope;
}

/**
 * Evaluates the spline (and its slope) at ascending points `at`; points outside the knots give NaN.
 * Linear in the number of points: one pass with a moving interval.
 */
export function evaluateSpline(spline: CubicSpline, at: Float64Array, withSlope = false): { values: Float64Array; slopes?: Float64Array } {
  const { knotsX: x, knotsY: y, curvatures: m } = spline;
  const values = new Float64Array(at.length);
  const slopes = withSlope ? new Float64Array(at.length) : undefined;
  const last = x.length - 1;
  let i = 0;
  for (let p = 0; p < at.length; p++) {
    const t = at[p]!;
    if (!(t >= x[0]! && t <= x[last]!)) {
      values[p] = Number.NaN;
      if (slopes) slopes[p] = Number.NaN;
      continue;
    }
    if (t < x[i]!) i = 0;
    while (i < last - 1 && t > x[i + 1]!) i++;
    const h = x[i + 1]! - x[i]!;
    const A = (x[i + 1]! - t) / h;
    const B = (t - x[i]!) / h;
    values[p] = A * y[i]! + B * y[i + 1]! + (((A * A * A - A) * m[i]! + (B * B * B - B) * m[i + 1]!) * h * h) / 6;
    if (slopes) slopes[p] = (y[i + 1]! - y[i]!) / h + (((1 - 3 * A * A) * m[i]! + (3 * B * B - 1) * m[i + 1]!) * h) / 6;
  }
  return slopes ? { values, slopes } : { values };
}
