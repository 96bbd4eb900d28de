// The femto-learning runs to failure (../shared/datasets/femto-learning, see its README): six bearings of the
// PRONOSTIA accelerated life tests, IEEE PHM 2012 challenge learning set (P. Nectoux et al., IEEE PHM 2012).
// Read through the eval's datasets.ts (from beside the repository, never copied into it).
import { join } from 'node:path';
import type { MachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';
import { datasetDir, datasetsDir, readFemtoSnapshot, readJson, readRig, type FemtoBearing } from '../datasets.js';

export const FEMTO_BEARINGS = ['Bearing1_1', 'Bearing1_2', 'Bearing2_1', 'Bearing2_2', 'Bearing3_1', 'Bearing3_2'] as const;

/** Where the data set is looked for (for the note printed when it is absent). */
export function femtoDir(): string {
  return join(datasetsDir(), 'femto-learning');
}

/** Whether the data set is present; callers skip with a printed note when it is not. */
export function femtoAvailable(): boolean {
  return datasetDir('femto-learning').dir !== null;
}

function dir(): string {
  const found = datasetDir('femto-learning');
  if (found.dir === null) throw new Error(found.reason);
  return found.dir;
}

export function femtoRig(): MachineModel {
  return readRig(dir());
}

export interface FemtoRun {
  bearing: string;
  /** Start of each snapshot, s from the first. */
  snapshotStartS: number[];
  /** One snapshot as a two-channel recording in g (test-h, test-v). */
  snapshot(index: number): Recording;
}

export function loadFemtoRun(bearing: string): FemtoRun {
  const d = dir();
  const meta = readJson<FemtoBearing>(join(d, `${bearing}.json`));
  return { bearing, snapshotStartS: meta.snapshotStartS, snapshot: (index) => readFemtoSnapshot(d, meta, index) };
}
