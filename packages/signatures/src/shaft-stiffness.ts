import { SignatureInputError } from './errors.js';

/** Shear modulus of carbon steel, GPa. */
// Shigley's Mechanical Engineering Design (Budynas & Nisbett), Table A-5: G = 79.3 GPa (11.5 Mpsi) (from memory).
export const STEEL_SHEAR_MODULUS_GPA = 79.3;

/** Polar second moment of area of a solid round section, m⁴. */
// J_p = π·d⁴/32 (Roark's Formulas for Stress and Strain, Table 10.1 case 1; from memory).
export function polarSecondMomentM4(diameterMm: number): number {
  if (!(diameterMm > 0) || !Number.isFinite(diameterMm)) {
    throw new SignatureInputError('invalid_parameter', `diameterMm (${diameterMm}) must be a finite number > 0`);
  }
  const d = diameterMm / 1000;
  return (Math.PI * d ** 4) / 32;
}

/** Torsional stiffness of a solid round shaft, N·m/rad. */
// θ = T·L/(G·J_p) ⇒ k = G·π·d⁴/(32·L): Shigley Eq. 4-5; Roark Table 10.1 case 1 (from memory).
export function shaftTorsionalStiffnessNmPerRad(shaft: { diameterMm: number; lengthMm: number; shearModulusGPa?: number }): number {
  const { lengthMm } = shaft;
  const g = shaft.shearModulusGPa ?? STEEL_SHEAR_MODULUS_GPA;
  if (!(lengthMm > 0) || !Number.isFinite(lengthMm)) {
    throw new SignatureInputError('invalid_parameter', `lengthMm (${lengthMm}) must be a finite number > 0`);
  }
  if (!(g > 0) || !Number.isFinite(g)) {
    throw new SignatureInputError('invalid_parameter', `shearModulusGPa (${g}) must be a finite number > 0`);
  }
  return (g * 1e9 * polarSecondMomentM4(shaft.diameterMm)) / (lengthMm / 1000);
}
