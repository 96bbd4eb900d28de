// Exact powers of ten: 10^22 is the largest power of ten a double holds exactly (5^22 < 2^53).
const exactPowersOfTen = [
  1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20,
  1e21, 1e22,
];
const twoTo53 = 9007199254740992;

/**
 * Reads decimal numbers (`-12`, `3.`, `.5`, `1.25e-3`, `+7E+2`) straight from ASCII/UTF-8 bytes, without
 * making strings: the CSV decoder's hot loop. The result is the same double `Number()` gives.
 *
 * Clinger's fast path (W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990):
 * when the decimal mantissa is an integer below 2^53 and |exponent| <= 22, both operands are exact
 * doubles and one IEEE multiplication or division rounds correctly. Anything else (more than 16
 * significant digits, far exponents) is handed to `Number()` on the slice.
 */
export class DecimalScanner {
  /** Index just past the number read by the last `scan`; equal to its `start` when no number was read. */
  end = 0;
  /**
   * Decimal exponent of the last written digit: -3 for "1.250", 2 for "7e2", so the value was written to a
   * resolution of 10^this (-400, i.e. exact, for a bare "0"); clamped to [-400, 400].
   */
  lastDigitExponent = 0;

  /** Reads one number starting at `start` (no leading spaces) and not past `limit`; NaN when there is none. */
  scan(bytes: Uint8Array, start: number, limit: number): number {
    let i = start;
    let c = i < limit ? bytes[i] : -1;
    let negative = false;
    if (c === 45 || c === 43) {
      negative = c === 45;
      c = ++i < limit ? bytes[i] : -1;
    }
    let mantissa = 0;
    let significantDigits = 0;
    let fractionDigits = 0;
    let anyDigit = false;
    while (c >= 48 && c <= 57) {
      anyDigit = true;
      if (significantDigits > 0 || c !== 48) {
        mantissa = mantissa * 10 + (c - 48);
        significantDigits++;
      }
      c = ++i < limit ? bytes[i] : -1;
    }
    if (c === 46) {
      c = ++i < limit ? bytes[i] : -1;
      while (c >= 48 && c <= 57) {
        anyDigit = true;
        fractionDigits++;
        if (significantDigits > 0 || c !== 48) {
          mantissa = mantissa * 10 + (c - 48);
          significantDigits++;
        }
        c = ++i < limit ? bytes[i] : -1;
      }
    }
    if (!anyDigit) {
      this.end = start;
      return NaN;
    }
    let exponent = 0;
    if (c === 101 || c === 69) {
      c = ++i < limit ? bytes[i] : -1;
      let exponentNegative = false;
      if (c === 45 || c === 43) {
        exponentNegative = c === 45;
        c = ++i < limit ? bytes[i] : -1;
      }
      if (!(c >= 48 && c <= 57)) {
        // "1e" or "1e+" is not a number for Number() either.
        this.end = start;
        return NaN;
      }
      while (c >= 48 && c <= 57) {
        // Past 10^6 the value is 0 or Infinity anyway; capping keeps the integer exact.
        if (exponent < 1e6) exponent = exponent * 10 + (c - 48);
        c = ++i < limit ? bytes[i] : -1;
      }
      if (exponentNegative) exponent = -exponent;
    }
    this.end = i;
    const scale = exponent - fractionDigits;
    this.lastDigitExponent = scale < -400 ? -400 : scale > 400 ? 400 : scale;
    let value: number;
    if (mantissa === 0) {
      // A bare "0" (the shortest form of zero) is exact, whatever the precision of its neighbours.
      if (fractionDigits === 0 && exponent === 0) this.lastDigitExponent = -400;
      value = 0;
    } else if (significantDigits <= 15 || (significantDigits === 16 && mantissa <= twoTo53)) {
      if (scale === 0) value = mantissa;
      else if (scale > 0 && scale <= 22) value = mantissa * exactPowersOfTen[scale];
      else if (scale < 0 && scale >= -22) value = mantissa / exactPowersOfTen[-scale];
      else return Number(asciiText(bytes, start, i));
    } else {
      return Number(asciiText(bytes, start, i));
    }
    return negative ? -value : value;
  }
}

/** The characters of a scanned number (ASCII only), for Number() to round the cases the fast path leaves. */
function asciiText(bytes: Uint8Array, start: number, end: number): string {
  let text = '';
  for (let i = start; i < end; i++) text += String.fromCharCode(bytes[i]);
  return text;
}
