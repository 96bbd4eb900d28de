import { readdirSync, readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModelInput } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { SignatureInputError } from './errors.js';
import { faultCandidates } from './fault-candidates.js';
import { faultExcitation, predictSignature, type Signature } from './signature.js';
import { partialSum } from './fourier-series.js';

const G_N = 9.80665; // m/s², 3rd CGPM (1901); check-values.md §8
// k = Gπd⁴/(32L) for d = 50 mm, L = 1 m, G = 79.3 GPa (Shigley Eq. 4-5, from memory) = 48,657.9 N·m/rad (check-values.md §5);
// written out unrounded because 2× (40 Hz) sits near the antiresonance √(k/J1), where the rounding shows.
const K_50MM = (79.3e9 * Math.PI * 0.05 ** 4) / 32;

/**
 * Shaft a (motor J1 linked to a 20-tooth pinion Jp by the 50 mm × 1 m shaft) drives a 40-tooth wheel Jw on
 * shaft b. With the mesh rigid, the chain is two bodies: J1 and J2 = Jp + Jw·(20/40)².
 */
function gearedModel(extra: { resonances?: Array<{ frequencyHz: number; dampingRatio: number }>; quantity?: string; unit?: string; damping?: number } = {}): MachineModelInput {
  const J1 = 0.8, Jp = 0.05, Jw = 0.6;
  return {
    id: 'test-gearbox',
    speed: { shaft: 'a', nominalRpm: 1200, minRpm: 600, maxRpm: 6000 },
    shafts: [{ id: 'a' }, { id: 'b' }],
    gearMeshes: [{ id: 'mesh', driver: { gear: 'pinion', shaft: 'a', teeth: 20 }, driven: { gear: 'wheel', shaft: 'b', teeth: 40 } }],
    bearings: [{ id: 'brg-a', shaft: 'a', faultOrders: { bpfo: 3.5848, bpfi: 5.4152, bsf: 2.35675, ftf: 0.39828 } }],
    motor: { shaft: 'a', lineFrequencyHz: 50, poles: 4 },
    torsional: {
      dampingRatio: extra.damping ?? 1e-5,
      inertias: [{ id: 'motor', shaft: 'a', kgM2: J1 }, { id: 'pinion', shaft: 'a', kgM2: Jp }, { id: 'wheel', shaft: 'b', kgM2: Jw }],
      links: [{ id: 'a-shaft', from: 'motor', to: 'pinion', diameterMm: 50, lengthMm: 1000, shearModulusGPa: 79.3 }],
    },
    points: [
      { id: 'brg-a-h', near: 'brg-a', direction: 'horizontal', quantity: (extra.quantity ?? 'acceleration') as 'acceleration', unit: extra.unit ?? 'm/s^2', resonances: extra.resonances },
      { id: 'enc-a', shaft: 'a', at: 'pinion', quantity: 'encoder', pulsesPerRev: 1024 },
    ],
  };
}
const load = (m: MachineModelInput) => loadMachineModel(JSON.stringify(m));
const J1 = 0.8, J2 = 0.05 + 0.6 * 0.25;

/** Undamped driving-point receptance at body 2 of a free two-inertia chain: (k − ω²J1)/(−ω²((J1+J2)k − ω²J1J2)). */
// Two-degree-of-freedom receptance by Cramer's rule (e.g. Thomson & Dahleh, Theory of Vibration with Applications, ch. 5; from memory).
function h22(omega: number): number {
  return (K_50MM - omega * omega * J1) / (-omega * omega * ((J1 + J2) * K_50MM - omega * omega * J1 * J2));
}
const lineAt = (s: Signature, hz: number) => s.lines.find((l) => Math.abs(l.frequencyHz - hz) < 1e-6)!;
// one-sided |2c_n| of the rectangular one-pitch drop for N_t = 20 (check-values.md §6, numpy)
const MISSING_TOOTH_Z20: Array<[number, number]> = [[1, 0.099589], [2, 0.098363], [10, 0.063662], [19, 0.005242], [21, 0.004742]];

describe('predictSignature', () => {
  it('passes the missing-tooth series through the two-inertia receptance to the point in m/s²', () => {
    // amplitude = |2c_n|·T0·|H22(ω)|·r·ω² (angle → tangential motion at r → acceleration).
    const s = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion', meanTorqueNm: 50, transferRadiusMm: 80 });
    expect(s.domain).toBe('spectrum');
    expect(s.amplitudeBasis).toBe('model');
    expect(s.quantity).toBe('acceleration');
    expect(s.unit).toBe('m/s^2');
    expect(s.point).toBe('brg-a-h');
    for (const [n, twoC] of MISSING_TOOTH_Z20) {
      const w = 2 * Math.PI * 20 * n;
      const line = lineAt(s, 20 * n);
      expect(line.harmonic).toBe(n);
      expect(line.excitationCoefficient.amplitude).toBeCloseTo(twoC, 6);
      // (the table rounds |2c_n| to 6 decimals, so the response is checked against the line's own coefficient)
      expect(line.amplitude / (line.excitationCoefficient.amplitude * 50 * Math.abs(h22(w)) * 0.08 * w * w)).toBeCloseTo(1, 6);
    }
    // the rectangular one-pitch drop has no line at the mesh harmonics (check-values.md §6)
    expect(s.lines.find((l) => l.harmonic === 20 || l.harmonic === 40)).toBeUndefined();
    expect(s.naturalFrequenciesHz).toEqual([expect.closeTo(Math.sqrt((K_50MM * (J1 + J2)) / (J1 * J2)) / (2 * Math.PI), 3)]);
  });

  it('converts to g and reads an encoder as angle in rad', () => {
    const inG = predictSignature(load(gearedModel({ unit: 'g' })), { fault: 'gear-missing-tooth', component: 'pinion' });
    const inSi = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion' });
    expect(lineAt(inG, 20).amplitude).toBeCloseTo(lineAt(inSi, 20).amplitude / G_N, 12);
    const enc = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion', point: 'enc-a' });
    expect(enc.quantity).toBe('angle');
    expect(enc.unit).toBe('rad');
    const w = 2 * Math.PI * 40;
    expect(lineAt(enc, 40).amplitude / (0.098363 * Math.abs(h22(w)))).toBeCloseTo(1, 4); // |2c_2| = 0.098363, check-values §6
  });

  it('warns when a line falls within 10 % of the torsional natural frequency (common practice margin)', () => {
    // f_n = 87.77 Hz: 4× (80 Hz, 8.9 % below) is inside the margin, 5× (100 Hz, 13.9 % above) is not.
    const s = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion' });
    const w = s.warnings.filter((x) => x.kind === 'resonance');
    expect(w).toHaveLength(1);
    expect(w[0]!.source).toBe('torsional');
    expect(w[0]!.lines!.map((l) => l.frequencyHz)).toEqual([80]);
    expect(w[0]!.message).toMatch(/torsional mode 1 at 87\.7\d Hz/);
  });

  it('multiplies in the point resonance as base-excitation transmissibility and warns near it', () => {
    // T = √(1 + (2ζr)²)/√((1 − r²)² + (2ζr)²) (Thomson & Dahleh §3.5, from memory).
    const res = { frequencyHz: 400, dampingRatio: 0.05 };
    const s = predictSignature(load(gearedModel({ resonances: [res] })), { fault: 'gear-missing-tooth', component: 'pinion' });
    const bare = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion' });
    const r = 420 / 400, z = 0.05;
    const T = Math.sqrt(1 + (2 * z * r) ** 2) / Math.sqrt((1 - r * r) ** 2 + (2 * z * r) ** 2);
    expect(lineAt(s, 420).structuralMagnification).toBeCloseTo(T, 10);
    expect(lineAt(s, 420).amplitude / lineAt(bare, 420).amplitude).toBeCloseTo(T, 10);
    const structural = s.warnings.find((x) => x.source === 'structural')!;
    expect(structural.lines!.map((l) => l.frequencyHz)).toEqual([360, 380, 420, 440]);
  });

  it('labels the lines around the mesh as sidebands of the gear mesh frequency', () => {
    const s = predictSignature(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion' });
    expect(lineAt(s, 380).label).toBe('GMF mesh − 1× a');
    expect(lineAt(s, 420).label).toBe('GMF mesh + 1× a');
    expect(lineAt(s, 200).label).toBe('10× a');
    expect(lineAt(s, 20).order).toBe(1);
  });

  it('halves a broken tooth against a missing one and follows the speed', () => {
    const m = load(gearedModel());
    const missing = predictSignature(m, { fault: 'gear-missing-tooth', component: 'pinion' });
    const broken = predictSignature(m, { fault: 'gear-broken-tooth', component: 'pinion' });
    expect(lineAt(broken, 20).amplitude / lineAt(missing, 20).amplitude).toBeCloseTo(0.5, 12);
    const fast = predictSignature(m, { fault: 'gear-missing-tooth', component: 'wheel', speedRpm: 2400 });
    // the wheel turns at half the reference speed: its 1× is order 0.5 (gear ratio 20/40, common practice)
    expect(fast.lines[0]!.frequencyHz).toBeCloseTo(20, 12);
    expect(fast.lines[0]!.order).toBeCloseTo(0.5, 12);
    expect(fast.shaft).toBe('b');
  });

  it('predicts envelope lines at the CWRU 6205 defect frequencies at 1797 rpm', () => {
    // check-values.md §3 (mech.py, Randall & Antoni 2011 formulas on CWRU geometry): BPFO 107.36, BPFI 162.19,
    // FTF 11.929, 2·BSF 141.17 Hz at f_r = 29.95 Hz.
    const m = load({
      id: 'test-cwru', speed: { shaft: 's', nominalRpm: 1797 }, shafts: [{ id: 's' }],
      bearings: [{ id: 'de', shaft: 's', rollingElements: 9, rollingElementDiameterMm: 0.3126 * 25.4, pitchDiameterMm: 1.537 * 25.4, contactAngleDeg: 0 }],
      points: [{ id: 'de-acc', near: 'de', quantity: 'acceleration', unit: 'g', resonances: [{ frequencyHz: 3000, dampingRatio: 0.05 }] }],
    });
    const outer = predictSignature(m, { fault: 'bearing-outer-race', component: 'de' });
    expect(outer.domain).toBe('envelope');
    expect(outer.amplitudeBasis).toBe('relative');
    expect(outer.lines.slice(0, 3).map((l) => l.frequencyHz)).toEqual([expect.closeTo(107.36, 2), expect.closeTo(214.72, 1), expect.closeTo(322.08, 1)]);
    expect(outer.lines[0]!.label).toBe('1×BPFO de');
    const inner = predictSignature(m, { fault: 'bearing-inner-race', component: 'de', harmonics: 1, sidebands: 1 });
    expect(inner.lines.filter((l) => l.harmonic === 1).map((l) => l.frequencyHz)).toEqual([expect.closeTo(162.19 - 29.95, 2), expect.closeTo(162.19, 2), expect.closeTo(162.19 + 29.95, 2)]);
    const rolling = predictSignature(m, { fault: 'bearing-rolling-element', component: 'de', harmonics: 1, sidebands: 1 });
    expect(rolling.lines.filter((l) => l.harmonic === 1).map((l) => l.frequencyHz)).toEqual([expect.closeTo(141.17 - 11.929, 2), expect.closeTo(141.17, 2), expect.closeTo(141.17 + 11.929, 2)]);
    const cage = predictSignature(m, { fault: 'bearing-cage', component: 'de', harmonics: 2 });
    expect(cage.lines.map((l) => l.frequencyHz)).toEqual([expect.closeTo(11.929, 3), expect.closeTo(23.858, 2)]);
    // the point's 3 kHz resonance sets the impacts' decay: λ = ζ·2π·f_r/BPFO per period
    const lambda = (0.05 * 2 * Math.PI * 3000) / outer.lines[0]!.frequencyHz;
    expect(outer.lines[0]!.excitationCoefficient.amplitude).toBeCloseTo(2 / Math.hypot(lambda, 2 * Math.PI), 9);
  });

  it('predicts shaft families at orders of their own shaft, relative, weighted (f/f1)² for acceleration', () => {
    // a = −ω²x for a sinusoid (check-values.md §8): a stiffness-controlled path turns equal forces into ω²-weighted accelerations.
    const m = load(gearedModel());
    const mis = predictSignature(m, { fault: 'misalignment', component: 'b' });
    expect(mis.amplitudeBasis).toBe('relative');
    expect(mis.lines.map((l) => l.order)).toEqual([0.5, 1, 1.5]);
    expect(mis.lines.map((l) => l.amplitude)).toEqual([expect.closeTo(1, 12), expect.closeTo(4 * 1, 12), expect.closeTo(9 * 0.4, 12)]);
    const unb = predictSignature(m, { fault: 'unbalance', component: 'a' });
    expect(unb.lines.map((l) => l.frequencyHz)).toEqual([20]);
    const loose = predictSignature(m, { fault: 'looseness', component: 'a', harmonics: 6 });
    expect(loose.lines.map((l) => l.order)).toEqual([0.5, 1, 1.5, 2, 2.5, 3]);
  });

  it('puts the electrical line at twice the line frequency whatever the speed', () => {
    const m = load(gearedModel());
    for (const speedRpm of [900, 1500]) {
      const s = predictSignature(m, { fault: 'electrical', component: 'motor', speedRpm });
      expect(s.lines.map((l) => l.frequencyHz)).toEqual([100]);
      expect(s.lines[0]!.order).toBeCloseTo(100 / (speedRpm / 60), 12);
    }
  });

  it('falls back to relative amplitudes with a note when the model has no torsional section', () => {
    const raw = gearedModel();
    delete raw.torsional;
    raw.points = raw.points!.slice(0, 1);
    const s = predictSignature(load(raw), { fault: 'gear-missing-tooth', component: 'pinion' });
    expect(s.amplitudeBasis).toBe('relative');
    expect(s.naturalFrequenciesHz).toEqual([]);
    expect(s.warnings.some((w) => w.kind === 'model' && /no torsional section/.test(w.message))).toBe(true);
  });

  it('rejects an unknown fault, a component of the wrong kind, an unknown point and a bad speed', () => {
    const m = load(gearedModel());
    const code = (f: () => unknown) => { try { f(); return null; } catch (e) { return e instanceof SignatureInputError ? e.code : 'other'; } };
    expect(code(() => predictSignature(m, { fault: 'rust' as never, component: 'a' }))).toBe('unknown_fault');
    expect(code(() => predictSignature(m, { fault: 'gear-missing-tooth', component: 'a' }))).toBe('unknown_component');
    expect(code(() => predictSignature(m, { fault: 'bearing-cage', component: 'pinion' }))).toBe('unknown_component');
    expect(code(() => predictSignature(m, { fault: 'unbalance', component: 'a', point: 'nowhere' }))).toBe('unknown_point');
    expect(code(() => predictSignature(m, { fault: 'unbalance', component: 'a', speedRpm: -5 }))).toBe('invalid_parameter');
    expect(() => predictSignature(m, { fault: 'gear-missing-tooth', component: 'a' })).toThrow(/component \('a'\) must be a gear/);
  });
});

describe('predictSignature on the example machine', () => {
  const model = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));

  it('gives every fault candidate lines, bearings in the envelope domain', () => {
    for (const c of faultCandidates(model)) {
      const s = predictSignature(model, { fault: c.fault, component: c.component });
      expect(s.lines.length, `${c.fault} ${c.component}`).toBeGreaterThan(0);
      expect(s.domain).toBe(c.fault.startsWith('bearing-') ? 'envelope' : 'spectrum');
      for (const l of s.lines) {
        expect(Number.isFinite(l.amplitude) && l.amplitude >= 0).toBe(true);
        expect(l.frequencyHz).toBeGreaterThan(0);
      }
    }
  });

  it('finds the torsional natural frequencies of the scipy reference', () => {
    // fixtures/signatures/geared_chain.py (scipy constraint transformation)
    const ref = JSON.parse(readFileSync(new URL('../../../fixtures/signatures/geared-chain.json', import.meta.url), 'utf8')) as { naturalFrequenciesHz: number[] };
    const s = predictSignature(model, { fault: 'gear-missing-tooth', component: 'pinion-1' });
    expect(s.naturalFrequenciesHz).toEqual(ref.naturalFrequenciesHz.slice(1).map((f) => expect.closeTo(f, 6)));
    expect(s.modeShapes).toHaveLength(3);
  });
});

describe('predictSignature on every demo machine', () => {
  const dirs = ['../../../fixtures/machines/', '../../../fixtures/signatures/demo/'];
  const files = dirs.flatMap((d) => readdirSync(new URL(d, import.meta.url)).filter((f) => f.endsWith('.json')).map((f) => new URL(d + f, import.meta.url)));

  it('predicts finite, positive-frequency lines for every fault candidate of every machine', () => {
    expect(files.length).toBeGreaterThan(1);
    for (const file of files) {
      const model = loadMachineModel(readFileSync(file, 'utf8'));
      for (const c of faultCandidates(model)) {
        const s = predictSignature(model, { fault: c.fault, component: c.component });
        expect(s.lines.length, `${model.id} ${c.fault} ${c.component}`).toBeGreaterThan(0);
        expect(s.lines.every((l) => l.frequencyHz > 0 && Number.isFinite(l.amplitude) && Number.isFinite(l.phaseRad))).toBe(true);
      }
    }
  });
});

describe('faultExcitation', () => {
  it('gives the template with its series, whose partial sums converge to the torque in the gap and outside it', () => {
    // Dirichlet: at points of continuity the partial sums converge to the function (missing tooth: 0 in the gap, 1 elsewhere).
    const ex = faultExcitation(load(gearedModel()), { fault: 'gear-missing-tooth', component: 'pinion', harmonics: 4000 });
    expect(ex.series!.terms).toHaveLength(4000);
    expect(partialSum(ex.series!, 4000, 0)).toBeCloseTo(0, 2);
    expect(partialSum(ex.series!, 4000, 0.5)).toBeCloseTo(1, 2);
    expect(ex.segments!.length).toBeGreaterThan(0);
  });
});
