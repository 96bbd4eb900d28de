import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CliError } from './cli-error.js';
import { numberFlag, oneOf, parseBand, parseFlags, positiveNumber, wholeNumber } from './flags.js';

/** The CliError message a call throws, or undefined when it does not throw one. */
function messageOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    if (err instanceof CliError) return err.message;
    throw err;
  }
  return undefined;
}

// plain decimals as a user types them: whole part and up to three decimals, no sign or exponent
const decimal = fc.tuple(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 0, max: 999 })).map(([w, f]) => `${w}.${String(f).padStart(3, '0')}`);

describe('parseBand', () => {
  it('reads every LOW-HIGH pair of plain decimals with LOW < HIGH, spaces allowed around the dash', () => {
    fc.assert(
      fc.property(decimal, decimal, fc.constantFrom('', ' '), (a, b, space) => {
        fc.pre(Number(a) !== Number(b));
        const [lo, hi] = Number(a) < Number(b) ? [a, b] : [b, a];
        expect(parseBand('band', `${lo}${space}-${space}${hi}`)).toEqual([Number(lo), Number(hi)]);
      }),
    );
  });

  it('refuses a reversed or empty band with a message naming the flag and the text', () => {
    fc.assert(
      fc.property(decimal, decimal, (a, b) => {
        const [lo, hi] = Number(a) <= Number(b) ? [a, b] : [b, a];
        expect(messageOf(() => parseBand('envelope', `${hi}-${lo}`))).toMatch(/^--envelope must be LOW-HIGH in Hz with LOW < HIGH/);
      }),
    );
    for (const text of ['10-', '-10', '10', 'a-b', '1e1-100', '-5-10', '']) {
      expect(messageOf(() => parseBand('band', text))).toBe(`--band must be LOW-HIGH in Hz with LOW < HIGH, e.g. 10-1000 (got '${text}')`);
    }
  });

  it('gives undefined when the flag is absent', () => {
    expect(parseBand('band', undefined)).toBeUndefined();
  });
});

describe('numberFlag', () => {
  it('refuses blank text instead of reading it as 0, and non-finite numbers', () => {
    for (const text of ['', ' ', 'Infinity', 'NaN', 'abc']) {
      expect(messageOf(() => numberFlag('ripple', text, (v) => v >= 0, 'a number >= 0'))).toBe(`--ripple must be a number >= 0 (got '${text}')`);
    }
  });

  it('returns the number when the test passes', () => {
    // -0 prints as '0', so it cannot come back from its own text
    fc.assert(fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }).filter((x) => !Object.is(x, -0)), (x) => {
      expect(numberFlag('x', String(x), () => true, 'anything')).toBe(x);
    }));
  });
});

describe('positiveNumber', () => {
  it('takes numbers > 0 and refuses 0 and negatives, naming the flag', () => {
    fc.assert(fc.property(fc.double({ min: Number.MIN_VALUE, max: 1e12, noNaN: true }), (x) => {
      expect(positiveNumber('speed-rpm', String(x))).toBe(x);
      expect(messageOf(() => positiveNumber('speed-rpm', String(-x)))).toBe(`--speed-rpm must be a number > 0 (got '${-x}')`);
    }));
    expect(messageOf(() => positiveNumber('max-order', '0', 'an order > 0'))).toBe("--max-order must be an order > 0 (got '0')");
  });
});

describe('wholeNumber', () => {
  it('takes whole numbers from min up and refuses fractions and smaller numbers', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 20 }), fc.integer({ min: 0, max: 1_000_000 }), (min, k) => {
      expect(wholeNumber('harmonics', String(min + k), min)).toBe(min + k);
      expect(messageOf(() => wholeNumber('harmonics', String(min + k + 0.5), min))).toBe(`--harmonics must be a whole number >= ${min} (got '${min + k + 0.5}')`);
      if (min > 0) expect(messageOf(() => wholeNumber('harmonics', String(min - 1), min))).toMatch(/^--harmonics must be a whole number >= /);
    }));
  });
});

describe('oneOf', () => {
  it('returns an allowed word, the fallback when absent, and lists the words otherwise', () => {
    const scalings = ['peak', 'rms', 'psd'] as const;
    expect(oneOf('scaling', 'psd', scalings, 'rms')).toBe('psd');
    expect(oneOf('scaling', undefined, scalings, 'rms')).toBe('rms');
    expect(oneOf('scaling', undefined, scalings)).toBeUndefined();
    expect(messageOf(() => oneOf('scaling', 'PSD', scalings))).toBe("--scaling must be one of peak, rms, psd (got 'PSD')");
  });
});

describe('parseFlags', () => {
  it('returns values and positionals, and turns a parse failure into one line ending in the usage', () => {
    const options = { json: { type: 'boolean' }, band: { type: 'string' } } as const;
    const parsed = parseFlags(['a.wav', '--band', '10-20', '--json'], options, 'kinespec x <file>');
    expect(parsed.positionals).toEqual(['a.wav']);
    expect(parsed.values).toEqual({ band: '10-20', json: true });
    const message = messageOf(() => parseFlags(['--colour', 'red'], options, 'kinespec x <file>'));
    expect(message).toMatch(/^Unknown option '--colour'.* \(usage: kinespec x <file>\)$/);
    expect(message!.split('\n')).toHaveLength(1);
  });
});

describe('renamed flags', () => {
  it('answers a flag that was renamed with its new name, in the one-line usage error', () => {
    expect(messageOf(() => parseFlags(['a.wav', '--sample-rate', '1000'], { 'sample-rate-hz': { type: 'string' } }, 'kinespec x <file>'))).toBe(
      '--sample-rate is now --sample-rate-hz (usage: kinespec x <file>)',
    );
    expect(messageOf(() => parseFlags(['--sample-rate=1000'], { 'sample-rate-hz': { type: 'string' } }, 'u'))).toBe('--sample-rate is now --sample-rate-hz (usage: u)');
  });
});
