import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { MACHINE, modelText } from './fixtures.js';

/*
 * GET /api/v1/signatures through inject: the excitation waveform, its Fourier partial sums and the
 * magnification per line, checked against closed forms from outside the project. The example machine's
 * pinion-1 has Z = 18 teeth (fixtures/machines/aeration-mixer-2.json); a missing tooth is the rectangular
 * torque dip of one pitch, L = 1/Z rev, depth 1 (check-values.md §6, "gear torque with a missing tooth").
 */

interface Signature {
  lines: Array<{ frequencyHz: number; magnification: number; torsionalMagnification: number | null; structuralMagnification: number; label: string }>;
  excitation: { shaft: string; periodRev: number | null; angleRev: number[]; waveform: number[]; partialSums: Record<string, number[]> };
  magnification: Array<{ harmonic: number; sideband: number; frequencyHz: number; factor: number; torsional: number | null; structural: number | null }>;
}

const model = JSON.parse(modelText) as {
  gearMeshes: Array<{ driver: { gear: string; teeth: number } }>;
  points: Array<{ id: string; resonances?: Array<{ frequencyHz: number; dampingRatio: number }> }>;
};
const Z = model.gearMeshes.find((m) => m.driver.gear === 'pinion-1')!.driver.teeth;
const L = 1 / Z;
// numpy convention sinc(x) = sin(πx)/(πx) (check-values.md §6)
const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
/** Distance in revolutions from θ to the nearer jump of the dip (at ±L/2), on the circle. */
const jumpDistance = (theta: number) => Math.min(...[-L / 2, L / 2].map((j) => { const d = Math.abs(theta - j) % 1; return Math.min(d, 1 - d); }));
// Gibbs overshoot of a Fourier partial sum at a jump, as a fraction of the jump: (1/π)·Si(π) − ½
// (check-values.md §6; Gibbs, Nature 59 (1899); Hewitt & Hewitt, Arch. Hist. Exact Sci. 21 (1979), from memory)
const GIBBS_FRACTION = 0.0894898722;

describe('GET /api/v1/signatures excitation and magnification', () => {
  let svc: TestService;
  let site: TestSite;
  const get = async (query: string) => svc.app.inject({ url: `/api/v1/signatures?machine=${MACHINE}&${query}`, headers: auth(site.keys.engineer) });

  beforeAll(async () => {
    svc = await startTestService(targets[0]!);
    site = await makeSite(svc.db, 'signatures');
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode, put.body).toBe(200);
  });
  afterAll(async () => svc?.close());

  it('sends the exact waveform over one revolution and the default partial sums with the requested harmonics', async () => {
    const res = await get('fault=gear-missing-tooth&component=pinion-1&speedRpm=1480&harmonics=5');
    expect(res.statusCode, res.body).toBe(200);
    // well under the ~200 KB a browser page should fetch for one chart set
    expect(res.body.length).toBeLessThan(200_000);
    const { excitation } = res.json() as Signature;
    // a tooth fault repeats once per turn of its gear's shaft (common practice)
    expect(excitation.shaft).toBe('input');
    expect(excitation.periodRev).toBe(1);
    expect(excitation.angleRev).toHaveLength(1024);
    expect(excitation.waveform).toHaveLength(1024);
    expect(excitation.angleRev[1]! - excitation.angleRev[0]!).toBeCloseTo(1 / 1024, 6);
    // T/T0 = 1 outside the dip and 1 − d = 0 over |θ| < L/2 (check-values.md §6)
    excitation.angleRev.forEach((theta, i) => {
      const t = ((theta + 0.5) % 1 + 1) % 1 - 0.5;
      if (jumpDistance(theta) > 1e-6) expect(excitation.waveform[i], `θ = ${theta}`).toBe(Math.abs(t) < L / 2 ? 0 : 1);
    });
    expect(Object.keys(excitation.partialSums).map(Number).sort((a, b) => a - b)).toEqual([1, 3, 5, 10, 30]);
    // S_1(θ) = a0 + 2·c_1·cos 2πθ with a0 = 1 − L and c_1 = −L·sinc(L) (check-values.md §6, pulse train c_n);
    // the service sends six significant digits
    const s1 = excitation.partialSums['1']!;
    excitation.angleRev.forEach((theta, i) => {
      expect(s1[i]!).toBeCloseTo(1 - L - 2 * L * sinc(L) * Math.cos(2 * Math.PI * theta), 4);
    });
  });

  it('approaches the waveform away from the jumps and overshoots each jump by the Gibbs fraction', async () => {
    const res = await get('fault=gear-missing-tooth&component=pinion-1&partialSums=16,64,256');
    expect(res.statusCode, res.body).toBe(200);
    const { excitation } = res.json() as Signature;
    expect(Object.keys(excitation.partialSums)).toEqual(expect.arrayContaining(['16', '64', '256']));
    const far = excitation.angleRev.map((theta) => jumpDistance(theta) >= 0.1);
    const farError = (n: number) => Math.max(...excitation.partialSums[String(n)]!.map((v, i) => (far[i] ? Math.abs(v - excitation.waveform[i]!) : 0)));
    // Near a unit step S_N ≈ ½ + Si(2πNx)/π and |Si(z) − π/2| ≤ ~1/z for large z (Abramowitz & Stegun 5.2.8 and
    // 5.2.34, from memory): at least 0.1 rev from both jumps each adds at most 1/(2π²·N·0.1).
    for (const n of [16, 64, 256]) expect(farError(n), `N = ${n}`).toBeLessThan((1.1 * 2) / (2 * Math.PI ** 2 * n * 0.1));
    expect(farError(256)).toBeLessThan(farError(16));
    // The jump is 1 (missing tooth): above the high level 1 and below the low level 0 by (1/π)Si(π) − ½ of it.
    // N = 256 puts the peak, 1/(2N) rev from the jump, exactly on a sample of the 1024-point grid.
    const s = excitation.partialSums['256']!;
    expect(Math.max(...s) - 1).toBeCloseTo(GIBBS_FRACTION, 2);
    expect(0 - Math.min(...s)).toBeCloseTo(GIBBS_FRACTION, 2);
    expect(Math.abs(Math.max(...s) - 1 - GIBBS_FRACTION) / GIBBS_FRACTION).toBeLessThan(0.03);
  });

  it('gives each predicted line its magnification, the structural part being the base-excitation transmissibility', async () => {
    const res = await get('fault=gear-missing-tooth&component=pinion-1&point=gb-input-h&harmonics=60');
    expect(res.statusCode, res.body).toBe(200);
    const sig = res.json() as Signature;
    expect(sig.magnification).toHaveLength(sig.lines.length);
    const { frequencyHz: fn, dampingRatio: zeta } = model.points.find((p) => p.id === 'gb-input-h')!.resonances![0]!;
    sig.magnification.forEach((m, i) => {
      expect(m.frequencyHz).toBe(sig.lines[i]!.frequencyHz);
      const r = m.frequencyHz / fn;
      // |T(r)| = √((1 + (2ζr)²)/((1 − r²)² + (2ζr)²)) (base excitation; Rao, Mechanical Vibrations, §3.6, from memory)
      const t = Math.sqrt((1 + (2 * zeta * r) ** 2) / ((1 - r * r) ** 2 + (2 * zeta * r) ** 2));
      expect(m.structural!).toBeCloseTo(t, 6);
      expect(m.factor).toBeCloseTo((m.torsional ?? 1) * m.structural!, 9);
    });
  });

  it('sends no waveform for a fault with fixed lines', async () => {
    const res = await get('fault=unbalance&component=input');
    expect(res.statusCode, res.body).toBe(200);
    const { excitation, magnification, lines } = res.json() as Signature;
    expect(excitation.angleRev).toEqual([]);
    expect(excitation.waveform).toEqual([]);
    expect(excitation.partialSums).toEqual({});
    expect(magnification).toHaveLength(lines.length);
  });

  it('answers a bad partialSums list with a validation problem naming the parameter', async () => {
    for (const bad of ['0', '1,x', '1,501', '1,2,3,4,5,6,7,8,9']) {
      const res = await get(`fault=gear-missing-tooth&component=pinion-1&partialSums=${bad}`);
      expect(res.statusCode, bad).toBe(400);
      const body = res.json();
      expect(body.type).toBe('urn:kinespec:problem:validation-failed');
      expect(body.errors[0].path, bad).toBe('query.partialSums');
    }
  });

  it('documents the excitation, partial sums and magnification in the OpenAPI document', async () => {
    const doc = (await svc.app.inject('/openapi.json')).json();
    const op = doc.paths['/api/v1/signatures'].get;
    expect(op.parameters.map((p: { name: string }) => p.name)).toContain('partialSums');
    const schema = op.responses['200'].content['application/json'].schema;
    expect(Object.keys(schema.properties)).toEqual(expect.arrayContaining(['lines', 'excitation', 'magnification', 'campbell']));
    expect(Object.keys(schema.properties.excitation.properties)).toEqual(expect.arrayContaining(['angleRev', 'waveform', 'partialSums', 'periodRev']));
    expect(Object.keys(schema.properties.magnification.items.properties)).toEqual(expect.arrayContaining(['harmonic', 'frequencyHz', 'factor']));
  });
});
