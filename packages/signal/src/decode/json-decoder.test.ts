import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { decodeJsonRecording } from './json-decoder.js';

function errorOf(run: () => unknown): SignalInputError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SignalInputError);
    return error as SignalInputError;
  }
  throw new Error('expected a SignalInputError');
}

const doc = {
  sampleRateHz: 25600,
  unit: 'g',
  channels: [
    { name: 'DE-H', samples: [0.5, -0.25, 1e-3] },
    { name: 'DE-V', samples: [1, 2, 3], unit: 'mm/s' },
  ],
  machine: 'feed pump 3',
  speedRpm: 1480,
  metadata: { site: 'east line' },
};

describe('decodeJsonRecording', () => {
  it('reads the recording shape from a string, bytes or an object', () => {
    for (const input of [JSON.stringify(doc), new TextEncoder().encode(JSON.stringify(doc)), doc]) {
      const r = decodeJsonRecording(input);
      expect(r.sampleRateHz).toBe(25600);
      expect(r.channels).toEqual([
        { name: 'DE-H', unit: 'g', samples: Float64Array.from([0.5, -0.25, 1e-3]) },
        { name: 'DE-V', unit: 'mm/s', samples: Float64Array.from([1, 2, 3]) },
      ]);
      expect(r.metadata).toEqual({ machine: 'feed pump 3', speedRpm: '1480', site: 'east line', sourceFormat: 'json' });
    }
  });

  it('refuses an unknown unit in the document or the option, with the JSON path and the accepted units', () => {
    const top = errorOf(() => decodeJsonRecording({ sampleRateHz: 100, unit: 'furlongs', channels: [{ samples: [1, 2] }] }));
    expect([top.code, top.where]).toEqual(['unknown_unit', '$.unit']);
    expect(top.message).toMatch(/^channel 1 \('ch1'\): 'furlongs' is not a unit Kinespec knows; accepted: g, /);
    const own = errorOf(() => decodeJsonRecording({ sampleRateHz: 100, channels: [{ samples: [1] }, { samples: [2], unit: 'gg' }] }));
    expect([own.code, own.where]).toEqual(['unknown_unit', '$.channels[1].unit']);
    expect(errorOf(() => decodeJsonRecording(doc, { unit: 'furlongs' })).code).toBe('unknown_unit');
  });

  it('fills in names and units the document leaves out, and lets options override with a warning', () => {
    const r = decodeJsonRecording({ sampleRateHz: 100, channels: [{ samples: [1] }, { samples: [2] }] });
    expect(r.channels.map((c) => [c.name, c.unit])).toEqual([
      ['ch1', 'unknown'],
      ['ch2', 'unknown'],
    ]);
    const o = decodeJsonRecording(doc, { unit: 'm/s^2', sampleRateHz: 51200, channelNames: ['a', 'b'] });
    expect(o.sampleRateHz).toBe(51200);
    expect(o.channels.map((c) => [c.name, c.unit])).toEqual([
      ['a', 'm/s^2'],
      ['b', 'm/s^2'],
    ]);
    expect(o.metadata.warning).toMatch(/sampleRateHz 25600 but 51200 was used/);
  });

  it('names the path of what is wrong', () => {
    expect(errorOf(() => decodeJsonRecording('{"sampleRateHz": 1, ')).code).toBe('json_syntax');
    expect(errorOf(() => decodeJsonRecording('')).code).toBe('empty_input');
    expect(errorOf(() => decodeJsonRecording('[1,2]')).code).toBe('json_schema');
    expect(errorOf(() => decodeJsonRecording({ channels: [{ samples: [1] }] })).code).toBe('sample_rate_invalid');
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: -5, channels: [{ samples: [1] }] })).code).toBe('sample_rate_invalid');
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: {} }))).toMatchObject({ code: 'json_schema', where: '$.channels' });
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [] })).code).toBe('no_samples');
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [{ samples: [] }] })).code).toBe('no_samples');
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [{ samples: [1, '2'] }] }))).toMatchObject({
      code: 'json_schema',
      where: '$.channels[0].samples[1]',
    });
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [{ name: 3, samples: [1] }] })).where).toBe('$.channels[0].name');
    expect(
      errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [{ samples: [1, 2] }, { samples: [1] }] })),
    ).toMatchObject({ code: 'channel_length_mismatch', where: '$.channels[1].samples' });
  });

  it('rejects the null that JSON.stringify writes for NaN and Infinity', () => {
    const text = JSON.stringify({ sampleRateHz: 10, channels: [{ samples: [1, NaN, 3] }] });
    expect(errorOf(() => decodeJsonRecording(text))).toMatchObject({ code: 'non_finite_sample', where: '$.channels[0].samples[1]' });
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 10, channels: [{ samples: [Infinity] }] })).code).toBe('non_finite_sample');
  });

  it('describes values a JSON text cannot hold when an object is handed in', () => {
    const cyclic: Record<string, unknown> = {};
    cyclic.self = cyclic;
    const r = decodeJsonRecording({ sampleRateHz: 1, channels: [{ samples: [1] }], cyclic });
    expect(r.metadata.cyclic).toBe('[object Object]');
    expect(errorOf(() => decodeJsonRecording({ sampleRateHz: 1, channels: [{ samples: [1n] }] })).message).toMatch(/must be a number, not 1/);
  });

  it('checks the limits', () => {
    const wide = { sampleRateHz: 1, channels: Array.from({ length: 3 }, () => ({ samples: [1, 2] })) };
    expect(errorOf(() => decodeJsonRecording(wide, { limits: { maxChannels: 2 } })).code).toBe('too_large');
    expect(errorOf(() => decodeJsonRecording(wide, { limits: { maxSamplesPerChannel: 1 } })).code).toBe('too_large');
  });

  it('round-trips random recordings through JSON.stringify', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e6, noNaN: true }),
        fc.array(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 3, maxLength: 3 }), { minLength: 1, maxLength: 5 }),
        (sampleRateHz, channels) => {
          const text = JSON.stringify({ sampleRateHz, unit: 'g', channels: channels.map((samples, c) => ({ name: `p${c}`, samples })) });
          const r = decodeJsonRecording(text);
          expect(r.sampleRateHz).toBe(sampleRateHz);
          // JSON has no -0: JSON.stringify(-0) is "0".
          r.channels.forEach((ch, c) => expect(Array.from(ch.samples)).toEqual(channels[c].map((x) => (x === 0 ? 0 : x))));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('throws nothing but SignalInputError on random JSON values and strings', () => {
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue(), fc.string()), (value) => {
        try {
          decodeJsonRecording(typeof value === 'string' ? value : JSON.stringify(value));
        } catch (error) {
          expect(error).toBeInstanceOf(SignalInputError);
        }
      }),
      { numRuns: 2000 },
    );
  });
});
