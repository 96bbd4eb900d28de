import { readFileSync } from 'node:fs';
import { componentLines, loadMachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, impactTrain, sine } from '../test/signals.js';
import { analyseRecording, SOFTWARE_VERSION } from './analyse-recording.js';
import { DiagnosisInputError } from './errors.js';

const model = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));
const fs = 25600;
const n = 65536;

/** The example machine's running lines at a speed: 1× and 2× of each shaft, the mesh tones, plus noise (in g). */
function runningMachine(speedHz: number, seed: number): Float64Array {
  const x = gaussianNoise(n, seed, 0.01);
  componentLines(model, speedHz)
    .filter((l) => (l.family === 'shaft-harmonic' && l.harmonic <= 2) || l.family === 'gear-mesh')
    .forEach((l, j) => {
      const a = l.family === 'gear-mesh' ? 0.1 / l.harmonic : 0.004;
      const tone = sine(n, fs, l.frequencyHz, a, j);
      for (let i = 0; i < n; i++) x[i] += tone[i]!;
    });
  return x;
}

function recording(samples: Float64Array, extra: Recording['channels'] = []): Recording {
  return { sampleRateHz: fs, channels: [{ name: 'gb-input-h', unit: 'g', samples }, ...extra], metadata: {} };
}

describe('analyseRecording', () => {
  const speedHz = (1480 * 0.985) / 60;
  const healthy = analyseRecording(recording(runningMachine(speedHz, 1)), { model, pointId: 'gb-input-h' });

  it('returns the contract object: speed, overall with zone, indicators, plot spectrum, hypotheses, warnings', () => {
    expect(healthy.softwareVersion).toBe(SOFTWARE_VERSION);
    expect(healthy.domain).toBe('frequency');
    expect(healthy.speedSource).toBe('spectrum');
    expect(healthy.overall.bandHz).toEqual([10, 1000]);
    expect(['A', 'B', 'C', 'D']).toContain(healthy.overall.zone);
    expect(healthy.overall.accelerationUnit).toBe('g');
    expect(healthy.spectrum.scaling).toBe('peak');
    expect(healthy.spectrum.frequenciesHz.length).toBeLessThanOrEqual(2048);
    expect(healthy.envelopeSpectrum?.bandSource).toBe('resonance');
    for (const key of ['velocity_rms_mm_per_s', 'acceleration_peak', 'crest_factor', 'kurtosis', 'envelope_rms']) {
      expect(Number.isFinite(healthy.indicators[key])).toBe(true);
    }
    expect(healthy.hypotheses.length).toBeGreaterThan(20);
    for (const h of healthy.hypotheses) expect(healthy.indicators[`score:${h.fault}:${h.component}`]).toBe(h.score);
    for (let i = 1; i < healthy.hypotheses.length; i++) expect(healthy.hypotheses[i - 1]!.score).toBeGreaterThanOrEqual(healthy.hypotheses[i]!.score);
  });

  it('finds the running speed off nameplate from the spectrum alone (1.5 % slow)', () => {
    expect(Math.abs(healthy.speedHz! - speedHz) / speedHz).toBeLessThan(2e-4);
    expect(healthy.speedUncertaintyHz).toBeGreaterThan(0);
  });

  it('refines a given speed within ±3 %, and keeps the given one when the lines fit best at the edge of that window', () => {
    // The machine runs 1.5 % under a given 1480 rpm: refined onto its lines.
    const near = analyseRecording(recording(runningMachine(speedHz, 1)), { model, pointId: 'gb-input-h', speedRpm: 1480 });
    expect(near.speedSource).toBe('spectrum');
    expect(Math.abs(near.speedHz! / speedHz - 1)).toBeLessThan(1e-3);
    // Lines of a speed 3.5 % over the given one: the best fit inside ±3 % lies on its edge, so they are another
    // machine's lines and the given speed stands.
    const far = analyseRecording(recording(runningMachine((1480 * 1.035) / 60, 1)), { model, pointId: 'gb-input-h', speedRpm: 1480 });
    expect(far.speedSource).toBe('given');
    expect(far.speedHz! * 60).toBeCloseTo(1480, 6);
    expect(far.warnings.some((w) => w.includes('edge of the ±3 %'))).toBe(true);
  });

  it('scores every gear and bearing fault below 0.5 on a machine that shows only its running lines', () => {
    for (const h of healthy.hypotheses) if (h.fault.startsWith('gear-') || h.fault.startsWith('bearing-')) expect(h.score).toBeLessThan(0.5);
  });

  it('gives every hypothesis a reason and evidence rows with predicted, measured and SNR', () => {
    for (const h of healthy.hypotheses) {
      expect(h.reason).toMatch(/\.$/);
      for (const e of h.evidence) {
        expect(e).toHaveProperty('frequencyHz');
        expect(e).toHaveProperty('predicted');
        expect(e).toHaveProperty('measured');
        expect(e).toHaveProperty('snrDb');
      }
    }
  });

  it('finds an outer-race defect of input-de in the envelope spectrum, with BPFO and its harmonics as evidence (Randall & Antoni 2011)', () => {
    // Impacts at BPFO of input-de (9 elements, 7.94/39.04 mm: BPFO = 4.5·(1 − 0.2034) = 3.5848 orders of its shaft),
    // 1.5 % random slip, ringing the point's 3.4 kHz resonance (Randall & Antoni 2011, §2.1).
    const inputHz = speedHz * 0.72 * 0.99;
    const bpfoHz = 4.5 * (1 - 7.94 / 39.04) * inputHz;
    const impacts = impactTrain({ sampleRateHz: fs, length: n, rateHz: bpfoHz, resonanceHz: 3400, dampingRatio: 0.05, amplitude: 0.8, jitterFraction: 0.015, seed: 4 });
    const a = analyseRecording(recording(add(runningMachine(speedHz, 2), impacts)), { model, pointId: 'gb-input-h' });
    const top = a.hypotheses[0]!;
    expect(top).toMatchObject({ fault: 'bearing-outer-race', component: 'input-de', domain: 'envelope' });
    expect(top.score).toBeGreaterThanOrEqual(0.5);
    // The harmonics the resolution can tell from the shaft's own (a line on a shaft harmonic is not counted).
    const counted = [1, 2, 3, 4, 5].map((k) => top.evidence.find((e) => e.label === `${k}×BPFO input-de`)!).filter((e) => e.counted);
    expect(counted.length).toBeGreaterThanOrEqual(2);
    for (const line of counted) {
      const k = Number(line.label.split('×')[0]);
      expect(line.matched).toBe(true);
      expect(Math.abs(line.measuredFrequencyHz! - k * bpfoHz) / (k * bpfoHz)).toBeLessThan(0.02);
    }
    expect(top.bandHz![0]).toBeLessThan(3400);
    expect(top.bandHz![1]).toBeGreaterThan(3400);
    expect(top.reason).toMatch(/outer-race defect in input-de/);
  });

  it('reads the speed from a once-per-rev tach channel and order-tracks in the angle domain', () => {
    const tach = new Float64Array(n);
    // 5 V pulse at each revolution of the reference shaft (motor), 1 ms wide.
    for (let r = 0; r * fs < n * speedHz; r++) {
      const i0 = Math.round((r * fs) / speedHz);
      for (let i = i0; i < Math.min(n, i0 + 26); i++) tach[i] = 5;
    }
    const a = analyseRecording(recording(runningMachine(speedHz, 3), [{ name: 'tach', unit: 'V', samples: tach }]), { model, pointId: 'gb-input-h', tachChannel: 1 });
    expect(a.speedSource).toBe('tach');
    expect(Math.abs(a.speedHz! - speedHz) / speedHz).toBeLessThan(1e-3);
    expect(a.domain).toBe('angle');
    expect(a.orderSpectrum?.shaft).toBe('motor');
    expect(a.hypotheses.some((h) => h.domain === 'order')).toBe(true);
  });

  it('warns when the speed varied during the record by more than the matching tolerance allows', () => {
    // The same running lines with the speed ramping 3 % over the record: each line's phase is the integral of its frequency.
    const x = gaussianNoise(n, 8, 0.01);
    const lines = componentLines(model, speedHz).filter((l) => (l.family === 'shaft-harmonic' && l.harmonic <= 2) || l.family === 'gear-mesh');
    lines.forEach((l, j) => {
      const a = l.family === 'gear-mesh' ? 0.1 / l.harmonic : 0.004;
      for (let i = 0; i < n; i++) {
        const t = i / fs;
        const duration = n / fs;
        // f(t) = f0·(1 + 0.03·t/T): phase = 2π f0 (t + 0.015 t²/T)
        x[i] += a * Math.sin(2 * Math.PI * l.frequencyHz * (t + (0.015 * t * t) / duration) + j);
      }
    });
    const a = analyseRecording(recording(x), { model, pointId: 'gb-input-h' });
    expect(a.warnings.some((w) => /speed varied during the record/.test(w))).toBe(true);
    expect(healthy.warnings.some((w) => /speed varied/.test(w))).toBe(false);
  });

  it('without a model gives no hypotheses and no speed, but still the overall level and spectrum', () => {
    const a = analyseRecording(recording(runningMachine(speedHz, 5)));
    expect(a.hypotheses).toEqual([]);
    expect(a.speedHz).toBeNull();
    expect(a.speedSource).toBeNull();
    expect(a.overall.zone).toBeNull();
    expect(a.overall.velocityRmsMmPerS).toBeGreaterThan(0);
  });

  it('is deterministic: the same recording gives the same analysis', () => {
    const x = runningMachine(speedHz, 6);
    expect(JSON.stringify(analyseRecording(recording(x), { model, pointId: 'gb-input-h' }))).toBe(JSON.stringify(analyseRecording(recording(x), { model, pointId: 'gb-input-h' })));
  });

  it('rejects an unknown point, channel or a too short record with a typed error naming it', () => {
    const r = recording(runningMachine(speedHz, 7));
    expect(() => analyseRecording(r, { model, pointId: 'nowhere' })).toThrow(DiagnosisInputError);
    expect(() => analyseRecording(r, { model, pointId: 'nowhere' })).toThrow(/pointId 'nowhere'/);
    // Channels are numbered from 1 in every message: index 3 is the fourth channel.
    expect(() => analyseRecording(r, { model, channel: 3 })).toThrow(/channel 4 does not exist: the recording has channels 1\.\.1/);
    expect(() => analyseRecording(recording(new Float64Array(100)), { model })).toThrow(/1024/);
    expect(() => analyseRecording({ sampleRateHz: fs, channels: [], metadata: {} })).toThrow(/channel/);
    expect(() => analyseRecording({ sampleRateHz: fs, channels: [{ name: 'x', unit: 'V', samples: new Float64Array(2048) }], metadata: {} })).toThrow(/unit 'V'/);
  });
});

describe('analyseRecording with a baseline', () => {
  const speedHz = (1480 * 0.985) / 60;
  const inputHz = speedHz * 0.72 * 0.99;
  // An input shaft whose 1× grew to 12 mm/s r.m.s.-ish (far over the ISO A/B boundary of group 2 rigid, 1.4 mm/s).
  const unbalanced = () => {
    const x = runningMachine(speedHz, 12);
    const a = (12e-3 * Math.SQRT2 * 2 * Math.PI * inputHz) / 9.80665; // peak g of 12 mm/s r.m.s. at 1× input
    const tone = sine(n, fs, inputHz, a, 0.3);
    for (let i = 0; i < n; i++) x[i] += tone[i]!;
    return x;
  };

  it('scores unbalance from the absolute level when there is no baseline', () => {
    const a = analyseRecording(recording(unbalanced()), { model, pointId: 'gb-input-h' });
    expect(a.hypotheses.find((h) => h.fault === 'unbalance' && h.component === 'input')!.score).toBeGreaterThanOrEqual(0.5);
  });

  it('scores it by the rise over an earlier analysis of the same state when one is given: no rise, no fault', () => {
    const before = analyseRecording(recording(unbalanced()), { model, pointId: 'gb-input-h' });
    const after = analyseRecording(recording(unbalanced()), { model, pointId: 'gb-input-h', baseline: before });
    const h = after.hypotheses.find((x) => x.fault === 'unbalance' && x.component === 'input')!;
    expect(h.parts.level).toBe(0);
    expect(h.score).toBe(0);
  });
});
