// Where the public recordings live and how to read them. They stay in ../shared/datasets beside the repository
// (never copied into it); see that folder's README.md for formats, sources and citations.
import { closeSync, existsSync, openSync, readFileSync, readSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import { decodeWav, type Recording } from '@kinespec/signal';

/** The repository root (this file is tests/eval/datasets.ts), so the path holds in any clone placed beside ../shared. */
const REPO_ROOT = resolve(fileURLToPath(new URL('.', import.meta.url)), '../..');

/** ../shared/datasets from the repository root; KINESPEC_DATASETS_DIR overrides it (a copy elsewhere). */
export function datasetsDir(): string {
  return process.env.KINESPEC_DATASETS_DIR ?? resolve(REPO_ROOT, '../shared/datasets');
}

/** The folder of one data set, or null (with the reason) when it is absent. */
export function datasetDir(name: string): { dir: string } | { dir: null; reason: string } {
  const dir = join(datasetsDir(), name);
  if (!existsSync(join(dir, 'rig.json'))) return { dir: null, reason: `${dir} not found (the public recordings live in ../shared/datasets beside the repository)` };
  return { dir };
}

export function readRig(dir: string): MachineModel {
  return loadMachineModel(readFileSync(join(dir, 'rig.json'), 'utf8'), 'json');
}

export function readJson<T>(path: string): T {
  return JSON.parse(readFileSync(path, 'utf8')) as T;
}

/** A float32 WAV already in engineering units (cwru-load1, ims-healthy): the unit and channel names from labels.json. */
export function readWav(path: string, unit: string, channelNames: readonly string[]): Recording {
  return decodeWav(new Uint8Array(readFileSync(path)), { unit, channelNames });
}

/** One bearing of femto-learning (`BearingX_Y.json` beside its samples). */
export interface FemtoBearing {
  bearing: string;
  file: string;
  dtype: string;
  scale: number;
  unit: string;
  sampleRateHz: number;
  samplesPerSnapshot: number;
  snapshots: number;
  snapshotStartS: number[];
  speedRpm: number;
  radialLoadN: number;
}

/**
 * Snapshots of one femto-learning bearing as two-channel recordings (horizontal, vertical), read from the integer
 * file by offset: little-endian milli-g laid out [snapshot][sample][channel], times `scale` to g.
 */
export function readFemtoSnapshot(dir: string, meta: FemtoBearing, snapshot: number): Recording {
  const bytesPerValue = meta.dtype.startsWith('int16') ? 2 : meta.dtype.startsWith('int32') ? 4 : Number.NaN;
  if (!Number.isFinite(bytesPerValue) || !meta.dtype.includes('little')) throw new Error(`${meta.bearing}: dtype '${meta.dtype}' is not read here`);
  if (!(snapshot >= 0 && snapshot < meta.snapshots)) throw new RangeError(`${meta.bearing}: snapshot ${snapshot} is outside 0..${meta.snapshots - 1}`);
  const n = meta.samplesPerSnapshot;
  const bytes = Buffer.alloc(n * 2 * bytesPerValue);
  const fd = openSync(join(dir, meta.file), 'r');
  try {
    const read = readSync(fd, bytes, 0, bytes.length, snapshot * bytes.length);
    if (read !== bytes.length) throw new Error(`${meta.file}: snapshot ${snapshot} is truncated (${read} of ${bytes.length} bytes)`);
  } finally {
    closeSync(fd);
  }
  const horizontal = new Float64Array(n);
  const vertical = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const at = i * 2 * bytesPerValue;
    const h = bytesPerValue === 2 ? bytes.readInt16LE(at) : bytes.readInt32LE(at);
    const v = bytesPerValue === 2 ? bytes.readInt16LE(at + bytesPerValue) : bytes.readInt32LE(at + bytesPerValue);
    horizontal[i] = h * meta.scale;
    vertical[i] = v * meta.scale;
  }
  return {
    sampleRateHz: meta.sampleRateHz,
    channels: [
      { name: 'test-h', unit: meta.unit, samples: horizontal },
      { name: 'test-v', unit: meta.unit, samples: vertical },
    ],
    metadata: { source: `femto-learning/${meta.file}`, snapshot: String(snapshot), startS: String(meta.snapshotStartS[snapshot]) },
  };
}
