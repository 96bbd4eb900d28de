import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { editDistance, nearestName } from './nearest-name.js';

describe('editDistance', () => {
  it('gives the textbook distances (kitten → sitting is 3; Levenshtein 1966, common worked example)', () => {
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('flaw', 'lawn')).toBe(2);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('unit', 'unit')).toBe(0);
  });

  it('is a metric: symmetric, zero only for equal strings, and obeys the triangle inequality (property)', () => {
    const word = fc.string({ maxLength: 8 });
    fc.assert(
      fc.property(word, word, word, (a, b, c) => {
        const ab = editDistance(a, b);
        expect(ab).toBe(editDistance(b, a));
        expect(ab === 0).toBe(a === b);
        expect(editDistance(a, c)).toBeLessThanOrEqual(ab + editDistance(b, c));
        expect(ab).toBeLessThanOrEqual(Math.max(a.length, b.length));
      }),
    );
  });
});

describe('nearestName', () => {
  const keys = ['sampleRateHz', 'unit', 'channels', 'recordedAt'];
  it('names the key a typo was meant to be, ignoring case and punctuation', () => {
    expect(nearestName('unti', keys)).toBe('unit');
    expect(nearestName('smaple_rate_hz', keys)).toBe('sampleRateHz');
    expect(nearestName('Recorded-At', keys)).toBe('recordedAt');
  });

  it('names nothing for a word that is not close to any', () => {
    expect(nearestName('operator', keys)).toBeUndefined();
    expect(nearestName('fs', ['g'])).toBeUndefined();
  });
});
