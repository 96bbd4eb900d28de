import { shaftRatios, type MachineModel } from '@kinespec/kinematics';
import { detectPulses, speedFromPulses, type PulseSpeed, type Recording } from '@kinespec/signal';
import type { SpeedSource } from './recording-analysis.js';

export interface TachSpeed {
  speedHz: number;
  uncertaintyHz: number;
  source: SpeedSource;
  /** Smoothed speed spread over the record (max − min), Hz of the reference shaft. */
  spreadHz: number;
  pulses: PulseSpeed;
}

/**
 * Reference-shaft speed from a tach or encoder channel: pulses by a Schmitt trigger, then revolutions over
 * time (@kinespec/signal angle area). One pulse per revolution of the reference shaft unless `pulsesPerRev`
 * says otherwise or the channel is named after a tach/encoder point of the model (its shaft and pulses per rev).
 * Returns null (with a warning) when the channel holds too few pulses to give a speed.
 */
export function speedFromTach(
  recording: Recording,
  tachIndex: number,
  model: MachineModel,
  pulsesPerRev: number | undefined,
  warnings: string[],
): TachSpeed | null {
  const channel = recording.channels[tachIndex]!;
  const point = model.points.find((p) => p.id === channel.name && (p.quantity === 'tach' || p.quantity === 'encoder'));
  const metaPpr = Number(recording.metadata?.tachChannel === String(tachIndex) ? recording.metadata.tachPulsesPerRev : recording.metadata?.encoderChannel === String(tachIndex) ? recording.metadata.encoderPulsesPerRev : Number.NaN);
  const ppr = pulsesPerRev ?? point?.pulsesPerRev ?? (Number.isInteger(metaPpr) && metaPpr > 0 ? metaPpr : 1);
  const shaft = point?.shaft ?? (recording.metadata?.tachChannel === String(tachIndex) ? recording.metadata.tachShaft : recording.metadata?.encoderShaft) ?? model.speed.shaft;
  const ratioOfShaft = shaftRatios(model).find((r) => r.shaft === shaft)?.ratio;
  if (ratioOfShaft === undefined) {
    warnings.push(`the tach channel reads shaft '${shaft}', which the model does not have; read as the reference shaft`);
  }
  const ratio = 1 / (ratioOfShaft ?? 1);
  let pulses: PulseSpeed;
  try {
    const edges = detectPulses(channel.samples, recording.sampleRateHz);
    if (edges.edgeTimesS.length < 2 * ppr + 1) {
      warnings.push(`tach channel ${tachIndex} holds ${edges.edgeTimesS.length} pulses, too few for a speed; speed taken from the spectrum`);
      return null;
    }
    pulses = speedFromPulses(edges.edgeTimesS, { pulsesPerRev: ppr, ratio });
  } catch (err) {
    warnings.push(`tach channel ${tachIndex} gives no speed (${err instanceof Error ? err.message : String(err)}); speed taken from the spectrum`);
    return null;
  }
  if (pulses.missingPulses > 0 || pulses.extraPulses > 0) {
    warnings.push(`tach channel ${tachIndex}: ${pulses.missingPulses} missing and ${pulses.extraPulses} extra pulses corrected`);
  }
  const isEncoder = point?.quantity === 'encoder' || recording.metadata?.encoderChannel === String(tachIndex) || /encoder/i.test(channel.name);
  const revs = Math.max(1, pulses.revolutionTimesS.length - 1);
  // The mean over whole revolutions is exact to the pulse timing; its spread tells how much the speed varied.
  const uncertaintyHz = Math.max(pulses.spreadHz / (2 * Math.sqrt(revs)), 1e-6 * pulses.meanSpeedHz);
  return { speedHz: pulses.meanSpeedHz, uncertaintyHz, source: isEncoder ? 'encoder' : 'tach', spreadHz: pulses.spreadHz, pulses };
}
