import { Rk4, rk4StepS } from './rk4.js';
import { symmetricEigenvalues } from './symmetric-eigenvalues.js';
/**
 * What the train needs of a stage's tooth contact (ToothPairMesh is the rig's; tests pass simpler ones, e.g. a
 * constant linear spring, to compare with closed forms).
 */
export interface MeshContact {
  /** Tooth force (N, >= 0) at mesh position u (base pitches), approach δ (m) and its rate (m/s). */
  forceN(u: number, approachM: number, approachRateMPerS: number): number;
  meanStiffnessNPerM: number;
  peakPairStiffnessNPerM: number;
  /** Base pitches a pair stays in contact (so at most ceil of it pairs at once). */
  contactPitches: number;
}

/**
 * A lumped-parameter gear train: motor, then S gear stages, then the load, in one torsional chain, each gear body
 * also free to move along its line of action on its bearings (the lumped model of Parey, El Badaoui, Guillet &
 * Tandon 2006, JSV 294:547-561, extended stage by stage; cf. Bartelmus 2001, MSSP 15:855-871). The housing feels the
 * bearing forces k_b·y + c_b·ẏ of the gear bodies, which is what the accelerometer reads through its path.
 *
 * Degrees of freedom (S stages): torsional 0 motor, 2i+1 pinion i, 2i+2 wheel i, 2S+1 load; transverse 2S+2+2i
 * pinion i, 2S+3+2i wheel i. Angles are deviations φ from the nominal rotation Ω·t, so that the state stays small
 * and the nominal terms cancel in the mesh approach (r_bp·Ω_p = r_bg·Ω_g).
 *
 * Equations (Newton-Euler, per body):
 *   J_m φ̈_m = T_m − c_em φ̇_m − τ_0                         (motor: linear torque-speed slope of an induction motor)
 *   J_pi φ̈_pi = τ_i − r_bp,i F_i ; J_gi φ̈_gi = r_bg,i F_i − τ_{i+1}   (links τ_l = k_l Δφ + c_l Δφ̇)
 *   J_L φ̈_L = τ_S − T_L − c_L φ̇_L
 *   m y ̈ = ∓F_i − k_b y − c_b ẏ                             (pinion −F, wheel +F)
 *   δ_i = r_bp φ_p − r_bg φ_g + y_p − y_g − e_ecc(t),  F_i = mesh_i.forceN(u_i, δ_i, δ̇_i)
 */
export interface GearStageDynamics {
  mesh: MeshContact;
  pinionTeeth: number;
  wheelTeeth: number;
  baseRadiusPinionM: number;
  baseRadiusWheelM: number;
  pinionInertiaKgM2: number;
  wheelInertiaKgM2: number;
  /** Mass moving with each body along the line of action (gear, shaft share), kg. */
  pinionMassKg: number;
  wheelMassKg: number;
  /** Radial stiffness and damping of each body's bearings along the line of action. */
  pinionSupportNPerM: number;
  pinionSupportNsPerM: number;
  wheelSupportNPerM: number;
  wheelSupportNsPerM: number;
  /** Geometric eccentricity of each gear (m) and its phase (rad): a once-per-turn transmission error. */
  pinionEccentricityM: number;
  pinionEccentricityPhaseRad: number;
  wheelEccentricityM: number;
  wheelEccentricityPhaseRad: number;
  /** Mesh position at t = 0, in base pitches (which pair is in contact when the recording starts). */
  meshPhasePitches: number;
}

export interface TorsionalLinkDynamics {
  stiffnessNmPerRad: number;
  dampingNmsPerRad: number;
}

export interface GearTrainSpec {
  /** Nominal speed of the motor and first pinion, rad/s. */
  inputSpeedRadPerS: number;
  motorInertiaKgM2: number;
  motorTorqueNm: number;
  /** −dT/dω of the motor at its operating point (N·m·s/rad, > 0): its electrical damping. */
  motorTorqueSlopeNmsPerRad: number;
  loadInertiaKgM2: number;
  loadTorqueNm: number;
  /** dT/dω of the load (N·m·s/rad, >= 0): 2T/ω for a fan, 0 for a constant-torque load. */
  loadTorqueSlopeNmsPerRad: number;
  stages: GearStageDynamics[];
  /** S + 1 links: motor–pinion 1, wheel i–pinion i+1, wheel S–load. */
  links: TorsionalLinkDynamics[];
}

export interface GearTrainRun {
  stepS: number;
  /** Bearing force of each gear body on the housing along its line of action, N, per step: [p1, w1, p2, w2, ...]. */
  bearingForceN: Float64Array[];
  /** Total tooth force of each stage, N, per step. */
  meshForceN: Float64Array[];
  /** Deviation of the motor speed from nominal at each step, rad/s (for the energy and speed checks). */
  motorSpeedDeviationRadPerS: Float64Array;
}

function checkSpec(spec: GearTrainSpec): void {
  const S = spec.stages.length;
  if (S < 1) throw new RangeError('stages must list at least one gear stage');
  if (spec.links.length !== S + 1) throw new RangeError(`links must list stages + 1 (${S + 1}) links, got ${spec.links.length}`);
  for (const [name, v] of Object.entries({ inputSpeedRadPerS: spec.inputSpeedRadPerS, motorInertiaKgM2: spec.motorInertiaKgM2, loadInertiaKgM2: spec.loadInertiaKgM2 })) {
    if (!(v > 0)) throw new RangeError(`${name} (${v}) must be > 0`);
  }
}

/** Nominal speed of each stage's pinion and wheel, rad/s. */
export function stageSpeedsRadPerS(spec: GearTrainSpec): Array<{ pinion: number; wheel: number }> {
  const out: Array<{ pinion: number; wheel: number }> = [];
  let w = spec.inputSpeedRadPerS;
  for (const st of spec.stages) {
    const wheel = (w * st.pinionTeeth) / st.wheelTeeth;
    out.push({ pinion: w, wheel });
    w = wheel;
  }
  return out;
}

function dofCount(S: number): number {
  return 4 * S + 2;
}

function massVector(spec: GearTrainSpec): Float64Array {
  const S = spec.stages.length;
  const m = new Float64Array(dofCount(S));
  m[0] = spec.motorInertiaKgM2;
  m[2 * S + 1] = spec.loadInertiaKgM2;
  spec.stages.forEach((st, i) => {
    m[2 * i + 1] = st.pinionInertiaKgM2;
    m[2 * i + 2] = st.wheelInertiaKgM2;
    m[2 * S + 2 + 2 * i] = st.pinionMassKg;
    m[2 * S + 3 + 2 * i] = st.wheelMassKg;
  });
  return m;
}

/** Linearised stiffness matrix with the given mesh stiffness of each stage (N/m), row-major. */
export function stiffnessMatrix(spec: GearTrainSpec, meshStiffnessNPerM: readonly number[]): Float64Array {
  const S = spec.stages.length;
  const n = dofCount(S);
  const K = new Float64Array(n * n);
  const add = (i: number, j: number, v: number) => {
    K[i * n + j] = K[i * n + j]! + v;
  };
  spec.links.forEach((l, li) => {
    const a = 2 * li;
    const b = 2 * li + 1;
    add(a, a, l.stiffnessNmPerRad);
    add(b, b, l.stiffnessNmPerRad);
    add(a, b, -l.stiffnessNmPerRad);
    add(b, a, -l.stiffnessNmPerRad);
  });
  spec.stages.forEach((st, i) => {
    // δ = g·x with g = (+r_bp at pinion, −r_bg at wheel, +1 at pinion y, −1 at wheel y): the mesh adds k g gᵀ.
    const g: Array<[number, number]> = [
      [2 * i + 1, st.baseRadiusPinionM],
      [2 * i + 2, -st.baseRadiusWheelM],
      [2 * S + 2 + 2 * i, 1],
      [2 * S + 3 + 2 * i, -1],
    ];
    const k = meshStiffnessNPerM[i]!;
    for (const [a, ga] of g) for (const [b, gb] of g) add(a, b, k * ga * gb);
    add(2 * S + 2 + 2 * i, 2 * S + 2 + 2 * i, st.pinionSupportNPerM);
    add(2 * S + 3 + 2 * i, 2 * S + 3 + 2 * i, st.wheelSupportNPerM);
  });
  return K;
}

/**
 * Undamped natural frequencies (Hz, ascending; the first is the free rotation at 0) with each stage's mesh at the
 * given stiffness: eigenvalues of M^-1/2 K M^-1/2.
 */
export function naturalFrequenciesHz(spec: GearTrainSpec, meshStiffnessNPerM: readonly number[]): number[] {
  checkSpec(spec);
  const m = massVector(spec);
  const n = m.length;
  const K = stiffnessMatrix(spec, meshStiffnessNPerM);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) A[i * n + j] = K[i * n + j]! / Math.sqrt(m[i]! * m[j]!);
  return symmetricEigenvalues(A, n).map((lambda) => Math.sqrt(Math.max(0, lambda)) / (2 * Math.PI));
}

/** The highest natural frequency the train can reach: every stage at the stiffness of all pairs it may hold at once. */
export function highestNaturalFrequencyHz(spec: GearTrainSpec): number {
  const stiff = spec.stages.map((st) => st.mesh.peakPairStiffnessNPerM * Math.ceil(st.mesh.contactPitches));
  const f = naturalFrequenciesHz(spec, stiff);
  return f[f.length - 1]!;
}

/** The largest integration step (s) for this train: RK4 at ω_max·h = 0.6 (see rk4.ts). */
export function gearTrainStepS(spec: GearTrainSpec): number {
  return rk4StepS(highestNaturalFrequencyHz(spec));
}

/** The approach δ (m) at which the mesh carries `forceN` at position u without motion. */
export function staticApproachM(mesh: MeshContact, u: number, forceN: number): number {
  if (forceN <= 0) return 0;
  let lo = -1e-3;
  let hi = 1e-3;
  if (mesh.forceN(u, hi, 0) < forceN) return hi;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (mesh.forceN(u, mid, 0) < forceN) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Static equilibrium at the starting mesh position: the initial state, so that the run starts near its steady motion. */
export function staticState(spec: GearTrainSpec): Float64Array {
  const S = spec.stages.length;
  const n = dofCount(S);
  const x = new Float64Array(2 * n);
  let torque = spec.motorTorqueNm;
  let phi = 0;
  x[0] = 0;
  spec.stages.forEach((st, i) => {
    const link = spec.links[i]!;
    const pinionPhi = phi - torque / link.stiffnessNmPerRad;
    const force = torque / st.baseRadiusPinionM;
    const yp = -force / st.pinionSupportNPerM;
    const yg = force / st.wheelSupportNPerM;
    // The approach that carries this force at the starting mesh position, with every deviation of the pairs in
    // contact and the eccentricities at t = 0 (bisection on the monotone force-approach curve).
    const u0 = (st.pinionTeeth * pinionPhi) / (2 * Math.PI) + st.meshPhasePitches;
    const ecc = st.pinionEccentricityM * Math.sin(pinionPhi + st.pinionEccentricityPhaseRad) + st.wheelEccentricityM * Math.sin(st.wheelEccentricityPhaseRad);
    const approach = staticApproachM(st.mesh, u0, force) + ecc;
    const wheelPhi = (st.baseRadiusPinionM * pinionPhi + yp - yg - approach) / st.baseRadiusWheelM;
    x[2 * i + 1] = pinionPhi;
    x[2 * i + 2] = wheelPhi;
    x[2 * S + 2 + 2 * i] = yp;
    x[2 * S + 3 + 2 * i] = yg;
    torque = force * st.baseRadiusWheelM;
    phi = wheelPhi;
  });
  x[2 * S + 1] = phi - torque / spec.links[S]!.stiffnessNmPerRad;
  return x;
}

/**
 * Integrates the train from its static state for `steps` steps of `stepS` and returns every step's bearing and
 * tooth forces. The caller discards the first part as run-in. `observe` sees the state [φ..., y..., φ̇..., ẏ...]
 * after each step (for tests; it must not modify it).
 */
export function simulateGearTrain(spec: GearTrainSpec, stepS: number, steps: number, observe?: (tS: number, state: Float64Array) => void): GearTrainRun {
  checkSpec(spec);
  if (!(stepS > 0)) throw new RangeError(`stepS (${stepS}) must be > 0`);
  if (!(Number.isInteger(steps) && steps > 0)) throw new RangeError(`steps (${steps}) must be a whole number > 0`);
  const S = spec.stages.length;
  const n = dofCount(S);
  const mass = massVector(spec);
  const invMass = mass.map((m) => 1 / m);
  const speeds = stageSpeedsRadPerS(spec);
  const stages = spec.stages;
  const links = spec.links;
  const meshForce = new Float64Array(S);
  const TWO_PI = 2 * Math.PI;

  // Per-stage constants in flat arrays, read in the hot loop without property look-ups.
  const rbp = Float64Array.from(stages, (st) => st.baseRadiusPinionM);
  const rbg = Float64Array.from(stages, (st) => st.baseRadiusWheelM);
  const wp = Float64Array.from(speeds, (sp) => sp.pinion);
  const wg = Float64Array.from(speeds, (sp) => sp.wheel);
  const kp = Float64Array.from(stages, (st) => st.pinionSupportNPerM);
  const cp = Float64Array.from(stages, (st) => st.pinionSupportNsPerM);
  const kg = Float64Array.from(stages, (st) => st.wheelSupportNPerM);
  const cg = Float64Array.from(stages, (st) => st.wheelSupportNsPerM);
  const linkK = Float64Array.from(links, (l) => l.stiffnessNmPerRad);
  const linkC = Float64Array.from(links, (l) => l.dampingNmsPerRad);
  const meshes = stages.map((st) => st.mesh);

  const derivative = (t: number, s: Float64Array, out: Float64Array): void => {
    // out[0..n) = velocities, out[n..2n) = accelerations.
    for (let i = 0; i < n; i++) {
      out[i] = s[n + i]!;
      out[n + i] = 0;
    }
    out[n] = spec.motorTorqueNm - spec.motorTorqueSlopeNmsPerRad * s[n]!;
    out[n + 2 * S + 1] = -spec.loadTorqueNm - spec.loadTorqueSlopeNmsPerRad * s[n + 2 * S + 1]!;
    for (let l = 0; l < linkK.length; l++) {
      const a = 2 * l;
      const b = a + 1;
      const tau = linkK[l]! * (s[a]! - s[b]!) + linkC[l]! * (s[n + a]! - s[n + b]!);
      out[n + a] = out[n + a]! - tau;
      out[n + b] = out[n + b]! + tau;
    }
    for (let i = 0; i < S; i++) {
      const st = stages[i]!;
      const ip = 2 * i + 1;
      const ig = ip + 1;
      const yp = 2 * S + 2 + 2 * i;
      const yg = yp + 1;
      const thetaP = wp[i]! * t + s[ip]!;
      const thetaG = wg[i]! * t + s[ig]!;
      const eP = st.pinionEccentricityM;
      const eG = st.wheelEccentricityM;
      const aP = thetaP + st.pinionEccentricityPhaseRad;
      const aG = thetaG + st.wheelEccentricityPhaseRad;
      const ecc = eP * Math.sin(aP) + eG * Math.sin(aG);
      const eccRate = eP * wp[i]! * Math.cos(aP) + eG * wg[i]! * Math.cos(aG);
      const approach = rbp[i]! * s[ip]! - rbg[i]! * s[ig]! + s[yp]! - s[yg]! - ecc;
      const approachRate = rbp[i]! * s[n + ip]! - rbg[i]! * s[n + ig]! + s[n + yp]! - s[n + yg]! - eccRate;
      const u = (st.pinionTeeth * thetaP) / TWO_PI + st.meshPhasePitches;
      const F = meshes[i]!.forceN(u, approach, approachRate);
      meshForce[i] = F;
      out[n + ip] = out[n + ip]! - rbp[i]! * F;
      out[n + ig] = out[n + ig]! + rbg[i]! * F;
      out[n + yp] = out[n + yp]! - F - kp[i]! * s[yp]! - cp[i]! * s[n + yp]!;
      out[n + yg] = out[n + yg]! + F - kg[i]! * s[yg]! - cg[i]! * s[n + yg]!;
    }
    for (let i = 0; i < n; i++) out[n + i] = out[n + i]! * invMass[i]!;
  };

  const state = staticState(spec);
  const rk4 = new Rk4(2 * n, derivative);
  const bearingForceN = Array.from({ length: 2 * S }, () => new Float64Array(steps));
  const meshForceN = Array.from({ length: S }, () => new Float64Array(steps));
  const motorSpeedDeviationRadPerS = new Float64Array(steps);
  for (let k = 0; k < steps; k++) {
    const t = k * stepS;
    rk4.step(t, stepS, state);
    // The tooth forces kept are those of RK4's last stage, evaluated at t + h on the stage's predicted state (its
    // error is of the order of one step's truncation error; a further evaluation per step would cost a quarter more).
    for (let i = 0; i < S; i++) {
      const st = stages[i]!;
      const yp = 2 * S + 2 + 2 * i;
      bearingForceN[2 * i]![k] = st.pinionSupportNPerM * state[yp]! + st.pinionSupportNsPerM * state[n + yp]!;
      bearingForceN[2 * i + 1]![k] = st.wheelSupportNPerM * state[yp + 1]! + st.wheelSupportNsPerM * state[n + yp + 1]!;
      meshForceN[i]![k] = meshForce[i]!;
    }
    motorSpeedDeviationRadPerS[k] = state[n]!;
    if (observe !== undefined) observe(t + stepS, state);
  }
  return { stepS, bearingForceN, meshForceN, motorSpeedDeviationRadPerS };
}
