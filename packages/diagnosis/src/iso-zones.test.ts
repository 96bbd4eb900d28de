import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DiagnosisInputError } from './errors.js';
import { gradeSeverity, isoBandHz, isoZone, isoZoneBoundaries, ISO_10816_3_ZONE_TABLE } from './iso-zones.js';

// ISO 10816-3:2009 Annex A / ISO 20816-3:2022 zone boundaries, mm/s r.m.s. 10–1000 Hz. From memory, corroborated
// by public secondary sources (IS 14817-3:2004 summary; a distributor note quoting DIN ISO 10816-3 with
// 4.5 / 7.1 mm/s for a large rigid machine), as listed in docs/check-values.md §7.
const standardTable = [
  { group: 1, foundation: 'rigid', ab: 2.3, bc: 4.5, cd: 7.1 },
  { group: 1, foundation: 'flexible', ab: 3.5, bc: 7.1, cd: 11.0 },
  { group: 2, foundation: 'rigid', ab: 1.4, bc: 2.8, cd: 4.5 },
  { group: 2, foundation: 'flexible', ab: 2.3, bc: 4.5, cd: 7.1 },
] as const;

describe('isoZoneBoundaries', () => {
  for (const row of standardTable) {
    it(`gives ${row.ab}/${row.bc}/${row.cd} mm/s for group ${row.group} ${row.foundation} (ISO 10816-3 / 20816-3)`, () => {
      expect(isoZoneBoundaries(row.group, row.foundation)).toEqual({ abMmPerS: row.ab, bcMmPerS: row.bc, cdMmPerS: row.cd });
    });
  }

  it('holds exactly the four rows of the standard and nothing else', () => {
    expect(ISO_10816_3_ZONE_TABLE).toHaveLength(4);
  });

  it('does not use the ISO 10816-1 class I value 0.71 mm/s that some web pages mix in (check-values §7 caution)', () => {
    expect(ISO_10816_3_ZONE_TABLE.some((r) => r.abMmPerS === 0.71)).toBe(false);
  });

  it('rejects an unknown group with a typed error', () => {
    expect(() => isoZoneBoundaries(3 as 1, 'rigid')).toThrow(DiagnosisInputError);
  });
});

describe('isoZone', () => {
  const g2rigid = isoZoneBoundaries(2, 'rigid');

  it('grades values inside each zone of group 2 rigid', () => {
    expect(isoZone(0.5, g2rigid)).toBe('A');
    expect(isoZone(2.0, g2rigid)).toBe('B');
    expect(isoZone(3.5, g2rigid)).toBe('C');
    expect(isoZone(9.0, g2rigid)).toBe('D');
  });

  // Boundary rule of this package (the standard leaves it open, check-values §7): equal goes to the upper zone.
  it('puts a value exactly on a boundary into the upper zone', () => {
    for (const row of standardTable) {
      const b = isoZoneBoundaries(row.group, row.foundation);
      expect(isoZone(row.ab, b)).toBe('B');
      expect(isoZone(row.bc, b)).toBe('C');
      expect(isoZone(row.cd, b)).toBe('D');
      expect(isoZone(row.ab * (1 - 1e-12), b)).toBe('A');
      expect(isoZone(row.bc * (1 - 1e-12), b)).toBe('B');
      expect(isoZone(row.cd * (1 - 1e-12), b)).toBe('C');
    }
  });

  it('never grades a larger value into a better zone', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 50, noNaN: true }), fc.double({ min: 0, max: 50, noNaN: true }), (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        return isoZone(lo, g2rigid) <= isoZone(hi, g2rigid);
      }),
    );
  });

  it('rejects a negative or non-finite velocity with a typed error naming the parameter', () => {
    expect(() => isoZone(-1, g2rigid)).toThrow(/velocityRmsMmPerS/);
    expect(() => isoZone(Number.NaN, g2rigid)).toThrow(DiagnosisInputError);
  });
});

describe('isoBandHz', () => {
  // ISO 10816-3: 10–1000 Hz, 2–1000 Hz for machines running between 120 and 600 r/min (from memory, check-values §7).
  it('uses 2–1000 Hz under 600 rpm and 10–1000 Hz from 600 rpm up', () => {
    expect(isoBandHz(300)).toEqual([2, 1000]);
    expect(isoBandHz(599.9)).toEqual([2, 1000]);
    expect(isoBandHz(600)).toEqual([10, 1000]);
    expect(isoBandHz(1480)).toEqual([10, 1000]);
    expect(isoBandHz(null)).toEqual([10, 1000]);
  });
});

describe('gradeSeverity', () => {
  it('defaults the alarm to baseline + 0.25 × B/C (distributor note quoting DIN ISO 10816-3: 0.8 + 1.125 = 1.925 mm/s)', () => {
    const s = gradeSeverity(1.0, { iso: { group: 1, foundation: 'rigid' }, baselineVelocityRmsMmPerS: 0.8 });
    expect(s.alarmLevelMmPerS).toBeCloseTo(1.925, 12);
    expect(s.alarmLevelSource).toBe('iso');
    expect(s.alarmState).toBe('normal');
    expect(gradeSeverity(1.925, { iso: { group: 1, foundation: 'rigid' }, baselineVelocityRmsMmPerS: 0.8 }).alarmState).toBe('alarm');
  });

  it('caps the default alarm at 1.25 × B/C (ISO 10816-3 §6.3, check-values §7)', () => {
    const s = gradeSeverity(1.0, { iso: { group: 2, foundation: 'rigid' }, baselineVelocityRmsMmPerS: 3.0 });
    expect(s.alarmLevelMmPerS).toBeCloseTo(1.25 * 2.8, 12);
  });

  it('lets the point’s own alarm and trip levels override the ISO defaults', () => {
    const iso = { group: 2, foundation: 'rigid' } as const;
    const s = gradeSeverity(3.0, { iso, alarmVelocityRmsMmPerS: 3.2, tripVelocityRmsMmPerS: 6.0 });
    expect(s.zone).toBe('C');
    expect(s.alarmLevelMmPerS).toBe(3.2);
    expect(s.tripLevelMmPerS).toBe(6.0);
    expect(s.alarmLevelSource).toBe('point');
    expect(s.alarmState).toBe('normal');
    expect(gradeSeverity(4.6, { iso }).alarmState).toBe('trip');
    expect(gradeSeverity(4.6, { iso, tripVelocityRmsMmPerS: 6.0 }).alarmState).toBe('alarm');
  });

  it('gives no zone without an ISO class but still applies the point’s levels', () => {
    const s = gradeSeverity(5, { alarmVelocityRmsMmPerS: 4 });
    expect(s.zone).toBeNull();
    expect(s.alarmState).toBe('alarm');
    expect(gradeSeverity(5, {}).alarmState).toBeNull();
  });
});
