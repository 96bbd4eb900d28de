import { spectraError } from './spectra-error.js';

/**
 * Data windows for DFT analysis, all periodic ("DFT-even"), as scipy.signal.get_window returns them
 * by default (fftbins=True): the symmetric window of length N+1 with its last point dropped.
 *
 * Every window here is a cosine sum w[n] = sum_k (-1)^k a_k cos(2 pi k n / N), n = 0..N-1
 * (F. J. Harris, "On the use of windows for harmonic analysis with the discrete Fourier
 * transform", Proc. IEEE 66(1):51-83, 1978), so coherent gain and ENBW have closed forms.
 */
export type WindowName = 'rectangular' | 'hann' | 'hamming' | 'blackman-harris' | 'flattop';

export const WINDOW_NAMES: readonly WindowName[] = ['rectangular', 'hann', 'hamming', 'blackman-harris', 'flattop'];

/** Cosine-sum coefficients a_k of each window. */
export const WINDOW_COEFFICIENTS: Readonly<Record<WindowName, readonly number[]>> = {
  rectangular: [1],
  // Harris (1978), Hann: a0 = a1 = 0.5
  hann: [0.5, 0.5],
  // Harris (1978), Hamming: 0.54 / 0.46 (as scipy.signal.windows.hamming)
  hamming: [0.54, 0.46],
  // Harris (1978), minimum 4-term Blackman-Harris, -92 dB side lobes (as scipy.signal.windows.blackmanharris)
  'blackman-harris': [0.35875, 0.48829, 0.14128, 0.01168],
  // G. D'Antona & A. Ferrero, Digital Signal Processing for Measurement Systems, Springer 2006, p. 70
  // (the coefficients scipy.signal.windows.flattop uses)
  flattop: [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368],
};

export function isWindowName(name: string): name is WindowName {
  return (WINDOW_NAMES as readonly string[]).includes(name);
}

export function assertWindowName(name: string, parameter = 'window'): WindowName {
  if (!isWindowName(name)) {
    throw spectraError('unknown_window', `${parameter} '${name}' is not one of ${WINDOW_NAMES.join(', ')}`);
  }
  return name;
}

const windowCache = new Map<string, Float64Array>();

/** The periodic window of length `length` (a fresh array). */
export function windowSamples(name: WindowName, length: number): Float64Array {
  return sharedWindow(name, length).slice();
}

/** The same window, cached for lengths up to 65536 and shared between callers: never write to it. */
export function sharedWindow(name: WindowName, length: number): Float64Array {
  if (!Number.isInteger(length) || length < 1) {
    throw spectraError('invalid_segment_length', `window length (${length}) must be a positive integer`);
  }
  const key = `${name}:${length}`;
  const cached = windowCache.get(key);
  if (cached) return cached;
  const a = WINDOW_COEFFICIENTS[assertWindowName(name)];
  const w = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    // scipy.signal.windows.general_cosine with sym=False: phase runs from -pi over N points,
    // which is the same as sum_k (-1)^k a_k cos(2 pi k n / N)
    const phase = -Math.PI + (2 * Math.PI * n) / length;
    let v = 0;
    for (let k = 0; k < a.length; k++) v += a[k] * Math.cos(k * phase);
    w[n] = v;
  }
  if (length <= 65536) windowCache.set(key, w);
  return w;
}

/** Coherent gain sum(w)/N of the periodic window; for a cosine sum it is a0 exactly (Harris 1978, coherent gain). */
export function windowCoherentGain(name: WindowName): number {
  return WINDOW_COEFFICIENTS[assertWindowName(name)][0];
}

/**
 * Equivalent noise bandwidth in bins, N sum(w^2) / (sum w)^2 (Harris 1978). For a periodic
 * cosine sum with N > 2K it is (a0^2 + (1/2) sum_{k>=1} a_k^2) / a0^2 (Parseval on the cosine terms).
 */
export function windowEnbwBins(name: WindowName): number {
  const a = WINDOW_COEFFICIENTS[assertWindowName(name)];
  let s = a[0] * a[0];
  for (let k = 1; k < a.length; k++) s += 0.5 * a[k] * a[k];
  return s / (a[0] * a[0]);
}

/** Coherent gain of arbitrary window samples, sum(w)/N. */
export function coherentGainOf(w: Float64Array): number {
  let s = 0;
  for (let i = 0; i < w.length; i++) s += w[i];
  return s / w.length;
}

/** ENBW in bins of arbitrary window samples, N sum(w^2) / (sum w)^2. */
export function enbwBinsOf(w: Float64Array): number {
  let s1 = 0;
  let s2 = 0;
  for (let i = 0; i < w.length; i++) {
    s1 += w[i];
    s2 += w[i] * w[i];
  }
  return (w.length * s2) / (s1 * s1);
}

/**
 * |W(offset)| / |W(0)|: the window's amplitude response to a tone `offsetBins` away from a bin
 * centre, for the periodic window of length `length`. Exact for finite N: each cosine term shifts the
 * Dirichlet kernel D(v) = e^{-j pi v (N-1)/N} sin(pi v) / sin(pi v / N) by +-k bins (Harris 1978, cosine-sum windows).
 */
export function windowAmplitudeResponse(name: WindowName, offsetBins: number, length = 4096): number {
  const terms = KERNEL_TERMS.get(name) ?? KERNEL_TERMS.get(assertWindowName(name))!;
  return kernelMagnitude(terms, offsetBins, length) / zeroOffsetMagnitude(name, terms, length);
}

/** Weight of each shifted Dirichlet kernel in a cosine-sum window's kernel: a0, then -a1/2, +a2/2, ... */
const KERNEL_TERMS = new Map<string, Float64Array>(
  WINDOW_NAMES.map((name) => [name, Float64Array.from(WINDOW_COEFFICIENTS[name], (ak, k) => (k % 2 === 0 ? 1 : -1) * ak * (k === 0 ? 1 : 0.5))]),
);

/** |W(0)| per window and length: the same for every call, so computed once (peak interpolation asks for it thousands of times). */
const zeroOffset = new Map<string, Map<number, number>>();

function zeroOffsetMagnitude(name: string, terms: Float64Array, length: number): number {
  let byLength = zeroOffset.get(name);
  if (!byLength) {
    byLength = new Map();
    zeroOffset.set(name, byLength);
  }
  let m = byLength.get(length);
  if (m === undefined) {
    m = kernelMagnitude(terms, 0, length);
    if (byLength.size < 256) byLength.set(length, m);
  }
  return m;
}

/** |sum_k c_k (D(v - k) + D(v + k))| (the k = 0 term once), without allocating. */
function kernelMagnitude(terms: Float64Array, v: number, n: number): number {
  let re = 0;
  let im = 0;
  for (let k = 0; k < terms.length; k++) {
    const c = terms[k];
    addDirichlet(v - k, n);
    re += c * dirichletRe;
    im += c * dirichletIm;
    if (k > 0) {
      addDirichlet(v + k, n);
      re += c * dirichletRe;
      im += c * dirichletIm;
    }
  }
  return Math.hypot(re, im);
}

// The last Dirichlet kernel value, handed from addDirichlet to kernelMagnitude without an array.
let dirichletRe = 0;
let dirichletIm = 0;

function addDirichlet(v: number, n: number): void {
  const s = Math.sin((Math.PI * v) / n);
  // at v = mN the ratio is 0/0; its limit (l'Hopital) is N cos(pi v) / cos(pi v / N)
  const magnitude = Math.abs(s) < 1e-12 ? (n * Math.cos(Math.PI * v)) / Math.cos((Math.PI * v) / n) : Math.sin(Math.PI * v) / s;
  const phase = (-Math.PI * v * (n - 1)) / n;
  dirichletRe = magnitude * Math.cos(phase);
  dirichletIm = magnitude * Math.sin(phase);
}
