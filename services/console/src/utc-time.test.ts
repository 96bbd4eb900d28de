import { describe, expect, it } from 'vitest';
import { utcFromInput, utcInputValue } from './utc-time.js';

describe('utc form times', () => {
  it('round-trips a time through a datetime-local value read as UTC', () => {
    expect(utcInputValue('2025-03-14T08:00:05.000Z')).toBe('2025-03-14T08:00:05');
    expect(utcFromInput('2025-03-14T08:00')).toBe('2025-03-14T08:00:00.000Z');
    expect(utcFromInput(utcInputValue('2025-12-31T23:59:59.000Z'))).toBe('2025-12-31T23:59:59.000Z');
  });

  it('refuses what is not a datetime-local value', () => {
    expect(utcFromInput('')).toBeNull();
    expect(utcFromInput('14/03/2025 08:00')).toBeNull();
    expect(utcInputValue('not a time')).toBe('');
  });
});
