import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { decodeCsv, type CsvDecodeOptions } from './csv-decoder.js';
import { recordingWarnings } from './recording-parts.js';

const fixtures = new URL('../../../../fixtures/decode/', import.meta.url);
interface Expected {
  sampleRateHz: number;
  names: string[];
  samples: number[][];
}
const expected: Record<string, Expected> = JSON.parse(readFileSync(new URL('csv-expected.json', fixtures), 'utf8'));

function errorOf(run: () => unknown): SignalInputError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SignalInputError);
    return error as SignalInputError;
  }
  throw new Error('expected a SignalInputError');
}

const values = (text: string, options?: CsvDecodeOptions) => decodeCsv(text, options).channels.map((c) => Array.from(c.samples));

describe('decodeCsv', () => {
  // Reference values: numpy.loadtxt on files written by numpy.savetxt (fixtures/decode/make_csv_fixtures.py).
  const options: Record<string, CsvDecodeOptions> = { 'time-ms-tab-crlf.csv': { timeColumn: 0, timeUnit: 'ms' } };
  for (const [name, ref] of Object.entries(expected)) {
    it(`gives numpy.loadtxt's values and the stated sample rate for ${name}`, () => {
      const r = decodeCsv(new Uint8Array(readFileSync(new URL(name, fixtures))), options[name]);
      expect(r.sampleRateHz).toBe(ref.sampleRateHz);
      expect(r.channels.map((c) => c.name)).toEqual(ref.names);
      r.channels.forEach((c, k) => expect(Array.from(c.samples)).toEqual(ref.samples[k]));
    });
  }

  it('takes units from header brackets and comments, metadata from # key=value lines', () => {
    const fromHeader = decodeCsv(readFileSync(new URL('time-18e-comma.csv', fixtures), 'utf8'));
    expect(fromHeader.channels.map((c) => c.unit)).toEqual(['g', 'g']);
    expect(fromHeader.metadata.timeColumn).toBe('time_s');
    const fromComments = decodeCsv(readFileSync(new URL('comments-fixed-semicolon.csv', fixtures), 'utf8'));
    expect(fromComments.channels.map((c) => c.unit)).toEqual(['mm/s', 'mm/s']);
    expect(fromComments.metadata).toMatchObject({ sampleRateHz: '2000', unit: 'mm/s', machine: 'feed pump 3', sourceFormat: 'csv' });
  });

  it('refuses a unit it does not know, from a header, a comment or the option, naming where and listing the accepted ones', () => {
    const header = errorOf(() => decodeCsv('DE-H [gg],DE-V [g]\n1,2\n3,4\n', { sampleRateHz: 100 }));
    expect(header.code).toBe('unknown_unit');
    expect(header.where).toBe('line 1');
    expect(header.message).toMatch(/^column 'DE-H': 'gg' is not a unit Kinespec knows \(did you mean 'g'\?\); accepted: g, m\/s\^2/);
    const comment = errorOf(() => decodeCsv('# sampleRateHz=100\n# unit=furlongs\n1\n2\n'));
    expect([comment.code, comment.where]).toEqual(['unknown_unit', 'line 2']);
    expect(errorOf(() => decodeCsv('1\n2\n', { sampleRateHz: 100, unit: 'furlongs' })).code).toBe('unknown_unit');
  });

  it('writes units in their canonical spelling, and lets the unit option win over an unknown header unit with a warning', () => {
    expect(decodeCsv('a [m/s2]\n1\n2\n', { sampleRateHz: 10 }).channels[0]!.unit).toBe('m/s^2');
    const r = decodeCsv('a [gg]\n1\n2\n', { sampleRateHz: 10, unit: 'g' });
    expect(r.channels[0]!.unit).toBe('g');
    expect(r.metadata.warning).toBe("column 'a' says unit 'gg' but 'g' was used");
    expect(decodeCsv('a [m/s2]\n1\n2\n', { sampleRateHz: 10, unit: 'm/s^2' }).metadata.warning).toBeUndefined();
  });

  it('warns about a mistyped comment key with the key it probably meant, and lists keys it keeps but does not read', () => {
    const r = decodeCsv('# sampleRateHz=100\n# unti=g\n# operator=J. Ames\n# site=mill 2\n1\n2\n');
    expect(r.channels[0]!.unit).toBe('unknown');
    expect(r.metadata.warning).toBe(
      "line 2: '# unti=' is not a key Kinespec reads (did you mean 'unit'?), kept as metadata only; " +
        'comment keys kept as metadata only, not read by Kinespec: operator, site',
    );
    expect(r.metadata).toMatchObject({ unti: 'g', operator: 'J. Ames' });
    expect(recordingWarnings(r.metadata)).toHaveLength(2);
    expect(decodeCsv('# sample_rate=100\n# recorded_at=2025-01-01\n1\n2\n').metadata.warning).toBeUndefined();
  });

  it('reads a single column without header given the sample rate', () => {
    const r = decodeCsv('0.5\n-1.25\n3e-3\n', { sampleRateHz: 1000, unit: 'g' });
    expect(r.sampleRateHz).toBe(1000);
    expect(r.channels).toEqual([{ name: 'ch1', unit: 'g', samples: Float64Array.from([0.5, -1.25, 0.003]) }]);
  });

  it('detects comma, semicolon and tab, and follows a sep= line', () => {
    expect(values('a,b\n1,2\n3,4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('a;b\n1;2\n3;4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('a\tb\n1\t2\n3\t4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('sep=;\n1;2\n3;4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('1|2\n3|4'.replace(/\|/g, ','), { sampleRateHz: 1, separator: ',' })).toEqual([[1, 3], [2, 4]]);
  });

  it('takes channel names from a # channels= comment when there is no header', () => {
    const r = decodeCsv('# fs=100\n# channels=DE-H, DE-V\n1,2\n3,4\n');
    expect(r.sampleRateHz).toBe(100);
    expect(r.channels.map((c) => c.name)).toEqual(['DE-H', 'DE-V']);
  });

  it('handles CRLF, lone CR, blank lines, spaces, quotes, a BOM and a trailing separator', () => {
    expect(values('\ufeff"a" , "b"\r\n 1 , 2 \r\n\r\n3,4\r\n', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('a,b\r1,2\r3,4\r', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('a,b,\n1,2,\n3,4,\n', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('a,b\n"1","2"\n3,4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
    expect(values('# note\na,b\n1,2\n# mid-file comment\n3,4', { sampleRateHz: 1 })).toEqual([[1, 3], [2, 4]]);
  });

  it('reads UTF-16 text with a byte-order mark', () => {
    const text = 'a;b\r\n1;2\r\n';
    const bytes = new Uint8Array(2 + text.length * 2);
    bytes.set([0xff, 0xfe]);
    for (let i = 0; i < text.length; i++) bytes[2 + 2 * i] = text.charCodeAt(i);
    expect(values(bytes as unknown as string, { sampleRateHz: 1 })).toEqual([[1], [2]]);
  });

  it('derives the sample rate from a time column and drops that column', () => {
    const lines = ['t,x'];
    for (let i = 0; i < 100; i++) lines.push(`${(i / 2560).toFixed(6)},${i}`);
    const r = decodeCsv(lines.join('\n'));
    // Times written to 1 us cannot tell 2560 Hz from its neighbours, so the rate snaps to the whole number.
    expect(r.sampleRateHz).toBe(2560);
    expect(r.channels.map((c) => c.name)).toEqual(['x']);
  });

  it('derives a non-integer rate when the times resolve it', () => {
    const lines = ['time (s),x'];
    for (let i = 0; i < 50; i++) lines.push(`${String(i / 1234.5)},${i}`);
    expect(decodeCsv(lines.join('\n')).sampleRateHz).toBeCloseTo(1234.5, 9);
  });

  it('recognises time in ms from the header and takes timeColumn by name or index', () => {
    expect(decodeCsv('time_ms,a\n0,1\n0.5,2\n1,3\n').sampleRateHz).toBe(2000);
    expect(decodeCsv('time [ms],a\n0,1\n0.5,2\n1,3\n').sampleRateHz).toBe(2000);
    expect(decodeCsv('when,a\n0,1\n0.5,2\n1,3\n', { timeColumn: 'when' }).sampleRateHz).toBe(2);
    expect(decodeCsv('0,1\n0.5,2\n1,3\n', { timeColumn: 0 }).sampleRateHz).toBe(2);
    const kept = decodeCsv('time,a\n0,1\n0.5,2\n1,3\n', { timeColumn: false, sampleRateHz: 10 });
    expect(kept.channels.map((c) => c.name)).toEqual(['time', 'a']);
  });

  it('rejects uneven time steps and names the line', () => {
    const lines = ['time_s,x'];
    // One sample missing after line 13: times written to 1 us at 1 kHz.
    for (let i = 0; i < 20; i++) lines.push(`${((i < 12 ? i : i + 1) / 1000).toFixed(6)},${i}`);
    const error = errorOf(() => decodeCsv(lines.join('\n')));
    expect(error.code).toBe('csv_uneven_time');
    expect(error.where).toBe('line 14');
    expect(error.message).toMatch(/uneven: line 14 comes 0.00200000 s after/);
  });

  it('tolerates a time step 0.4 % off the mean, and rejects one 2 % off (tolerance 0.5 % + resolution)', () => {
    const times = (late: number) => {
      const lines = ['t,x'];
      for (let i = 0; i < 10; i++) lines.push(`${(i * 0.001 + (i === 5 ? late : 0)).toFixed(7)},${i}`);
      return lines.join('\n');
    };
    expect(decodeCsv(times(0.000004)).channels[0].samples).toHaveLength(10);
    expect(errorOf(() => decodeCsv(times(0.00002))).code).toBe('csv_uneven_time');
  });

  it('rejects time that goes backwards or has too few rows', () => {
    expect(errorOf(() => decodeCsv('t,x\n0,1\n0.1,2\n0.1,3\n0.3,4\n')).where).toBe('line 4');
    expect(errorOf(() => decodeCsv('t,x\n0,1\n0.1,2\n0.1,3\n0.3,4\n')).code).toBe('csv_time_invalid');
    expect(errorOf(() => decodeCsv('t,x\n0,1\n')).code).toBe('csv_time_invalid');
    expect(errorOf(() => decodeCsv('time [h],x\n0,1\n1,2\n')).code).toBe('csv_time_invalid');
  });

  it('warns when the time column and a sample-rate comment disagree', () => {
    const r = decodeCsv('# sampleRateHz=1000\nt,x\n0,1\n0.002,2\n0.004,3\n');
    expect(r.sampleRateHz).toBe(500);
    expect(r.metadata.warning).toMatch(/comment on line 1 gives 1000 Hz/);
    const o = decodeCsv('# sampleRateHz=1000\nx\n1\n2\n', { sampleRateHz: 2000 });
    expect(o.sampleRateHz).toBe(2000);
    expect(o.metadata.warning).toMatch(/gives 1000 Hz but sampleRateHz 2000 was used/);
  });

  it('names line and column of a cell that is not a number', () => {
    const error = errorOf(() => decodeCsv('a,b\n1,2\n3,x7\n', { sampleRateHz: 1 }));
    expect(error).toMatchObject({ code: 'csv_non_numeric', where: 'line 3, column 2' });
    expect(error.message).toMatch(/Line 3, column 2 \('b'\) holds 'x7'/);
    expect(errorOf(() => decodeCsv('a;b\n1;2,5\n', { sampleRateHz: 1 })).message).toMatch(/decimal comma/);
    expect(errorOf(() => decodeCsv('a,b\n1,\n', { sampleRateHz: 1 })).message).toMatch(/is empty/);
  });

  it('names the line whose cell count differs', () => {
    const fewer = errorOf(() => decodeCsv('a,b,c\n1,2,3\n4,5\n', { sampleRateHz: 1 }));
    expect(fewer).toMatchObject({ code: 'csv_column_count', where: 'line 3' });
    expect(fewer.message).toMatch(/Line 3 has 2 cells but line 1 \(the header\) has 3/);
    const more = errorOf(() => decodeCsv('1,2\n3,4,5\n', { sampleRateHz: 1 }));
    expect(more.message).toMatch(/Line 2 has 3 cells but line 1 has 2/);
  });

  it('rejects NaN, infinities and overflowing numbers', () => {
    for (const cell of ['NaN', 'nan', 'inf', '-Infinity', '1e400']) {
      const error = errorOf(() => decodeCsv(`a,b\n1,2\n3,${cell}\n`, { sampleRateHz: 1 }));
      expect(error, cell).toMatchObject({ code: 'non_finite_sample', where: 'line 3, column 2' });
    }
  });

  it('rejects empty input, comment-only input, a header without rows and a missing sample rate', () => {
    expect(errorOf(() => decodeCsv('')).code).toBe('empty_input');
    expect(errorOf(() => decodeCsv(' \n\n')).code).toBe('empty_input');
    expect(errorOf(() => decodeCsv('# sampleRateHz=100\n')).code).toBe('empty_input');
    expect(errorOf(() => decodeCsv('a,b\n', { sampleRateHz: 1 })).code).toBe('no_samples');
    expect(errorOf(() => decodeCsv('time\n0\n1\n')).code).toBe('no_samples');
    expect(errorOf(() => decodeCsv('1\n2\n')).code).toBe('sample_rate_invalid');
    expect(errorOf(() => decodeCsv('1\n2\n', { sampleRateHz: 0 })).code).toBe('sample_rate_invalid');
    expect(errorOf(() => decodeCsv('# sampleRateHz=-5\n1\n2\n')).code).toBe('sample_rate_invalid');
  });

  it('rejects bad options naming the option', () => {
    expect(errorOf(() => decodeCsv('a,b\n1,2\n', { timeColumn: 'time' })).message).toMatch(/timeColumn 'time' is not in the header/);
    expect(errorOf(() => decodeCsv('1,2\n', { timeColumn: 5 })).code).toBe('option_invalid');
    expect(errorOf(() => decodeCsv('1,2\n', { sampleRateHz: 1, channelNames: ['x'] })).code).toBe('option_invalid');
    expect(errorOf(() => decodeCsv('1,2\n', { separator: '|' as ',' })).code).toBe('option_invalid');
  });

  it('stops at the limits with too_large', () => {
    const many = Array.from({ length: 100 }, (_, i) => String(i)).join('\n');
    expect(errorOf(() => decodeCsv(many, { sampleRateHz: 1, limits: { maxSamplesPerChannel: 99 } })).code).toBe('too_large');
    expect(decodeCsv(many, { sampleRateHz: 1, limits: { maxSamplesPerChannel: 100 } }).channels[0].samples).toHaveLength(100);
    expect(errorOf(() => decodeCsv('1,2,3\n', { sampleRateHz: 1, limits: { maxChannels: 2 } })).code).toBe('too_large');
  });

  it('reads random tables written with toString, toExponential and toFixed exactly as Number() would', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 4 }),
        fc.array(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }), { minLength: 1, maxLength: 60 }),
        fc.constantFrom(',', ';', '\t'),
        fc.constantFrom('\n', '\r\n'),
        fc.constantFrom('toString', 'toExponential', 'toFixed'),
        (columns, flat, separator, newline, style) => {
          const rows = Math.max(1, Math.floor(flat.length / columns));
          const format = (x: number) => (style === 'toString' ? String(x) : style === 'toExponential' ? x.toExponential(12) : x.toFixed(9));
          const lines = [];
          for (let r = 0; r < rows; r++) lines.push(Array.from({ length: columns }, (_, c) => format(flat[(r * columns + c) % flat.length])).join(separator));
          const r = decodeCsv(lines.join(newline), { sampleRateHz: 100, header: false });
          expect(r.channels).toHaveLength(columns);
          r.channels.forEach((channel, c) =>
            channel.samples.forEach((x, row) => expect(Object.is(x, Number(format(flat[(row * columns + c) % flat.length])))).toBe(true)),
          );
        },
      ),
      { numRuns: 500 },
    );
  });

  it('throws nothing but SignalInputError on random text', () => {
    const alphabet = fc.constantFrom(...'0123456789.,;\t\n\r -+eE#="abc:tim_s[]()'.split(''));
    fc.assert(
      fc.property(fc.array(alphabet, { maxLength: 120 }).map((a) => a.join('')), fc.boolean(), (text, withRate) => {
        try {
          const r = decodeCsv(text, withRate ? { sampleRateHz: 10 } : {});
          for (const c of r.channels) expect(c.samples.every((x) => Number.isFinite(x))).toBe(true);
          expect(r.sampleRateHz).toBeGreaterThan(0);
        } catch (error) {
          expect(error).toBeInstanceOf(SignalInputError);
        }
      }),
      { numRuns: 3000 },
    );
  });

  it('throws nothing but SignalInputError on random bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
        try {
          decodeCsv(bytes, { sampleRateHz: 10 });
        } catch (error) {
          expect(error).toBeInstanceOf(SignalInputError);
        }
      }),
      { numRuns: 2000 },
    );
  });
});
