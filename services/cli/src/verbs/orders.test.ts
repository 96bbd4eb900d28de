import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadMachineModel } from '@kinespec/kinematics';
import { encodeWav, type Recording } from '@kinespec/signal';
import { simulateRecording, type SimulatedFault } from '@kinespec/simulator';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';

const machinePath = new URL('../../../../fixtures/machines/aeration-mixer-2.json', import.meta.url).pathname;
const model = loadMachineModel(readFileSync(machinePath, 'utf8'));
const dir = mkdtempSync(join(tmpdir(), 'kinespec-orders-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) };
  const code = await main(['orders', ...argv], io);
  return { code, out, err };
}

function writeJson(name: string, rec: Recording): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify({ sampleRateHz: rec.sampleRateHz, metadata: rec.metadata, channels: rec.channels.map((c) => ({ name: c.name, unit: c.unit, samples: Array.from(c.samples) })) }));
  return path;
}

// Ratios worked by hand from the model (common practice: belt D1/D2 less 1 % slip, gears N1/N2).
const inputRatio = (180 / 250) * 0.99;

function runUp(faults: SimulatedFault[], durationS: number, extra: Partial<Parameters<typeof simulateRecording>[1]> = {}): Recording {
  return simulateRecording(model, { pointId: 'gb-input-h', sampleRateHz: 10_000, durationS, speedProfile: [1350, 1480], includeTach: true, faults, seed: 11, ...extra });
}

describe('orders verb', () => {
  const ramp = writeJson('mixer-runup.json', runUp([], 6));

  it('tracks the mesh of stage 1 at order 18 × input ratio of the motor while the speed ramps 1350 → 1480 rpm', async () => {
    const r = await run(ramp, '--machine', machinePath, '--tach-channel', 'tach', '--json');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.out);
    // the speed of a linear ramp averages to its mid value; the smoothed extremes lie within a revolution of the ends
    expect(report.speedRpm.mean).toBeCloseTo(1415, -1);
    expect(report.speedRpm.min).toBeGreaterThan(1349);
    expect(report.speedRpm.max).toBeLessThan(1481);
    expect(report.shaft).toBe('motor');
    expect(report.orders.length).toBe(report.values.length);
    // GMF = teeth × shaft speed (common practice): order 18 of the input shaft = 18 × 0.7128 of the motor
    const meshOrder = 18 * inputRatio;
    // the simulator's healthy mesh tone is 0.15 g peak; the order spectrum holds it in one line despite the ramp
    expect(report.peaks[0].order).toBeCloseTo(meshOrder, 2);
    expect(report.peaks[0].amplitude).toBeCloseTo(0.15, 2);
  });

  it('reports orders of another shaft through the model ratio (--shaft input puts that mesh at order 18)', async () => {
    const r = JSON.parse((await run(ramp, '--machine', machinePath, '--tach-channel', '2', '--shaft', 'input', '--json')).out);
    expect(r.peaks[0].order).toBeCloseTo(18, 2);
    expect(r.speedRpm.mean).toBeCloseTo(1415 * inputRatio, -1);
  });

  it('gives TSA indicators per gear, and FM4 of the wheel with a missing tooth stands out', async () => {
    const faulty = writeJson('mixer-tooth.json', runUp([{ fault: 'gear-missing-tooth', component: 'wheel-2', severity: 1 }], 12));
    const healthy = writeJson('mixer-healthy.json', runUp([], 12));
    const tsa = async (path: string) => JSON.parse((await run(path, '--machine', machinePath, '--tach-channel', 'tach', '--tsa', '--json')).out).tsa;
    const bad = await tsa(faulty);
    const good = await tsa(healthy);
    expect(bad.map((g: { gear: string }) => g.gear)).toEqual(['pinion-1', 'wheel-1', 'pinion-2', 'wheel-2']);
    const wheel = (list: Array<{ gear: string; fm4: number; averages: number; noiseReductionFactor: number }>) => list.find((g) => g.gear === 'wheel-2')!;
    expect(wheel(bad).averages).toBeGreaterThanOrEqual(12);
    expect(wheel(bad).noiseReductionFactor).toBeCloseTo(1 / Math.sqrt(wheel(bad).averages), 12);
    expect(wheel(bad).fm4).toBeGreaterThan(3 * wheel(good).fm4);
    // the other gears do not move much
    expect(bad.find((g: { gear: string }) => g.gear === 'pinion-1').fm4).toBeLessThan(4);
  });

  it('works on a WAV recording with an encoder of 60 pulses per rev on the input shaft', async () => {
    const rec = simulateRecording(model, { pointId: 'gb-input-h', sampleRateHz: 10_000, durationS: 4, speedRpm: 1450, includeEncoder: { pulsesPerRev: 60, shaft: 'input' }, seed: 4 });
    const path = join(dir, 'mixer-encoder.wav');
    writeFileSync(path, encodeWav(rec, { format: 'float32' }));
    const r = await run(path, '--machine', machinePath, '--tach-channel', '2', '--pulses-per-rev', '60', '--pulse-shaft', 'input', '--unit', 'g', '--json');
    expect(r.err).toBe('');
    const report = JSON.parse(r.out);
    expect(report.tachChannel).toBe('ch2');
    expect(report.pulsesPerRev).toBe(60);
    expect(report.speedRpm.mean).toBeCloseTo(1450, 0);
    expect(report.peaks[0].order).toBeCloseTo(18 * inputRatio, 2);
  });

  it('prints a human summary with the speed profile and the TSA table', async () => {
    const r = await run(ramp, '--machine', machinePath, '--tach-channel', 'tach', '--tsa');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/speed of 'motor': min 13\d\d/);
    expect(r.out).toMatch(/pinion-1\s+input\s+18/);
  });

  it('fails with one line and exit code 2 on bad input', async () => {
    const noMachine = await run(ramp, '--tach-channel', 'tach');
    expect(noMachine.code).toBe(2);
    expect(noMachine.err).toMatch(/--machine/);
    const badChannel = await run(ramp, '--machine', machinePath, '--tach-channel', '9');
    expect(badChannel.code).toBe(2);
    expect(badChannel.err.trim().split('\n')).toHaveLength(1);
    const badShaft = await run(ramp, '--machine', machinePath, '--tach-channel', 'tach', '--shaft', 'spindle');
    expect(badShaft.code).toBe(2);
    expect(badShaft.err).toMatch(/spindle/);
    const flat = writeJson('flat.json', { sampleRateHz: 1000, metadata: {}, channels: [{ name: 'a', unit: 'g', samples: new Float64Array(2000) }, { name: 'tach', unit: 'V', samples: new Float64Array(2000) }] });
    const noPulses = await run(flat, '--machine', machinePath, '--tach-channel', 'tach');
    expect(noPulses.code).toBe(2);
    expect(noPulses.err).toMatch(/flat/);
  });
});
