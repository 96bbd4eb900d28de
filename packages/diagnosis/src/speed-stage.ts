import { speedRangeRpm, type MachineModel } from '@kinespec/kinematics';
import { binPower, type PulseSpeed, type Recording } from '@kinespec/signal';
import { peakAt, type MatchableSpectrum } from './line-matching.js';
import type { SpeedSource } from './recording-analysis.js';
import { speedFromSpectrum } from './running-speed.js';
import { speedFromTach } from './tach-speed.js';

export interface RunningSpeed {
  speedHz: number;
  uncertaintyHz: number;
  source: SpeedSource;
  /** Pulses of a tach or encoder channel, for order tracking. */
  pulses?: PulseSpeed;
  /** Spread (max − min) of the smoothed speed over the record, Hz. */
  spreadHz?: number;
  /** Orders of the running lines that placed the speed, when the spectrum did. */
  supportOrders: number[];
  /** A speed was given and the one found agrees with it within 1 %. */
  givenAgrees: boolean;
}

/** Lines closer than this SNR to the floor are not peaks worth matching. */
const MIN_SNR_DB = 6;

/**
 * The running speed of the reference shaft: from a tach or encoder channel when there is one with usable pulses,
 * else from the spectrum's running lines (running-speed.ts), searched ±3 % around a given speed (machines run off
 * nameplate) or over the model's range; else the given or nominal speed, with a warning.
 */
export function runningSpeed(
  recording: Recording,
  tachIndex: number | null,
  model: MachineModel,
  options: { speedRpm?: number; pulsesPerRev?: number },
  measured: MatchableSpectrum,
  warnings: string[],
): RunningSpeed {
  if (tachIndex !== null) {
    const tach = speedFromTach(recording, tachIndex, model, options.pulsesPerRev, warnings);
    if (tach) return { speedHz: tach.speedHz, uncertaintyHz: tach.uncertaintyHz, source: tach.source, pulses: tach.pulses, spreadHz: tach.spreadHz, supportOrders: [], givenAgrees: false };
  }
  const range = speedRangeRpm(model);
  const searchRpm: [number, number] = options.speedRpm !== undefined
    ? [options.speedRpm * 0.97, options.speedRpm * 1.03]
    : [range.minRpm, range.maxRpm];
  // A model with a single speed still runs off nameplate by a few percent (common practice: slip, drives).
  if (searchRpm[1] - searchRpm[0] < 0.06 * searchRpm[0]) {
    const mid = (searchRpm[0] + searchRpm[1]) / 2;
    searchRpm[0] = Math.min(searchRpm[0], mid * 0.97);
    searchRpm[1] = Math.max(searchRpm[1], mid * 1.03);
  }
  const found = speedFromSpectrum(measured, model, {
    searchRangeHz: [searchRpm[0] / 60, searchRpm[1] / 60],
    minSnrDb: MIN_SNR_DB,
    preferredHz: (options.speedRpm ?? range.nominalRpm) / 60,
  });
  if (found && found.support.length >= 2) {
    const smeared = smearedOrder(measured, found.support);
    if (smeared !== null) {
      warnings.push(
        `the speed varied during the record: the ${smeared.label} line (order ${smeared.order.toFixed(1)}) is smeared over more than its matching tolerance; ` +
          'high-order patterns score low, record a tach or encoder channel so that the recording can be order-tracked',
      );
    }
    if (options.speedRpm !== undefined && Math.abs(found.speedHz * 60 - options.speedRpm) > 0.002 * options.speedRpm) {
      warnings.push(`speed refined from the given ${options.speedRpm} rpm to ${(found.speedHz * 60).toFixed(1)} rpm by ${found.support.length} running lines`);
    }
    const givenAgrees = options.speedRpm !== undefined && Math.abs(found.speedHz * 60 - options.speedRpm) <= 0.01 * options.speedRpm;
    return { speedHz: found.speedHz, uncertaintyHz: found.uncertaintyHz, source: 'spectrum', supportOrders: found.support.map((s) => s.order), givenAgrees };
  }
  const fallbackRpm = options.speedRpm ?? range.nominalRpm;
  warnings.push(`the spectrum does not show the running speed; using the ${options.speedRpm !== undefined ? 'given' : "model's nominal"} ${fallbackRpm} rpm`);
  return { speedHz: fallbackRpm / 60, uncertaintyHz: (0.01 * fallbackRpm) / 60, source: 'given', supportOrders: [], givenAgrees: options.speedRpm !== undefined };
}

/**
 * The highest-order running line (20 dB over the floor or more) whose power is spread beyond the window's main lobe:
 * the power in ±3 bins over 1.5 × the interpolated tone power (a steady tone gives about 1 with the Hann window, whose
 * noise bandwidth is 1.5 bins, Harris 1978); above 2, most of the line lies outside its main lobe, so the speed moved
 * by more than the matching tolerance during the record. Null when every line is sharp.
 */
export function smearedOrder(measured: MatchableSpectrum, support: ReadonlyArray<{ label: string; order: number; frequencyHz: number; snrDb: number }>): { label: string; order: number } | null {
  const { spectrum } = measured;
  if (spectrum.window !== 'hann') return null;
  const df = spectrum.frequencyResolutionHz;
  const strong = support.filter((s) => s.snrDb >= 20).sort((a, b) => b.order - a.order);
  for (const s of strong.slice(0, 3)) {
    const k = Math.round(s.frequencyHz / df);
    if (k < 4 || k > spectrum.values.length - 5) continue;
    let peakBin = k;
    for (let j = k - 1; j <= k + 1; j++) if (spectrum.values[j]! > spectrum.values[peakBin]!) peakBin = j;
    const tone = peakAt(measured, peakBin);
    let power = 0;
    for (let j = peakBin - 3; j <= peakBin + 3; j++) power += binPower(spectrum, j);
    const tonePower = (tone.rmsAmplitude * tone.rmsAmplitude);
    if (tonePower > 0 && power / (1.5 * tonePower) > 2) return { label: s.label, order: s.order };
  }
  return null;
}

