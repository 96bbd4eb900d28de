import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { encodeWav } from '@kinespec/signal';
import { afterAll, describe, expect, it } from 'vitest';

// End to end through the installed launcher: services/cli/bin/kinespec.js runs the compiled dist/,
// which `npm ci` builds (prepare) and `npm run build` rebuilds. Without it the tests are skipped.
const root = fileURLToPath(new URL('../../', import.meta.url));
const bin = join(root, 'services/cli/bin/kinespec.js');
const built = existsSync(join(root, 'services/cli/dist/main.js'));
const SKIP_NOTE = 'services/cli/dist/main.js is missing: run `npm run build` (npm ci does it) to test the launcher';

const dir = mkdtempSync(join(tmpdir(), 'kinespec-bin-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function kinespec(...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('kinespec launcher', () => {
  it('prints the version of the root package.json and exits 0', (ctx) => {
    ctx.skip(!built, SKIP_NOTE);
    const r = kinespec('--version');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toBe((JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string }).version);
  });

  it('prints the spectrum of a WAV file as one JSON object and exits 0', (ctx) => {
    ctx.skip(!built, SKIP_NOTE);
    // invented test signal: 1 g peak at 100 Hz, 8192 Hz sampling, 4 s
    const fs = 8192;
    const samples = new Float64Array(4 * fs).map((_, i) => Math.sin((2 * Math.PI * 100 * i) / fs));
    const path = join(dir, 'sine-100hz.wav');
    writeFileSync(path, encodeWav({ sampleRateHz: fs, channels: [{ name: 'de-h', unit: 'g', samples }], metadata: {} }, { format: 'float32' }));
    const r = kinespec('spectrum', path, '--unit', 'g', '--json');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report).toMatchObject({ sampleRateHz: fs, samples: 4 * fs, scaling: 'rms', window: 'hann', segmentLength: 8192, quantity: 'acceleration', unit: 'g' });
    expect(report.frequenciesHz).toHaveLength(4097);
    expect(report.values).toHaveLength(4097);
    expect(Array.isArray(report.notes)).toBe(true);
    expect(report.overall).toEqual({ rms: expect.any(Number), unit: 'g', bandHz: [0, 4096] });
    // rms of a sine is peak / sqrt 2 (common practice); the line sits on bin 100 of a 1 Hz resolution
    expect(report.peaks[0].frequencyHz).toBeCloseTo(100, 3);
    expect(report.peaks[0].amplitude).toBeCloseTo(Math.SQRT1_2, 3);
    expect(report.overall.rms).toBeCloseTo(Math.SQRT1_2, 3);
  });

  it('says in exactly one line on stderr that a file is missing, and exits 2', (ctx) => {
    ctx.skip(!built, SKIP_NOTE);
    const missing = join(dir, 'no-such-recording.wav');
    const r = kinespec('spectrum', missing);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(`kinespec spectrum: cannot read '${missing}': no such file\n`);
  });
});
