// femto-learning: PRONOSTIA run-to-failure tests, learning set of the IEEE PHM 2012 challenge
// (../shared/datasets/femto-learning; P. Nectoux et al., "PRONOSTIA: an experimental platform for bearings
// accelerated degradation tests", IEEE PHM 2012).
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Corpus, LabelledCase } from '../corpus.js';
import { datasetDir, readFemtoSnapshot, readJson, readRig, type FemtoBearing } from '../datasets.js';

export const FEMTO_SOURCE =
  'FEMTO-ST PRONOSTIA, IEEE PHM 2012 challenge learning set (../shared/datasets/femto-learning); ' +
  'Nectoux et al., "PRONOSTIA: an experimental platform for bearings accelerated degradation tests", IEEE PHM 2012';

/** The healthy stretch: snapshots that start within the first hour of a run (a run lasts hours; failures come at the end). */
export const FEMTO_FIRST_HOUR_S = 3600;
/** Every 60th snapshot of the first hour (one each 10 minutes, snapshots every 10 s): 6 per bearing. */
export const FEMTO_FIRST_HOUR_STEP = 60;
/** The last snapshots of each run, reported only: the bearing is badly damaged, the defect's kind is not labelled. */
export const FEMTO_END_SNAPSHOTS = 3;

function bearings(dir: string): FemtoBearing[] {
  return readdirSync(dir)
    .filter((f) => /^Bearing\d+_\d+\.json$/.test(f))
    .sort()
    .map((f) => readJson<FemtoBearing>(join(dir, f)));
}

/**
 * Every snapshot is read on both accelerometers at the rig model's points 'test-h' and 'test-v', with the speed
 * the test conditions state (1800, 1650 or 1500 rpm) given to the analysis.
 */
function femtoCorpus(phase: 'first-hour' | 'end'): Corpus {
  return {
    id: phase === 'first-hour' ? 'femto-first-hour' : 'femto-end',
    title:
      phase === 'first-hour'
        ? `femto-learning, first hour of each bearing (every ${FEMTO_FIRST_HOUR_STEP}th snapshot, both channels; speed given)`
        : `femto-learning, last ${FEMTO_END_SNAPSHOTS} snapshots of each run (badly damaged; reported, no goal)`,
    source: FEMTO_SOURCE,
    async load(options) {
      const found = datasetDir('femto-learning');
      if (found.dir === null) return { available: false, reason: found.reason };
      const dir = found.dir;
      const machine = readRig(dir);
      const all = bearings(dir);
      function* cases(): Generator<LabelledCase> {
        for (const meta of options.quick ? all.slice(0, 2) : all) {
          const picked: number[] = [];
          if (phase === 'first-hour') {
            for (let s = 0; s < meta.snapshots && meta.snapshotStartS[s]! < FEMTO_FIRST_HOUR_S; s += FEMTO_FIRST_HOUR_STEP) picked.push(s);
          } else {
            for (let s = Math.max(0, meta.snapshots - FEMTO_END_SNAPSHOTS); s < meta.snapshots; s++) picked.push(s);
          }
          for (const snapshot of options.quick ? picked.slice(0, 2) : picked) {
            const recording = readFemtoSnapshot(dir, meta, snapshot);
            for (const [channel, pointId] of ['test-h', 'test-v'].entries()) {
              if (!machine.points.some((p) => p.id === pointId)) throw new Error(`femto-learning rig model has no point '${pointId}'`);
              yield {
                id: `femto-learning/${meta.bearing}/${snapshot}/${pointId}`,
                machine,
                pointId,
                recording,
                label: { faults: [], speedRpm: meta.speedRpm, speedGiven: true },
                analysis: { channel },
                tags: {
                  bearing: meta.bearing,
                  snapshot: String(snapshot),
                  startS: String(meta.snapshotStartS[snapshot]),
                  point: pointId,
                  state: phase === 'first-hour' ? 'first hour (healthy)' : `end of run, ${((meta.snapshotStartS.at(-1)! - meta.snapshotStartS[snapshot]!) / 60).toFixed(1)} min before the stop (damaged, kind not labelled)`,
                },
                ...(phase === 'end' ? { reportOnly: true } : {}),
              };
            }
          }
        }
      }
      return { available: true, cases: cases() };
    },
  };
}

export const femtoFirstHourCorpus = (): Corpus => femtoCorpus('first-hour');
export const femtoEndCorpus = (): Corpus => femtoCorpus('end');
