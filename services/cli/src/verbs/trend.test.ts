import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';

const machine = new URL('../../../../fixtures/machines/aeration-mixer-2.json', import.meta.url).pathname;
const pumpMachine = new URL('../../../../fixtures/machines/skelmere-feed-pump-3.json', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'kinespec-trend-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) };
  const code = await main(['trend', ...argv], io);
  return { code, out, err };
}

/** Gaussian noise of r.m.s. `rmsG` (Park–Miller and Box–Muller), 2,560 samples at 25.6 kHz: a 0.1 s snapshot. */
function snapshot(rmsG: number, seed: number): number[] {
  let s = seed;
  const u = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return Array.from({ length: 2560 }, () => rmsG * Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()));
}

const DAY_MS = 86_400_000;
const START = Date.parse('2025-01-06T08:00:00Z');

/** A manifest of daily recordings whose r.m.s. follows `rmsOfDay`, written as JSON recordings in g. */
function writeManifest(name: string, days: number, rmsOfDay: (day: number) => number): string {
  const entries = [];
  for (let d = 0; d < days; d++) {
    const file = `${name}-${d}.json`;
    writeFileSync(join(dir, file), JSON.stringify({ sampleRateHz: 25600, channels: [{ name: 'gb-input-h', unit: 'g', samples: snapshot(rmsOfDay(d), 1 + d) }] }));
    entries.push({ file, recordedAt: new Date(START + d * DAY_MS).toISOString() });
  }
  const path = join(dir, `${name}.manifest.json`);
  writeFileSync(path, JSON.stringify(entries));
  return path;
}

// r.m.s. 0.1 g for 30 days, then e^(0.1·(day − 30)): crossing 0.5 g at day 30 + ln(5)/0.1 = 46.09 (closed form).
const rising = writeManifest('rising', 42, (d) => 0.1 * Math.exp(d > 30 ? 0.1 * (d - 30) : 0));
const flat = writeManifest('flat', 30, () => 0.1);

describe('trend verb', () => {
  it('prints the contract JSON: indicator, unit, values, forecast { threshold, crossingAt, remainingS, lowS, highS, onsetAt, method }', async () => {
    const r = await run(rising, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'acceleration_rms', '--threshold', '0.5', '--json');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(Object.keys(j)).toEqual(expect.arrayContaining(['indicator', 'unit', 'values', 'forecast']));
    expect(j.indicator).toBe('acceleration_rms');
    expect(j.unit).toBe('g');
    expect(j.values).toHaveLength(42);
    expect(j.values[0]).toEqual({ recordedAt: '2025-01-06T08:00:00.000Z', value: expect.any(Number) });
    // the r.m.s. of 2,560 Gaussian samples is within a few percent of σ (standard error σ/√(2N) ≈ 1.4 %)
    expect(j.values[0].value / 0.1).toBeCloseTo(1, 1);
    for (const key of ['threshold', 'crossingAt', 'remainingS', 'lowS', 'highS', 'onsetAt', 'method']) expect(j.forecast).toHaveProperty(key);
    expect(j.forecast.threshold).toBe(0.5);
  });

  it('foresees the crossing of an exponential rise at its closed-form time (day 46.1; 5.1 days after the last recording) within 25 %', async () => {
    const j = JSON.parse((await run(rising, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'acceleration_rms', '--threshold', '0.5', '--json')).out);
    const remainingDays = 30 + Math.log(5) / 0.1 - 41;
    expect(j.forecast.status).toBe('crossing');
    expect(j.forecast.remainingS / 86400 / remainingDays).toBeGreaterThan(0.75);
    expect(j.forecast.remainingS / 86400 / remainingDays).toBeLessThan(1.25);
    expect(j.forecast.lowS).toBeLessThan(j.forecast.remainingS);
    expect(Date.parse(j.forecast.crossingAt)).toBeCloseTo(START + 41 * DAY_MS + j.forecast.remainingS * 1000, -3);
    // the rise began at day 30 (Page's change point: the last value at the healthy level)
    expect(Math.abs(Date.parse(j.forecast.onsetAt) - (START + 30 * DAY_MS)) / DAY_MS).toBeLessThanOrEqual(2);
  });

  it('prints the series, the threshold and the forecast for people, with the caution', async () => {
    const r = await run(rising, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'acceleration_rms', '--threshold', '0.5');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/acceleration_rms at point 'gb-input-h' of 'aeration-mixer-2': 42 recordings/);
    expect(r.out).toMatch(/threshold: 0\.5 g \(the value given\)/);
    expect(r.out).toMatch(/crossing foreseen in about \d+ days/);
    expect(r.out).toMatch(/qualified engineer/);
  });

  it('says no crossing is foreseen for a flat series, with remainingS null', async () => {
    const j = JSON.parse((await run(flat, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'acceleration_rms', '--threshold', '0.5', '--json')).out);
    expect(j.forecast.status).toBe('no-crossing');
    expect(j.forecast.remainingS).toBeNull();
    expect(j.forecast.crossingAt).toBeNull();
  });

  it('takes the zone C boundary of the overall velocity from the model (ISO 10816-3 group 2 rigid B/C: 2.8 mm/s)', async () => {
    const j = JSON.parse((await run(flat, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'velocity_rms_mm_per_s', '--zone', 'C', '--json')).out);
    expect(j.unit).toBe('mm/s');
    expect(j.forecast.thresholdSource).toBe('the zone C boundary');
    expect(j.forecast.threshold).toBe(2.8);
  });

  it('refuses, with one line and exit 2: a zone on an indicator without zones, two thresholds, a tach point, a bad manifest', async () => {
    const zone = await run(flat, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'kurtosis', '--zone', 'C');
    expect(zone.code).toBe(2);
    expect(zone.err).toMatch(/no ISO zones/);
    expect(zone.err.trim().split('\n')).toHaveLength(1);
    const two = await run(flat, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'kurtosis', '--threshold', '3', '--alarm');
    expect(two.err).toMatch(/exactly one of/);
    const tach = await run(flat, '--machine', pumpMachine, '--point', 'train-tach', '--indicator', 'velocity_rms_mm_per_s', '--alarm');
    expect(tach.code).toBe(2);
    expect(tach.err).toMatch(/tach point has no vibration levels/);
    const bad = join(dir, 'bad.manifest.json');
    writeFileSync(bad, JSON.stringify([{ file: 'flat-0.json', recordedAt: 'yesterday' }]));
    const r = await run(bad, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'kurtosis', '--threshold', '5');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/entry 1: "recordedAt" must be an ISO 8601/);
    writeFileSync(bad, JSON.stringify([{ file: 'flat-0.json', recordedAt: '2025-01-01T00:00:00Z' }, { file: 'flat-1.json', recordedAt: '2025-01-01T00:00:00Z' }]));
    expect((await run(bad, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'kurtosis', '--threshold', '5')).err).toMatch(/two recordings at/);
    const unknown = await run(flat, '--machine', machine, '--point', 'gb-input-h', '--indicator', 'accel_peak', '--threshold', '5');
    expect(unknown.err).toMatch(/not known/);
  });
});
