import { basename } from 'node:path';
import { gearSynchronousAverages, type GearTsa } from '@kinespec/diagnosis';
import { MachineModelError, shaftRatios, type MachineModel } from '@kinespec/kinematics';
import {
  detectPulses,
  findPeaks,
  isMotionUnit,
  normalizeUnit,
  orderSpectrum,
  resampleToAngle,
  scaleShaftAngle,
  shaftAngleFromPulses,
  speedFromPulses,
  type AngleInterpolation,
  type Channel,
  type Recording,
  type SpectrumScaling,
} from '@kinespec/signal';
import { CliError } from '../cli-error.js';
import { oneOf, parseFlags, positiveNumber, wholeNumber } from '../flags.js';
import { loadMachineFile } from '../machine-file.js';
import { decoderHint, loadRecordingFile, recordingFileArgument, selectChannel, withFileNameOnInputErrors, type DecoderHint, recordingHintFlags } from '../recording-file.js';
import { significant } from '../significant-figures.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec orders <recording> --machine <machine.json> --tach-channel N|name [--channel N|name] [--shaft id] ' +
  '[--pulses-per-rev P] [--pulse-shaft id] [--max-order K] [--samples-per-rev S] [--scaling peak|rms|psd] ' +
  '[--interpolation sinc|cubic|linear] [--tsa] [--sample-rate-hz F] [--unit g] [--json]';

const SCALINGS = ['peak', 'rms', 'psd'] as const;
const INTERPOLATIONS = ['sinc', 'cubic', 'linear'] as const;

export interface OrdersSettings {
  machinePath: string;
  tachChannel?: string;
  channel?: string;
  shaft?: string;
  pulseShaft?: string;
  pulsesPerRev?: number;
  maxOrder?: number;
  samplesPerRev?: number;
  scaling: SpectrumScaling;
  interpolation: AngleInterpolation;
  tsa: boolean;
}

/** One gear's synchronous average and its FM0 / FM4 / NA4 (from @kinespec/diagnosis). */
export type GearTsaReport = GearTsa;

export interface OrdersReport {
  file: string;
  channel: string;
  unit: string;
  tachChannel: string;
  pulseShaft: string;
  pulsesPerRev: number;
  /** Shaft whose orders are reported. */
  shaft: string;
  /** Speed of `shaft`, smoothed over one revolution of the pulse shaft. */
  speedRpm: { min: number; mean: number; max: number };
  pulses: { count: number; missing: number; extra: number; smoothing: string };
  samplesPerRev: number;
  revolutions: number;
  maxOrder: number;
  orderResolution: number;
  interpolation: AngleInterpolation;
  antiAliasHz: [number, number] | null;
  scaling: SpectrumScaling;
  valueUnit: string;
  peaks: { order: number; amplitude: number; prominenceDb: number }[];
  tsa?: GearTsaReport[];
  notes: string[];
  orders: number[];
  values: number[];
}

function parseSettings(args: string[]): { file: string; settings: OrdersSettings; json: boolean; hint: DecoderHint } {
  const { values: v, positionals } = parseFlags(
    args,
    {
      machine: { type: 'string' },
      'tach-channel': { type: 'string' },
      channel: { type: 'string' },
      shaft: { type: 'string' },
      'pulse-shaft': { type: 'string' },
      'pulses-per-rev': { type: 'string' },
      'max-order': { type: 'string' },
      'samples-per-rev': { type: 'string' },
      scaling: { type: 'string' },
      interpolation: { type: 'string' },
      tsa: { type: 'boolean' },
      ...recordingHintFlags,
      json: { type: 'boolean' },
    },
    USAGE,
  );
  const file = recordingFileArgument(positionals, USAGE);
  if (v.machine === undefined) throw new CliError(`--machine <machine.json> is required: the orders are those of its shafts (usage: ${USAGE})`);
  const settings: OrdersSettings = {
    machinePath: v.machine,
    tachChannel: v['tach-channel'],
    channel: v.channel,
    shaft: v.shaft,
    pulseShaft: v['pulse-shaft'],
    pulsesPerRev: wholeNumber('pulses-per-rev', v['pulses-per-rev'], 1),
    maxOrder: positiveNumber('max-order', v['max-order'], 'an order > 0'),
    samplesPerRev: wholeNumber('samples-per-rev', v['samples-per-rev'], 8),
    scaling: oneOf('scaling', v.scaling, SCALINGS, 'peak'),
    interpolation: oneOf('interpolation', v.interpolation, INTERPOLATIONS, 'sinc'),
    tsa: v.tsa === true,
  };
  return { file, settings, json: v.json === true, hint: decoderHint(v['sample-rate-hz'], v.unit) };
}

/**
 * The pulse channel: --tach-channel (a name or a 1-based number), else the channel the recording's
 * metadata names (tachChannel / encoderChannel, 0-based as the simulator and loggers write it), else a
 * channel named after a tach or encoder point of the model.
 */
function pulseChannelOf(recording: Recording, model: MachineModel, selector: string | undefined): Channel {
  if (selector !== undefined) return selectChannel(recording, selector, 'tach-channel');
  for (const key of ['tachChannel', 'encoderChannel']) {
    const index = Number(recording.metadata[key]);
    if (recording.metadata[key] !== undefined && Number.isInteger(index) && recording.channels[index]) return recording.channels[index];
  }
  const named = recording.channels.find((c) => model.points.some((p) => p.id === c.name && (p.quantity === 'tach' || p.quantity === 'encoder')));
  if (named) return named;
  throw new CliError('no tach or encoder channel found: give --tach-channel N (1-based) or the channel name');
}

/** Pulses per revolution and shaft of the pulse channel: flags, then the model's point of that name, then metadata, then 1 per rev of the reference shaft. */
function pulseGeometry(recording: Recording, model: MachineModel, channel: Channel, settings: OrdersSettings): { ppr: number; shaft: string } {
  const point = model.points.find((p) => p.id === channel.name && (p.quantity === 'tach' || p.quantity === 'encoder'));
  const index = recording.channels.indexOf(channel);
  const meta = (key: 'tach' | 'encoder', field: 'PulsesPerRev' | 'Shaft') =>
    recording.metadata[`${key}Channel`] === String(index) ? recording.metadata[`${key}${field}`] : undefined;
  const metaPpr = Number(meta('tach', 'PulsesPerRev') ?? meta('encoder', 'PulsesPerRev'));
  const ppr = settings.pulsesPerRev ?? point?.pulsesPerRev ?? (Number.isInteger(metaPpr) && metaPpr >= 1 ? metaPpr : 1);
  const shaft = settings.pulseShaft ?? point?.shaft ?? meta('tach', 'Shaft') ?? meta('encoder', 'Shaft') ?? model.speed.shaft;
  return { ppr, shaft };
}

function ratioOf(ratios: Map<string, number>, shaft: string, flag: string): number {
  const r = ratios.get(shaft);
  if (r === undefined) throw new CliError(`${flag} '${shaft}' is not a shaft of the machine (shafts: ${[...ratios.keys()].join(', ')})`);
  return r;
}

/** The whole analysis behind the verb: recording and model in, the report out. */
export function analyseOrders(recording: Recording, model: MachineModel, file: string, settings: OrdersSettings): OrdersReport {
  const notes: string[] = [];
  const fs = recording.sampleRateHz;
  const tach = pulseChannelOf(recording, model, settings.tachChannel);
  const vibration = settings.channel !== undefined ? selectChannel(recording, settings.channel) : recording.channels.find((c) => c !== tach);
  if (!vibration) throw new CliError('the recording has only the pulse channel; a vibration channel is needed beside it');
  if (vibration === tach) throw new CliError('--channel and --tach-channel name the same channel');
  const unit = isMotionUnit(vibration.unit) ? normalizeUnit(vibration.unit) : vibration.unit;

  let ratios: Map<string, number>;
  try {
    ratios = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  } catch (err) {
    if (err instanceof MachineModelError) throw new CliError(err.message);
    throw err;
  }
  const { ppr, shaft: pulseShaft } = pulseGeometry(recording, model, tach, settings);
  const shaft = settings.shaft ?? model.speed.shaft;
  const pulseRatio = ratioOf(ratios, pulseShaft, 'the pulse shaft');
  const ratio = ratioOf(ratios, shaft, '--shaft') / pulseRatio;

  const edges = detectPulses(tach.samples, fs);
  const pulses = speedFromPulses(edges.edgeTimesS, { pulsesPerRev: ppr });
  if (pulses.missingPulses > 0 || pulses.extraPulses > 0) {
    notes.push(`${pulses.missingPulses} missing and ${pulses.extraPulses} extra pulses found and corrected`);
  }
  const angle = shaftAngleFromPulses(pulses, vibration.samples.length, fs);
  const angleSignal = resampleToAngle(vibration.samples, fs, scaleShaftAngle(angle, ratio), {
    maxOrder: settings.maxOrder,
    samplesPerRev: settings.samplesPerRev,
    interpolation: settings.interpolation,
  });
  const spectrum = orderSpectrum(angleSignal, { scaling: settings.scaling, unit });
  const keep = spectrum.orders.findIndex((o) => o > angleSignal.maxOrder + 1e-9);
  const last = keep < 0 ? spectrum.orders.length : keep;
  const peaks = findPeaks(spectrum.spectrum, { count: 10, bandHz: [spectrum.orderResolution / 2, angleSignal.maxOrder] }).map((p) => ({
    order: p.frequencyHz,
    amplitude: p.amplitude,
    prominenceDb: p.prominenceDb,
  }));

  const report: OrdersReport = {
    file,
    channel: vibration.name,
    unit,
    tachChannel: tach.name,
    pulseShaft,
    pulsesPerRev: ppr,
    shaft,
    speedRpm: { min: 60 * pulses.minHz * ratio, mean: 60 * pulses.meanSpeedHz * ratio, max: 60 * pulses.maxHz * ratio },
    pulses: { count: pulses.pulseTimesS.length, missing: pulses.missingPulses, extra: pulses.extraPulses, smoothing: pulses.instantaneous.smoothing },
    samplesPerRev: angleSignal.samplesPerRev,
    revolutions: angleSignal.revolutions,
    maxOrder: angleSignal.maxOrder,
    orderResolution: spectrum.orderResolution,
    interpolation: angleSignal.interpolation,
    antiAliasHz: angleSignal.antiAliasHz,
    scaling: spectrum.scaling,
    valueUnit: spectrum.valueUnit,
    peaks,
    notes,
    orders: Array.from(spectrum.orders.subarray(0, last)),
    values: Array.from(spectrum.values.subarray(0, last)),
  };
  if (settings.tsa) {
    // every gear over its own shaft's revolutions, through the model ratio from the pulse shaft
    report.tsa = gearSynchronousAverages(vibration.samples, fs, angle, model, (id) => ratios.get(id)! / pulseRatio);
    for (const g of report.tsa) if (g.note !== undefined) notes.push(`gear '${g.gear}': ${g.note}`);
  }
  return report;
}

/** Indicators a gear's average could not give are null: printed as '-'. */
function sig(x: number | null, digits = 4): string {
  return x === null || Number.isNaN(x) ? '-' : significant(x, digits);
}

function summary(r: OrdersReport): string {
  const lines: string[] = [];
  lines.push(`${r.file}, channel '${r.channel}' (${r.unit || 'no unit'}); pulses from '${r.tachChannel}', ${r.pulsesPerRev} per rev of shaft '${r.pulseShaft}'`);
  lines.push(
    `speed of '${r.shaft}': min ${sig(r.speedRpm.min, 5)}, mean ${sig(r.speedRpm.mean, 5)}, max ${sig(r.speedRpm.max, 5)} rpm ` +
      `(${r.pulses.count} pulses, ${r.pulses.missing} missing, ${r.pulses.extra} extra)`,
  );
  lines.push(
    `order tracking: ${r.revolutions} revolutions at ${r.samplesPerRev} samples/rev (${r.interpolation}), orders up to ${sig(r.maxOrder)}, ` +
      `resolution ${sig(r.orderResolution)} order`,
  );
  const label = r.scaling === 'psd' ? r.valueUnit : `${r.unit} ${r.scaling}`;
  if (r.peaks.length === 0) lines.push('no order stands 6 dB above the noise floor');
  else {
    lines.push(`strongest orders (${label}):`);
    for (const p of r.peaks.slice(0, 8)) lines.push(`  order ${sig(p.order, 5).padStart(9)}  ${sig(p.amplitude)}`);
  }
  if (r.tsa) {
    lines.push('synchronous average per gear (FM4 and NA4 near 3 for a healthy gear):');
    lines.push('  gear                 shaft            teeth  averages   FM0     FM4     NA4');
    for (const g of r.tsa) {
      lines.push(
        `  ${g.gear.padEnd(20)} ${g.shaft.padEnd(16)} ${String(g.teeth).padStart(5)} ${String(g.averages).padStart(9)} ` +
          `${sig(g.fm0, 3).padStart(7)} ${sig(g.fm4, 3).padStart(7)} ${sig(g.na4, 3).padStart(7)}`,
      );
    }
  }
  for (const note of r.notes) lines.push(`note: ${note}`);
  return lines.join('\n');
}

export const ordersVerb: Verb = {
  name: 'orders',
  summary:
    'order spectrum of a vibration channel resampled to shaft angle from a tach or encoder channel (computed order tracking), ' +
    'with the speed profile and, with --tsa, the synchronous average of every gear and its FM0, FM4 and NA4.\n' +
    'Orders are of --shaft (default the model\'s reference shaft); the pulse channel reads one pulse per rev of the reference ' +
    'shaft unless --pulses-per-rev / --pulse-shaft or the model\'s tach or encoder point of that name say otherwise. ' +
    'Channels are given by name or 1-based number. Default scaling peak.',
  usage: USAGE,
  async run(args, io) {
    const { file, settings, json, hint } = parseSettings(args);
    const model = loadMachineFile(settings.machinePath, io);
    const report = withFileNameOnInputErrors(file, () => analyseOrders(loadRecordingFile(file, hint), model, basename(file), settings));
    io.out(json ? JSON.stringify(report) : summary(report));
    return 0;
  },
};
