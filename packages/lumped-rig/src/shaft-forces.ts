/**
 * Forces of a turning shaft on its bearing housings: mass unbalance, coupling misalignment, and the steady
 * rotating-machine lines of a healthy machine (blade pass, motor magnetic pull). Each is a sum of harmonics of a
 * shaft's rotation, returned as a function of time so that it can be sampled on any grid.
 */
export interface Harmonic {
  /** Multiple of the shaft speed (may be fractional for other sources). */
  order: number;
  amplitudeN: number;
  phaseRad: number;
}

/** Σ A_h cos(2π h f t + φ_h) sampled at t = startS + k·stepS. */
export function harmonicForce(harmonics: readonly Harmonic[], shaftSpeedHz: number, startS: number, stepS: number, count: number, out: Float64Array = new Float64Array(count)): Float64Array {
  for (const h of harmonics) {
    const w = 2 * Math.PI * h.order * shaftSpeedHz;
    // Rotate a phasor instead of calling cos per sample; renormalised each 1024 samples against rounding drift.
    let c = Math.cos(w * startS + h.phaseRad);
    let s = Math.sin(w * startS + h.phaseRad);
    const dc = Math.cos(w * stepS);
    const ds = Math.sin(w * stepS);
    for (let k = 0; k < count; k++) {
      out[k] = out[k]! + h.amplitudeN * c;
      const nc = c * dc - s * ds;
      s = s * dc + c * ds;
      c = nc;
      if ((k & 1023) === 1023) {
        c = Math.cos(w * (startS + (k + 1) * stepS) + h.phaseRad);
        s = Math.sin(w * (startS + (k + 1) * stepS) + h.phaseRad);
      }
    }
  }
  return out;
}

/**
 * Mass unbalance U = m·e (kg·m) of a rotor of mass m balanced to grade G at speed Ω: e = G/Ω, with G in mm/s
 * (ISO 21940-11, formerly ISO 1940-1: G = e·Ω; from memory). A given unbalance pulls with U·Ω², so its force
 * rises with the square of the speed.
 */
export function unbalanceKgM(rotorMassKg: number, balanceGradeMmPerS: number, atSpeedRadPerS: number): number {
  if (!(rotorMassKg > 0)) throw new RangeError(`rotorMassKg (${rotorMassKg}) must be > 0`);
  if (!(balanceGradeMmPerS > 0)) throw new RangeError(`balanceGradeMmPerS (${balanceGradeMmPerS}) must be > 0`);
  if (!(atSpeedRadPerS > 0)) throw new RangeError(`atSpeedRadPerS (${atSpeedRadPerS}) must be > 0`);
  return (rotorMassKg * balanceGradeMmPerS) / 1000 / atSpeedRadPerS;
}

/** The once-per-turn force of an unbalance, N: U·Ω² (centrifugal force of the eccentric mass). */
export function unbalanceHarmonics(unbalanceKgMValue: number, shaftSpeedHz: number, phaseRad: number): Harmonic[] {
  const w = 2 * Math.PI * shaftSpeedHz;
  return [{ order: 1, amplitudeN: unbalanceKgMValue * w * w, phaseRad }];
}

/**
 * Reaction forces of a flexible coupling run with a parallel offset Δ (m) and an angular misalignment, as seen on
 * the adjacent bearing. A coupling whose flexible elements make its radial stiffness vary with the angle (two- and
 * three-fold symmetric element sets, one element stiffer than the rest) turns the offset into forces at 1×, 2× (the
 * strongest: the two-fold variation) and 3×; the angular part bends the shaft end once and twice per turn and
 * loads the bearing axially (after Sekhar & Prabhu 1995, JSV 185:655-671, who derive the 2× reaction of a
 * misaligned coupling; the relative sizes are the signature of common practice: strong 2×, 1×, some 3×, high
 * axial). `shares` are the amplitudes of each order as fractions of k·Δ, drawn per machine by the caller.
 */
export interface MisalignmentShares {
  radial: [number, number, number];
  axial: [number, number, number];
}

export function misalignmentHarmonics(couplingRadialStiffnessNPerM: number, offsetM: number, shares: MisalignmentShares, phasesRad: readonly number[]): { radial: Harmonic[]; axial: Harmonic[] } {
  if (!(couplingRadialStiffnessNPerM > 0)) throw new RangeError(`couplingRadialStiffnessNPerM (${couplingRadialStiffnessNPerM}) must be > 0`);
  if (!(offsetM >= 0)) throw new RangeError(`offsetM (${offsetM}) must be >= 0`);
  const scale = couplingRadialStiffnessNPerM * offsetM;
  const radial = shares.radial.map((share, i) => ({ order: i + 1, amplitudeN: scale * share, phaseRad: phasesRad[i] ?? 0 }));
  const axial = shares.axial.map((share, i) => ({ order: i + 1, amplitudeN: scale * share, phaseRad: phasesRad[i + 3] ?? 0 }));
  return { radial, axial };
}
