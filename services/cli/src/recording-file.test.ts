import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Recording } from '@kinespec/signal';
import { afterAll, describe, expect, it } from 'vitest';
import { CliError } from './cli-error.js';
import { channelIndex, decoderHint, loadRecordingFile, recordingFileArgument, selectChannel, withFileNameOnInputErrors } from './recording-file.js';

const dir = mkdtempSync(join(tmpdir(), 'kinespec-recording-file-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// An invented two-axis logger file; channel '2' is a name on purpose, to test that names win over numbers.
const recording: Recording = {
  sampleRateHz: 1000,
  channels: [
    { name: 'de-h', unit: 'g', samples: new Float64Array(4) },
    { name: '2', unit: 'g', samples: new Float64Array(4) },
    { name: 'tach', unit: 'V', samples: new Float64Array(4) },
  ],
  metadata: {},
};

describe('channelIndex', () => {
  it('takes an exact name first, else a 1-based number, and returns the 0-based index', () => {
    expect(channelIndex(recording, 'tach')).toBe(2);
    expect(channelIndex(recording, '2')).toBe(1);
    expect(channelIndex(recording, '3')).toBe(2);
    expect(channelIndex(recording, '1')).toBe(0);
  });

  it('lists the channels, 1-based, when nothing matches, naming the flag', () => {
    for (const selector of ['0', '4', '1.5', 'DE-H', '']) {
      expect(() => channelIndex(recording, selector, 'tach-channel')).toThrow(
        new CliError(`--tach-channel '${selector}' matches no channel; the recording has 1 'de-h', 2 '2', 3 'tach'`),
      );
    }
  });
});

describe('selectChannel', () => {
  it('gives the first channel when the flag is absent, else the channel the flag names', () => {
    expect(selectChannel(recording, undefined).name).toBe('de-h');
    expect(selectChannel(recording, '3').name).toBe('tach');
  });
});

describe('decoderHint', () => {
  it('passes --sample-rate-hz and --unit on, leaving out the absent ones', () => {
    expect(decoderHint(undefined, undefined)).toEqual({});
    expect(decoderHint('25600', 'g')).toEqual({ sampleRateHz: 25600, unit: 'g' });
    expect(decoderHint(undefined, 'mm/s')).toEqual({ unit: 'mm/s' });
  });

  it('refuses a sample rate that is not > 0, and a unit it does not know with the accepted list', () => {
    expect(() => decoderHint('0', undefined)).toThrow("--sample-rate-hz must be a sample rate in Hz > 0 (got '0')");
    expect(() => decoderHint(undefined, ' ')).toThrow("--unit: ' ' is not a unit Kinespec knows; accepted: g, m/s^2");
    expect(() => decoderHint(undefined, 'furlongs')).toThrow(/^--unit: 'furlongs' is not a unit Kinespec knows; accepted: g, m\/s\^2, .*\(vibration\); V, mV, counts, FS/);
  });

  it('writes a unit in its canonical spelling', () => {
    expect(decoderHint(undefined, 'm/s2')).toEqual({ unit: 'm/s^2' });
  });
});

describe('recordingFileArgument', () => {
  it('wants exactly one file', () => {
    expect(recordingFileArgument(['a.wav'], 'u')).toBe('a.wav');
    expect(() => recordingFileArgument([], 'kinespec x <file>')).toThrow('a recording file is required (usage: kinespec x <file>)');
    expect(() => recordingFileArgument(['a.wav', 'b.wav'], 'u')).toThrow('one recording file at a time (got 2)');
  });
});

describe('loadRecordingFile', () => {
  it('decodes a CSV file with the hint, and says why a file cannot be read', () => {
    const path = join(dir, 'two-axes.csv');
    writeFileSync(path, 'de,nde\n0.5,1\n-0.5,-1\n');
    const rec = loadRecordingFile(path, { sampleRateHz: 2048, unit: 'g' });
    expect(rec.sampleRateHz).toBe(2048);
    expect(rec.channels.map((c) => [c.name, c.unit, Array.from(c.samples)])).toEqual([['de', 'g', [0.5, -0.5]], ['nde', 'g', [1, -1]]]);
    expect(() => loadRecordingFile(join(dir, 'missing.wav'))).toThrow(`cannot read '${join(dir, 'missing.wav')}': no such file`);
    expect(() => loadRecordingFile(dir)).toThrow(`cannot read '${dir}': it is a directory`);
  });
});

describe('withFileNameOnInputErrors', () => {
  it('puts the file name before an input error of the decoders, and lets other errors through', () => {
    const path = join(dir, 'no-rate.csv');
    writeFileSync(path, '0.1\n0.2\n');
    expect(() => withFileNameOnInputErrors(path, () => loadRecordingFile(path))).toThrow(/^no-rate\.csv: /);
    class OtherError extends Error {}
    expect(() => withFileNameOnInputErrors(path, () => { throw new OtherError('x'); })).toThrow(OtherError);
    expect(() => withFileNameOnInputErrors(path, () => { throw new OtherError('y'); }, [OtherError])).toThrow(new CliError('no-rate.csv: y'));
  });
});
