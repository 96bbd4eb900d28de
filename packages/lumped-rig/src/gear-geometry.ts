/**
 * Involute gear geometry of a gear stage: base radii, contact ratios and the ISO mean mesh stiffness.
 * Standard teeth (basic rack addendum = module, no profile shift), external parallel-axis gears.
 */

/** What the rig knows of a gear stage beyond the tooth counts of the machine model. */
export interface GearStageSpec {
  /** Gear mesh id in the machine model. */
  meshId: string;
  pinionId: string;
  wheelId: string;
  pinionTeeth: number;
  wheelTeeth: number;
  /** Normal module. */
  moduleMm: number;
  /** Normal pressure angle; 20° is the standard basic rack (ISO 53). */
  pressureAngleDeg: number;
  /** 0 for spur gears. */
  helixAngleDeg: number;
  faceWidthMm: number;
}

export interface GearStageGeometry {
  pitchRadiusPinionM: number;
  pitchRadiusWheelM: number;
  baseRadiusPinionM: number;
  baseRadiusWheelM: number;
  /** Transverse contact ratio εα. */
  transverseContactRatio: number;
  /** Overlap (face) contact ratio εβ; 0 for spur gears. */
  overlapContactRatio: number;
  /** Base helix angle βb (rad): the axial share of the tooth force is tan βb of the transverse one. */
  baseHelixAngleRad: number;
  /** Mean mesh stiffness along the line of action, N/m (ISO 6336-1 cγα·b). */
  meanMeshStiffnessNPerM: number;
}

const DEG = Math.PI / 180;

/**
 * Single pair tooth stiffness c' of solid steel spur gears with the standard basic rack, N/(mm·µm):
 * ISO 6336-1 (method B) gives about 14 for such gears (from memory: the usual quoted value of c'th for
 * z large, no profile shift, solid wheel bodies).
 */
export const SINGLE_PAIR_STIFFNESS_N_PER_MM_UM = 14;

/** Steel density (kg/m³), common practice. */
export const STEEL_DENSITY_KG_PER_M3 = 7850;

export function gearStageGeometry(spec: GearStageSpec): GearStageGeometry {
  for (const [name, v] of [['pinionTeeth', spec.pinionTeeth], ['wheelTeeth', spec.wheelTeeth]] as const) {
    if (!(Number.isInteger(v) && v >= 8)) throw new RangeError(`${name} (${v}) must be a whole number >= 8`);
  }
  if (!(spec.moduleMm > 0)) throw new RangeError(`moduleMm (${spec.moduleMm}) must be > 0`);
  if (!(spec.faceWidthMm > 0)) throw new RangeError(`faceWidthMm (${spec.faceWidthMm}) must be > 0`);
  if (!(spec.pressureAngleDeg > 10 && spec.pressureAngleDeg < 35)) throw new RangeError(`pressureAngleDeg (${spec.pressureAngleDeg}) must be in (10, 35)`);
  if (!(spec.helixAngleDeg >= 0 && spec.helixAngleDeg < 45)) throw new RangeError(`helixAngleDeg (${spec.helixAngleDeg}) must be in [0, 45)`);
  const mn = spec.moduleMm / 1000;
  const beta = spec.helixAngleDeg * DEG;
  const alphaN = spec.pressureAngleDeg * DEG;
  // Transverse pressure angle and module of a helical gear: tan αt = tan αn / cos β, mt = mn / cos β (ISO 21771, from memory).
  const alphaT = Math.atan(Math.tan(alphaN) / Math.cos(beta));
  const mt = mn / Math.cos(beta);
  const r1 = (mt * spec.pinionTeeth) / 2;
  const r2 = (mt * spec.wheelTeeth) / 2;
  const rb1 = r1 * Math.cos(alphaT);
  const rb2 = r2 * Math.cos(alphaT);
  const ra1 = r1 + mn;
  const ra2 = r2 + mn;
  const centreDistance = r1 + r2;
  // Length of the path of contact over the transverse base pitch (e.g. Shigley's Mechanical Engineering Design, contact ratio; from memory).
  const pathOfContact = Math.sqrt(ra1 * ra1 - rb1 * rb1) + Math.sqrt(ra2 * ra2 - rb2 * rb2) - centreDistance * Math.sin(alphaT);
  const transverseContactRatio = pathOfContact / (Math.PI * mt * Math.cos(alphaT));
  // εβ = b sin β / (π mn) (ISO 21771, from memory).
  const overlapContactRatio = ((spec.faceWidthMm / 1000) * Math.sin(beta)) / (Math.PI * mn);
  // tan βb = tan β cos αt (ISO 21771, from memory).
  const baseHelixAngleRad = Math.atan(Math.tan(beta) * Math.cos(alphaT));
  // Mean mesh stiffness cγα = c'(0.75 εα + 0.25) per unit face width (ISO 6336-1, from memory); N/(mm·µm) × mm = N/µm.
  const meshStiffnessPerWidth = SINGLE_PAIR_STIFFNESS_N_PER_MM_UM * (0.75 * transverseContactRatio + 0.25);
  const meanMeshStiffnessNPerM = meshStiffnessPerWidth * spec.faceWidthMm * 1e6;
  return {
    pitchRadiusPinionM: r1,
    pitchRadiusWheelM: r2,
    baseRadiusPinionM: rb1,
    baseRadiusWheelM: rb2,
    transverseContactRatio,
    overlapContactRatio,
    baseHelixAngleRad,
    meanMeshStiffnessNPerM,
  };
}

/** Mass (kg) and polar moment of inertia (kg·m²) of a gear body as a solid steel disc of its pitch radius. */
export function solidDisc(radiusM: number, widthM: number): { massKg: number; inertiaKgM2: number } {
  const massKg = STEEL_DENSITY_KG_PER_M3 * Math.PI * radiusM * radiusM * widthM;
  // J = m r² / 2 for a uniform disc (any dynamics textbook).
  return { massKg, inertiaKgM2: (massKg * radiusM * radiusM) / 2 };
}
