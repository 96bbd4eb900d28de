// Synthetic signals for this package's tests, each with a known answer. Not part of the package build.
import { parkMiller } from '../../../fixtures/diagnosis/reference-signal.js';

/** Standard normal samples: Box & Muller (1958), Ann. Math. Statist. 29:610. */
export function gaussianNoise(count: number, seed: number, sigma = 1): Float64Array {
  const u = parkMiller(seed, 2 * count);
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = sigma * Math.sqrt(-2 * Math.log(u[2 * i]!)) * Math.cos(2 * Math.PI * u[2 * i + 1]!);
  return out;
}

/**
 * Impacts at `rateHz` each ringing a single-degree-of-freedom resonance (impulse response e^(−ζωt)·sin(ω_d t)),
 * the textbook model of a localised bearing defect (R. B. Randall & J. Antoni, MSSP 25:485–520, 2011, §2.1).
 * `jitterFraction` moves each impact by a uniform random fraction of the period (rolling-element slip, 1–2 %).
 */
export function impactTrain(options: {
  sampleRateHz: number; length: number; rateHz: number; resonanceHz: number; dampingRatio: number;
  amplitude: number; jitterFraction?: number; seed?: number; modulation?: (tS: number) => number;
}): Float64Array {
  const { sampleRateHz: fs, length, rateHz, resonanceHz, dampingRatio: zeta, amplitude } = options;
  const x = new Float64Array(length);
  const wn = 2 * Math.PI * resonanceHz;
  const wd = wn * Math.sqrt(1 - zeta * zeta);
  const decayS = 8 / (zeta * wn);
  const period = 1 / rateHz;
  const jitter = parkMiller(options.seed ?? 7, Math.ceil((length / fs) * rateHz) + 2);
  for (let k = 0; k * period < length / fs; k++) {
    const t0 = k * period + (options.jitterFraction ?? 0) * period * (jitter[k]! - 0.5);
    const a = amplitude * (options.modulation ? options.modulation(t0) : 1);
    const i0 = Math.max(0, Math.ceil(t0 * fs));
    for (let i = i0; i < length; i++) {
      const t = i / fs - t0;
      if (t > decayS) break;
      x[i] += a * Math.exp(-zeta * wn * t) * Math.sin(wd * t);
    }
  }
  return x;
}

export function add(...signals: Float64Array[]): Float64Array {
  const out = new Float64Array(signals[0]!.length);
  for (const s of signals) for (let i = 0; i < out.length; i++) out[i] += s[i]!;
  return out;
}

export function sine(length: number, sampleRateHz: number, frequencyHz: number, amplitude = 1, phase = 0): Float64Array {
  return Float64Array.from({ length }, (_, i) => amplitude * Math.sin((2 * Math.PI * frequencyHz * i) / sampleRateHz + phase));
}

/**
 * A unit impulse every `periodSamples` samples through the second-order peak filter that scipy.signal.iirpeak
 * designs (S. J. Orfanidis, Introduction to Signal Processing, 1996, §11.3: notch/peak design), times `gain`.
 * This is the check-values §9 setup: impulses at 100/s through a 3 kHz, Q = 20 resonance.
 */
export function peakFilteredImpulses(length: number, sampleRateHz: number, periodSamples: number, centreHz: number, q: number, gain: number): Float64Array {
  const w0 = (2 * Math.PI * centreHz) / sampleRateHz;
  const beta = Math.tan(w0 / q / 2);
  const g = 1 / (1 + beta);
  const b0 = 1 - g;
  const a1 = -2 * g * Math.cos(w0);
  const a2 = 2 * g - 1;
  const y = new Float64Array(length);
  let x1 = 0, x2 = 0, y1 = 0, y2 = 0;
  for (let i = 0; i < length; i++) {
    const xi = i % periodSamples === 0 ? 1 : 0;
    const yi = b0 * xi - b0 * x2 - a1 * y1 - a2 * y2;
    x2 = x1; x1 = xi; y2 = y1; y1 = yi;
    y[i] = gain * yi;
  }
  return y;
}
