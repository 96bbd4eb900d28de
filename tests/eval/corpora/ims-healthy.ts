// ims-healthy: the first hours of IMS bearing data set 1, all four bearings new (../shared/datasets/ims-healthy;
// J. Qiu, J. Lee, J. Lin, G. Yu, J. Sound Vib. 289 (2006) 1066-1090).
import { join } from 'node:path';
import type { Corpus, LabelledCase } from '../corpus.js';
import { datasetDir, readJson, readRig, readWav } from '../datasets.js';

interface ImsLabel {
  file: string;
  sampleRateHz: number;
  channels: string[];
  unit: string;
  speedRpm: number;
  fault: string | null;
  recordedAt: string;
}

export const IMS_SOURCE =
  'NSF I/UCR Center for Intelligent Maintenance Systems, bearing data set 1, first hours (../shared/datasets/ims-healthy); ' +
  'Qiu, Lee, Lin, Yu, J. Sound Vib. 289 (2006) 1066-1090';

/**
 * Ten snapshots × four bearings = 40 healthy point-recordings. The rig model has one radial point per bearing
 * (`near` the bearing); each is read on that bearing's x channel ('b1-x' … 'b4-x', the first of its pair). The
 * source states no unit (read as g, see the data set's README); the speed is given: 2000 rpm as the source states.
 */
export function imsCorpus(): Corpus {
  return {
    id: 'ims-healthy',
    title: "ims-healthy, each bearing's x channel at its point (speed given, 2000 rpm)",
    source: IMS_SOURCE,
    async load(options) {
      const found = datasetDir('ims-healthy');
      if (found.dir === null) return { available: false, reason: found.reason };
      const dir = found.dir;
      const machine = readRig(dir);
      const labels = readJson<ImsLabel[]>(join(dir, 'labels.json'));
      const unit = 'g';
      function* cases(): Generator<LabelledCase> {
        for (const l of options.quick ? labels.slice(0, 2) : labels) {
          const recording = readWav(join(dir, l.file), unit, l.channels);
          for (const point of machine.points) {
            const channel = l.channels.indexOf(`${point.near ?? point.id}-x`);
            if (channel < 0) throw new Error(`ims-healthy ${l.file}: no x channel for point '${point.id}'`);
            yield {
              id: `ims-healthy/${l.file.replace(/\.wav$/, '')}/${point.id}`,
              machine,
              pointId: point.id,
              recording,
              label: { faults: [], speedRpm: l.speedRpm, speedGiven: true },
              analysis: { channel },
              tags: { snapshot: l.file, point: point.id },
            };
          }
        }
      }
      return { available: true, cases: cases(), notes: ['unit not stated by the source; read as g (levels are not judged here, only false alarms)'] };
    },
  };
}
