import { dirname, resolve } from 'node:path';
import {
  computeIndicators,
  DiagnosisInputError,
  levelPointOf,
  thresholdOf,
  type ThresholdChoice,
} from '@kinespec/diagnosis';
import { duration, forecastCrossing, ForecastInputError, type Forecast } from '@kinespec/forecast';
import type { MachineModel } from '@kinespec/kinematics';
import { SignalInputError } from '@kinespec/signal';
import { CliError } from '../cli-error.js';
import { numberFlag, parseFlags } from '../flags.js';
import { readInputFile } from '../input-file.js';
import type { CliIo } from '../io.js';
import { loadMachineFile } from '../machine-file.js';
import { channelIndex, decoderHint, loadRecordingFile, withFileNameOnInputErrors } from '../recording-file.js';
import { significant } from '../significant-figures.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec trend <manifest.json> --machine <machine.json> --point <id> [--unit g] [--channel N|name] --indicator <name> ' +
  '[--threshold <value> | --zone B|C|D | --alarm | --trip] [--json]';

/** One line of the manifest: a recording file (relative to the manifest's folder) and when it was recorded. */
export interface ManifestEntry {
  file: string;
  recordedAt: string;
  /** recordedAt in ms since the Unix epoch. */
  atMs: number;
}

/** What `--json` prints (names are a contract: add fields, rename none). */
export interface TrendResult {
  indicator: string;
  unit: string;
  values: Array<{ recordedAt: string; value: number }>;
  forecast: {
    threshold: number;
    /** What the threshold is: 'the value given', 'the zone C boundary', 'the alarm level', 'the trip level'. */
    thresholdSource: string;
    crossingAt: string | null;
    /** From the last recording; null when no crossing is foreseen. */
    remainingS: number | null;
    lowS: number | null;
    highS: number | null;
    onsetAt: string | null;
    method: string;
    status: Forecast['status'];
    reason: string;
    /** The lasting level now (trailing median of the last three values). */
    level: number;
  };
}

// ISO 8601 date-time with a time zone (Z or ±hh:mm), as data loggers write it.
const ISO_8601 = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** Reads and checks a manifest: a JSON array of { file, recordedAt }, sorted by time; every problem names its entry. */
export function readManifest(path: string): ManifestEntry[] {
  const text = readInputFile(path, 'manifest').toString('utf8');
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (err) {
    throw new CliError(`${path}: not valid JSON (${(err as Error).message})`);
  }
  if (!Array.isArray(parsed) || parsed.length === 0) throw new CliError(`${path}: must be a non-empty JSON array of { "file": "...", "recordedAt": "ISO 8601" }`);
  const entries = parsed.map((e, i): ManifestEntry => {
    if (typeof e !== 'object' || e === null) throw new CliError(`${path}: entry ${i + 1} must be an object { file, recordedAt }`);
    const { file, recordedAt } = e as Record<string, unknown>;
    if (typeof file !== 'string' || file.trim() === '') throw new CliError(`${path}: entry ${i + 1}: "file" must name a recording file`);
    if (typeof recordedAt !== 'string' || !ISO_8601.test(recordedAt) || Number.isNaN(Date.parse(recordedAt))) {
      throw new CliError(`${path}: entry ${i + 1}: "recordedAt" must be an ISO 8601 date-time with a time zone, e.g. 2025-03-14T08:00:00Z (got ${JSON.stringify(recordedAt)})`);
    }
    return { file: resolve(dirname(path), file), recordedAt, atMs: Date.parse(recordedAt) };
  });
  entries.sort((a, b) => a.atMs - b.atMs);
  for (let i = 1; i < entries.length; i++) {
    if (entries[i]!.atMs === entries[i - 1]!.atMs) throw new CliError(`${path}: two recordings at ${entries[i]!.recordedAt} (${entries[i - 1]!.file} and ${entries[i]!.file}); one value per time`);
  }
  return entries;
}

function thresholdChoice(v: { threshold?: string; zone?: string; alarm?: boolean; trip?: boolean }): ThresholdChoice {
  const given = [v.threshold !== undefined, v.zone !== undefined, v.alarm === true, v.trip === true].filter(Boolean).length;
  if (given !== 1) throw new CliError(`give exactly one of --threshold <value>, --zone B|C|D, --alarm, --trip (usage: ${USAGE})`);
  if (v.threshold !== undefined) return { value: numberFlag('threshold', v.threshold, Number.isFinite, "a number in the indicator's unit")! };
  if (v.zone !== undefined) {
    const zone = v.zone.toUpperCase();
    if (zone !== 'B' && zone !== 'C' && zone !== 'D') throw new CliError(`--zone must be B, C or D, the zone whose lower boundary is the threshold (got '${v.zone}')`);
    return { zone };
  }
  return { level: v.alarm ? 'alarm' : 'trip' };
}

/**
 * The indicator of every recording of the manifest, in time order, and the forecast of its crossing of the
 * threshold. Each recording is decoded and only what the indicator needs is computed (computeIndicators).
 */
export function trendOfManifest(
  entries: readonly ManifestEntry[],
  options: { model: MachineModel; pointId: string; indicator: string; choice: ThresholdChoice; unit?: string; channel?: string },
): TrendResult {
  const point = levelPointOf(options.model, options.pointId);
  if (!point) throw new CliError(`--point '${options.pointId}' is not a point of machine '${options.model.id}' (points: ${options.model.points.map((p) => p.id).join(', ')})`);
  const threshold = withInputErrors(() => thresholdOf(options.indicator, point, options.choice));
  const hint = decoderHint(undefined, options.unit);
  const values: TrendResult['values'] = [];
  let unit = '';
  for (const e of entries) {
    const computed = withFileNameOnInputErrors(
      e.file,
      () => {
        const recording = loadRecordingFile(e.file, hint);
        const channel = options.channel === undefined ? undefined : channelIndex(recording, options.channel, 'channel');
        return computeIndicators(recording, [options.indicator], { model: options.model, pointId: options.pointId, ...(channel !== undefined ? { channel } : {}) });
      },
      [SignalInputError, DiagnosisInputError],
    );
    const value = computed.values[options.indicator];
    if (value === undefined) throw new CliError(`${e.file}: the analysis gives no '${options.indicator}' for this recording (a score needs a fault the model makes possible)`);
    unit = computed.units[options.indicator]!;
    values.push({ recordedAt: e.recordedAt, value });
  }
  const series = entries.map((e, i) => ({ tS: e.atMs / 1000, value: values[i]!.value }));
  const f = series.length >= 2
    ? withInputErrors(() => forecastCrossing(series, threshold.value))
    : null;
  const iso = (tS: number | null) => (tS === null ? null : new Date(Math.round(tS * 1000)).toISOString());
  return {
    indicator: options.indicator,
    unit,
    values,
    forecast: {
      threshold: threshold.value,
      thresholdSource: threshold.label,
      crossingAt: f ? iso(f.crossingTS) : null,
      remainingS: f?.remainingS ?? null,
      lowS: f?.lowS ?? null,
      highS: f?.highS ?? null,
      onsetAt: f?.onset ? iso(f.onset.tS) : null,
      method: f?.method ?? 'no forecast: a trend needs at least two recordings',
      status: f?.status ?? 'no-crossing',
      reason: f?.reason ?? 'no crossing foreseen: a trend needs at least two recordings',
      level: f?.level ?? values[values.length - 1]!.value,
    },
  };
}

function withInputErrors<T>(work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof DiagnosisInputError || err instanceof ForecastInputError) throw new CliError(err.message);
    throw err;
  }
}

/** The human summary: the series, the threshold and the forecast. */
export function formatTrend(r: TrendResult, context: { machine: string; point: string }): string {
  const u = (x: number) => `${significant(x, 3)} ${r.unit === '1' ? '' : r.unit}`.trim();
  const sorted = r.values.map((v) => v.value).sort((a, b) => a - b);
  const median = sorted[Math.floor((sorted.length - 1) / 2)]!;
  const last = r.values[r.values.length - 1]!;
  const f = r.forecast;
  const lines = [
    `${r.indicator} at point '${context.point}' of '${context.machine}': ${r.values.length} recording${r.values.length === 1 ? '' : 's'}, ${r.values[0]!.recordedAt} .. ${last.recordedAt}`,
    `  min ${u(sorted[0]!)}, median ${u(median)}, max ${u(sorted[sorted.length - 1]!)}; last ${u(last.value)}, lasting level ${u(f.level)}`,
    `threshold: ${u(f.threshold)} (${f.thresholdSource})`,
  ];
  if (f.onsetAt) lines.push(`onset of the current rise: ${f.onsetAt}`);
  if (f.status === 'crossing') {
    const interval = `10-90 %: ${f.lowS === null ? '-' : duration(f.lowS)} .. ${f.highS === null ? 'beyond the horizon' : duration(f.highS)}`;
    lines.push(`crossing foreseen in about ${duration(f.remainingS!)} (${interval}), around ${f.crossingAt}`);
  } else if (f.status === 'crossed') {
    lines.push(`crossed: ${f.reason}`);
  } else {
    lines.push(f.reason);
  }
  lines.push(`method: ${f.method}`);
  lines.push('A forecast supports, and never replaces, the judgement of a qualified engineer on site; plan the stop with the machine maker\'s limits and local codes.');
  return lines.join('\n');
}

export const trendVerb: Verb = {
  name: 'trend',
  summary: 'Trend one indicator over a manifest of recordings and forecast when it will cross a threshold, an ISO zone boundary, or the point\'s alarm or trip level',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    const { values: v, positionals } = parseFlags(
      args,
      {
        machine: { type: 'string' },
        point: { type: 'string' },
        unit: { type: 'string' },
        channel: { type: 'string' },
        indicator: { type: 'string' },
        threshold: { type: 'string' },
        zone: { type: 'string' },
        alarm: { type: 'boolean' },
        trip: { type: 'boolean' },
        json: { type: 'boolean' },
      },
      USAGE,
    );
    if (positionals.length !== 1) throw new CliError(`one manifest file is required (usage: ${USAGE})`);
    if (v.machine === undefined) throw new CliError(`--machine <machine.json> is required (usage: ${USAGE})`);
    if (v.point === undefined) throw new CliError(`--point <id> is required (usage: ${USAGE})`);
    if (v.indicator === undefined) throw new CliError(`--indicator <name> is required, e.g. velocity_rms_mm_per_s or acceleration_peak (usage: ${USAGE})`);
    const choice = thresholdChoice(v);
    const entries = readManifest(positionals[0]!);
    const model = loadMachineFile(v.machine, io);
    const result = trendOfManifest(entries, {
      model,
      pointId: v.point,
      indicator: v.indicator,
      choice,
      ...(v.unit !== undefined ? { unit: v.unit } : {}),
      ...(v.channel !== undefined ? { channel: v.channel } : {}),
    });
    io.out(v.json ? JSON.stringify(result, null, 2) : formatTrend(result, { machine: model.id, point: v.point }));
    return 0;
  },
};
