import { ExactSdof } from './exact-sdof.js';

/**
 * The path from the forces at a bearing housing to the accelerometer on it.
 *
 * Two stages in series:
 * 1. the housing on its mount, a single-degree-of-freedom body of mass M on the mount stiffness (rigid or
 *    resilient foundation): M ẍ + c ẋ + k x = F. Its acceleration ẍ is zero at DC (a steady force only deflects the
 *    mount), resonant at the mount frequency and mass-like (F/M) above it;
 * 2. local structural resonances between that body motion and the sensor (housing wall, pedestal, sensor mount),
 *    each a unit-gain resonator ÿ + 2ζω ẏ + ω² y = ω² ẍ whose impulse response e^{−ζωt} sin(ω_d t) is the ringing
 *    of the single-point defect models (McFadden & Smith 1984, JSV 96:69-82; Antoni & Randall 2003, ASME J. Vib.
 *    Acoust. 125:282-289). The sensor reads Σ w_r y_r with Σ w_r = 1: the body motion below the resonances,
 *    amplified about Q_r = 1/(2ζ_r) around each, falling off above.
 *
 * Both stages are stepped exactly for forces linear between samples (ExactSdof), and impacts (force impulses at
 * any instant between samples) are added exactly: as a velocity jump I/M of the housing, and as a jump of every
 * resonator, whose ringing then has the amplitude I·ω/m of a mode of modal mass m struck directly (the caller
 * passes the impulses divided by that mass: `diracAreas`).
 */
export interface Resonance {
  frequencyHz: number;
  dampingRatio: number;
  /** Share of the housing motion the sensor reads through this resonance; the shares sum to 1. */
  weight: number;
}

export interface MountSpec {
  housingMassKg: number;
  frequencyHz: number;
  dampingRatio: number;
}

/** Force impulses (N·s) at given instants (s, on the same clock as the force samples), sorted by time. */
export interface ImpulseTrain {
  timeS: Float64Array;
  impulseNs: Float64Array;
}

export const NO_IMPULSES: ImpulseTrain = { timeS: new Float64Array(0), impulseNs: new Float64Array(0) };

function checkImpulses(impulses: ImpulseTrain): void {
  if (impulses.timeS.length !== impulses.impulseNs.length) throw new RangeError('impulses: timeS and impulseNs must have the same length');
  for (let i = 1; i < impulses.timeS.length; i++) {
    if (!(impulses.timeS[i]! >= impulses.timeS[i - 1]!)) throw new RangeError('impulses.timeS must be sorted');
  }
}

/**
 * Housing acceleration (m/s²) on a linear mount for force samples F[k] at t = startS + k·stepS (N), plus impulses.
 * The mount starts at rest under the first force sample.
 */
export function mountAcceleration(forceN: Float64Array, stepS: number, startS: number, mount: MountSpec, impulses: ImpulseTrain = NO_IMPULSES): Float64Array {
  if (!(mount.housingMassKg > 0)) throw new RangeError(`housingMassKg (${mount.housingMassKg}) must be > 0`);
  checkImpulses(impulses);
  const sdof = new ExactSdof(mount.frequencyHz, mount.dampingRatio, stepS);
  const w2 = sdof.omegaRadPerS * sdof.omegaRadPerS;
  const toInput = 1 / (mount.housingMassKg * w2); // u = F/(M ω²) so that x = y
  const twoZetaW = 2 * sdof.dampingRatio * sdof.omegaRadPerS;
  const out = new Float64Array(forceN.length);
  if (forceN.length === 0) return out;
  sdof.rest(forceN[0]! * toInput);
  out[0] = w2 * (forceN[0]! * toInput - sdof.y) - twoZetaW * sdof.v;
  let next = 0;
  while (next < impulses.timeS.length && impulses.timeS[next]! <= startS) next++;
  for (let k = 1; k < forceN.length; k++) {
    sdof.step(forceN[k - 1]! * toInput, forceN[k]! * toInput);
    const t = startS + k * stepS;
    while (next < impulses.timeS.length && impulses.timeS[next]! <= t) {
      sdof.impulse(impulses.impulseNs[next]! * toInput, t - impulses.timeS[next]!);
      next++;
    }
    // ẍ = F/M − 2ζω ẋ − ω² x, written with u = F/(Mω²).
    out[k] = w2 * (forceN[k]! * toInput - sdof.y) - twoZetaW * sdof.v;
  }
  return out;
}

/**
 * Sensor acceleration (m/s²) through the local resonances, from the housing acceleration samples and the Dirac
 * accelerations (impulse / struck modal mass, m/s) at the impact instants.
 */
export function resonanceResponse(housingAccelerationMPerS2: Float64Array, stepS: number, startS: number, resonances: readonly Resonance[], diracAreasMPerS: ImpulseTrain = NO_IMPULSES): Float64Array {
  if (resonances.length === 0) throw new RangeError('resonances must list at least one resonance');
  const totalWeight = resonances.reduce((s, r) => s + r.weight, 0);
  if (!(Math.abs(totalWeight - 1) < 1e-9)) throw new RangeError(`resonance weights must sum to 1 (got ${totalWeight})`);
  checkImpulses(diracAreasMPerS);
  const a = housingAccelerationMPerS2;
  const out = new Float64Array(a.length);
  if (a.length === 0) return out;
  for (const r of resonances) {
    const sdof = new ExactSdof(r.frequencyHz, r.dampingRatio, stepS);
    sdof.rest(a[0]!);
    out[0] = out[0]! + r.weight * sdof.y;
    let next = 0;
    while (next < diracAreasMPerS.timeS.length && diracAreasMPerS.timeS[next]! <= startS) next++;
    for (let k = 1; k < a.length; k++) {
      sdof.step(a[k - 1]!, a[k]!);
      const t = startS + k * stepS;
      while (next < diracAreasMPerS.timeS.length && diracAreasMPerS.timeS[next]! <= t) {
        sdof.impulse(diracAreasMPerS.impulseNs[next]!, t - diracAreasMPerS.timeS[next]!);
        next++;
      }
      out[k] = out[k]! + r.weight * sdof.y;
    }
  }
  return out;
}

/** The impulses of a train as Dirac accelerations of a mass: I/m, m/s. */
export function diracAreas(impulses: ImpulseTrain, housingMassKg: number): ImpulseTrain {
  return { timeS: impulses.timeS, impulseNs: impulses.impulseNs.map((i) => i / housingMassKg) };
}

/**
 * Stationary variance of a unit-gain resonator's output for a white input sequence of variance σ² held linearly
 * between samples of step h, valid while ω·h << 1: E[y²] ≈ ω σ² h / (4ζ). From the white-noise response of an
 * SDOF, E[x²] = π S0 / (k c) for a two-sided force PSD S0 per rad/s (Crandall & Mark 1963, Random Vibration in
 * Mechanical Systems; Newland, An Introduction to Random Vibrations, §7), with S0 = ω⁴ σ² h / (2π) here.
 */
export function resonatorWhiteNoiseVariance(frequencyHz: number, dampingRatio: number, inputVariance: number, stepS: number): number {
  return (2 * Math.PI * frequencyHz * inputVariance * stepS) / (4 * dampingRatio);
}
