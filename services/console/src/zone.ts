import type { Zone } from './api-types.js';
import { okabeIto } from './palette.js';

// ISO 20816 (formerly ISO 10816) evaluation zones: A newly commissioned, B unrestricted long-term
// operation, C restricted operation, D damage may occur (wording paraphrased; common practice).
export const zoneMeaning: Record<Zone, string> = {
  A: 'new-machine condition',
  B: 'acceptable for long-term running',
  C: 'restricted: plan action',
  D: 'severe: risk of damage',
};

export const zoneColour: Record<Zone, string> = {
  A: okabeIto.bluishGreen,
  B: okabeIto.skyBlue,
  C: okabeIto.orange,
  D: okabeIto.vermillion,
};

/** Light fills for zone bands behind trend charts. */
export const zoneFill: Record<Zone, string> = {
  A: 'rgba(0, 158, 115, 0.10)',
  B: 'rgba(86, 180, 233, 0.12)',
  C: 'rgba(230, 159, 0, 0.14)',
  D: 'rgba(213, 94, 0, 0.14)',
};

/** Shapes that grow sharper with severity, so a zone reads in greyscale too. */
export const zoneShape: Record<Zone, 'circle' | 'square' | 'triangle' | 'diamond'> = {
  A: 'circle',
  B: 'square',
  C: 'triangle',
  D: 'diamond',
};

/** Higher means worse; a machine without a zone sorts below A. */
export function zoneRank(zone: Zone | null | undefined): number {
  return zone ? { A: 1, B: 2, C: 3, D: 4 }[zone] : 0;
}

export function isZone(value: unknown): value is Zone {
  return value === 'A' || value === 'B' || value === 'C' || value === 'D';
}
