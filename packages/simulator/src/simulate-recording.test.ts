import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { SimulatorInputError, simulateRecording } from './index.js';

const aerationMixer = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));

/** Amplitude of the line at `frequencyHz`, from the Hann-windowed DFT at that frequency divided by the window's coherent gain (common practice). */
function lineAmplitude(x: Float64Array, sampleRateHz: number, frequencyHz: number): number {
  let re = 0;
  let im = 0;
  let gain = 0;
  const n = x.length;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    const phase = (2 * Math.PI * frequencyHz * i) / sampleRateHz;
    re += w * x[i]! * Math.cos(phase);
    im -= w * x[i]! * Math.sin(phase);
    gain += w;
  }
  return (2 * Math.hypot(re, im)) / gain;
}

function risingEdges(x: Float64Array, thresholdV: number): number {
  let count = 0;
  for (let i = 1; i < x.length; i++) if (x[i - 1]! < thresholdV && x[i]! >= thresholdV) count++;
  return count;
}

// Shaft speeds worked by hand from the model (common practice: belt ratio D1/D2 less slip, gear ratio N1/N2).
const motorHz = 1480 / 60;
const inputHz = motorHz * (180 / 250) * 0.99;
const intermediateHz = (inputHz * 18) / 67;
const outputHz = (intermediateHz * 23) / 79;

describe('simulateRecording', () => {
  const base = { pointId: 'gb-input-h', sampleRateHz: 10_000, durationS: 2, speedRpm: 1480 };

  it('returns the same samples for the same seed and different samples for another seed', () => {
    const a = simulateRecording(aerationMixer, { ...base, seed: 42 });
    const b = simulateRecording(aerationMixer, { ...base, seed: 42 });
    const c = simulateRecording(aerationMixer, { ...base, seed: 43 });
    expect(Array.from(a.channels[0]!.samples)).toEqual(Array.from(b.channels[0]!.samples));
    expect(a.channels[0]!.samples[100]).not.toEqual(c.channels[0]!.samples[100]);
    expect(a.channels[0]!.unit).toBe('g');
    expect(a.channels[0]!.samples.length).toBe(20_000);
  });

  it('puts the mesh tones at teeth × shaft speed, with the healthy amplitude of 0.15 g', () => {
    const rec = simulateRecording(aerationMixer, { ...base, noise: { accelerationRmsG: 0 } });
    const x = rec.channels[0]!.samples;
    // Common practice: GMF = N_p·f_p = N_g·f_g.
    const gmf1 = 18 * inputHz;
    expect(gmf1).toBeCloseTo(67 * intermediateHz, 9);
    const gmf2 = 23 * intermediateHz;
    expect(lineAmplitude(x, 10_000, gmf1)).toBeCloseTo(0.15, 2);
    expect(lineAmplitude(x, 10_000, 2 * gmf1)).toBeCloseTo(0.06, 2);
    // stage 2 is one mesh away from the input shaft: half as strong at this point
    expect(lineAmplitude(x, 10_000, gmf2)).toBeCloseTo(0.075, 2);
    // no line half-way between the mesh harmonics
    expect(lineAmplitude(x, 10_000, 1.5 * gmf1)).toBeLessThan(0.002);
  });

  it('raises the 1× line of an unbalanced shaft to about 8 mm/s r.m.s. on a velocity point', () => {
    const model: MachineModel = {
      ...aerationMixer,
      points: [...aerationMixer.points, { id: 'motor-de-v', shaft: 'motor', quantity: 'velocity', unit: 'mm/s', direction: 'vertical' }],
    };
    const rec = simulateRecording(model, {
      pointId: 'motor-de-v', sampleRateHz: 5000, durationS: 4, speedRpm: 1480, healthyLevel: 0,
      faults: [{ fault: 'unbalance', component: 'motor', severity: 1 }], noise: { rms: 0 },
    });
    const peak = lineAmplitude(rec.channels[0]!.samples, 5000, motorHz);
    expect(peak / Math.SQRT2).toBeCloseTo(8, 1);
    expect(rec.channels[0]!.unit).toBe('mm/s');
  });

  it('adds an outer-race impact train whose squared signal has a line at BPFO = 3.5848 × shaft speed', () => {
    // BPFO order 3.5848 of a 6205 bearing (n = 9, d/D = 0.2034): check-values §3, CWRU drive-end bearing data.
    const bpfoHz = 3.5848 * inputHz;
    const rec = simulateRecording(aerationMixer, {
      ...base, durationS: 4, faults: [{ fault: 'bearing-outer-race', component: 'input-de', severity: 0.5 }], seed: 3,
    });
    const x = rec.channels[0]!.samples;
    const squared = x.map((v) => v * v);
    const atBpfo = lineAmplitude(squared, 10_000, bpfoHz);
    expect(atBpfo).toBeGreaterThan(5 * lineAmplitude(squared, 10_000, 1.13 * bpfoHz));
    expect(atBpfo).toBeGreaterThan(5 * lineAmplitude(squared, 10_000, 5.4152 * inputHz));
    // the impacts ring the point's 3.4 kHz resonance
    const healthy = simulateRecording(aerationMixer, { ...base, durationS: 4, seed: 3 });
    expect(bandPower(x, 10_000, 3200, 3600)).toBeGreaterThan(20 * bandPower(healthy.channels[0]!.samples, 10_000, 3200, 3600));
  });

  it('adds a once-per-revolution transient for a missing tooth on the output wheel', () => {
    const rec = simulateRecording(aerationMixer, {
      ...base, durationS: 8, faults: [{ fault: 'gear-missing-tooth', component: 'wheel-2', severity: 1 }], seed: 5,
    });
    const squared = rec.channels[0]!.samples.map((v) => v * v);
    const atShaft = lineAmplitude(squared, 10_000, outputHz);
    expect(atShaft).toBeGreaterThan(10 * lineAmplitude(squared, 10_000, 1.37 * outputHz));
    // the mesh of stage 2 loses one tooth in 79 per revolution of the wheel: sidebands at GMF2 ± f_output appear
    const healthy = simulateRecording(aerationMixer, { ...base, durationS: 8, seed: 5, noise: { accelerationRmsG: 0 } });
    const faulty = simulateRecording(aerationMixer, {
      ...base, durationS: 8, seed: 5, noise: { accelerationRmsG: 0 }, faults: [{ fault: 'gear-missing-tooth', component: 'wheel-2', severity: 1 }],
    });
    const gmf2 = 79 * outputHz;
    const sideband = (r: typeof rec) => lineAmplitude(r.channels[0]!.samples, 10_000, gmf2 + outputHz);
    expect(sideband(faulty)).toBeGreaterThan(5 * sideband(healthy));
  });

  it('writes one tach pulse per revolution of the reference shaft, also during a run-up', () => {
    const rec = simulateRecording(aerationMixer, { ...base, durationS: 3, speedProfile: [600, 1500], includeTach: true });
    expect(rec.channels[1]!.name).toBe('tach');
    expect(rec.channels[1]!.unit).toBe('V');
    expect(rec.metadata.tachChannel).toBe('1');
    // revolutions of a linear ramp: (f0 + f1)/2 · T, with T the time from the first to the last sample
    const revolutions = ((600 + 1500) / 2 / 60) * (29_999 / 10_000);
    const edges = risingEdges(rec.channels[1]!.samples, 2.5);
    expect(Math.abs(edges - revolutions)).toBeLessThanOrEqual(1);
  });

  it('writes pulsesPerRev encoder pulses per revolution of the chosen shaft', () => {
    const rec = simulateRecording(aerationMixer, { ...base, sampleRateHz: 25_600, durationS: 1, includeEncoder: { pulsesPerRev: 60, shaft: 'input' } });
    const edges = risingEdges(rec.channels[1]!.samples, 2.5);
    expect(Math.abs(edges - 60 * inputHz * (25_599 / 25_600))).toBeLessThanOrEqual(1);
  });

  it('keeps every shaft-locked line at a fixed order when the speed varies', () => {
    const rec = simulateRecording(aerationMixer, {
      ...base, durationS: 4, speedProfile: (t) => 1400 + 80 * Math.sin(t), healthyLevel: 1, noise: { accelerationRmsG: 0 },
    });
    const x = rec.channels[0]!.samples;
    // Integrate the same speed law by hand (closed form) and correlate with order 18 of the input shaft.
    const ratio = (180 / 250) * 0.99;
    let re = 0;
    let im = 0;
    const fs = 10_000;
    for (let i = 0; i < x.length; i++) {
      const t = i / fs;
      const revolutions = ((1400 * t + 80 * (1 - Math.cos(t))) / 60) * ratio;
      re += x[i]! * Math.cos(2 * Math.PI * 18 * revolutions);
      im -= x[i]! * Math.sin(2 * Math.PI * 18 * revolutions);
    }
    expect((2 * Math.hypot(re, im)) / x.length).toBeCloseTo(0.15, 2);
  });

  it('puts the healthy mesh tones at the levels meshHarmonicsG asks for', () => {
    const rec = simulateRecording(aerationMixer, { ...base, noise: { accelerationRmsG: 0 }, meshHarmonicsG: [0.05, 0.2, 0, 0.1] });
    const x = rec.channels[0]!.samples;
    // Common practice: GMF = N_p·f_p.
    const gmf1 = 18 * inputHz;
    expect(lineAmplitude(x, 10_000, gmf1)).toBeCloseTo(0.05, 2);
    expect(lineAmplitude(x, 10_000, 2 * gmf1)).toBeCloseTo(0.2, 2);
    expect(lineAmplitude(x, 10_000, 3 * gmf1)).toBeLessThan(0.002);
    expect(lineAmplitude(x, 10_000, 4 * gmf1)).toBeCloseTo(0.1, 2);
  });

  it('rings the resonance given in the options instead of the point\'s', () => {
    const opts = { ...base, durationS: 2, faults: [{ fault: 'bearing-outer-race' as const, component: 'input-de', severity: 1 }], seed: 3 };
    const own = simulateRecording(aerationMixer, opts).channels[0]!.samples;
    const moved = simulateRecording(aerationMixer, { ...opts, resonances: [{ frequencyHz: 1500, dampingRatio: 0.03 }] }).channels[0]!.samples;
    // the point's own mode is 3.4 kHz (fixtures/machines/aeration-mixer-2.json)
    expect(bandPower(moved, 10_000, 1400, 1600)).toBeGreaterThan(10 * bandPower(own, 10_000, 1400, 1600));
    expect(bandPower(own, 10_000, 3300, 3500)).toBeGreaterThan(10 * bandPower(moved, 10_000, 3300, 3500));
  });

  it('drops the tooth impact with toothFault.impactScale 0 and keeps the gate', () => {
    const opts = { ...base, durationS: 8, seed: 5, noise: { accelerationRmsG: 0 }, healthyLevel: 1, faults: [{ fault: 'gear-missing-tooth' as const, component: 'wheel-2', severity: 1 }] };
    const withImpact = simulateRecording(aerationMixer, opts).channels[0]!.samples;
    const gateOnly = simulateRecording(aerationMixer, { ...opts, toothFault: { impactScale: 0, gateWidthPitches: 1.5, gateEdgeFraction: 0.5 } }).channels[0]!.samples;
    // the impact rings the 3.4 kHz mode; the gate alone leaves that band empty
    expect(bandPower(withImpact, 10_000, 3300, 3500)).toBeGreaterThan(100 * bandPower(gateOnly, 10_000, 3300, 3500));
    // McFadden & Smith (1985): the gate still modulates the mesh once per wheel revolution (sideband at GMF2 + f_output)
    const gmf2 = 79 * outputHz;
    const healthy = simulateRecording(aerationMixer, { ...opts, faults: [] }).channels[0]!.samples;
    expect(lineAmplitude(gateOnly, 10_000, gmf2 + outputHz)).toBeGreaterThan(5 * lineAmplitude(healthy, 10_000, gmf2 + outputHz));
  });

  it('removes the once-per-turn modulation of inner-race impacts with bearingFault.loadZoneDepth 0', () => {
    const opts = { ...base, durationS: 4, seed: 9, noise: { accelerationRmsG: 0 }, healthyLevel: 0, bearingSlipPercent: 0, faults: [{ fault: 'bearing-inner-race' as const, component: 'input-de', severity: 1 }] };
    const squared = (x: Float64Array) => x.map((v) => v * v);
    const full = squared(simulateRecording(aerationMixer, opts).channels[0]!.samples);
    const none = squared(simulateRecording(aerationMixer, { ...opts, bearingFault: { loadZoneDepth: 0 } }).channels[0]!.samples);
    // Randall & Antoni (2011): a load zone modulates inner-race impacts at shaft speed, giving BPFI ± f_shaft sidebands.
    const bpfiHz = 5.4152 * inputHz;
    const sidebandOverLine = (x: Float64Array) => lineAmplitude(x, 10_000, bpfiHz + inputHz) / lineAmplitude(x, 10_000, bpfiHz);
    expect(sidebandOverLine(full)).toBeGreaterThan(0.2);
    expect(sidebandOverLine(none)).toBeLessThan(0.02);
  });

  it('shapes pink and brown noise to PSD slopes of -10 and -20 dB per decade and keeps the r.m.s. asked for', () => {
    // Kasdin (1995), Proc. IEEE 83(5): 1/f^α noise has a PSD slope of −10·α dB per decade.
    const fs = 20_000;
    // Mean power over one octave a decade apart; points 2 Hz apart (the 2 s record resolves 0.5 Hz) average the noise's scatter.
    const meanPower = (x: Float64Array, lowHz: number) => {
      let sum = 0;
      let count = 0;
      for (let f = lowHz; f <= 2 * lowHz; f += 2, count++) sum += lineAmplitude(x, fs, f) ** 2;
      return sum / count;
    };
    const slopeDbPerDecade = (x: Float64Array) => 10 * Math.log10(meanPower(x, 1000) / meanPower(x, 100));
    const noiseOnly = (colour: { white?: number; pink?: number; brown?: number }) =>
      simulateRecording(aerationMixer, { ...base, sampleRateHz: fs, durationS: 2, healthyLevel: 0, noise: { accelerationRmsG: 0.05, colour, seed: 11 } }).channels[0]!.samples;
    const rms = (x: Float64Array) => Math.sqrt(x.reduce((s, v) => s + v * v, 0) / x.length);
    const pink = noiseOnly({ pink: 1 });
    const brown = noiseOnly({ brown: 1 });
    const white = noiseOnly({ white: 1 });
    expect(Math.abs(slopeDbPerDecade(pink) + 10)).toBeLessThan(1.5);
    expect(Math.abs(slopeDbPerDecade(brown) + 20)).toBeLessThan(1.5);
    expect(Math.abs(slopeDbPerDecade(white))).toBeLessThan(1.5);
    for (const x of [pink, brown, white, noiseOnly({ white: 1, pink: 1, brown: 2 })]) expect(rms(x)).toBeCloseTo(0.05, 2);
  });

  it('rejects an unknown point, an unknown component and a severity out of range with typed errors', () => {
    const code = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return e instanceof SimulatorInputError ? e.code : 'other';
      }
      return 'none';
    };
    expect(code(() => simulateRecording(aerationMixer, { ...base, pointId: 'nowhere' }))).toBe('unknown_point');
    expect(code(() => simulateRecording(aerationMixer, { ...base, faults: [{ fault: 'gear-missing-tooth', component: 'input-de', severity: 1 }] }))).toBe('unknown_component');
    expect(code(() => simulateRecording(aerationMixer, { ...base, faults: [{ fault: 'unbalance', component: 'motor', severity: 2 }] }))).toBe('invalid_severity');
    expect(code(() => simulateRecording(aerationMixer, { ...base, durationS: undefined }))).toBe('invalid_length');
    expect(code(() => simulateRecording(aerationMixer, { ...base, includeEncoder: 4096 }))).toBe('pulses_per_rev');
    expect(code(() => simulateRecording(aerationMixer, { ...base, resonances: [{ frequencyHz: 2000, dampingRatio: 1.5 }] }))).toBe('invalid_resonance');
    expect(code(() => simulateRecording(aerationMixer, { ...base, toothFault: { gateEdgeFraction: 0.8 } }))).toBe('invalid_shape');
    expect(code(() => simulateRecording(aerationMixer, { ...base, bearingFault: { loadZoneDepth: -1 } }))).toBe('invalid_shape');
    expect(code(() => simulateRecording(aerationMixer, { ...base, noise: { colour: { pink: -1 } } }))).toBe('invalid_noise');
  });
});

/** Mean power of the Hann-windowed DFT over a band, by direct sums every 10 Hz (enough to compare two signals). */
function bandPower(x: Float64Array, sampleRateHz: number, lowHz: number, highHz: number): number {
  let total = 0;
  for (let f = lowHz; f <= highHz; f += 10) total += lineAmplitude(x, sampleRateHz, f) ** 2;
  return total;
}
