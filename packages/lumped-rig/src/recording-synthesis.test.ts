import { describe, expect, it } from 'vitest';
import { amplitudeNear, amplitudeSpectrum, envelopeSpectrum, toneAmplitude } from '../test-support/spectrum.js';
import { defectFrequenciesHz } from './bearing-kinematics.js';
import { crusherGearbox } from './machines/crusher-gearbox.js';
import { dustFan } from './machines/dust-fan.js';
import { screenDrive } from './machines/screen-drive.js';
import { synthesizeRecording, type SynthesisPlan } from './recording-synthesis.js';
import { shaftSpeedsHz } from './rig-machine.js';
import type { RigFault } from './rig-faults.js';

const quiet = { noise: { rmsG: 2e-4, colour: 'white' as const }, backgroundRmsG: 2e-3 };

function fanPlan(faults: RigFault[], speedRpm = 2700, seed = 21): SynthesisPlan {
  return { machine: dustFan, pointId: 'fan-de-h', speedRpm, sampleRateHz: 25_600, durationS: 2.56, faults, seed, ...quiet };
}

function fanShaftHz(draws: Record<string, number | string>, speedRpm: number): number {
  return shaftSpeedsHz(dustFan, speedRpm, Number(draws.beltSlipPercent)).fan!;
}

/** Largest envelope line below maxHz. */
function strongestLine(s: { amplitude: Float64Array; binHz: number }, minHz: number, maxHz: number): number {
  let best = 0;
  let at = 0;
  for (let k = Math.ceil(minHz / s.binHz); k < maxHz / s.binHz; k++) {
    if (s.amplitude[k]! > best) {
      best = s.amplitude[k]!;
      at = k * s.binHz;
    }
  }
  return at;
}

describe('synthesizeRecording', () => {
  it('writes one channel in g of duration × rate samples, says the rate and duration in its metadata, and nothing of the truth', () => {
    const { recording } = synthesizeRecording(fanPlan([{ fault: 'unbalance', component: 'fan-impeller', severity: 'clear' }]));
    expect(recording.sampleRateHz).toBe(25_600);
    expect(recording.channels).toHaveLength(1);
    expect(recording.channels[0]!.unit).toBe('g');
    expect(recording.channels[0]!.samples.length).toBe(Math.round(2.56 * 25_600));
    expect(recording.metadata.sampleRateHz).toBe('25600');
    expect(Number(recording.metadata.durationS)).toBeCloseTo(2.56, 9);
    const text = JSON.stringify(recording.metadata);
    expect(text).not.toMatch(/unbalance|rpm|speed|fault|severity/i);
    expect(recording.channels[0]!.samples.every(Number.isFinite)).toBe(true);
  });

  it('puts an outer-race defect at BPFO of the true shaft speed in the envelope spectrum (Randall & Antoni 2011), absent when healthy', () => {
    const faulty = synthesizeRecording(fanPlan([{ fault: 'bearing-outer-race', component: 'fan-de', severity: 'shallow' }]));
    const healthy = synthesizeRecording(fanPlan([]));
    const bpfo = defectFrequenciesHz(dustFan.model.bearings.find((b) => b.id === 'fan-de')!, fanShaftHz(faulty.draws, 2700)).bpfoHz;
    const band = (r: typeof faulty) => envelopeSpectrum(r.recording.channels[0]!.samples, 25_600, 2560, 11_520);
    const ef = band(faulty);
    const eh = band(healthy);
    // The strongest envelope line is BPFO (within the slip jitter and a bin), and it stands far above the healthy one.
    expect(Math.abs(strongestLine(ef, 20, 1000) / bpfo - 1)).toBeLessThan(0.01);
    expect(amplitudeNear(ef, bpfo) / amplitudeNear(eh, bpfo)).toBeGreaterThan(30);
  });

  it('puts an inner-race defect at BPFI with shaft-rate sidebands (load-zone modulation)', () => {
    const r = synthesizeRecording(fanPlan([{ fault: 'bearing-inner-race', component: 'fan-de', severity: 'clear' }]));
    const fr = fanShaftHz(r.draws, 2700);
    const bpfi = defectFrequenciesHz(dustFan.model.bearings.find((b) => b.id === 'fan-de')!, fr).bpfiHz;
    const e = envelopeSpectrum(r.recording.channels[0]!.samples, 25_600, 2560, 11_520);
    const floor = amplitudeNear(e, bpfi + 0.5 * fr, 0);
    expect(amplitudeNear(e, bpfi) / floor).toBeGreaterThan(10);
    expect(amplitudeNear(e, bpfi - fr) / floor).toBeGreaterThan(5);
    expect(amplitudeNear(e, bpfi + fr) / floor).toBeGreaterThan(5);
    expect(amplitudeNear(e, fr) / floor).toBeGreaterThan(5);
  });

  it('makes the unbalance line grow with speed squared through the mount accelerance r²/√((1−r²)² + (2ζr)²)', () => {
    const plans = [2000, 2900].map((rpm) => fanPlan([{ fault: 'unbalance', component: 'fan-impeller', severity: 'clear' }], rpm, 33));
    const [a, b] = plans.map((p) => synthesizeRecording(p));
    const amp = (r: typeof a, rpm: number) => toneAmplitude(r!.recording.channels[0]!.samples, 25_600, fanShaftHz(r!.draws, rpm));
    const accelerance = (f: number) => {
      const r = f / Number(a!.draws.mountFrequencyHz);
      const z = Number(a!.draws.mountDampingRatio);
      return (r * r) / Math.sqrt((1 - r * r) ** 2 + (2 * z * r) ** 2);
    };
    const f1 = fanShaftHz(a!.draws, 2000);
    const f2 = fanShaftHz(b!.draws, 2900);
    const expected = (f2 / f1) ** 2 * (accelerance(f2) / accelerance(f1));
    expect(Math.abs(amp(b, 2900) / amp(a, 2000) / expected - 1)).toBeLessThan(0.03);
  });

  it('shows the gear mesh frequency z·f of a healthy reducer, and a stronger 2× mesh frequency when the teeth are worn', () => {
    const plan: SynthesisPlan = { machine: screenDrive, pointId: 'reducer-input-h', speedRpm: 1400, sampleRateHz: 20_000, durationS: 1.6, faults: [], seed: 5, ...quiet };
    const healthy = synthesizeRecording(plan);
    const worn = synthesizeRecording({ ...plan, faults: [{ fault: 'gear-wear', component: 'reducer-mesh', severity: 'clear' }] });
    const gmf = (23 * 1400) / 60;
    const sh = amplitudeSpectrum(healthy.recording.channels[0]!.samples, 20_000);
    const sw = amplitudeSpectrum(worn.recording.channels[0]!.samples, 20_000);
    const between = amplitudeNear(sh, gmf + 0.5 * (1400 / 60), 0);
    expect(amplitudeNear(sh, gmf) / between).toBeGreaterThan(10);
    expect(amplitudeNear(sw, 2 * gmf) / amplitudeNear(sh, 2 * gmf)).toBeGreaterThan(3);
  });

  it('drops contact once per pinion turn with a missing spur tooth: the pinion-rate comb rises', () => {
    const plan: SynthesisPlan = { machine: crusherGearbox, pointId: 'gearbox-intermediate-v', speedRpm: 900, sampleRateHz: 12_800, durationS: 1.5, faults: [], seed: 8, ...quiet };
    const healthy = synthesizeRecording(plan);
    const faulty = synthesizeRecording({ ...plan, faults: [{ fault: 'gear-missing-tooth', component: 'ls-pinion', severity: 'clear' }] });
    const fInter = (900 / 60) * (19 / 71);
    const comb = (r: typeof healthy) => {
      const s = amplitudeSpectrum(r.recording.channels[0]!.samples, 12_800);
      let sum = 0;
      for (let h = 3; h <= 40; h++) if (h % 17 !== 0) sum += amplitudeNear(s, h * fInter, 1);
      return sum;
    };
    expect(comb(faulty) / comb(healthy)).toBeGreaterThan(5);
  });

  it('is deterministic for a plan and changes with the seed', () => {
    const a = synthesizeRecording(fanPlan([], 2500, 4)).recording.channels[0]!.samples;
    const b = synthesizeRecording(fanPlan([], 2500, 4)).recording.channels[0]!.samples;
    const c = synthesizeRecording(fanPlan([], 2500, 5)).recording.channels[0]!.samples;
    expect(Buffer.from(a.buffer).equals(Buffer.from(b.buffer))).toBe(true);
    expect(Buffer.from(a.buffer).equals(Buffer.from(c.buffer))).toBe(false);
  });

  it('names a bad plan', () => {
    expect(() => synthesizeRecording({ ...fanPlan([]), pointId: 'nowhere' })).toThrow(/pointId/);
    expect(() => synthesizeRecording({ ...fanPlan([]), speedRpm: 5000 })).toThrow(/speedRpm/);
    expect(() => synthesizeRecording({ ...fanPlan([{ fault: 'misalignment', component: 'fan', severity: 'clear' }]) })).toThrow(/does not fit/);
  });
});
