// The femto-learning runs to failure (../shared/datasets/femto-learning, see its README): six bearings of the
// PRONOSTIA accelerated life tests, IEEE PHM 2012 challenge learning set (P. Nectoux et al., IEEE PHM 2012).
// Read from the shared folder beside the repository, never copied into it.
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';

export const FEMTO_DIR = fileURLToPath(new URL('../../../../shared/datasets/femto-learning/', import.meta.url));

export const FEMTO_BEARINGS = ['Bearing1_1', 'Bearing1_2', 'Bearing2_1', 'Bearing2_2', 'Bearing3_1', 'Bearing3_2'] as const;

export interface FemtoRun {
  bearing: string;
  sampleRateHz: number;
  samplesPerSnapshot: number;
  /** Start of each snapshot, s from the first. */
  snapshotStartS: number[];
  speedRpm: number;
  radialLoadN: number;
  /** One snapshot as a two-channel recording in g (test-h, test-v). */
  snapshot(index: number): Recording;
}

interface FemtoMeta {
  file: string;
  scale: number;
  sampleRateHz: number;
  samplesPerSnapshot: number;
  snapshots: number;
  snapshotStartS: number[];
  speedRpm: number;
  radialLoadN: number;
}

/** Whether the data set is present; callers skip with a printed note when it is not. */
export function femtoAvailable(): boolean {
  return existsSync(`${FEMTO_DIR}rig.json`) && FEMTO_BEARINGS.every((b) => existsSync(`${FEMTO_DIR}${b}.json`));
}

export function femtoRig(): MachineModel {
  return loadMachineModel(readFileSync(`${FEMTO_DIR}rig.json`, 'utf8'));
}

export function loadFemtoRun(bearing: string): FemtoRun {
  const meta = JSON.parse(readFileSync(`${FEMTO_DIR}${bearing}.json`, 'utf8')) as FemtoMeta;
  const bytes = readFileSync(`${FEMTO_DIR}${meta.file}`);
  const wide = meta.file.endsWith('.i32');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const perSnapshot = meta.samplesPerSnapshot * 2;
  const expected = meta.snapshots * perSnapshot * (wide ? 4 : 2);
  if (bytes.byteLength !== expected) throw new Error(`${meta.file}: ${bytes.byteLength} bytes, expected ${expected}`);
  return {
    bearing,
    sampleRateHz: meta.sampleRateHz,
    samplesPerSnapshot: meta.samplesPerSnapshot,
    snapshotStartS: meta.snapshotStartS,
    speedRpm: meta.speedRpm,
    radialLoadN: meta.radialLoadN,
    snapshot(index: number): Recording {
      const n = meta.samplesPerSnapshot;
      const h = new Float64Array(n);
      const v = new Float64Array(n);
      const base = index * perSnapshot;
      for (let i = 0; i < n; i++) {
        // [snapshot][sample][channel], little-endian integers in milli-g (scale 0.001)
        const k = base + 2 * i;
        h[i] = (wide ? view.getInt32(4 * k, true) : view.getInt16(2 * k, true)) * meta.scale;
        v[i] = (wide ? view.getInt32(4 * (k + 1), true) : view.getInt16(2 * (k + 1), true)) * meta.scale;
      }
      return {
        sampleRateHz: meta.sampleRateHz,
        channels: [{ name: 'test-h', unit: 'g', samples: h }, { name: 'test-v', unit: 'g', samples: v }],
        metadata: { bearing, snapshot: String(index) },
      };
    },
  };
}
