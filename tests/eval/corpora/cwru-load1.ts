// cwru-load1: seeded bearing defects of the Case Western Reserve University Bearing Data Center, load 1 hp
// (../shared/datasets/cwru-load1; W. A. Smith and R. B. Randall, MSSP 64-65 (2015) 100-131, benchmark study).
import { join } from 'node:path';
import type { Corpus, LabelledCase } from '../corpus.js';
import { datasetDir, readJson, readRig, readWav } from '../datasets.js';

interface CwruLabel {
  file: string;
  channels: string[];
  unit: string;
  sampleRateHz: number;
  speedRpm: number;
  fault: string;
  component: string;
  faultDiameterIn: number;
  loadHp: number;
  record: string;
}

export const CWRU_SOURCE =
  'Case Western Reserve University Bearing Data Center, 12 kHz drive-end records at 1 hp (../shared/datasets/cwru-load1); ' +
  'Smith & Randall, "Rolling element bearing diagnostics using the CWRU data: a benchmark study", MSSP 64-65 (2015) 100-131';

/**
 * The nine seeded-defect records read on one channel at the rig model's point for it: 'de' (the drive-end
 * accelerometer, at the defective bearing) or 'fe' (the fan-end one, across the motor). The speed is given as a
 * user would read it: the rpm each record states.
 */
export function cwruCorpus(channel: 'de' | 'fe'): Corpus {
  return {
    id: `cwru-${channel}`,
    title: `cwru-load1, ${channel === 'de' ? 'drive-end' : 'fan-end'} channel at point '${channel}' (speed given from the record)`,
    source: CWRU_SOURCE,
    async load() {
      const found = datasetDir('cwru-load1');
      if (found.dir === null) return { available: false, reason: found.reason };
      const dir = found.dir;
      const machine = readRig(dir);
      const point = machine.points.find((p) => p.id === channel) ?? machine.points.find((p) => p.near === channel);
      if (!point) return { available: false, reason: `the rig model of cwru-load1 has no point for the '${channel}' channel` };
      const labels = readJson<CwruLabel[]>(join(dir, 'labels.json'));
      function* cases(): Generator<LabelledCase> {
        for (const l of labels) {
          const channelIndex = l.channels.indexOf(channel);
          if (channelIndex < 0) continue;
          yield {
            id: `cwru-load1/${l.record}/${channel}`,
            machine,
            pointId: point!.id,
            recording: readWav(join(dir, l.file), l.unit, l.channels),
            label: { faults: [{ fault: l.fault, component: l.component, severity: null }], speedRpm: l.speedRpm, speedGiven: true },
            analysis: { channel: channelIndex },
            tags: { record: l.record, diameterIn: String(l.faultDiameterIn), channel },
          };
        }
      }
      return { available: true, cases: cases() };
    },
  };
}
