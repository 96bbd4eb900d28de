import { Rk4 } from './rk4.js';
import type { ImpulseTrain } from './structural-path.js';

/**
 * A bearing housing whose hold-down has come loose (structural looseness), integrated in time.
 *
 * The housing (mass M) rests on its base under a holding force W (its weight share, belt pull, whatever still
 * clamps it). Pressed on the base it sees the contact stiffness k_c (the bolted mount's own stiffness); once the
 * dynamic force exceeds W it lifts off and flies freely through the bolt's clearance g; beyond it the bolt head
 * stops it with stiffness k_b. The support force is therefore piecewise linear — zero across the gap — and the
 * response clipped: every landing is an impact, giving many harmonics of the running speed, and, when the flight
 * lasts longer than a turn, subharmonic (half-order) motion, as in the piecewise-linear impacting oscillators of
 * Shaw & Holmes (1983, JSV 90:129-155; from memory).
 *
 *   M ÿ = F(t) − W − S(y, ẏ),  S = k_c y + c_c ẏ (y < 0);  0 (0 <= y <= g);  k_b (y − g) + c_b ẏ (y > g)
 */
export interface LooseSupportSpec {
  housingMassKg: number;
  contactStiffnessNPerM: number;
  contactDampingNsPerM: number;
  boltStiffnessNPerM: number;
  boltDampingNsPerM: number;
  /** Clearance of the loose bolt, m. */
  gapM: number;
  /** Force still holding the housing down, N (>= 0). */
  holdingForceN: number;
}

export function supportForceN(spec: LooseSupportSpec, y: number, v: number): number {
  if (y < 0) {
    const f = spec.contactStiffnessNPerM * y + spec.contactDampingNsPerM * v;
    // The base only pushes: a damped rebound cannot pull the housing down.
    return f < 0 ? f : 0;
  }
  if (y > spec.gapM) {
    const f = spec.boltStiffnessNPerM * (y - spec.gapM) + spec.boltDampingNsPerM * v;
    return f > 0 ? f : 0;
  }
  return 0;
}

/**
 * Housing acceleration (m/s²) for force samples F[k] at t = startS + k·stepS (linear in between), with impulses
 * (N·s) applied as velocity jumps. Sub-steps keep ω_c·h <= 0.6 at the stiffer of contact and bolt (see rk4.ts).
 * Starts pressed at rest under F[0] − W.
 */
export function looseSupportAcceleration(forceN: Float64Array, stepS: number, startS: number, spec: LooseSupportSpec, impulses: ImpulseTrain): Float64Array {
  for (const [name, v] of Object.entries({ housingMassKg: spec.housingMassKg, contactStiffnessNPerM: spec.contactStiffnessNPerM, boltStiffnessNPerM: spec.boltStiffnessNPerM })) {
    if (!(v > 0)) throw new RangeError(`${name} (${v}) must be > 0`);
  }
  if (!(spec.gapM >= 0)) throw new RangeError(`gapM (${spec.gapM}) must be >= 0`);
  if (!(spec.holdingForceN >= 0)) throw new RangeError(`holdingForceN (${spec.holdingForceN}) must be >= 0`);
  const out = new Float64Array(forceN.length);
  if (forceN.length === 0) return out;
  const M = spec.housingMassKg;
  const omegaMax = Math.sqrt(Math.max(spec.contactStiffnessNPerM, spec.boltStiffnessNPerM) / M);
  const sub = Math.max(1, Math.ceil((omegaMax * stepS) / 0.6));
  const h = stepS / sub;
  let f0 = 0;
  let slope = 0;
  let t0 = 0;
  const rk4 = new Rk4(2, (t, s, d) => {
    const F = f0 + slope * (t - t0);
    d[0] = s[1]!;
    d[1] = (F - spec.holdingForceN - supportForceN(spec, s[0]!, s[1]!)) / M;
  });
  const state = new Float64Array(2);
  // Pressed at rest: k_c y = F − W (when F < W; otherwise start at the base and let it lift).
  state[0] = Math.min(0, (forceN[0]! - spec.holdingForceN) / spec.contactStiffnessNPerM);
  const accel = (F: number) => (F - spec.holdingForceN - supportForceN(spec, state[0]!, state[1]!)) / M;
  out[0] = accel(forceN[0]!);
  let next = 0;
  while (next < impulses.timeS.length && impulses.timeS[next]! <= startS) next++;
  for (let k = 1; k < forceN.length; k++) {
    f0 = forceN[k - 1]!;
    slope = (forceN[k]! - f0) / stepS;
    t0 = startS + (k - 1) * stepS;
    for (let j = 0; j < sub; j++) rk4.step(t0 + j * h, h, state);
    const t = startS + k * stepS;
    while (next < impulses.timeS.length && impulses.timeS[next]! <= t) {
      state[1] = state[1]! + impulses.impulseNs[next]! / M;
      next++;
    }
    out[k] = accel(forceN[k]!);
  }
  return out;
}
