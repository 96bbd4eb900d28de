import { contactRollingSpeedsMPerS, defectFrequenciesHz, type RollingBearingGeometry } from './bearing-kinematics.js';
import type { Random } from './random.js';
import type { ImpulseTrain } from './structural-path.js';

/**
 * Impacts of a localized bearing defect after Antoni & Randall's cyclostationary model (Antoni & Randall 2003,
 * "A stochastic model for simulation and diagnostics of rolling element bearings with localized faults", ASME J.
 * Vib. Acoust. 125:282-289; summarised in Randall & Antoni 2011, MSSP 25:485-520, §2):
 *   x(t) = Σ_i A_i q(t_i) h(t − t_i),  t_i − t_{i−1} = T (1 + σ ξ_i)
 * — one impact per defect period T (BPFO, BPFI, or 2×BSF), inter-arrival times jittered by σ = 1-2 % (the
 * elements slip a little, so the train is cyclostationary, not periodic), amplitudes A_i scattered, q the load the
 * element carries as it meets the defect, and h the structural ringing (added by the structural path).
 *
 * q follows the load zone of a radially loaded bearing (Stribeck; Harris & Kotzalas, Rolling Bearing Analysis,
 * load distribution: q(ψ) = q_max [1 − (1 − cos ψ)/(2ε)]^n, n = 3/2 for balls and 10/9 for rollers, zero outside
 * the zone; from memory): constant for an outer-race defect (fixed in the zone), modulated at the shaft rate for an
 * inner-race defect (it turns through the zone), at the cage rate for an element defect (the element orbits). An
 * element defect strikes the inner and the outer race in turn; the inner-race strike reaches the housing through
 * one more contact and is taken weaker (INNER_RACE_STRIKE_SHARE).
 */
export type BearingDefectKind = 'outer-race' | 'inner-race' | 'rolling-element';

export interface BearingImpactSpec {
  kind: BearingDefectKind;
  geometry: RollingBearingGeometry;
  shaftSpeedHz: number;
  /** Element kind, for the load-distribution exponent. */
  elementKind: 'ball' | 'roller';
  /** Radial load on the bearing, N. */
  radialLoadN: number;
  /** Load distribution factor ε: 0.5 for zero clearance (a 180° zone), smaller with clearance. */
  loadDistributionFactor: number;
  /** Length of the spall along the rolling direction, m. */
  spallLengthM: number;
  /** Standard deviation of the inter-arrival times, as a fraction of the period (0.01-0.02 in the model). */
  jitterFraction: number;
  /** Relative standard deviation of the impact amplitudes A_i. */
  amplitudeScatter: number;
  /** Angle of an outer-race defect from the centre of the load zone (rad). */
  defectAngleRad: number;
  /** Starting angle of the turning defect (inner race) or element (rolling element) from the zone centre (rad). */
  startAngleRad: number;
}

/** Stribeck's factor: the most loaded element carries about 5·F_r/(Z cos α) (Harris & Kotzalas; from memory). */
export const STRIBECK_FACTOR = 5;

/**
 * Share κ of the element load that is given up over the spall and taken back in the exit impact, in the impulse
 * I = κ·Q·L/v (load Q, spall length L, rolling speed v). A loaded element only partly unloads over a shallow spall,
 * so κ is well below 1; 0.1 is assumed, chosen with LOCAL_MODAL_MASS_KG so that a 0.1-0.3 mm spall rings its own
 * housing with peaks of a few tenths of a g to about 1 g and a 1-2.5 mm spall with several g, the range public
 * seeded-fault test rigs show (from memory). The corpus draws spall sizes over a decade, so κ sets the scale only.
 */
export const LOAD_MOMENTUM_SHARE = 0.1;

/** Strength of an element defect's strike on the inner race relative to the outer race (assumed). */
export const INNER_RACE_STRIKE_SHARE = 0.5;

/** Load carried by an element at ψ from the load-zone centre, as a fraction of the most loaded one. */
export function loadZoneFraction(psiRad: number, loadDistributionFactor: number, elementKind: 'ball' | 'roller'): number {
  const exponent = elementKind === 'ball' ? 1.5 : 10 / 9;
  const base = 1 - (1 - Math.cos(psiRad)) / (2 * loadDistributionFactor);
  return base > 0 ? base ** exponent : 0;
}

/** The defect's own period T (s): 1/BPFO, 1/BPFI or 1/(2·BSF). */
export function defectPeriodS(kind: BearingDefectKind, geometry: RollingBearingGeometry, shaftSpeedHz: number): number {
  const f = defectFrequenciesHz(geometry, shaftSpeedHz);
  if (kind === 'outer-race') return 1 / f.bpfoHz;
  if (kind === 'inner-race') return 1 / f.bpfiHz;
  return 1 / (2 * f.bsfHz);
}

/** Impulses (N·s) of the defect from startS to endS, sorted by time. */
export function bearingImpacts(spec: BearingImpactSpec, startS: number, endS: number, random: Random): ImpulseTrain {
  if (!(spec.jitterFraction >= 0 && spec.jitterFraction < 0.2)) throw new RangeError(`jitterFraction (${spec.jitterFraction}) must be in [0, 0.2)`);
  if (!(spec.loadDistributionFactor > 0 && spec.loadDistributionFactor <= 1)) throw new RangeError(`loadDistributionFactor (${spec.loadDistributionFactor}) must be in (0, 1]`);
  if (!(spec.spallLengthM > 0)) throw new RangeError(`spallLengthM (${spec.spallLengthM}) must be > 0`);
  if (!(endS > startS)) throw new RangeError(`endS (${endS}) must exceed startS (${startS})`);
  const g = spec.geometry;
  const f = defectFrequenciesHz(g, spec.shaftSpeedHz);
  const period = defectPeriodS(spec.kind, g, spec.shaftSpeedHz);
  const speeds = contactRollingSpeedsMPerS(g, spec.shaftSpeedHz);
  const rollingSpeed = spec.kind === 'outer-race' ? speeds.outerRace : spec.kind === 'inner-race' ? speeds.innerRace : speeds.rollingElement;
  const cosAlpha = Math.cos((g.contactAngleDeg * Math.PI) / 180);
  const maxElementLoadN = (STRIBECK_FACTOR * spec.radialLoadN) / (g.rollingElements * cosAlpha);
  const fullImpulseNs = LOAD_MOMENTUM_SHARE * maxElementLoadN * (spec.spallLengthM / rollingSpeed);
  const times: number[] = [];
  const impulses: number[] = [];
  // Start at a random phase of the first period so that the train does not line up with the record start.
  let t = startS + period * random.uniform();
  let strike = 0;
  while (t < endS) {
    let q: number;
    if (spec.kind === 'outer-race') q = loadZoneFraction(spec.defectAngleRad, spec.loadDistributionFactor, spec.elementKind);
    else if (spec.kind === 'inner-race') q = loadZoneFraction(spec.startAngleRad + 2 * Math.PI * spec.shaftSpeedHz * t, spec.loadDistributionFactor, spec.elementKind);
    else {
      q = loadZoneFraction(spec.startAngleRad + 2 * Math.PI * f.ftfHz * t, spec.loadDistributionFactor, spec.elementKind);
      if (strike % 2 === 1) q *= INNER_RACE_STRIKE_SHARE;
    }
    const amplitude = Math.max(0, 1 + spec.amplitudeScatter * random.normal());
    if (q > 0 && amplitude > 0) {
      times.push(t);
      impulses.push(fullImpulseNs * q * amplitude);
    }
    strike++;
    // Renewal process: each inter-arrival time is T(1 + σξ), ξ ~ N(0, 1), kept positive.
    t += period * Math.max(0.5, 1 + spec.jitterFraction * random.normal());
  }
  return { timeS: Float64Array.from(times), impulseNs: Float64Array.from(impulses) };
}
