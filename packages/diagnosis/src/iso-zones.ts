import { DiagnosisInputError } from './errors.js';

/** Evaluation zones of ISO 20816-3 / ISO 10816-3: A new machine, B unrestricted long-term operation,
 * C restricted operation, D damage. */
export type IsoZone = 'A' | 'B' | 'C' | 'D';
export type IsoGroup = 1 | 2;
export type IsoFoundation = 'rigid' | 'flexible';

export interface ZoneBoundaries {
  /** Upper boundary of zone A (A/B), mm/s r.m.s. */
  abMmPerS: number;
  /** B/C boundary, mm/s r.m.s. */
  bcMmPerS: number;
  /** C/D boundary, mm/s r.m.s. */
  cdMmPerS: number;
}

/**
 * ISO 10816-3:2009 Table A.1/A.2 (kept by ISO 20816-3:2022): broadband r.m.s. velocity on bearing housings,
 * 10–1000 Hz (2–1000 Hz for machines running at 120–600 r/min). Values from memory, corroborated by public
 * secondary sources (IS 14817-3:2004 summary for the groups; a distributor note quoting DIN ISO 10816-3 for
 * 4.5 and 7.1 mm/s in group 1 rigid); see docs/check-values.md §7.
 * Group 1: large machines, > 300 kW or shaft height H >= 315 mm. Group 2: medium machines, 15–300 kW, 160 <= H < 315 mm.
 */
export const ISO_10816_3_ZONE_TABLE: ReadonlyArray<{ group: IsoGroup; foundation: IsoFoundation } & ZoneBoundaries> = [
  { group: 1, foundation: 'rigid', abMmPerS: 2.3, bcMmPerS: 4.5, cdMmPerS: 7.1 },
  { group: 1, foundation: 'flexible', abMmPerS: 3.5, bcMmPerS: 7.1, cdMmPerS: 11.0 },
  { group: 2, foundation: 'rigid', abMmPerS: 1.4, bcMmPerS: 2.8, cdMmPerS: 4.5 },
  { group: 2, foundation: 'flexible', abMmPerS: 2.3, bcMmPerS: 4.5, cdMmPerS: 7.1 },
];

/** The zone boundaries of a machine group and foundation class (ISO 20816-3 / ISO 10816-3). */
export function isoZoneBoundaries(group: IsoGroup, foundation: IsoFoundation): ZoneBoundaries {
  const row = ISO_10816_3_ZONE_TABLE.find((r) => r.group === group && r.foundation === foundation);
  if (!row) throw new DiagnosisInputError('invalid_argument', `iso class (group ${group}, ${foundation}) must be group 1 or 2, rigid or flexible`);
  return { abMmPerS: row.abMmPerS, bcMmPerS: row.bcMmPerS, cdMmPerS: row.cdMmPerS };
}

/**
 * The zone of a broadband r.m.s. velocity. Boundary rule (the standard leaves it open, check-values §7):
 * a value exactly equal to a boundary belongs to the UPPER (worse) zone, so that a reading at the limit is
 * never graded better than the limit itself (4.5 mm/s with B/C = 4.5 is zone C).
 */
export function isoZone(velocityRmsMmPerS: number, boundaries: ZoneBoundaries): IsoZone {
  if (!Number.isFinite(velocityRmsMmPerS) || velocityRmsMmPerS < 0) {
    throw new DiagnosisInputError('invalid_argument', `velocityRmsMmPerS (${velocityRmsMmPerS}) must be a finite number >= 0`);
  }
  if (velocityRmsMmPerS >= boundaries.cdMmPerS) return 'D';
  if (velocityRmsMmPerS >= boundaries.bcMmPerS) return 'C';
  if (velocityRmsMmPerS >= boundaries.abMmPerS) return 'B';
  return 'A';
}

/**
 * The measurement band of the overall level: 10–1000 Hz, or 2–1000 Hz for machines under 600 r/min
 * (ISO 10816-3 §4.2 / ISO 20816-3, from memory, check-values §7).
 */
export function isoBandHz(speedRpm: number | null): [number, number] {
  return speedRpm !== null && speedRpm < 600 ? [2, 1000] : [10, 1000];
}

export type AlarmState = 'normal' | 'alarm' | 'trip';

export interface SeverityLevels {
  zone: IsoZone | null;
  boundaries: ZoneBoundaries | null;
  alarmLevelMmPerS: number | null;
  tripLevelMmPerS: number | null;
  /** Where each level came from: the point's own setting, the ISO default, or none. */
  alarmLevelSource: 'point' | 'iso' | null;
  tripLevelSource: 'point' | 'iso' | null;
  alarmState: AlarmState | null;
}

export interface SeverityOptions {
  iso?: { group: IsoGroup; foundation: IsoFoundation } | null;
  /** User-set levels of the point; each overrides the ISO default. */
  alarmVelocityRmsMmPerS?: number | null;
  tripVelocityRmsMmPerS?: number | null;
  /** Healthy r.m.s. velocity of this point (criterion II reference). */
  baselineVelocityRmsMmPerS?: number | null;
}

/**
 * Grades an overall r.m.s. velocity: its ISO zone and its alarm state. Default levels when the point sets none:
 * ALARM = baseline + 0.25 × (B/C), at most 1.25 × (B/C), or the B/C boundary without a baseline;
 * TRIP = the C/D boundary (ISO 10816-3 §6.3–6.4, alarm rule corroborated by a distributor note quoting
 * DIN ISO 10816-3, check-values §7; trip "normally <= 1.25 × C/D", here the conservative C/D itself).
 * A level equal to a threshold counts as reaching it (same rule as the zones).
 */
export function gradeSeverity(velocityRmsMmPerS: number, options: SeverityOptions): SeverityLevels {
  const boundaries = options.iso ? isoZoneBoundaries(options.iso.group, options.iso.foundation) : null;
  const zone = boundaries ? isoZone(velocityRmsMmPerS, boundaries) : null;
  let alarmLevelMmPerS: number | null = null;
  let alarmLevelSource: SeverityLevels['alarmLevelSource'] = null;
  if (options.alarmVelocityRmsMmPerS != null) {
    alarmLevelMmPerS = options.alarmVelocityRmsMmPerS;
    alarmLevelSource = 'point';
  } else if (boundaries) {
    const baseline = options.baselineVelocityRmsMmPerS;
    alarmLevelMmPerS = baseline != null
      ? Math.min(baseline + 0.25 * boundaries.bcMmPerS, 1.25 * boundaries.bcMmPerS)
      : boundaries.bcMmPerS;
    alarmLevelSource = 'iso';
  }
  let tripLevelMmPerS: number | null = null;
  let tripLevelSource: SeverityLevels['tripLevelSource'] = null;
  if (options.tripVelocityRmsMmPerS != null) {
    tripLevelMmPerS = options.tripVelocityRmsMmPerS;
    tripLevelSource = 'point';
  } else if (boundaries) {
    tripLevelMmPerS = boundaries.cdMmPerS;
    tripLevelSource = 'iso';
  }
  let alarmState: AlarmState | null = null;
  if (alarmLevelMmPerS !== null || tripLevelMmPerS !== null) {
    alarmState = tripLevelMmPerS !== null && velocityRmsMmPerS >= tripLevelMmPerS
      ? 'trip'
      : alarmLevelMmPerS !== null && velocityRmsMmPerS >= alarmLevelMmPerS ? 'alarm' : 'normal';
  }
  return { zone, boundaries, alarmLevelMmPerS, tripLevelMmPerS, alarmLevelSource, tripLevelSource, alarmState };
}
