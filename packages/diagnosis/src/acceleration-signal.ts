import { convertUnit, quantityOfUnit, scratchArray } from '@kinespec/signal';
import { fftPlan, previousPowerOfTwo } from './fft-plan.js';

/**
 * Highest frequency kept when a velocity or displacement channel is differentiated to acceleration, Hz.
 * A velocity reading is specified over the broadband vibration-severity range, 10–1000 Hz (ISO 20816-1, and
 * ISO 2954 for the instruments). Above it a velocity channel holds what a velocity measurement does not read
 * faithfully (noise, the sensor's or integrator's roll-off, the sharp edges of impacts), and differentiation
 * multiplies it by 2πf: a 0.01 mm/s line at 10 kHz becomes 0.63 m/s². Differentiated over the whole band, a demo
 * velocity point with a broken tooth read an acceleration peak of 366 m/s² and a kurtosis of 241; up to 1 kHz it
 * reads 44 m/s² and 23. Inside the band a = 2πf·v is exact, so the acceleration of a velocity point is the
 * acceleration of what the velocity measurement covers; impacts ringing above 1 kHz are left to acceleration points.
 */
export const DIFFERENTIATION_TOP_HZ = 1000;

/**
 * The acceleration time signal of a vibration channel, for time-domain indicators (peak, crest factor,
 * kurtosis), in m/s² unless the channel is already in an acceleration unit (then unchanged, same unit).
 * Velocity is differentiated once and displacement twice in the frequency domain (multiply by j·2πf, common
 * practice) up to DIFFERENTIATION_TOP_HZ (an ideal DFT-domain low-pass, as fftBandPass), over the largest
 * power-of-two span from the start of the record, with the mean removed and a 5 % cosine taper at each end so
 * that the record's wrap-around jump does not read as an impact; the tapered ends are then dropped.
 */
export function accelerationSignal(samples: Float64Array, sampleRateHz: number, unit: string): { samples: Float64Array; unit: string } {
  const quantity = quantityOfUnit(unit);
  if (quantity === 'acceleration') return { samples, unit };
  const steps = quantity === 'velocity' ? 1 : 2;
  const si = convertUnit(1, unit, quantity === 'velocity' ? 'm/s' : 'm');
  const n = previousPowerOfTwo(samples.length);
  if (n < 64) return { samples: new Float64Array(0), unit: 'm/s^2' };
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i]!;
  mean /= n;
  const taper = Math.floor(0.05 * n);
  // Work arrays reused between calls (every element is written before it is read); only `kept` is returned.
  const x = scratchArray('diagnosis:differentiation-input', n);
  for (let i = 0; i < n; i++) {
    const w = i < taper ? 0.5 - 0.5 * Math.cos((Math.PI * i) / taper) : i >= n - taper ? 0.5 - 0.5 * Math.cos((Math.PI * (n - 1 - i)) / taper) : 1;
    x[i] = (samples[i]! - mean) * w * si;
  }
  const plan = fftPlan(n);
  const spectrum = scratchArray('diagnosis:differentiation-spectrum', 2 * n);
  plan.realTransform(spectrum, x);
  plan.completeSpectrum(spectrum);
  for (let k = 0; k < n; k++) {
    // Signed frequency of bin k; the Nyquist bin of a real signal has no sign, so it is dropped.
    const f = k < n / 2 ? k : k > n / 2 ? k - n : 0;
    const w = (2 * Math.PI * f * sampleRateHz) / n;
    if (Math.abs(f * sampleRateHz) / n > DIFFERENTIATION_TOP_HZ) {
      spectrum[2 * k] = 0;
      spectrum[2 * k + 1] = 0;
      continue;
    }
    let re = spectrum[2 * k]!;
    let im = spectrum[2 * k + 1]!;
    for (let s = 0; s < steps; s++) {
      const r = -w * im;
      im = w * re;
      re = r;
    }
    spectrum[2 * k] = re;
    spectrum[2 * k + 1] = im;
  }
  const out = scratchArray('diagnosis:differentiation-output', 2 * n);
  plan.inverseTransform(out, spectrum);
  const kept = new Float64Array(n - 2 * taper);
  for (let i = 0; i < kept.length; i++) kept[i] = out[2 * (i + taper)]!;
  return { samples: kept, unit: 'm/s^2' };
}
