import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../io.js';
import { main } from '../main.js';

// Recordings invented for these tests: Harrow Lane water works, raw-water pump P-2, drive-end bearing housing.
const dir = mkdtempSync(join(tmpdir(), 'kinespec-spectrum-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => void (out += `${t}\n`), err: (t) => void (err += `${t}\n`) };
  const code = await main(['spectrum', ...argv], io);
  return { code, out, err };
}

async function runJson(...argv: string[]) {
  const r = await run(...argv, '--json');
  expect(r.err).toBe('');
  expect(r.code).toBe(0);
  return JSON.parse(r.out);
}

/** Mono IEEE-float WAV, written here from the RIFF layout (check-values.md section 11), independent of the decoders. */
function floatWav(samples: Float64Array, sampleRateHz: number): Buffer {
  const data = Buffer.alloc(samples.length * 4);
  samples.forEach((v, i) => data.writeFloatLE(v, i * 4));
  const header = Buffer.alloc(44);
  header.write('RIFF', 0, 'ascii');
  header.writeUInt32LE(36 + data.length, 4);
  header.write('WAVE', 8, 'ascii');
  header.write('fmt ', 12, 'ascii');
  header.writeUInt32LE(16, 16);
  header.writeUInt16LE(3, 20); // WAVE_FORMAT_IEEE_FLOAT
  header.writeUInt16LE(1, 22);
  header.writeUInt32LE(sampleRateHz, 24);
  header.writeUInt32LE(sampleRateHz * 4, 28);
  header.writeUInt16LE(4, 32);
  header.writeUInt16LE(32, 34);
  header.write('data', 36, 'ascii');
  header.writeUInt32LE(data.length, 40);
  return Buffer.concat([header, data]);
}

const FS = 25600;
const N = 1 << 16;
// 1 g peak at 100 Hz plus 0.2 g peak at 1234 Hz
const accel = new Float64Array(N).map(
  (_, i) => Math.sin((2 * Math.PI * 100 * i) / FS) + 0.2 * Math.sin((2 * Math.PI * 1234 * i) / FS + 0.7),
);
const wavPath = join(dir, 'p2-de-h.wav');
writeFileSync(wavPath, floatWav(accel, FS));

describe('spectrum verb', () => {
  it('reports a WAV recording as JSON: settings, overall RMS, ISO velocity and the peaks strongest first', async () => {
    const r = await runJson(wavPath, '--unit', 'g');
    expect(r).toMatchObject({
      sampleRateHz: FS,
      frequencyResolutionHz: 3.125,
      unit: 'g',
      scaling: 'rms',
      window: 'hann',
      segmentLength: 8192,
      averages: 15,
      quantity: 'acceleration',
    });
    // rms of the two sines, sqrt(1/2 + 0.04/2) (rms = peak / sqrt 2, common practice); Parseval within 0.5 %
    expect(Math.abs(r.overall.rms / Math.sqrt(0.52) - 1)).toBeLessThan(0.005);
    expect(r.overall.unit).toBe('g');
    expect(r.overall.bandHz).toEqual([0, 12800]);
    // check-values.md section 8: 1 g peak at 100 Hz -> 11.0364 mm/s rms; 1234 Hz lies outside 10-1000 Hz
    expect(Math.abs(r.velocityRmsMmPerS / 11.0364 - 1)).toBeLessThan(0.005);
    expect(r.frequenciesHz).toHaveLength(4097);
    expect(r.values).toHaveLength(4097);
    expect(Math.abs(r.peaks[0].frequencyHz - 100)).toBeLessThan(0.05 * 3.125);
    expect(r.peaks[0].amplitude).toBeCloseTo(Math.SQRT1_2, 3);
    expect(Math.abs(r.peaks[1].frequencyHz - 1234)).toBeLessThan(0.05 * 3.125);
    expect(r.peaks[1].amplitude).toBeCloseTo(0.2 * Math.SQRT1_2, 3);
  });

  it('integrates to velocity in mm/s over 10-1000 Hz with --quantity velocity', async () => {
    const r = await runJson(wavPath, '--unit', 'g', '--quantity', 'velocity', '--scaling', 'peak', '--window', 'flattop');
    expect(r.unit).toBe('mm/s');
    expect(r.overall.bandHz).toEqual([10, 1000]);
    // check-values.md section 8: v_rms 11.0364, v_peak 15.6078 mm/s
    expect(Math.abs(r.overall.rms / 11.0364 - 1)).toBeLessThan(0.005);
    expect(r.velocityRmsMmPerS).toBe(r.overall.rms);
    expect(Math.abs(r.peaks[0].amplitude / 15.6078 - 1)).toBeLessThan(0.001);
  });

  it('prints a short human summary without --json', async () => {
    const r = await run(wavPath, '--unit', 'g');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/overall: 0\.72\d* g rms \(0-12800 Hz\); velocity 11\.0\d* mm\/s rms \(10-1000 Hz\)/);
    // peaks above the window's skirt around 0 Hz (2 bins of 3.125 Hz), each to a tenth of a bin: one decimal
    expect(r.out).toMatch(/top peaks in 6\.25-12800 Hz \(g rms\):\n\s+100\.0 Hz\s+0\.7071/);
    expect(r.out).toMatch(/\n\s+1234\.0 Hz\s+0\.1414/);
  });

  it('gives a peak frequency to a tenth of a bin: two decimals at 0.39 Hz resolution (the interpolated peak is good to a few hundredths of a bin)', async () => {
    const r = await run(wavPath, '--unit', 'g', '--segment', '65536');
    expect(r.out).toMatch(/resolution 0\.3906 Hz/);
    expect(r.out).toMatch(/\n\s+100\.00 Hz\s+0\.707/);
    expect(r.out).not.toMatch(/100\.00\d Hz/);
  });

  it('looks for the peaks of a spectrum integrated to velocity only in its overall band, not in the 1/f rise near 0 Hz', async () => {
    // a slow drift (0.3 Hz, the kind a loose cable or a temperature change gives) integrates to a huge velocity near 0 Hz
    const drifting = accel.map((v, i) => v + 0.05 * Math.sin((2 * Math.PI * 0.3 * i) / FS));
    const path = join(dir, 'p2-drift.wav');
    writeFileSync(path, floatWav(drifting, FS));
    const r = await runJson(path, '--unit', 'g', '--quantity', 'velocity');
    expect(r.peakBandHz).toEqual([10, 1000]);
    expect(Math.abs(r.peaks[0].frequencyHz - 100)).toBeLessThan(0.05);
    expect(r.peaks.every((p: { frequencyHz: number }) => p.frequencyHz >= 10)).toBe(true);
  });

  it('names the component line under each peak with --machine, at the running speed it finds', async () => {
    const examples = new URL('../../../../fixtures/', import.meta.url);
    const r = await run(
      new URL('examples/feed-pump-3-pump-de-h.wav', examples).pathname, '--unit', 'g',
      '--machine', new URL('machines/skelmere-feed-pump-3.json', examples).pathname, '--point', 'pump-de-h',
    );
    expect(r.code, r.err).toBe(0);
    // the simulated pump turns at 2968 rpm (make-examples.ts); the spectrum comb finds it within its uncertainty
    const speed = /speed: ([\d.]+) ± ([\d.]+) rpm, from the spectrum/.exec(r.out);
    expect(speed, r.out).not.toBeNull();
    expect(Math.abs(Number(speed![1]) - 2968)).toBeLessThan(3 * Number(speed![2]) + 1);
    // 1× of the train (unbalance) and the impeller's blade pass (7 vanes in the model: 7 × 49.47 Hz = 346.3 Hz)
    expect(r.out).toMatch(/\n\s+49\.5 Hz\s+\S+\s+1× train/);
    expect(r.out).toMatch(/\n\s+346\.3 Hz\s+\S+\s+blade pass impeller/);
    const json = await runJson(new URL('examples/feed-pump-3-pump-de-h.wav', examples).pathname, '--unit', 'g', '--machine', new URL('machines/skelmere-feed-pump-3.json', examples).pathname);
    expect(json.peaks[0]).toMatchObject({ line: '1× train' });
    expect(json.speed.source).toBe('the spectrum');
  });

  it('refuses --point without --machine, and an unknown --unit with the accepted list', async () => {
    const a = await run(wavPath, '--point', 'pump-de-h');
    expect([a.code, a.err.trim()]).toEqual([2, 'kinespec spectrum: --point and --speed-rpm name a point and speed of a machine: give --machine <machine.json> too']);
    const b = await run(wavPath, '--unit', 'furlongs');
    expect(b.code).toBe(2);
    expect(b.err.split('\n').filter(Boolean)).toHaveLength(1);
    expect(b.err).toMatch(/--unit: 'furlongs' is not a unit Kinespec knows; accepted: g, /);
  });

  it('reads a CSV file, picks a channel by name or 1-based number, and shortens a segment longer than the record', async () => {
    const fs = 2048;
    const rows = ['# sampleRateHz=2048', '# unit=m/s^2', 'inboard,outboard'];
    for (let i = 0; i < 3000; i++) {
      rows.push(`${(0.5 * Math.sin((2 * Math.PI * 50 * i) / fs)).toFixed(9)},${(2 * Math.sin((2 * Math.PI * 300 * i) / fs)).toFixed(9)}`);
    }
    const path = join(dir, 'p2-two-axes.csv');
    writeFileSync(path, `${rows.join('\n')}\n`);
    const byName = await runJson(path, '--channel', 'outboard', '--scaling', 'peak');
    const byNumber = await runJson(path, '--channel', '2', '--scaling', 'peak');
    expect(byName.channel).toBe('outboard');
    expect(byNumber.values).toEqual(byName.values);
    expect(byName.segmentLength).toBe(2048);
    expect(byName.notes.join(' ')).toMatch(/segment 8192 is longer than the record \(3000 samples\); used 2048/);
    expect(byName.unit).toBe('m/s^2');
    expect(Math.abs(byName.peaks[0].frequencyHz - 300)).toBeLessThan(0.05);
    expect(byName.peaks[0].amplitude).toBeCloseTo(2, 2);
    const first = await runJson(path);
    expect(first.channel).toBe('inboard');
  });

  it('reads a JSON recording with --window, --scaling psd and --band', async () => {
    const fs = 10_000;
    const de = Array.from({ length: 20_000 }, (_, i) => 0.3 * Math.sin((2 * Math.PI * 150 * i) / fs));
    const nde = Array.from({ length: 20_000 }, (_, i) => 0.1 * Math.sin((2 * Math.PI * 150 * i) / fs) + 0.4 * Math.sin((2 * Math.PI * 2500 * i) / fs));
    const path = join(dir, 'p2-fan.json');
    writeFileSync(path, JSON.stringify({ sampleRateHz: fs, unit: 'g', channels: [{ name: 'DE', samples: de }, { name: 'NDE', samples: nde }] }));
    const r = await runJson(path, '--channel', 'NDE', '--scaling', 'psd', '--window', 'flattop', '--band', '100-200', '--segment', '4096', '--overlap', '0.75', '--detrend', 'linear');
    expect(r).toMatchObject({ channel: 'NDE', scaling: 'psd', window: 'flattop', valueUnit: 'g^2/Hz', overlapFraction: 0.75, detrend: 'linear' });
    expect(r.overall.bandHz).toEqual([100, 200]);
    expect(r.overall.rms).toBeCloseTo(0.1 * Math.SQRT1_2, 4);
  });

  it('gives the envelope spectrum of a band with --envelope: DC 1.0 and m = 0.5 at fm', async () => {
    // check-values.md section 9 (envelope.py): (1 + 0.5 cos 2 pi 32 t) cos 2 pi 1024 t at fs 8192
    const fs = 8192;
    const x = new Float64Array(8192).map((_, i) => (1 + 0.5 * Math.cos((2 * Math.PI * 32 * i) / fs)) * Math.cos((2 * Math.PI * 1024 * i) / fs));
    const path = join(dir, 'p2-env.wav');
    writeFileSync(path, floatWav(x, fs));
    const r = await runJson(path, '--unit', 'g', '--envelope', '900-1150', '--window', 'rectangular', '--detrend', 'none', '--scaling', 'peak');
    expect(r.envelope).toEqual({ bandHz: [900, 1150], squared: false });
    expect(r.values[0]).toBeCloseTo(1.0, 5);
    expect(r.values[32]).toBeCloseTo(0.5, 5);
    expect(r.peaks[0].frequencyHz).toBeCloseTo(32, 3);
    expect(r.velocityRmsMmPerS).toBeUndefined();
  });

  const oneLine = (s: string) => s.trim().split('\n').length === 1;

  it('fails with one line on stderr and exit code 2 on bad input', async () => {
    const cases: [string[], RegExp][] = [
      [[join(dir, 'missing.wav')], /cannot read '.*missing\.wav': no such file/],
      [[wavPath, '--window', 'kaiser'], /--window must be one of rectangular, hann, hamming, blackman-harris, flattop/],
      [[wavPath, '--band', '1000-10'], /--band must be LOW-HIGH/],
      [[wavPath, '--overlap', '1'], /--overlap must be a fraction/],
      [[wavPath, '--segment', 'big'], /--segment must be a whole number/],
      [[wavPath, '--colour', 'red'], /Unknown option '--colour'/],
      [[wavPath, '--channel', '3'], /--channel '3' matches no channel; the recording has 1 /],
      [[wavPath, '--unit', 'um', '--quantity', 'velocity'], /holds displacement \(um\); velocity cannot be derived/],
      [[wavPath, '--unit', 'g', '--band', '20000-30000'], /lies above the Nyquist frequency 12800 Hz/],
      [[], /a recording file is required/],
    ];
    for (const [argv, message] of cases) {
      const r = await run(...argv);
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err).toMatch(message);
      expect(oneLine(r.err)).toBe(true);
    }
  });

  it('passes decoder errors through as one line, e.g. a CSV without a sample rate', async () => {
    const path = join(dir, 'no-rate.csv');
    writeFileSync(path, '0.1\n0.2\n0.3\n');
    const r = await run(path);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^kinespec spectrum: no-rate\.csv: /);
    expect(oneLine(r.err)).toBe(true);
    const short = await run(path, '--sample-rate-hz', '1000', '--unit', 'g');
    expect(short.code).toBe(2);
    expect(short.err).toMatch(/has 3 samples; a spectrum needs at least 16/);
  });
});
