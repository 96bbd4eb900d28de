/**
 * A number to `digits` significant figures for human output: plain from 0.001 up to (not including)
 * `plainBelow`, exponent form outside that range ("0.7071", "1.234e-5"); 0 is "0".
 */
export function significant(x: number, digits = 4, plainBelow = 1e6): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e-3 && a < plainBelow ? String(Number(x.toPrecision(digits))) : x.toExponential(digits - 1);
}
