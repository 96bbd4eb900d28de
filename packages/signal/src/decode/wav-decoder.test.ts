import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { codeOf } from '../../../../tests/support/signal-error-code.js';
import { SignalInputError } from '../errors.js';
import { decodeWav, decodeWavFrames, decodeWavFramesPortable, parseWavFormat, type WavFormat } from './wav-decoder.js';

const fixtures = new URL('../../../../fixtures/decode/', import.meta.url);
const fixture = (name: string) => new Uint8Array(readFileSync(new URL(name, fixtures)));
const hex = (text: string) => Uint8Array.from(text.trim().split(/\s+/), (h) => parseInt(h, 16));

// Reference files from scipy.io.wavfile.write, 8000 Hz mono, samples [0, 1, -1, 2]
// (docs/check-values.md §11, the bytes scipy.io.wavfile.write gives).
const scipyInt16 = hex(
  '52 49 46 46 2c 00 00 00 57 41 56 45 66 6d 74 20 10 00 00 00 01 00 01 00 40 1f 00 00 80 3e 00 00 02 00 10 00 64 61 74 61 08 00 00 00 00 00 01 00 ff ff 02 00',
);
const scipyInt32 = hex(
  '52 49 46 46 34 00 00 00 57 41 56 45 66 6d 74 20 10 00 00 00 01 00 01 00 40 1f 00 00 00 7d 00 00 04 00 20 00 64 61 74 61 10 00 00 00 00 00 00 00 01 00 00 00 ff ff ff ff 02 00 00 00',
);
// fmt size 18 (cbSize 0) and a fact chunk; the 16 data bytes are IEEE 754 binary32 0, 1, -1, 2 little-endian.
const scipyFloat32 = hex(
  '52 49 46 46 42 00 00 00 57 41 56 45 66 6d 74 20 12 00 00 00 03 00 01 00 40 1f 00 00 00 7d 00 00 04 00 20 00 00 00 66 61 63 74 04 00 00 00 04 00 00 00 64 61 74 61 10 00 00 00 ' +
    '00 00 00 00 00 00 80 3f 00 00 80 bf 00 00 00 40',
);

interface Expected {
  sampleRateHz: number;
  dtype: string;
  channels: number;
  samples: number[][];
}
const expected: Record<string, Expected> = JSON.parse(readFileSync(new URL('wav-expected.json', fixtures), 'utf8'));

/** scipy.io.wavfile.read's integer for a decoded full-scale value (24-bit comes back left-justified in int32). */
function asScipyValue(x: number, dtype: string): number {
  if (dtype === 'uint8') return x * 128 + 128;
  if (dtype === 'int16') return x * 32768;
  if (dtype === 'int32') return x * 2147483648;
  return x;
}

describe('decodeWav', () => {
  it('reads the scipy int16, int32 and float32 reference files of check-values §11', () => {
    for (const [bytes, name] of [[scipyInt16, 'int16'], [scipyInt32, 'int32'], [scipyFloat32, 'float32']] as const) {
      expect(Array.from(fixture(`scipy-ref-${name}.wav`)), `fixture scipy-ref-${name}.wav`).toEqual(Array.from(bytes));
    }
    const int16 = decodeWav(scipyInt16);
    expect(int16.sampleRateHz).toBe(8000);
    expect(Array.from(int16.channels[0].samples)).toEqual([0, 1, -1, 2].map((v) => v / 32768));
    expect(int16.channels[0].unit).toBe('FS');
    expect(Array.from(decodeWav(scipyInt32).channels[0].samples)).toEqual([0, 1, -1, 2].map((v) => v / 2 ** 31));
    const float32 = decodeWav(scipyFloat32, { unit: 'g' });
    expect(Array.from(float32.channels[0].samples)).toEqual([0, 1, -1, 2]);
    expect(float32.channels[0].unit).toBe('g');
    expect(float32.metadata.factSampleLength).toBe('4');
  });

  for (const [name, ref] of Object.entries(expected)) {
    it(`gives scipy.io.wavfile.read's values for ${name}`, () => {
      const recording = decodeWav(fixture(name));
      expect(recording.sampleRateHz).toBe(ref.sampleRateHz);
      expect(recording.channels).toHaveLength(ref.channels);
      recording.channels.forEach((channel, c) => {
        expect(Array.from(channel.samples, (x) => asScipyValue(x, ref.dtype))).toEqual(ref.samples[c]);
      });
    });
  }

  it('reports the extensible layout: valid bits and channel mask', () => {
    const r = decodeWav(fixture('extensible-pcm24in32-3ch-10000.wav'));
    expect(r.metadata).toMatchObject({ sampleFormat: 'pcm32', validBitsPerSample: '24', channelMask: '0x00000007' });
    expect(decodeWav(fixture('extensible-float32-2ch-20000.wav')).metadata.sampleFormat).toBe('float32');
  });

  it('skips unknown and odd-sized chunks and keeps LIST/INFO text as metadata', () => {
    const r = decodeWav(fixture('pcm8-odd-chunks-2000.wav'));
    expect(r.channels[0].samples).toHaveLength(21);
    expect(r.metadata['info.INAM']).toBe('Pump 3 DE');
    expect(r.metadata['info.ICMT']).toBe('Recorded on the east line');
    expect(r.metadata.warning).toBeUndefined();
  });

  it('follows a writer that left out the pad byte after an odd-sized chunk', () => {
    // RIFF, then a 3-byte 'junk' chunk with no pad byte, then a plain 8-bit fmt and 2 samples.
    const body = [
      ...'WAVE'.split('').map((c) => c.charCodeAt(0)),
      ...[0x6a, 0x75, 0x6e, 0x6b, 3, 0, 0, 0, 1, 2, 3],
      ...[0x66, 0x6d, 0x74, 0x20, 16, 0, 0, 0, 1, 0, 1, 0, 0x10, 0, 0, 0, 0x10, 0, 0, 0, 1, 0, 8, 0],
      ...[0x64, 0x61, 0x74, 0x61, 2, 0, 0, 0, 0x80, 0xff],
    ];
    const bytes = Uint8Array.from([0x52, 0x49, 0x46, 0x46, body.length, 0, 0, 0, ...body]);
    expect(Array.from(decodeWav(bytes).channels[0].samples)).toEqual([0, 127 / 128]);
  });

  it('accepts the whole frames of a data chunk that runs past the end of the file, with a warning', () => {
    const r = decodeWav(fixture('pcm16-stereo-cut.wav'));
    expect(r.channels[0].samples).toHaveLength(50);
    expect(r.metadata.warning).toMatch(/declares 384 bytes but the file holds 202/);
  });

  it('rejects a header cut anywhere before the data begins', () => {
    const codes = new Set<string | undefined>();
    for (let length = 1; length < 44; length++) codes.add(codeOf(() => decodeWav(scipyInt16.subarray(0, length))));
    expect([...codes]).toEqual(['wav_truncated']);
    expect(codeOf(() => decodeWav(scipyInt16.subarray(0, 44)))).toBe('no_samples');
    expect(codeOf(() => decodeWav(scipyInt16.subarray(0, 45)))).toBe('no_samples');
    expect(decodeWav(scipyInt16.subarray(0, 46)).channels[0].samples).toHaveLength(1);
  });

  it('names the problem in bad files with a stable code', () => {
    const edit = (offset: number, bytes: number[], base = scipyInt16) => {
      const copy = base.slice();
      copy.set(bytes, offset);
      return copy;
    };
    expect(codeOf(() => decodeWav(new Uint8Array()))).toBe('empty_input');
    expect(codeOf(() => decodeWav(new TextEncoder().encode('time,accel\n0,1\n')))).toBe('wav_not_riff');
    expect(codeOf(() => decodeWav(edit(0, [0x52, 0x49, 0x46, 0x58])))).toBe('unsupported_format'); // RIFX
    expect(codeOf(() => decodeWav(edit(20, [0x02, 0x00])))).toBe('unsupported_format'); // ADPCM
    expect(codeOf(() => decodeWav(edit(22, [0, 0])))).toBe('wav_format_invalid'); // 0 channels
    expect(codeOf(() => decodeWav(edit(24, [0, 0, 0, 0])))).toBe('sample_rate_invalid');
    expect(codeOf(() => decodeWav(edit(32, [3, 0])))).toBe('wav_format_invalid'); // block align 3 for 16-bit mono
    expect(codeOf(() => decodeWav(edit(34, [24, 0], scipyFloat32)))).toBe('unsupported_format'); // 24-bit float
    expect(codeOf(() => decodeWav(edit(36, [0x4c, 0x49, 0x53, 0x54])))).toBe('wav_missing_chunk'); // data renamed LIST
    expect(codeOf(() => decodeWav(edit(12, [0x4a, 0x55, 0x4e, 0x4b])))).toBe('wav_missing_chunk'); // fmt renamed JUNK
    expect(codeOf(() => decodeWav(edit(16, [0xff, 0, 0, 0])))).toBe('wav_truncated'); // fmt size past the end
    expect(codeOf(() => decodeWav(edit(16, [14, 0, 0, 0])))).toBe('wav_format_invalid'); // fmt of 14 bytes
  });

  it('rejects NaN and infinite float samples and says where', () => {
    const bad = scipyFloat32.slice();
    bad.set([0x00, 0x00, 0xc0, 0x7f], 58 + 8); // binary32 NaN as the third sample
    const error = (() => {
      try {
        decodeWav(bad);
      } catch (e) {
        return e as SignalInputError;
      }
    })();
    expect(error?.code).toBe('non_finite_sample');
    expect(error?.message).toMatch(/Sample 2 of channel 'ch1' is NaN/);
    expect(error?.where).toBe('byte 66');
  });

  it('checks the limits before allocating', () => {
    const wide = fixture('float32-3ch-51200.wav');
    expect(codeOf(() => decodeWav(wide, { limits: { maxChannels: 2 } }))).toBe('too_large');
    expect(codeOf(() => decodeWav(wide, { limits: { maxSamplesPerChannel: 63 } }))).toBe('too_large');
    expect(codeOf(() => decodeWav(wide, { limits: { maxTotalSamples: 100 } }))).toBe('too_large');
    expect(decodeWav(wide, { limits: { maxSamplesPerChannel: 64 } }).channels[0].samples).toHaveLength(64);
    expect(codeOf(() => decodeWav(wide, { limits: { maxChannels: 0 } }))).toBe('option_invalid');
  });

  it('turns PCM into engineering units with a sensitivity', () => {
    // 16384 counts of 16-bit PCM is half of full scale; behind a 10 V full-scale input that is 5 V, and at
    // 100 mV/g that is 50 g (value = V / sensitivity, common practice for IEPE accelerometers).
    const half = scipyInt16.slice();
    half.set([0x00, 0x40], 46); // second sample 16384
    const mv = decodeWav(half, { sensitivity: { mvPerUnit: 100, fullScaleVolts: 10, unit: 'g' } });
    expect(mv.channels[0].unit).toBe('g');
    expect(mv.channels[0].samples[1]).toBeCloseTo(50, 12);
    const shared = decodeWav(half, { sensitivity: { mvPerUnit: 100, unit: 'g' }, fullScaleVolts: 10 });
    expect(shared.channels[0].samples[1]).toBeCloseTo(50, 12);
    const counts = decodeWav(half, { sensitivity: { countsPerUnit: 1638.4, unit: 'm/s^2' } });
    expect(counts.channels[0].samples[1]).toBeCloseTo(10, 12);
    const range = decodeWav(half, { sensitivity: { fullScaleUnits: 50, unit: 'g' } });
    expect(range.channels[0].samples[1]).toBe(25);
  });

  it('counts valid bits, not container bits, for countsPerUnit', () => {
    const ref = expected['extensible-pcm24in32-3ch-10000.wav'];
    const r = decodeWav(fixture('extensible-pcm24in32-3ch-10000.wav'), { sensitivity: { countsPerUnit: 1000, unit: 'g' } });
    // 24 valid bits left-justified in 32: the 24-bit count is scipy's int32 / 256.
    expect(r.channels[1].samples[5]).toBeCloseTo(ref.samples[1][5] / 256 / 1000, 9);
  });

  it('takes one sensitivity per channel and checks each', () => {
    const stereo = fixture('pcm16-stereo-8000.wav');
    const ref = expected['pcm16-stereo-8000.wav'];
    const r = decodeWav(stereo, {
      sensitivity: [
        { fullScaleUnits: 50, unit: 'g' },
        { fullScaleUnits: 2, unit: 'mm/s' },
      ],
    });
    expect(r.channels.map((c) => c.unit)).toEqual(['g', 'mm/s']);
    expect(r.channels[1].samples[3]).toBe((ref.samples[1][3] / 32768) * 2);
    expect(codeOf(() => decodeWav(stereo, { sensitivity: [{ fullScaleUnits: 50, unit: 'g' }] }))).toBe('sensitivity_invalid');
    expect(codeOf(() => decodeWav(stereo, { sensitivity: { mvPerUnit: 100, unit: 'g' } }))).toBe('sensitivity_invalid');
    expect(codeOf(() => decodeWav(stereo, { sensitivity: { mvPerUnit: -1, fullScaleVolts: 5, unit: 'g' } }))).toBe('sensitivity_invalid');
    expect(codeOf(() => decodeWav(stereo, { sensitivity: { fullScaleUnits: 5, unit: '' } }))).toBe('sensitivity_invalid');
  });

  it('refuses an unknown unit as an option or in a sensitivity, even where PCM would not apply it', () => {
    expect(codeOf(() => decodeWav(scipyInt16, { unit: 'furlongs' }))).toBe('unknown_unit');
    expect(codeOf(() => decodeWav(scipyFloat32, { unit: 'gg' }))).toBe('unknown_unit');
    expect(codeOf(() => decodeWav(scipyInt16, { sensitivity: { fullScaleUnits: 50, unit: 'furlongs' } }))).toBe('unknown_unit');
    expect(decodeWav(scipyFloat32, { unit: 'm/s2' }).channels[0]!.unit).toBe('m/s^2');
  });

  it('warns that a unit without a sensitivity is not applied to PCM', () => {
    const r = decodeWav(scipyInt16, { unit: 'g' });
    expect(r.channels[0].unit).toBe('FS');
    expect(r.metadata.warning).toMatch(/unit 'g' was not applied/);
  });

  it('names channels from the option, else ch1, ch2, ...', () => {
    const stereo = fixture('pcm16-stereo-8000.wav');
    expect(decodeWav(stereo).channels.map((c) => c.name)).toEqual(['ch1', 'ch2']);
    expect(decodeWav(stereo, { channelNames: ['DE-H', 'DE-V'] }).channels.map((c) => c.name)).toEqual(['DE-H', 'DE-V']);
    expect(codeOf(() => decodeWav(stereo, { channelNames: ['DE-H'] }))).toBe('option_invalid');
  });

  it('decodes the same from an unaligned copy of the bytes', () => {
    for (const name of Object.keys(expected)) {
      const bytes = fixture(name);
      const shifted = new Uint8Array(bytes.length + 1);
      shifted.set(bytes, 1);
      expect(decodeWav(shifted.subarray(1)).channels, name).toEqual(decodeWav(bytes).channels);
    }
  });

  it('agrees with the byte-order-independent DataView path on random frames', () => {
    const formats: Array<[WavFormat['sampleFormat'], number]> = [
      ['pcm8', 1],
      ['pcm16', 2],
      ['pcm24', 3],
      ['pcm32', 4],
      ['float32', 4],
      ['float64', 8],
    ];
    fc.assert(
      fc.property(
        fc.constantFrom(...formats),
        fc.integer({ min: 1, max: 4 }),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 0, max: 7 }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.infiniteStream(fc.integer({ min: 0, max: 255 })),
        ([sampleFormat, width], channelCount, frameCount, offset, factor, stream) => {
          const bytes = Uint8Array.from({ length: offset + frameCount * channelCount * width }, () => stream.next().value);
          const format: WavFormat = { sampleFormat, channelCount, sampleRateHz: 1000, blockAlign: width * channelCount, validBits: width * 8, extensible: false };
          const factors = Array.from({ length: channelCount }, (_, c) => (c === 0 ? 1 : factor));
          const fast = decodeWavFrames(bytes, offset, frameCount, format, factors);
          const portable = decodeWavFramesPortable(bytes, offset, frameCount, format, factors);
          fast.forEach((channel, c) =>
            channel.forEach((x, i) => {
              const y = portable[c][i];
              if (Number.isNaN(y)) expect(x).toBeNaN();
              else if (!Number.isFinite(y)) expect(x).toBe(y);
              else expect(Math.abs(x - y)).toBeLessThanOrEqual(Math.abs(y) * 4 * Number.EPSILON);
            }),
          );
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('parseWavFormat', () => {
  it('reads the PCM GUID of an extensible fmt chunk as tag 1 (Microsoft Learn, WAVEFORMATEXTENSIBLE)', () => {
    const bytes = fixture('extensible-pcm16-mono-8000.wav');
    const format = parseWavFormat(new DataView(bytes.buffer, bytes.byteOffset), 20, 40);
    expect(format).toEqual({ sampleFormat: 'pcm16', channelCount: 1, sampleRateHz: 8000, blockAlign: 2, validBits: 16, extensible: true, channelMask: 4 });
  });

  it('rejects a SubFormat GUID that is neither PCM nor IEEE float', () => {
    const bytes = fixture('extensible-pcm16-mono-8000.wav').slice();
    bytes[20 + 24 + 15] = 0x72;
    expect(codeOf(() => parseWavFormat(new DataView(bytes.buffer), 20, 40))).toBe('unsupported_format');
  });
});

describe('decodeWav on random input', () => {
  it('throws nothing but SignalInputError on random bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
        try {
          decodeWav(bytes);
        } catch (error) {
          expect(error).toBeInstanceOf(SignalInputError);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('throws nothing but SignalInputError on valid files with random bytes changed or cut', () => {
    const files = Object.keys(expected).map(fixture);
    fc.assert(
      fc.property(
        fc.constantFrom(...files),
        fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 6 }),
        fc.nat(),
        (file, edits, cut) => {
          const bytes = file.slice(0, file.length - (cut % 8));
          for (const [at, value] of edits) bytes[at % Math.min(bytes.length, 80)] = value;
          try {
            const r = decodeWav(bytes);
            for (const c of r.channels) expect(c.samples.every((x) => Number.isFinite(x))).toBe(true);
          } catch (error) {
            expect(error).toBeInstanceOf(SignalInputError);
          }
        },
      ),
      { numRuns: 3000 },
    );
  });
});
