/**
 * Eigenvalues of a small real symmetric matrix by the cyclic Jacobi method (Jacobi 1846; Golub & Van Loan,
 * Matrix Computations, §8.5): plane rotations zero each off-diagonal entry in turn until the off-diagonal norm is
 * negligible. Used for the natural frequencies of the lumped models (10 × 10 at most), where its simplicity and
 * unconditional accuracy for symmetric matrices matter more than speed.
 *
 * `matrix` is row-major n × n and is not modified. Returns the eigenvalues in ascending order.
 */
export function symmetricEigenvalues(matrix: ArrayLike<number>, n: number): number[] {
  if (!(Number.isInteger(n) && n > 0) || matrix.length !== n * n) throw new RangeError(`matrix must have n × n (${n} × ${n}) entries`);
  const a = Float64Array.from(matrix);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      const x = a[i * n + j]!;
      const y = a[j * n + i]!;
      if (Math.abs(x - y) > 1e-9 * (Math.abs(x) + Math.abs(y) + 1e-300)) throw new RangeError(`matrix must be symmetric (entry ${i},${j})`);
    }
  }
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale += a[i]! * a[i]!;
  if (scale === 0) return new Array<number>(n).fill(0);
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) off += a[i * n + j]! * a[i * n + j]!;
    if (off <= 1e-30 * scale) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q]!;
        if (apq === 0) continue;
        const app = a[p * n + p]!;
        const aqq = a[q * n + q]!;
        // Rotation angle that zeroes a_pq: t = tan θ, the smaller root of t² + 2τt − 1 = 0 (Golub & Van Loan, Alg. 8.5.1).
        const tau = (aqq - app) / (2 * apq);
        const t = Math.sign(tau || 1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p]!;
          const akq = a[k * n + q]!;
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k]!;
          const aqk = a[q * n + k]!;
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
      }
    }
  }
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(a[i * n + i]!);
  return out.sort((x, y) => x - y);
}
