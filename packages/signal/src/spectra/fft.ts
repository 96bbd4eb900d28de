import FFT from 'fft.js';

/**
 * Discrete Fourier transforms of any length, built on fft.js (radix-4, power-of-two sizes).
 *
 * Convention (numpy.fft): X[k] = sum_n x[n] e^{-j 2 pi k n / N}; the inverse divides by N.
 * Complex arrays are interleaved [re0, im0, re1, im1, ...] in Float64Arrays.
 *
 * Power-of-two sizes go straight to fft.js. Other sizes use Bluestein's chirp-z algorithm
 * (L. I. Bluestein, "A linear filtering approach to the computation of discrete Fourier
 * transform", IEEE Trans. Audio Electroacoust. 18(4):451-455, 1970), so every length is
 * O(N log N) and no hot path falls back to a naive DFT.
 */

/** The interface every plan offers; `forward`/`inverse` never allocate. */
export interface ComplexFft {
  readonly size: number;
  /** out = DFT(data); both interleaved, length 2*size; out must not be data. */
  forward(out: Float64Array, data: Float64Array): void;
  /** out = IDFT(data) (divided by size); both interleaved, length 2*size; out must not be data. */
  inverse(out: Float64Array, data: Float64Array): void;
}

export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 1 && (n & (n - 1)) === 0 && n <= 2 ** 30;
}

/** Largest power of two that is <= n (n >= 1). */
export function largestPowerOfTwoAtMost(n: number): number {
  let p = 1;
  while (p * 2 <= n) p *= 2;
  return p;
}

class Radix4Fft implements ComplexFft {
  readonly fft: FFT;
  constructor(readonly size: number) {
    this.fft = new FFT(size);
  }
  forward(out: Float64Array, data: Float64Array): void {
    this.fft.transform(out, data);
  }
  inverse(out: Float64Array, data: Float64Array): void {
    this.fft.inverseTransform(out, data);
  }
}

class BluesteinFft implements ComplexFft {
  private readonly m: number;
  private readonly inner: ComplexFft;
  /** chirp[n] = exp(-j pi n^2 / N), interleaved. */
  private readonly chirp: Float64Array;
  /** DFT of the conjugate chirp laid out circularly over m points. */
  private readonly chirpSpectrum: Float64Array;
  private readonly a: Float64Array;
  private readonly b: Float64Array;
  private readonly conjugated: Float64Array;

  constructor(readonly size: number) {
    const n = size;
    let m = 1;
    while (m < 2 * n - 1) m *= 2;
    this.m = m;
    this.inner = new Radix4Fft(m);
    this.chirp = new Float64Array(2 * n);
    const twoN = 2 * n;
    for (let i = 0; i < n; i++) {
      // n^2 mod 2N keeps the angle small and exact: the chirp is periodic in n^2 with period 2N.
      const q = (i * i) % twoN;
      const angle = (Math.PI * q) / n;
      this.chirp[2 * i] = Math.cos(angle);
      this.chirp[2 * i + 1] = -Math.sin(angle);
    }
    const kernel = new Float64Array(2 * m);
    kernel[0] = 1;
    for (let i = 1; i < n; i++) {
      const re = this.chirp[2 * i];
      const im = -this.chirp[2 * i + 1];
      kernel[2 * i] = re;
      kernel[2 * i + 1] = im;
      kernel[2 * (m - i)] = re;
      kernel[2 * (m - i) + 1] = im;
    }
    this.chirpSpectrum = new Float64Array(2 * m);
    this.inner.forward(this.chirpSpectrum, kernel);
    this.a = new Float64Array(2 * m);
    this.b = new Float64Array(2 * m);
    this.conjugated = new Float64Array(2 * n);
  }

  forward(out: Float64Array, data: Float64Array): void {
    const { a, b, chirp, chirpSpectrum, size: n, m } = this;
    a.fill(0);
    for (let i = 0; i < n; i++) {
      const xr = data[2 * i];
      const xi = data[2 * i + 1];
      const cr = chirp[2 * i];
      const ci = chirp[2 * i + 1];
      a[2 * i] = xr * cr - xi * ci;
      a[2 * i + 1] = xr * ci + xi * cr;
    }
    this.inner.forward(b, a);
    for (let i = 0; i < m; i++) {
      const br = b[2 * i];
      const bi = b[2 * i + 1];
      const kr = chirpSpectrum[2 * i];
      const ki = chirpSpectrum[2 * i + 1];
      b[2 * i] = br * kr - bi * ki;
      b[2 * i + 1] = br * ki + bi * kr;
    }
    this.inner.inverse(a, b);
    for (let i = 0; i < n; i++) {
      const yr = a[2 * i];
      const yi = a[2 * i + 1];
      const cr = chirp[2 * i];
      const ci = chirp[2 * i + 1];
      out[2 * i] = yr * cr - yi * ci;
      out[2 * i + 1] = yr * ci + yi * cr;
    }
  }

  inverse(out: Float64Array, data: Float64Array): void {
    // IDFT(x) = conj(DFT(conj(x))) / N
    const n = this.size;
    const c = this.conjugated;
    for (let i = 0; i < n; i++) {
      c[2 * i] = data[2 * i];
      c[2 * i + 1] = -data[2 * i + 1];
    }
    this.forward(out, c);
    for (let i = 0; i < n; i++) {
      out[2 * i] /= n;
      out[2 * i + 1] = -out[2 * i + 1] / n;
    }
  }
}

/**
 * Plans are kept for every size in use, least recently used first out, within PLAN_CACHE_BYTES of tables:
 * building a plan costs several transforms of its size (a 2^18-point plan about 8 transforms), so rebuilding
 * one per call made long records slow. Bytes are estimated from the tables each kind holds.
 */
export const PLAN_CACHE_BYTES = 256 * 1024 * 1024;
const plans = new Map<number, { plan: ComplexFft; bytes: number }>();
let planBytes = 0;

function planBytesOf(size: number): number {
  if (size === 1) return 0;
  // fft.js: a complex table of 2·size doubles and a bit-reversal table of about size/2 int32s
  const radix4 = (m: number) => 16 * m + 2 * m;
  if (isPowerOfTwo(size)) return radix4(size);
  let m = 1;
  while (m < 2 * size - 1) m *= 2;
  // inner plan, chirp spectrum and two work arrays of 2m doubles; chirp and conjugate buffer of 2n
  return radix4(m) + 3 * 16 * m + 2 * 16 * size;
}

/** A complex DFT plan of the given size (any integer >= 1), reused across calls (see PLAN_CACHE_BYTES). */
export function complexFft(size: number): ComplexFft {
  if (!Number.isInteger(size) || size < 1) throw new RangeError(`FFT size (${size}) must be a positive integer`);
  const cached = plans.get(size);
  if (cached) {
    // most recently used last
    plans.delete(size);
    plans.set(size, cached);
    return cached.plan;
  }
  const plan: ComplexFft = size === 1 ? new IdentityFft() : isPowerOfTwo(size) ? new Radix4Fft(size) : new BluesteinFft(size);
  const bytes = planBytesOf(size);
  if (bytes <= PLAN_CACHE_BYTES) {
    while (planBytes + bytes > PLAN_CACHE_BYTES && plans.size > 0) {
      const [oldest, entry] = plans.entries().next().value!;
      plans.delete(oldest);
      planBytes -= entry.bytes;
    }
    plans.set(size, { plan, bytes });
    planBytes += bytes;
  }
  return plan;
}

/** Sizes of the plans kept now, least recently used first (for tests). */
export function cachedPlanSizes(): number[] {
  return [...plans.keys()];
}

class IdentityFft implements ComplexFft {
  readonly size = 1;
  forward(out: Float64Array, data: Float64Array): void {
    out[0] = data[0];
    out[1] = data[1];
  }
  inverse(out: Float64Array, data: Float64Array): void {
    out[0] = data[0];
    out[1] = data[1];
  }
}

/**
 * Real-input transform of a power-of-two size through fft.js's real radix-4 kernel.
 * `out` must hold 2*size numbers (fft.js uses the upper half as scratch); bins 0..size/2 are valid on return.
 */
export function realFftPow2(size: number): (out: Float64Array, data: Float64Array) => void {
  const plan = complexFft(size);
  if (!(plan instanceof Radix4Fft)) throw new RangeError(`real FFT size (${size}) must be a power of two >= 2`);
  return (out, data) => plan.fft.realTransform(out, data);
}

/** Full two-sided DFT of a real record of any length, interleaved (length 2N). */
export function realToComplexSpectrum(samples: Float64Array): Float64Array {
  return realSpectrumInto(samples, new Float64Array(2 * samples.length));
}

/** realToComplexSpectrum written into `out` (length 2N, any contents; every element is overwritten). */
export function realSpectrumInto(samples: Float64Array, out: Float64Array): Float64Array {
  const n = samples.length;
  if (n >= 2 && isPowerOfTwo(n)) {
    const plan = complexFft(n) as Radix4Fft;
    plan.fft.realTransform(out, samples);
    plan.fft.completeSpectrum(out);
    return out;
  }
  const data = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) data[2 * i] = samples[i];
  complexFft(n).forward(out, data);
  return out;
}

/** Inverse DFT of an interleaved spectrum of length 2N, returning the real part (N samples). */
export function complexSpectrumToReal(spectrum: Float64Array): Float64Array {
  const n = spectrum.length / 2;
  const out = new Float64Array(2 * n);
  complexFft(n).inverse(out, spectrum);
  const real = new Float64Array(n);
  for (let i = 0; i < n; i++) real[i] = out[2 * i];
  return real;
}

/** Inverse DFT of an interleaved spectrum of length 2N, full complex result (interleaved). */
export function inverseComplexSpectrum(spectrum: Float64Array): Float64Array {
  const n = spectrum.length / 2;
  const out = new Float64Array(2 * n);
  complexFft(n).inverse(out, spectrum);
  return out;
}
