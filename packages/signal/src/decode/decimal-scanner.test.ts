import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DecimalScanner } from './decimal-scanner.js';

// The reference is ECMAScript's Number(string) (ECMA-262, StringToNumber), which rounds decimal strings
// correctly; the scanner must give the identical double (Object.is, so -0 counts) for every string it accepts.
const scanner = new DecimalScanner();
const ascii = (text: string) => new TextEncoder().encode(text);
function scanAll(text: string): number | undefined {
  const value = scanner.scan(ascii(text), 0, text.length);
  return scanner.end > 0 && scanner.end === text.length ? value : undefined;
}

describe('DecimalScanner.scan', () => {
  it('reads the forms a CSV file uses', () => {
    const cases = [
      '0', '-0', '+7', '12', '3.', '.5', '-.5', '1.250', '1e5', '1E-5', '+1.5e+3', '007.50', '2.5e-308', '1.7976931348623157e308',
      // numpy.savetxt's default '%.18e', and 2^53 + 1, a tie that rounds to even.
      '3.906250000000000081e-05', '-1.976506442932850216e-02', '9007199254740993', '9007199254740995', '1.0000000000000000000e+00',
    ];
    for (const text of cases) expect(Object.is(scanAll(text), Number(text)), text).toBe(true);
  });

  it('rejects what is not a decimal number', () => {
    for (const text of ['', '-', '+', '.', 'e5', '1e', '1e+', '--1', 'abc', '.e1']) expect(scanAll(text), text).toBeUndefined();
  });

  it('stops at the first character after the number', () => {
    const text = ' 12.5;3';
    expect(scanner.scan(ascii(text), 1, text.length)).toBe(12.5);
    expect(scanner.end).toBe(5);
    expect(scanner.scan(ascii('1.5g'), 0, 4)).toBe(1.5);
    expect(scanner.end).toBe(3);
  });

  it('respects the limit it is given', () => {
    expect(scanner.scan(ascii('123456'), 0, 3)).toBe(123);
    expect(scanner.end).toBe(3);
  });

  it('equals Number() on shortest round-trip strings of random doubles', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const text = x.toString();
        expect(Object.is(scanAll(text), Number(text))).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it('equals Number() on toExponential, toFixed and toPrecision strings', () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e21, max: 1e21 }),
        fc.integer({ min: 0, max: 20 }),
        fc.integer({ min: 1, max: 21 }),
        (x, digits, precision) => {
          for (const text of [x.toExponential(digits), x.toFixed(digits), x.toPrecision(precision)]) {
            expect(Object.is(scanAll(text), Number(text)), text).toBe(true);
          }
        },
      ),
      { numRuns: 3000 },
    );
  });

  it('equals Number() on random digit strings, long mantissas and far exponents included', () => {
    const decimal = fc
      .tuple(
        fc.constantFrom('', '-', '+'),
        fc.stringMatching(/^\d{0,25}$/),
        fc.option(fc.stringMatching(/^\d{0,25}$/)),
        fc.option(fc.tuple(fc.constantFrom('e', 'E'), fc.constantFrom('', '-', '+'), fc.integer({ min: 0, max: 400 }))),
      )
      .map(([sign, int, frac, exp]) => `${sign}${int}${frac === null ? '' : `.${frac}`}${exp === null ? '' : `${exp[0]}${exp[1]}${exp[2]}`}`);
    fc.assert(
      fc.property(decimal, (text) => {
        const expected = Number(text);
        const got = scanAll(text);
        const hasDigit = /\d/.test(text.split(/[eE]/)[0]);
        if (hasDigit) expect(Object.is(got, expected), text).toBe(true);
        else expect(got, text).toBeUndefined();
      }),
      { numRuns: 5000 },
    );
  });

  it('equals Number() on 17 to 19-digit strings just below, at and just above rounding midpoints', () => {
    // The midpoint between a double and the next one up is (2m + 1) * 2^(e - 1); BigInt gives its exact decimal.
    const view = new DataView(new ArrayBuffer(8));
    const midpointDigits = (x: number): [string, number] => {
      view.setFloat64(0, x);
      const high = view.getUint32(0);
      const exponentBits = (high >>> 20) & 0x7ff;
      const mantissa = (BigInt(high & 0xfffff) << 32n) | BigInt(view.getUint32(4)) | (1n << 52n);
      const e2 = exponentBits - 1075 - 1;
      const m = 2n * mantissa + 1n;
      return e2 >= 0 ? [(m << BigInt(e2)).toString(), 0] : [(m * 5n ** BigInt(-e2)).toString(), e2];
    };
    fc.assert(
      fc.property(fc.double({ min: 1e-40, max: 1e40, noNaN: true }), fc.integer({ min: 16, max: 19 }), fc.constantFrom(-1, 0, 1), (x, n, nudge) => {
        const [digits, exponent10] = midpointDigits(x);
        let kept = BigInt(digits.slice(0, n));
        if (digits.length > n || nudge !== 0) kept += BigInt(nudge);
        const text = `${kept}e${exponent10 + Math.max(0, digits.length - n)}`;
        expect(Object.is(scanAll(text), Number(text)), text).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it('records the decimal exponent of the last written digit', () => {
    scanAll('1.250');
    expect(scanner.lastDigitExponent).toBe(-3);
    scanAll('7e2');
    expect(scanner.lastDigitExponent).toBe(2);
    scanAll('3.90625e-05');
    expect(scanner.lastDigitExponent).toBe(-10);
    scanAll('0');
    expect(scanner.lastDigitExponent).toBe(-400);
    scanAll('0.000');
    expect(scanner.lastDigitExponent).toBe(-3);
  });
});
