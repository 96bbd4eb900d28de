// Plumbing: the corpus plan and the shape of its cases (the physics is checked in the other test files).
import { faultKinds, validateMachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';
import { beforeAll, describe, expect, it } from 'vitest';
import { corpusPlan, FULL_COUNT, generateCorpus, MAX_SAMPLES, QUICK_COUNT, SAMPLE_RATES_HZ, type CorpusCase } from './corpus.js';
import { rigFaultKinds } from './rig-faults.js';

describe('corpusPlan (the full corpus, planned without synthesis)', () => {
  const plan = corpusPlan({ seed: 1 });

  it(`lists ${FULL_COUNT} cases, about a quarter healthy, some with two faults, every rig fault kind at least twice`, () => {
    expect(plan).toHaveLength(FULL_COUNT);
    const healthy = plan.filter((p) => p.faults.length === 0).length;
    expect(healthy / plan.length).toBeCloseTo(0.25, 2);
    expect(plan.filter((p) => p.faults.length === 2).length).toBeGreaterThanOrEqual(5);
    for (const kind of rigFaultKinds) expect(plan.filter((p) => p.faults.some((f) => f.fault === kind)).length).toBeGreaterThanOrEqual(2);
    expect(new Set(plan.map((p) => p.machine.model.id)).size).toBe(3);
  });

  it('draws speeds anywhere in each model range, the logger rates, 0.5-10 s, sample counts within the cap', () => {
    for (const p of plan) {
      const { minRpm, maxRpm } = p.machine.model.speed;
      expect(p.speedRpm).toBeGreaterThanOrEqual(minRpm!);
      expect(p.speedRpm).toBeLessThanOrEqual(maxRpm!);
      expect(SAMPLE_RATES_HZ).toContain(p.sampleRateHz);
      expect(p.durationS).toBeGreaterThanOrEqual(0.5 - 1e-9);
      expect(p.durationS).toBeLessThanOrEqual(10);
      expect(p.durationS * p.sampleRateHz).toBeLessThanOrEqual(MAX_SAMPLES);
    }
    // The speeds spread over the ranges, not all at nominal.
    const fractions = plan.map((p) => (p.speedRpm - p.machine.model.speed.minRpm!) / (p.machine.model.speed.maxRpm! - p.machine.model.speed.minRpm!));
    expect(fractions.filter((f) => f < 0.3).length).toBeGreaterThan(10);
    expect(fractions.filter((f) => f > 0.7).length).toBeGreaterThan(10);
  });

  it('is the same plan for the same seed and another for another', () => {
    const again = corpusPlan({ seed: 1 });
    expect(again.map((p) => [p.id, p.pointId, p.speedRpm, p.seed])).toEqual(plan.map((p) => [p.id, p.pointId, p.speedRpm, p.seed]));
    expect(corpusPlan({ seed: 2 }).map((p) => p.speedRpm)).not.toEqual(plan.map((p) => p.speedRpm));
  });

  it('names a bad option', () => {
    expect(() => corpusPlan({ seed: 1, count: 0 })).toThrow(/count/);
    expect(() => corpusPlan({ seed: Number.NaN })).toThrow(/seed/);
  });
});

describe('generateCorpus (quick)', () => {
  let cases: CorpusCase[];
  beforeAll(() => {
    cases = generateCorpus({ seed: 20_261_201, quick: true });
  });

  it(`gives ${QUICK_COUNT} labelled recordings with Kinespec fault names and model component ids`, () => {
    expect(cases).toHaveLength(QUICK_COUNT);
    for (const c of cases) {
      expect(validateMachineModel(c.machine).ok).toBe(true);
      expect(c.machine.points.some((p) => p.id === c.pointId)).toBe(true);
      expect(c.label.speedGiven).toBe(false);
      for (const f of c.label.faults) {
        expect(faultKinds).toContain(f.fault);
        expect(['shallow', 'clear']).toContain(f.severity);
        expect(Number.isFinite(f.size.value)).toBe(true);
        const ids = [...c.machine.shafts, ...c.machine.bearings, ...c.machine.rotors, ...c.machine.gearMeshes].map((x) => x.id);
        const gears = c.machine.gearMeshes.flatMap((m) => [m.driver.gear, m.driven.gear]);
        expect([...ids, ...gears]).toContain(f.component);
      }
    }
    expect(cases.filter((c) => c.label.faults.length === 0).length).toBe(3);
  });

  it('gives recordings of the Recording shape, finite, with rate and duration in the metadata', () => {
    for (const c of cases) {
      const r: Recording = c.recording;
      const samples = r.channels[0]!.samples;
      expect(samples.length).toBe(Math.round(Number(r.metadata.durationS) * r.sampleRateHz));
      expect(Number(r.metadata.sampleRateHz)).toBe(r.sampleRateHz);
      expect(samples.every(Number.isFinite)).toBe(true);
      let ss = 0;
      for (const v of samples) ss += v * v;
      const rmsG = Math.sqrt(ss / samples.length);
      // Plausible housing vibration: above the sensor noise, below a broken machine's tens of g.
      expect(rmsG).toBeGreaterThan(1e-3);
      expect(rmsG).toBeLessThan(20);
    }
  });

  it('repeats bit for bit for a seed', () => {
    const again = generateCorpus({ seed: 20_261_201, quick: true, count: 2 });
    for (let i = 0; i < 2; i++) {
      const a = cases[i]!.recording.channels[0]!.samples;
      const b = again[i]!.recording.channels[0]!.samples;
      expect(Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength))).toBe(true);
      expect(again[i]!.label).toEqual(cases[i]!.label);
    }
  });
});
