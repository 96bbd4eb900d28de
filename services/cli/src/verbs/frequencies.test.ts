import { describe, expect, it } from 'vitest';
import { main } from '../main.js';
import type { CliIo } from '../io.js';

function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

const fixture = (name: string) => new URL(`../../../../fixtures/machines/${name}`, import.meta.url).pathname;

describe('frequencies verb', () => {
  it('prints shaft speeds and lines grouped by component for the example machine', async () => {
    const io = capture();
    expect(await main(['frequencies', fixture('aeration-mixer-2.json')], io)).toBe(0);
    const text = io.stdout.join('\n');
    // By hand: 1480 × 180/250 × 0.99 = 1054.944 rpm on the input shaft; GMF stage-1 = 18 × 17.5824 = 316.483 Hz.
    expect(text).toMatch(/input\s+0\.712800\s+1054\.94\s+17\.5824\s+v-belt/);
    expect(text).toMatch(/stage-1 \(gear mesh, pinion-1 18T on input \/ wheel-1 67T on intermediate\)/);
    expect(text).toMatch(/316\.483\s+12\.8304\s+GMF stage-1\s+18 teeth × 17\.58 Hz/);
    expect(text).toMatch(/BPFO input-de/);
    expect(text).toMatch(/100\.000\s+4\.0541\s+2× line frequency/);
  });

  it('gives { shafts, lines } with --json at the speed asked for', async () => {
    const io = capture();
    expect(await main(['frequencies', fixture('aeration-mixer-2.json'), '--speed-rpm', '1380', '--json'], io)).toBe(0);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.referenceSpeedRpm).toBe(1380);
    expect(body.shafts.map((s: { shaft: string }) => s.shaft)).toEqual(['motor', 'input', 'intermediate', 'output']);
    const gmf = body.lines.find((l: { label: string }) => l.label === 'GMF stage-1');
    expect(gmf.frequencyHz).toBeCloseTo((18 * 1380 * (180 / 250) * 0.99) / 60, 9);
    expect(gmf).toMatchObject({ component: 'stage-1', family: 'gear-mesh', harmonic: 1 });
  });

  it('flags lines for a recording when given its sample rate and resolution', async () => {
    const io = capture();
    expect(await main(['frequencies', fixture('aeration-mixer-2.json'), '--json', '--sample-rate-hz', '1024', '--resolution-hz', '0.25'], io)).toBe(0);
    const lines = JSON.parse(io.stdout.join('\n')).lines as Array<{ label: string; aboveNyquist: boolean; ambiguousWith: string[] }>;
    expect(lines.find((l) => l.label === '2×GMF stage-1')!.aboveNyquist).toBe(true);
    expect(lines.find((l) => l.label === 'GMF stage-1')!.aboveNyquist).toBe(false);
    // 67 + 2 = 69 = 3 × 23: the second upper sideband of stage 1 sits on the third harmonic of stage 2.
    expect(lines.find((l) => l.label === 'GMF stage-1 + 2× intermediate')!.ambiguousWith).toContain('3×GMF stage-2');
  });

  it('honours --harmonics and --sidebands', async () => {
    const io = capture();
    expect(await main(['frequencies', fixture('skelmere-conveyor-drive-2.json'), '--json', '--harmonics', '2', '--sidebands', '1'], io)).toBe(0);
    const lines = JSON.parse(io.stdout.join('\n')).lines as Array<{ component: string; family: string }>;
    expect(lines.filter((l) => l.component === 'input' && l.family === 'shaft-harmonic')).toHaveLength(2);
    expect(lines.filter((l) => l.component === 'hs-mesh' && l.family === 'mesh-sideband')).toHaveLength(3 * 2 * 2);
  });

  it('prints the problems of an invalid model on stderr and exits 2', async () => {
    const io = capture();
    expect(await main(['frequencies', fixture('invalid/speed-range.json')], io)).toBe(2);
    expect(io.stderr).toHaveLength(3);
    expect(io.stderr[0]).toMatch(/speed\.minRpm: \(1500\) must be <= nominalRpm \(1480\)/);
    expect(io.stderr[2]).toMatch(/^kinespec frequencies: .* is not a valid machine model \(2 problems/);
  });

  it('refuses bad flags with one line naming the flag', async () => {
    for (const args of [['--speed-rpm', '-5'], ['--harmonics', '2.5'], ['--harmonics', ''], ['--sample-rate-hz', '1000'], ['--bogus']]) {
      const io = capture();
      expect(await main(['frequencies', fixture('aeration-mixer-2.json'), ...args], io)).toBe(2);
      expect(io.stderr).toHaveLength(1);
    }
  });
});
