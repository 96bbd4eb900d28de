import type { GearStageGeometry } from './gear-geometry.js';

/**
 * The tooth contact of one gear stage, pair by pair.
 *
 * The mesh position u counts base pitches rolled by the pinion (u = z_p·θ_p / 2π). Pair j (pinion tooth j mod z_p
 * against wheel tooth j mod z_g) comes into contact at u = j and leaves at u = j + εγ, so that εγ pairs share the
 * load on average: alternately one and two pairs for a spur stage of 1 < εα < 2, the classic rectangular stiffness
 * wave of lumped gear models (e.g. Parey, El Badaoui, Guillet & Tandon 2006, JSV 294:547-561; Bartelmus 2001, MSSP
 * 15:855-871). A pair's stiffness follows its contact-line length: it ramps over εβ (a helical tooth enters
 * diagonally across the face) and is flat while the line spans the face (pair stiffness proportional to the contact
 * line length, a common approximation for helical gears; from memory). The wave is scaled so that its mean equals
 * ISO 6336-1's cγα·b.
 *
 * Each pair carries its own deviation e_j from the perfect involute: accumulated pitch deviations of both teeth,
 * tip relief near both ends of its contact, and wear; it pushes only while the approach δ exceeds e_j
 * (single-sided contact: a pair never pulls, and with a tooth gone the gears separate and impact, as in the
 * backlash models after Kahraman & Singh 1990, JSV 142:49-75). Faults are lost stiffness: a cracked tooth keeps a
 * fraction of its pair stiffness, a missing one none.
 */
export interface ToothPairMeshSpec {
  geometry: GearStageGeometry;
  pinionTeeth: number;
  wheelTeeth: number;
  /** Viscous mesh damping at the mean stiffness, N·s/m; each pair takes the share of its stiffness. */
  meanDampingNsPerM: number;
  /** Stiffness factor of each pinion tooth's pairs: 1 sound, 0 < f < 1 cracked, 0 missing. */
  pinionToothStiffness: Float64Array;
  wheelToothStiffness: Float64Array;
  /** Accumulated pitch deviation of each tooth along the line of action, m (positive: late, less contact). */
  pinionPitchDeviationM: Float64Array;
  wheelPitchDeviationM: Float64Array;
  /** Tip relief depth at the very tip, m, and its length in base pitches (rolled distance). */
  tipReliefM: number;
  reliefLengthPitches: number;
  /** Wear depth at the tip and root of each pinion tooth, m (zero at the pitch point, linear in sliding distance). */
  pinionWearM: Float64Array;
  wheelWearM: Float64Array;
}

/**
 * Shortest ramp of a pair's stiffness, in base pitches, for a spur pair: tooth tips are rounded and the load
 * builds over a few hundredths of a pitch (an assumption; it only keeps the wave from being a step of zero width).
 */
export const SPUR_ENTRY_RAMP_PITCHES = 0.05;

/** Length of a pair's contact and of its stiffness ramps (base pitches), and its peak stiffness (N/m). */
export function pairContact(geometry: GearStageGeometry): { contactPitches: number; rampPitches: number; peakPairStiffnessNPerM: number } {
  const overlap = Math.max(geometry.overlapContactRatio, SPUR_ENTRY_RAMP_PITCHES);
  const contactPitches = geometry.transverseContactRatio + overlap;
  const rampPitches = Math.min(geometry.transverseContactRatio, overlap);
  // Area under one pair's trapezoid = contactPitches − rampPitches; one pair enters per pitch, so the mean is peak × area.
  return { contactPitches, rampPitches, peakPairStiffnessNPerM: geometry.meanMeshStiffnessNPerM / (contactPitches - rampPitches) };
}

export class ToothPairMesh {
  readonly contactPitches: number;
  readonly rampPitches: number;
  readonly peakPairStiffnessNPerM: number;
  readonly meanStiffnessNPerM: number;
  private readonly zp: number;
  private readonly zg: number;
  private readonly dampingPerStiffness: number;

  constructor(private readonly spec: ToothPairMeshSpec) {
    const { geometry, pinionTeeth, wheelTeeth } = spec;
    if (spec.pinionToothStiffness.length !== pinionTeeth || spec.pinionPitchDeviationM.length !== pinionTeeth || spec.pinionWearM.length !== pinionTeeth) {
      throw new RangeError(`pinion tooth arrays must have pinionTeeth (${pinionTeeth}) entries`);
    }
    if (spec.wheelToothStiffness.length !== wheelTeeth || spec.wheelPitchDeviationM.length !== wheelTeeth || spec.wheelWearM.length !== wheelTeeth) {
      throw new RangeError(`wheel tooth arrays must have wheelTeeth (${wheelTeeth}) entries`);
    }
    const contact = pairContact(geometry);
    this.contactPitches = contact.contactPitches;
    this.rampPitches = contact.rampPitches;
    this.meanStiffnessNPerM = geometry.meanMeshStiffnessNPerM;
    this.peakPairStiffnessNPerM = contact.peakPairStiffnessNPerM;
    this.zp = pinionTeeth;
    this.zg = wheelTeeth;
    this.dampingPerStiffness = spec.meanDampingNsPerM / this.meanStiffnessNPerM;
  }

  /** Stiffness shape of a healthy pair at s base pitches into its contact: 0..1. */
  pairShape(s: number): number {
    if (s <= 0 || s >= this.contactPitches) return 0;
    return Math.min(s, this.contactPitches - s, this.rampPitches) / this.rampPitches;
  }


  /** Sum of the pair stiffnesses in contact at mesh position u (no deviations), N/m. */
  stiffnessNPerM(u: number): number {
    let k = 0;
    const jHigh = Math.floor(u);
    for (let j = Math.floor(u - this.contactPitches) + 1; j <= jHigh; j++) {
      const ip = mod(j, this.zp);
      const ig = mod(j, this.zg);
      k += this.peakPairStiffnessNPerM * this.pairShape(u - j) * this.spec.pinionToothStiffness[ip]! * this.spec.wheelToothStiffness[ig]!;
    }
    return k;
  }

  /**
   * Total tooth force along the line of action, N (>= 0), for an approach δ (m) of the pinion's flank on the
   * wheel's, its rate δ̇ (m/s), at mesh position u. (The hot loop of the gear train: arrays read into locals.)
   */
  forceN(u: number, approachM: number, approachRateMPerS: number): number {
    const { pinionToothStiffness: kp, wheelToothStiffness: kg, pinionPitchDeviationM: ep, wheelPitchDeviationM: eg, pinionWearM: wp, wheelWearM: wg, tipReliefM, reliefLengthPitches } = this.spec;
    const contact = this.contactPitches;
    const ramp = this.rampPitches;
    const peak = this.peakPairStiffnessNPerM;
    const dampingShare = this.dampingPerStiffness * approachRateMPerS;
    let total = 0;
    let j = Math.floor(u - contact) + 1;
    const jHigh = Math.floor(u);
    let ip = mod(j, this.zp);
    let ig = mod(j, this.zg);
    for (; j <= jHigh; j++) {
      const s = u - j;
      const toothFactor = kp[ip]! * kg[ig]!;
      if (toothFactor > 0 && s > 0 && s < contact) {
        const k = (peak * toothFactor * Math.min(s, contact - s, ramp)) / ramp;
        const a = 1 - s / reliefLengthPitches;
        const b = 1 - (contact - s) / reliefLengthPitches;
        const relief = tipReliefM * ((a > 0 ? a * a : 0) + (b > 0 ? b * b : 0));
        // Wear grows with sliding distance, which is zero at the pitch point (mid-contact) and largest at tip and
        // root (Archard's law with sliding speed proportional to the distance from the pitch point; e.g. Flodin &
        // Andersson 1997, Wear 207:16-23; from memory).
        const fromPitchPoint = Math.abs((2 * s) / contact - 1);
        const penetration = approachM - (ep[ip]! + eg[ig]! + relief + (wp[ip]! + wg[ig]!) * fromPitchPoint);
        if (penetration > 0) {
          const f = k * (penetration + dampingShare);
          if (f > 0) total += f;
        }
      }
      if (++ip === this.zp) ip = 0;
      if (++ig === this.zg) ig = 0;
    }
    return total;
  }
}

function mod(j: number, n: number): number {
  const r = j % n;
  return r < 0 ? r + n : r;
}
