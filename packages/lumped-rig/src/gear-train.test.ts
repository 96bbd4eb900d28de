// Source: the gear-pair torsional mode in closed form (Kahraman & Singh, JSV 142:49-75, 1990), below.
import { describe, expect, it } from 'vitest';
import { assembleGearTrain } from './gear-train-assembly.js';
import { gearTrainStepS, highestNaturalFrequencyHz, naturalFrequenciesHz, simulateGearTrain, staticState, type GearTrainSpec, type MeshContact } from './gear-train.js';
import { screenDrive } from './machines/screen-drive.js';
import { createRandom } from './random.js';
import { MAX_OMEGA_STEP } from './rk4.js';

/** A constant, two-sided linear tooth spring: the textbook mesh of the closed forms. */
function linearMesh(k: number, c = 0): MeshContact {
  return { forceN: (_u, d, v) => k * d + c * v, meanStiffnessNPerM: k, peakPairStiffnessNPerM: k, contactPitches: 1 };
}

function pair(mesh: MeshContact, supportNPerM: number, linkNmPerRad: number): GearTrainSpec {
  return {
    inputSpeedRadPerS: 150,
    motorInertiaKgM2: 0.4,
    motorTorqueNm: 0,
    motorTorqueSlopeNmsPerRad: 0,
    loadInertiaKgM2: 5,
    loadTorqueNm: 0,
    loadTorqueSlopeNmsPerRad: 0,
    stages: [
      {
        mesh,
        pinionTeeth: 23,
        wheelTeeth: 79,
        baseRadiusPinionM: 0.0334,
        baseRadiusWheelM: (0.0334 * 79) / 23,
        pinionInertiaKgM2: 0.0016,
        wheelInertiaKgM2: 0.14,
        pinionMassKg: 6,
        wheelMassKg: 28,
        pinionSupportNPerM: supportNPerM,
        pinionSupportNsPerM: 0,
        wheelSupportNPerM: supportNPerM,
        wheelSupportNsPerM: 0,
        pinionEccentricityM: 0,
        pinionEccentricityPhaseRad: 0,
        wheelEccentricityM: 0,
        wheelEccentricityPhaseRad: 0,
        meshPhasePitches: 0,
      },
    ],
    links: [
      { stiffnessNmPerRad: linkNmPerRad, dampingNmsPerRad: 0 },
      { stiffnessNmPerRad: linkNmPerRad, dampingNmsPerRad: 0 },
    ],
  };
}

// Torsional mode of a gear pair on rigid bearings, free of its shafts: ω² = k (r_bp²/J_p + r_bg²/J_g)
// (the equivalent-mass form m_e = 1/(r_bp²/J_p + r_bg²/J_g); e.g. Kahraman & Singh 1990, JSV 142:49-75).
function closedFormMeshModeHz(spec: GearTrainSpec, k: number): number {
  const st = spec.stages[0]!;
  return Math.sqrt(k * (st.baseRadiusPinionM ** 2 / st.pinionInertiaKgM2 + st.baseRadiusWheelM ** 2 / st.wheelInertiaKgM2)) / (2 * Math.PI);
}

describe('gear train natural frequencies', () => {
  it('has the closed-form gear-pair torsional mode when bearings are rigid and shafts decoupled', () => {
    const k = 9e8;
    const spec = pair(linearMesh(k), 1e16, 1e-6);
    const f = naturalFrequenciesHz(spec, [k]);
    const expected = closedFormMeshModeHz(spec, k);
    expect(Math.min(...f.map((x) => Math.abs(x / expected - 1)))).toBeLessThan(1e-6);
    // Three rigid-body rotations (motor, pair, load, each free) sit at 0.
    expect(f.slice(0, 3).every((x) => x < 1e-2)).toBe(true);
  });

  it('oscillates at that frequency when integrated in time (zero crossings of the approach δ)', () => {
    const k = 9e8;
    const spec = pair(linearMesh(k), 1e12, 1e-6);
    const stepS = gearTrainStepS(spec);
    const state0 = staticState(spec);
    expect(state0.every((x) => x === 0)).toBe(true);
    const st = spec.stages[0]!;
    let previous = 0;
    const crossings: number[] = [];
    let first = true;
    simulateGearTrain({ ...spec, motorTorqueNm: 0 }, stepS, 4000, (t, s) => {
      if (first) {
        // Give the pinion a twist rate once (an impulse): free vibration of the mesh mode follows.
        s[7] = 1;
        first = false;
      }
      const delta = st.baseRadiusPinionM * s[1]! - st.baseRadiusWheelM * s[2]! + s[4]! - s[5]!;
      if (previous < 0 && delta >= 0) crossings.push(t - (delta / (delta - previous)) * stepS);
      previous = delta;
    });
    const periods = crossings.slice(1).map((t, i) => t - crossings[i]!);
    const meanPeriod = periods.reduce((s, x) => s + x, 0) / periods.length;
    // Rigid-ish supports (1e12 N/m) stiffen the mode by under 0.1 %; RK4 at ω·h <= 0.6 shifts it by under 0.2 %.
    expect(Math.abs(1 / meanPeriod / closedFormMeshModeHz(spec, k) - 1)).toBeLessThan(3e-3);
  });

  it('steps at ω_max·h = 0.6 rad for the stiffest mesh state', () => {
    const spec = pair(linearMesh(9e8), 4e8, 3e4);
    const h = gearTrainStepS(spec);
    expect(2 * Math.PI * highestNaturalFrequencyHz(spec) * h).toBeCloseTo(MAX_OMEGA_STEP, 12);
  });
});

describe('simulateGearTrain conservation laws', () => {
  it('keeps the energy of an undamped linear train in free vibration (to RK4 accuracy)', () => {
    const k = 9e8;
    const spec = pair(linearMesh(k), 4e8, 3e4);
    const st = spec.stages[0]!;
    const n = 6;
    const masses = [spec.motorInertiaKgM2, st.pinionInertiaKgM2, st.wheelInertiaKgM2, spec.loadInertiaKgM2, st.pinionMassKg, st.wheelMassKg];
    const energy = (s: Float64Array) => {
      let e = 0;
      for (let i = 0; i < n; i++) e += 0.5 * masses[i]! * s[n + i]! ** 2;
      e += 0.5 * spec.links[0]!.stiffnessNmPerRad * (s[0]! - s[1]!) ** 2 + 0.5 * spec.links[1]!.stiffnessNmPerRad * (s[2]! - s[3]!) ** 2;
      const delta = st.baseRadiusPinionM * s[1]! - st.baseRadiusWheelM * s[2]! + s[4]! - s[5]!;
      return e + 0.5 * k * delta ** 2 + 0.5 * st.pinionSupportNPerM * s[4]! ** 2 + 0.5 * st.wheelSupportNPerM * s[5]! ** 2;
    };
    const energies: number[] = [];
    let kicked = false;
    const stepS = gearTrainStepS(spec) / 8;
    const steps = 20_000;
    simulateGearTrain(spec, stepS, steps, (_t, s) => {
      if (!kicked) {
        s[6 + 1] = 2;
        s[6 + 4] = 0.01;
        kicked = true;
      }
      energies.push(energy(s));
    });
    const e0 = energies[0]!;
    // RK4 only dissipates an oscillatory mode, by at most (ωh)^6/72 of its energy per step (rk4.ts), here ωh <= 0.075.
    const omegaStep = 2 * Math.PI * highestNaturalFrequencyHz(spec) * stepS;
    expect(energies.reduce((m, e) => Math.max(m, e / e0 - 1), -Infinity)).toBeLessThan(1e-9);
    expect(1 - energies[energies.length - 1]! / e0).toBeLessThan((steps * omegaStep ** 6) / 72);
  });

  it('conserves the angular momentum referred to the input shaft with no external torque (action and reaction at the mesh), for the real nonlinear mesh with damping', () => {
    const speed = 150;
    const { spec } = assembleGearTrain(screenDrive, { inputSpeedRadPerS: speed, motorTorqueNm: 120, motorTorqueSlopeNmsPerRad: 0, loadTorqueSlopeNmsPerRad: 0 }, [], createRandom(4));
    const st = spec.stages[0]!;
    const ratio = st.baseRadiusPinionM / st.baseRadiusWheelM;
    // The load torque that balances the motor's: T_L = T_m·r_bg/r_bp, so that dL/dt = T_m − (r_bp/r_bg)·T_L = 0.
    const balanced = { ...spec, loadTorqueNm: spec.motorTorqueNm / ratio };
    const L = (s: Float64Array) => spec.motorInertiaKgM2 * s[6]! + st.pinionInertiaKgM2 * s[7]! + ratio * (st.wheelInertiaKgM2 * s[8]! + spec.loadInertiaKgM2 * s[9]!);
    const scale = spec.motorInertiaKgM2 * 0.01;
    let worst = 0;
    simulateGearTrain(balanced, gearTrainStepS(balanced), 30_000, (_t, s) => {
      worst = Math.max(worst, Math.abs(L(s)));
    });
    expect(worst / scale).toBeLessThan(1e-8);
  });

  it('carries the motor torque: the mean tooth force is T/r_bp and the mean bearing forces balance it (Newton, torque balance)', () => {
    const { spec } = assembleGearTrain(screenDrive, { inputSpeedRadPerS: 150, motorTorqueNm: 150, motorTorqueSlopeNmsPerRad: 250, loadTorqueSlopeNmsPerRad: 0 }, [], createRandom(9));
    const steps = Math.round(0.5 / gearTrainStepS(spec));
    const run = simulateGearTrain(spec, gearTrainStepS(spec), steps);
    const mean = (a: Float64Array) => a.subarray(steps / 2).reduce((s, x) => s + x, 0) / (a.length - Math.floor(steps / 2));
    const expectedForce = 150 / spec.stages[0]!.baseRadiusPinionM;
    expect(Math.abs(mean(run.meshForceN[0]!) / expectedForce - 1)).toBeLessThan(5e-3);
    expect(Math.abs(mean(run.bearingForceN[0]!) / -expectedForce - 1)).toBeLessThan(5e-3);
    expect(Math.abs(mean(run.bearingForceN[1]!) / expectedForce - 1)).toBeLessThan(5e-3);
  });

  it('names a bad argument', () => {
    const spec = pair(linearMesh(9e8), 4e8, 3e4);
    expect(() => simulateGearTrain(spec, 0, 10)).toThrow(/stepS/);
    expect(() => simulateGearTrain({ ...spec, links: [] }, 1e-5, 10)).toThrow(/links/);
  });
});
