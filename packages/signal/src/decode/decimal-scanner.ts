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
    } else if ((significantDigits <= 15 || (significantDigits === 16 && mantissa <= twoTo53)) && scale >= -22 && scale <= 22) {
      if (scale === 0) value = mantissa;
      else if (scale > 0) value = mantissa * exactPowersOfTen[scale];
      else value = mantissa / exactPowersOfTen[-scale];
    } else {
      value = longDecimal(bytes, start, i, scale);
      if (value !== value) return Number(asciiText(bytes, start, i));
    }
    return negative ? -value : value;
  }
}

// Scratch words for reading a double's exponent bits.
const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);
const highWord = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;

// Dekker (1971), "A floating-point technique for extending the available precision", Numer. Math. 18:224-242:
// exact products and sums as unevaluated pairs of doubles (double-double arithmetic).
const splitter = 134217729; // 2^27 + 1
let pairLow = 0;
function twoProduct(a: number, b: number): number {
  const p = a * b;
  let t = splitter * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = splitter * b;
  const bh = t - (t - b);
  const bl = b - bh;
  pairLow = ah * bh - p + ah * bl + al * bh + al * bl;
  return p;
}
function quickTwoSum(a: number, b: number): number {
  const s = a + b;
  pairLow = b - (s - a);
  return s;
}

/**
 * Correct rounding for what Clinger's fast path leaves: 16 to 19 significant digits and decimal
 * exponents up to ±44 (numpy.savetxt's default '%.18e' writes 19). The mantissa is held exactly as a
 * double-double, scaled by exact powers of ten with an error near 2^-100 relative, and rounded once; when
 * the result lies too close to a rounding midpoint to be sure, NaN asks the caller to use Number().
 */
function longDecimal(bytes: Uint8Array, start: number, end: number, scale: number): number {
  if (scale < -44 || scale > 44) return NaN;
  let head = 0;
  let tail = 0;
  let tailDigits = 0;
  let digits = 0;
  for (let i = start; i < end; i++) {
    const c = bytes[i];
    if (c === 101 || c === 69) break;
    if (c < 48 || c > 57 || (digits === 0 && c === 48)) continue;
    if (digits < 15) head = head * 10 + (c - 48);
    else if (digits < 19) {
      tail = tail * 10 + (c - 48);
      tailDigits++;
    } else if (c !== 48) return NaN;
    else scale++;
    digits++;
  }
  // M = head * 10^tailDigits + tail, exactly, as hi + lo.
  let hi = twoProduct(head, exactPowersOfTen[tailDigits]);
  let lo = pairLow;
  const sum = hi + tail;
  lo += tail - (sum - hi);
  hi = quickTwoSum(sum, lo);
  lo = pairLow;
  while (scale !== 0) {
    const step = scale > 22 ? 22 : scale < -22 ? -22 : scale;
    const power = exactPowersOfTen[step < 0 ? -step : step];
    if (step > 0) {
      const p = twoProduct(hi, power);
      hi = quickTwoSum(p, pairLow + lo * power);
    } else {
      const q = hi / power;
      const p = twoProduct(q, power);
      const rest = hi - p - pairLow + lo;
      hi = quickTwoSum(q, rest / power);
    }
    lo = pairLow;
    scale -= step;
  }
  // hi is the nearest double to hi + lo; it is the nearest to the decimal too unless lo is within the
  // arithmetic's error of half an ulp, or hi is a power of two (whose ulp below is half the ulp above).
  bits[0] = hi;
  const exponentBits = (words[highWord] >>> 20) & 0x7ff;
  if (exponentBits < 64 || exponentBits > 1983) return NaN;
  if ((words[highWord] & 0xfffff) === 0 && words[1 - highWord] === 0) return NaN;
  // ulp(hi) = 2^(exponent - 52): a double with the exponent field 52 lower and a zero fraction.
  words[highWord] = (exponentBits - 52) << 20;
  words[1 - highWord] = 0;
  const ulp = bits[0];
  const distance = Math.abs(Math.abs(lo) - ulp / 2);
  return distance > ulp * 2 ** -30 ? hi : NaN;
}

/** The characters of a scanned number (ASCII only), for Number() to round the cases the fast path leaves. */
function asciiText(bytes: Uint8Array, start: number, end: number): string {
  let text = '';
  for (let i = start; i < end; i++) text += String.fromCharCode(bytes[i]);
  return text;
}
