import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadMachineModel } from '@kinespec/kinematics';
import { simulateRecording } from '@kinespec/simulator';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';
import { speedSourceText } from './diagnose.js';

function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

const machinePath = new URL('../../../../fixtures/machines/aeration-mixer-2.json', import.meta.url).pathname;
const model = loadMachineModel((await import('node:fs')).readFileSync(machinePath, 'utf8'));
const dir = mkdtempSync(join(tmpdir(), 'kinespec-diagnose-'));

// A simulated recording (@kinespec/simulator) of the example machine with a severe outer-race defect in input-de,
// written as CSV with its sample rate and unit in comment lines.
const recording = simulateRecording(model, {
  pointId: 'gb-input-h',
  sampleRateHz: 25600,
  durationS: 3,
  speedRpm: 1462,
  faults: [{ fault: 'bearing-outer-race', component: 'input-de', severity: 1 }],
  seed: 11,
});
const samples = recording.channels[0]!.samples;
const csvPath = join(dir, 'outer-race.csv');
writeFileSync(csvPath, `# sampleRateHz=25600\n# unit=g\n${Array.from(samples, (v) => v.toPrecision(9)).join('\n')}\n`);

describe('diagnose verb', () => {
  it('prints the speed, the overall level with its ISO zone and the fault shown with its reason', async () => {
    const io = capture();
    expect(await main(['diagnose', csvPath, '--machine', machinePath, '--point', 'gb-input-h'], io)).toBe(0);
    const text = io.stdout.join('\n');
    expect(text).toMatch(/speed: 146\d\.\d rpm .* from the spectrum/);
    expect(text).toMatch(/overall: \d+\.\d\d mm\/s RMS \(10–1000 Hz\), ISO 20816-3 zone [ABCD]/);
    expect(text).toMatch(/faults shown \(score >= 0\.5\):\n {2}[01]\.\d\d {2}bearing-outer-race in input-de: The recording shows an outer-race defect/);
    expect(text).toMatch(/next:/);
  });

  it('gives the contract object with --json: speed, overall, hypotheses highest first with evidence, domain', async () => {
    const io = capture();
    expect(await main(['diagnose', csvPath, '--machine', machinePath, '--point', 'gb-input-h', '--speed-rpm', '1480', '--json'], io)).toBe(0);
    const body = JSON.parse(io.stdout.join('\n'));
    expect(body.speedSource).toBe('spectrum');
    expect(Math.abs(body.speedHz * 60 - 1462)).toBeLessThan(1);
    expect(body.domain).toBe('frequency');
    expect(body.overall).toMatchObject({ zone: expect.stringMatching(/^[ABCD]$/) });
    expect(typeof body.overall.velocityRmsMmPerS).toBe('number');
    expect(body.hypotheses[0]).toMatchObject({ fault: 'bearing-outer-race', component: 'input-de' });
    for (let i = 1; i < body.hypotheses.length; i++) expect(body.hypotheses[i - 1].score).toBeGreaterThanOrEqual(body.hypotheses[i].score);
    expect(body.hypotheses[0].evidence[0]).toEqual(expect.objectContaining({ frequencyHz: expect.any(Number), predicted: expect.any(Number), snrDb: expect.any(Number) }));
  });

  it('fails with one line and exit code 2 on bad input', async () => {
    for (const args of [
      ['diagnose', csvPath],
      ['diagnose', csvPath, '--machine', machinePath, '--point', 'nowhere'],
      ['diagnose', join(dir, 'missing.csv'), '--machine', machinePath],
      ['diagnose', csvPath, '--machine', machinePath, '--speed-rpm', '-5'],
      ['diagnose', csvPath, '--machine', machinePath, '--channel', '7'],
      ['diagnose', csvPath, '--machine', machinePath, '--sample-rate-hz=0'],
      ['diagnose', csvPath, '--machine', machinePath, '--unit', 'furlongs'],
      ['diagnose', csvPath, '--machine', machinePath, '--sample-rate', '1000'],
    ]) {
      const io = capture();
      expect(await main(args, io)).toBe(2);
      expect(io.stderr).toHaveLength(1);
      expect(io.stderr[0]).toMatch(/^kinespec diagnose: /);
    }
  });
});

describe('speedSourceText', () => {
  it("tells the model's nominal speed from a speed the user gave, both of which the analysis calls 'given'", () => {
    expect(speedSourceText('given', false)).toBe("the model's nominal speed (not found in the spectrum)");
    expect(speedSourceText('given', true)).toBe('the value given (not found in the spectrum)');
    expect(speedSourceText('spectrum', true)).toBe('the spectrum');
    expect(speedSourceText('tach', false)).toBe('the tach');
  });
});
