import { describe, expect, it } from 'vitest';
import { main } from '../main.js';
import type { CliIo } from '../io.js';

function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

const fixture = (name: string) => new URL(`../../../../fixtures/machines/${name}`, import.meta.url).pathname;

describe('check verb', () => {
  it('exits 0 with a one-line summary for the example machine', async () => {
    const io = capture();
    expect(await main(['check', fixture('aeration-mixer-2.json')], io)).toBe(0);
    expect(io.stdout).toHaveLength(1);
    expect(io.stdout[0]).toMatch(/aeration-mixer-2.*4 shafts, 1 belt, 2 gear meshes, 2 bearings, 1 rotor.*reference shaft motor at 1480 rpm \(1380-1500\)/);
  });

  it('accepts the YAML demo machine', async () => {
    const io = capture();
    expect(await main(['check', fixture('skelmere-feed-pump-3.yaml')], io)).toBe(0);
  });

  it('prints every problem with its path, then exits 2 with one line on stderr', async () => {
    const io = capture();
    const file = fixture('invalid/unknown-references.json');
    expect(await main(['check', file], io)).toBe(2);
    expect(io.stdout).toHaveLength(5);
    expect(io.stdout[1]).toBe(`${file}: gearMeshes[0].driven.shaft: names shaft 'gearbox-out', which is not in shafts (unknown_shaft)`);
    expect(io.stderr).toEqual([`kinespec check: ${file}: 5 problems, not a valid machine model`]);
  });

  it('gives the problems as JSON with --json', async () => {
    const io = capture();
    expect(await main(['check', fixture('invalid/bad-teeth.json'), '--json'], io)).toBe(2);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.ok).toBe(false);
    expect(body.problems).toContainEqual({ path: 'gearMeshes[0].driven.teeth', code: 'not_whole_number', message: 'must be a whole number >= 1' });
  });

  it('reports a missing file and a missing argument as one line, exit 2', async () => {
    let io = capture();
    expect(await main(['check', '/no/such/machine.json'], io)).toBe(2);
    expect(io.stderr).toEqual(["kinespec check: cannot read machine model '/no/such/machine.json': no such file"]);
    io = capture();
    expect(await main(['check'], io)).toBe(2);
    expect(io.stderr[0]).toMatch(/missing the machine model file/);
  });

  it('reports a syntax error with its line', async () => {
    const io = capture();
    expect(await main(['check', fixture('invalid/syntax-error.json')], io)).toBe(2);
    expect(io.stdout[0]).toMatch(/\(model\): not valid JSON \(line 3, column 3\)/);
  });
});
