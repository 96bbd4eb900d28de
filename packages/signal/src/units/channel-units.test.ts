import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { ACCEPTED_UNITS, acceptedUnitsText, canonicalChannelUnit, checkChannelUnit } from './channel-units.js';
import { MOTION_UNITS } from './unit-registry.js';

function messageOf(run: () => unknown): string {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SignalInputError);
    expect((error as SignalInputError).code).toBe('unknown_unit');
    return (error as SignalInputError).message;
  }
  throw new Error('expected unknown_unit');
}

describe('checkChannelUnit', () => {
  it('accepts every motion unit, its aliases in their canonical spelling, and the signal units', () => {
    for (const u of MOTION_UNITS) expect(checkChannelUnit(u, 'unit')).toBe(u);
    expect(checkChannelUnit('m/s2', 'unit')).toBe('m/s^2');
    expect(checkChannelUnit(' ips ', 'unit')).toBe('in/s');
    expect(checkChannelUnit('µm', 'unit')).toBe('um');
    for (const u of ['V', 'mV', 'counts', 'FS']) expect(checkChannelUnit(u, 'unit')).toBe(u);
  });

  it('refuses an unknown unit, naming its source and every accepted unit', () => {
    const text = messageOf(() => checkChannelUnit('furlongs', '--unit'));
    expect(text).toMatch(/^--unit: 'furlongs' is not a unit Kinespec knows; accepted: /);
    for (const u of ACCEPTED_UNITS) expect(text).toContain(u);
    expect(text).not.toContain('did you mean');
  });

  it('points a slip of the keyboard to the unit it was probably meant to be', () => {
    expect(messageOf(() => checkChannelUnit('gg', "column 'DE-H'"))).toContain("(did you mean 'g'?)");
    expect(messageOf(() => checkChannelUnit('mm/ss', 'unit'))).toContain("(did you mean 'mm/s'?)");
  });

  it('refuses the decoders\' own "unknown" marker and the empty string as a given unit', () => {
    expect(canonicalChannelUnit('unknown')).toBeUndefined();
    messageOf(() => checkChannelUnit('', 'unit'));
    messageOf(() => checkChannelUnit('unknown', 'unit'));
  });

  it('lists vibration and signal units apart in one line', () => {
    expect(acceptedUnitsText()).toBe('g, m/s^2, mm/s^2, m/s, mm/s, in/s, m, mm, um, mils (vibration); V, mV, counts, FS (tach, encoder, full scale)');
  });
});
