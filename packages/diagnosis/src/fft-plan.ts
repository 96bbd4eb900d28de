import FFT from 'fft.js';

// One fft.js instance per size, kept for the life of the process: building the twiddle table costs
// more than a transform of the same size, and the analysis uses a handful of sizes over and over.
const plans = new Map<number, FFT>();

/** The cached fft.js transform of a power-of-two size. */
export function fftPlan(size: number): FFT {
  let plan = plans.get(size);
  if (!plan) {
    plan = new FFT(size);
    plans.set(size, plan);
  }
  return plan;
}

/** The smallest power of two >= n (n >= 1). */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** The largest power of two <= n (n >= 1). */
export function previousPowerOfTwo(n: number): number {
  let p = 1;
  while (p * 2 <= n) p *= 2;
  return p;
}
