import { describe, expect, it } from 'vitest';
import { significant } from './significant-figures.js';

describe('significant', () => {
  it('rounds to the significant figures asked for, plain between 0.001 and the plain limit', () => {
    expect(significant(Math.SQRT1_2)).toBe('0.7071');
    expect(significant(12800, 6)).toBe('12800');
    expect(significant(0.001)).toBe('0.001');
    expect(significant(-3.14159, 3)).toBe('-3.14');
    expect(significant(0)).toBe('0');
  });

  it('switches to exponent form below 0.001 and from the plain limit up', () => {
    expect(significant(5.383e-4)).toBe('5.383e-4');
    expect(significant(1234567)).toBe('1.235e+6');
    expect(significant(123456, 4, 1e5)).toBe('1.235e+5');
    expect(significant(123456)).toBe('123500');
  });
});
