import { gearIndicators, shaftSynchronousAverage, SignalInputError, type ShaftAngle } from '@kinespec/signal';
import type { MachineModel } from '@kinespec/kinematics';
import { indicatorDescriptor } from './indicators/indicator-registry.js';

/** Mesh harmonics kept in each gear's synchronous average (the regular signal of FM0/FM4/NA4). */
export const TSA_MESH_HARMONICS = 3;

/** One gear's time-synchronous average over its own shaft's revolutions and the indicators read from it. */
export interface GearTsa {
  gear: string;
  mesh: string;
  shaft: string;
  teeth: number;
  /** Revolutions averaged. */
  averages: number;
  /** Expected reduction of non-synchronous noise, 1/sqrt(N) (S. Braun, Acustica 32:69–77, 1975). */
  noiseReductionFactor: number;
  fm0: number | null;
  fm4: number | null;
  na4: number | null;
  rms: number | null;
  meshHarmonicAmplitudes: number[];
  /** Why the indicators are null, when they are. */
  note?: string;
}

/**
 * Time-synchronous average and gear indicators for every gear of the model, each over the revolutions of
 * its own shaft, which come through the kinematic ratio from the measured shaft angle.
 * FM0: Stewart (1977); FM4, NA4: Zakrajsek, Townsend & Decker, NASA TM-105950 (1993) — see @kinespec/signal.
 *
 * @param angle angle of the shaft whose speed ratio is 1 in `ratioOfShaft` (e.g. the reference shaft)
 * @param ratioOfShaft speed of a shaft over the speed of the angle's shaft
 */
export function gearSynchronousAverages(
  samples: Float64Array,
  sampleRateHz: number,
  angle: ShaftAngle,
  model: MachineModel,
  ratioOfShaft: (shaftId: string) => number,
): GearTsa[] {
  let maxAngleSpeedHz = 0;
  for (let i = angle.firstSample; i <= angle.lastSample; i++) maxAngleSpeedHz = Math.max(maxAngleSpeedHz, angle.speedHz[i]!);
  const out: GearTsa[] = [];
  for (const mesh of model.gearMeshes) {
    for (const gear of [mesh.driver, mesh.driven]) {
      const ratio = ratioOfShaft(gear.shaft);
      const base = { gear: gear.gear, mesh: mesh.id, shaft: gear.shaft, teeth: gear.teeth };
      // Highest order kept: the third mesh harmonic and its sidebands, below 0.4 fs at the fastest speed.
      const maxOrder = Math.min((TSA_MESH_HARMONICS + 0.5) * gear.teeth, (0.4 * sampleRateHz) / (maxAngleSpeedHz * ratio));
      try {
        const tsa = shaftSynchronousAverage(samples, sampleRateHz, angle, ratio, { maxOrder });
        const g = gearIndicators(tsa.average, { teeth: gear.teeth, maxOrder: tsa.angleSignal.maxOrder });
        out.push({
          ...base,
          averages: tsa.averages,
          noiseReductionFactor: tsa.noiseReductionFactor,
          fm0: g.fm0,
          fm4: g.fm4,
          na4: g.na4,
          rms: g.rms,
          meshHarmonicAmplitudes: g.meshHarmonicAmplitudes,
        });
      } catch (err) {
        if (!(err instanceof SignalInputError)) throw err;
        out.push({ ...base, averages: 0, noiseReductionFactor: 1, fm0: null, fm4: null, na4: null, rms: null, meshHarmonicAmplitudes: [], note: err.message });
      }
    }
  }
  return out;
}

/** Trend indicators of the gear averages: `tsa:fm0:<gear>`, `tsa:fm4:<gear>`, `tsa:na4:<gear>` (finite values only; the registry's family). */
export function gearTsaIndicators(gears: readonly GearTsa[]): Record<string, number> {
  return indicatorDescriptor('tsa:fm0:x').values({ gearTsa: gears }, { unit: null });
}
