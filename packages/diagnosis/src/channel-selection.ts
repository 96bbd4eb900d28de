import type { MachineModel, Point } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';
import { isMotionUnit } from '@kinespec/signal';
import { DiagnosisInputError } from './errors.js';

/**
 * Which channels of a recording the analysis reads, and which point of the model it reads them as. Channels are
 * numbered from 0 in code and from 1 in every message a person reads.
 */
export interface ChannelChoice {
  channel?: number;
  tachChannel?: number;
}

export function defaultUnit(quantity: 'acceleration' | 'velocity' | 'displacement'): string {
  return quantity === 'acceleration' ? 'g' : quantity === 'velocity' ? 'mm/s' : 'um';
}

export function tachChannelOf(recording: Recording, model: MachineModel | null, options: ChannelChoice): number | null {
  const n = recording.channels.length;
  if (options.tachChannel !== undefined) {
    if (!(Number.isInteger(options.tachChannel) && options.tachChannel >= 0 && options.tachChannel < n)) {
      throw new DiagnosisInputError('unknown_channel', `tach channel ${options.tachChannel + 1} does not exist: the recording has channels 1..${n}`);
    }
    return options.tachChannel;
  }
  for (const key of ['tachChannel', 'encoderChannel']) {
    const v = recording.metadata?.[key];
    if (v !== undefined && /^\d+$/.test(v) && Number(v) < n && Number(v) !== options.channel) return Number(v);
  }
  if (model) {
    const pulsePoints = new Set(model.points.filter((p) => p.quantity === 'tach' || p.quantity === 'encoder').map((p) => p.id));
    const i = recording.channels.findIndex((c, k) => k !== options.channel && pulsePoints.has(c.name));
    if (i >= 0) return i;
  }
  return null;
}

export function vibrationChannelOf(recording: Recording, channel: number | undefined, tachIndex: number | null): number {
  const n = recording.channels.length;
  if (channel !== undefined) {
    if (!(Number.isInteger(channel) && channel >= 0 && channel < n)) {
      throw new DiagnosisInputError('unknown_channel', `channel ${channel + 1} does not exist: the recording has channels 1..${n}`);
    }
    if (channel === tachIndex) throw new DiagnosisInputError('unknown_channel', `channel ${channel + 1} is the tach channel; give the vibration channel`);
    return channel;
  }
  const i = recording.channels.findIndex((c, k) => k !== tachIndex && isMotionUnit(c.unit));
  if (i >= 0) return i;
  const j = recording.channels.findIndex((_, k) => k !== tachIndex);
  if (j < 0) throw new DiagnosisInputError('unknown_channel', 'the recording has no vibration channel besides the tach channel');
  return j;
}

export function pointOf(model: MachineModel | null, pointId: string | undefined, channelName: string, warnings: string[]): Point | null {
  if (!model) return null;
  const vibration = model.points.filter((p) => p.quantity !== 'tach' && p.quantity !== 'encoder');
  if (pointId !== undefined) {
    const p = model.points.find((q) => q.id === pointId);
    if (!p) throw new DiagnosisInputError('unknown_point', `pointId '${pointId}' is not a point of machine '${model.id}' (points: ${model.points.map((q) => q.id).join(', ')})`);
    if (p.quantity === 'tach' || p.quantity === 'encoder') throw new DiagnosisInputError('unknown_point', `pointId '${pointId}' is a ${p.quantity} point; give a vibration point`);
    return p;
  }
  const named = vibration.find((p) => p.id === channelName);
  if (named) return named;
  if (vibration.length === 0) return null;
  if (vibration.length > 1) warnings.push(`no point given; analysed as point '${vibration[0]!.id}' (the model's first vibration point)`);
  return vibration[0]!;
}


/** The channel an analysis reads, the point it reads it as, and the unit its samples are in. */
export interface ChannelReading {
  sampleRateHz: number;
  tachIndex: number | null;
  channelIndex: number;
  channelName: string;
  samples: Float64Array;
  point: Point | null;
  unit: string;
}

/** Fewest samples a channel must hold to be analysed. */
export const MIN_ANALYSIS_SAMPLES = 1024;

/**
 * The first stage of every analysis (analyseRecording, computeIndicators): checks the recording, picks the vibration
 * channel and the tach channel, the point it is read as, and its unit; a channel without a vibration unit is read in
 * the point's unit, with a warning.
 */
export function readChannel(recording: Recording, model: MachineModel | null, options: ChannelChoice & { pointId?: string }, warnings: string[]): ChannelReading {
  if (!recording || !Array.isArray(recording.channels) || recording.channels.length === 0) {
    throw new DiagnosisInputError('empty_recording', 'recording must hold at least one channel');
  }
  const fs = recording.sampleRateHz;
  if (!(Number.isFinite(fs) && fs > 0)) throw new DiagnosisInputError('invalid_argument', `sampleRateHz (${fs}) must be a finite number > 0`);
  const tachIndex = tachChannelOf(recording, model, options);
  const channelIndex = vibrationChannelOf(recording, options.channel, tachIndex);
  const channel = recording.channels[channelIndex]!;
  const point = pointOf(model, options.pointId, channel.name, warnings);
  let unit = channel.unit;
  if (!isMotionUnit(unit)) {
    const fallback = point?.unit ?? (point && point.quantity !== 'tach' && point.quantity !== 'encoder' ? defaultUnit(point.quantity) : null);
    if (!fallback) {
      throw new DiagnosisInputError('invalid_argument', `channel ${channelIndex + 1} ('${channel.name}') has unit '${unit}', which is not a vibration unit; give the unit when uploading`);
    }
    warnings.push(`channel ${channelIndex + 1} ('${channel.name}') has no vibration unit ('${unit}'); read in the point's unit '${fallback}'`);
    unit = fallback;
  }
  const samples = channel.samples;
  if (samples.length < MIN_ANALYSIS_SAMPLES) {
    throw new DiagnosisInputError('invalid_argument', `channel ${channelIndex + 1} has ${samples.length} samples; an analysis needs at least ${MIN_ANALYSIS_SAMPLES}`);
  }
  return { sampleRateHz: fs, tachIndex, channelIndex, channelName: channel.name, samples, point, unit };
}
