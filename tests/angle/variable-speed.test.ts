import { readFileSync } from 'node:fs';
import { loadMachineModel, shaftRatio } from '@kinespec/kinematics';
import {
  detectPulses,
  magnitudeSpectrum,
  orderSpectrum,
  resampleToAngle,
  shaftAngleFromPulses,
  speedFromPulses,
  torsionalVibration,
  valueAtOrder,
  type Recording,
} from '@kinespec/signal';
import { simulateRecording, type SimulatedFault } from '@kinespec/simulator';
import { describe, expect, it } from 'vitest';

/*
 * Before / after: the same simulated gearbox recordings analysed in the frequency domain and in the angle
 * domain, with the speed wandering ±5 % (1400 ± 70 rpm, period 5 s) as a drive on a varying load does.
 * The simulator (packages/simulator) is independent time-domain physics; kinematics gives the ratios.
 */
const model = loadMachineModel(readFileSync(new URL('../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));
const fs = 10_000;
const durationS = 16;
// Speed law of the reference (motor) shaft and its closed-form angle: θ/2π = (1400·t + 70·(5/2π)·(1 − cos 2πt/5)) / 60.
const rpm = (t: number) => 1400 + 70 * Math.sin((2 * Math.PI * t) / 5);
const revolutions = (t: number) => (1400 * t + ((70 * 5) / (2 * Math.PI)) * (1 - Math.cos((2 * Math.PI * t) / 5))) / 60;
const inputRatio = shaftRatio(model, 'input');
const outputRatio = shaftRatio(model, 'output');

function record(faults: SimulatedFault[], varying = true): Recording {
  return simulateRecording(model, {
    pointId: 'gb-input-h', sampleRateHz: fs, durationS, ...(varying ? { speedProfile: rpm } : { speedRpm: 1400 }), includeTach: true, faults, seed: 21,
  });
}

function orderDomain(rec: Recording, maxOrder: number) {
  const pulses = speedFromPulses(detectPulses(rec.channels[1]!.samples, fs).edgeTimesS);
  const angle = shaftAngleFromPulses(pulses, rec.channels[0]!.samples.length, fs);
  return orderSpectrum(resampleToAngle(rec.channels[0]!.samples, fs, angle, { maxOrder }));
}

/**
 * How strongly a comb of lines at multiples of `spacing` stands out in [lo, hi): the summed height at the
 * multiples over the summed height half-way between them (1 when there is no comb).
 */
function combContrast(values: Float64Array, resolution: number, spacing: number, lo: number, hi: number): number {
  let on = 0;
  let off = 0;
  const height = (x: number) => {
    const b = Math.round(x / resolution);
    return Math.max(values[b - 1]!, values[b]!, values[b + 1]!);
  };
  for (let k = Math.ceil(lo / spacing); k * spacing < hi; k++) {
    on += height(k * spacing);
    off += height((k + 0.5) * spacing);
  }
  return on / off;
}

const missingTooth: SimulatedFault[] = [{ fault: 'gear-missing-tooth', component: 'wheel-2', severity: 0.6 }];

describe('variable speed: frequency domain against angle domain', () => {
  const healthy = record([]);
  const faulty = record(missingTooth);

  it('keeps the stage-1 mesh tone in one order line where the frequency spectrum smears it', () => {
    // GMF = teeth × shaft speed (common practice): order 18 of the input shaft; the simulator puts 0.15 g peak there.
    const meshOrder = 18 * inputRatio;
    const orders = orderDomain(healthy, 20);
    const inOrders = valueAtOrder(orders, meshOrder, 1.5 * orders.orderResolution).value;
    const spectrum = magnitudeSpectrum(healthy.channels[0]!.samples, fs, { scaling: 'peak' });
    const meanHz = Number(healthy.metadata.meanSpeedRpm) / 60;
    const k = Math.round((meshOrder * meanHz) / spectrum.frequencyResolutionHz);
    const inFrequency = Math.max(...Array.from(spectrum.values.subarray(k - 2, k + 3)));
    expect(Math.abs(inOrders / 0.15 - 1)).toBeLessThan(0.05);
    // a ±5 % speed swing spreads the 300 Hz line over ±15 Hz: its highest bin keeps under a fifth of the amplitude
    expect(inFrequency).toBeLessThan(0.2 * 0.15);
  });

  it('resolves the once-per-turn comb of a wheel with a missing tooth only in the order spectrum', () => {
    // The impacts ring the point's 3.4 kHz resonance once per output-shaft turn: a comb spaced by the output
    // shaft's order around orders 120-160 of the motor (common practice: a local fault gives harmonics of its shaft).
    const spacing = outputRatio;
    const ordersFaulty = orderDomain(faulty, 160);
    const ordersHealthy = orderDomain(healthy, 160);
    const afterFaulty = combContrast(ordersFaulty.values, ordersFaulty.orderResolution, spacing, 120, 160);
    const afterHealthy = combContrast(ordersHealthy.values, ordersHealthy.orderResolution, spacing, 120, 160);
    const frequency = (rec: Recording) => {
      const meanHz = Number(rec.metadata.meanSpeedRpm) / 60;
      const s = magnitudeSpectrum(rec.channels[0]!.samples, fs, { scaling: 'peak' });
      return combContrast(s.values, s.frequencyResolutionHz, spacing * meanHz, 120 * meanHz, 160 * meanHz);
    };
    const beforeFaulty = frequency(faulty);
    const constantSpeed = frequency(record(missingTooth, false));
    expect(afterFaulty).toBeGreaterThan(2);
    expect(afterHealthy).toBeLessThan(1.2);
    expect(beforeFaulty).toBeLessThan(1.2);
    // control: at constant speed the frequency spectrum shows the same comb, so only the speed swing hid it
    expect(constantSpeed).toBeGreaterThan(2);
  });

  it('reads the varying speed from the tach within 0.1 % of the speed law', () => {
    const pulses = speedFromPulses(detectPulses(healthy.channels[1]!.samples, fs).edgeTimesS);
    expect(pulses.missingPulses + pulses.extraPulses).toBe(0);
    let worst = 0;
    // each estimate is the mean speed over one revolution: compare with the law's exact mean over the same span
    for (let i = 0; i + 1 < pulses.pulseTimesS.length; i++) {
      const [a, b] = [pulses.pulseTimesS[i]!, pulses.pulseTimesS[i + 1]!];
      const lawHz = (revolutions(b) - revolutions(a)) / (b - a);
      worst = Math.max(worst, Math.abs(pulses.instantaneous.speedHz[i]! / lawHz - 1));
    }
    expect(worst).toBeLessThan(0.001);
    expect(pulses.minHz * 60).toBeGreaterThan(1329);
    expect(pulses.maxHz * 60).toBeLessThan(1471);
  });

  it('recovers a torsional vibration of the input shaft from a 60-pulse encoder', () => {
    const rec = simulateRecording(model, {
      pointId: 'gb-input-h', sampleRateHz: 25_600, durationS: 6, speedRpm: 1450, seed: 2,
      includeEncoder: { pulsesPerRev: 60, shaft: 'input' }, encoderAngleFluctuation: [{ order: 2, amplitudeDeg: 0.2 }, { order: 7, amplitudeDeg: 0.03 }],
    });
    const pulses = speedFromPulses(detectPulses(rec.channels[1]!.samples, rec.sampleRateHz).edgeTimesS, { pulsesPerRev: 60 });
    const tv = torsionalVibration(pulses, { angleUnit: 'deg' });
    expect(tv.meanSpeedHz * 60).toBeCloseTo(1450 * inputRatio, 0);
    for (const [order, amplitudeDeg] of [[2, 0.2], [7, 0.03]] as const) {
      const found = valueAtOrder(tv.angleSpectrum, order, 0.5 * tv.angleSpectrum.orderResolution).value;
      expect(Math.abs(found / amplitudeDeg - 1)).toBeLessThan(0.03);
    }
  });
});
