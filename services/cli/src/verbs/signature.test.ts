import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';

function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

const example = new URL('../../../../fixtures/machines/aeration-mixer-2.json', import.meta.url).pathname;
const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

describe('signature verb', () => {
  it('prints the missing-tooth table, natural frequencies and resonance warnings for the example machine', async () => {
    const io = capture();
    expect(await main(['signature', example, '--fault', 'gear-missing-tooth', '--component', 'pinion-1'], io)).toBe(0);
    const text = io.stdout.join('\n');
    // By hand: input shaft 1480 × 180/250 × 0.99 / 60 = 17.5824 Hz; its 1× is order 0.7128 of the motor.
    expect(text).toMatch(/17\.582\s+0\.7128\s+1\s+0\.1105\s/);
    // |2c_1| = 2·(1/18)·sinc(1/18) = 0.1105 (rectangular one-pitch drop, check-values.md §6 form)
    expect(2 * (1 / 18) * sinc(1 / 18)).toBeCloseTo(0.1105, 4);
    expect(text).toMatch(/torsional natural frequencies: 21\.75 Hz, 281\.1 Hz/);
    expect(text).toMatch(/RESONANCE torsional mode 2 at 281\.1 Hz/);
    expect(text).toMatch(/GMF stage-1 − 1× input/);
    expect(text).not.toMatch(/316\.48\d\s/); // no line at the mesh frequency for the rectangular drop
  });

  it('gives lines, naturalFrequenciesHz and warnings with --json', async () => {
    const io = capture();
    expect(await main(['signature', example, '--fault', 'gear-missing-tooth', '--component', 'pinion-1', '--speed-rpm', '1380', '--harmonics', '20', '--json'], io)).toBe(0);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.lines).toHaveLength(19); // orders 1..20 of the pinion shaft minus the mesh harmonic 18
    for (const l of body.lines) {
      expect(typeof l.frequencyHz).toBe('number');
      expect(typeof l.amplitude).toBe('number');
      expect(Number.isInteger(l.harmonic)).toBe(true);
    }
    expect(body.lines[0].frequencyHz).toBeCloseTo((1380 * (180 / 250) * 0.99) / 60, 9);
    expect(body.naturalFrequenciesHz).toHaveLength(2);
    expect(Array.isArray(body.warnings)).toBe(true);
    expect(body.domain).toBe('spectrum');
    expect(body.unit).toBe('g');
  });

  it('marks bearing signatures as envelope-domain', async () => {
    const io = capture();
    expect(await main(['signature', example, '--fault', 'bearing-outer-race', '--component', 'output-nde', '--json'], io)).toBe(0);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.domain).toBe('envelope');
    // faultOrders bpfo = 4.38 of the output shaft: 1480 × 0.72 × 0.99 × 18/67 × 23/79 / 60 × 4.38 Hz (by hand)
    expect(body.lines[0].frequencyHz).toBeCloseTo(((1480 * 0.72 * 0.99 * (18 / 67) * (23 / 79)) / 60) * 4.38, 9);
  });

  it('works on the signatures demo machine: velocity point, flexible coupling and belt', async () => {
    const demo = new URL('../../../../fixtures/signatures/demo/brackwater-vacuum-pump-3.json', import.meta.url).pathname;
    const io = capture();
    expect(await main(['signature', demo, '--fault', 'gear-broken-tooth', '--component', 'pinion', '--harmonics', '30', '--json'], io)).toBe(0);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.unit).toBe('mm/s');
    expect(body.naturalFrequenciesHz).toHaveLength(3);
    // 988 rpm / 60 = 16.4667 Hz; 21 teeth: 1..30 minus the mesh order 21
    expect(body.lines).toHaveLength(29);
    expect(body.lines[6].frequencyHz).toBeCloseTo(7 * 988 / 60, 9);
  });

  it('reads a YAML copy of a model from a temp dir', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'kinespec-signature-'));
    const model = JSON.parse(readFileSync(example, 'utf8'));
    const { stringify } = await import('yaml');
    const path = join(dir, 'mixer.yaml');
    writeFileSync(path, stringify(model));
    const io = capture();
    expect(await main(['signature', path, '--fault', 'unbalance', '--component', 'impeller', '--json'], io)).toBe(0);
    expect(JSON.parse(io.stdout.join('\n')).lines).toHaveLength(1);
  });

  it('exits 2 with one line for a bad fault, component, point or flag', async () => {
    const cases: Array<[string[], RegExp]> = [
      [['--fault', 'rust', '--component', 'input'], /--fault must be one of unbalance, misalignment/],
      [['--component', 'input'], /--fault is required/],
      [['--fault', 'unbalance'], /--component is required/],
      [['--fault', 'gear-missing-tooth', '--component', 'input'], /component \('input'\) must be a gear .*\(unknown_component\)/],
      [['--fault', 'unbalance', '--component', 'input', '--point', 'nowhere'], /point \('nowhere'\).*\(unknown_point\)/],
      [['--fault', 'unbalance', '--component', 'input', '--speed-rpm', '0'], /--speed-rpm must be a number > 0/],
      [['--fault', 'gear-broken-tooth', '--component', 'pinion-1', '--shape', 'square'], /--shape must be one of rectangular, half-sine, triangular/],
      [['--fault', 'unbalance', '--component', 'input', '--frobnicate'], /Unknown option '--frobnicate'/],
    ];
    for (const [flags, message] of cases) {
      const io = capture();
      expect(await main(['signature', example, ...flags], io)).toBe(2);
      expect(io.stderr).toHaveLength(1);
      expect(io.stderr[0]).toMatch(message);
    }
    const io = capture();
    expect(await main(['signature', '/nonexistent/machine.json', '--fault', 'unbalance', '--component', 'x'], io)).toBe(2);
    expect(io.stderr[0]).toMatch(/cannot read machine model/);
  });
});
