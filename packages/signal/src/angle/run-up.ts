import { SignalInputError } from '../errors.js';
import { welchSpectrum, type SpectrumScaling, type WindowName } from '../spectra/index.js';
import { resampleToAngle, type AngleResamplingOptions } from './angle-resampling.js';
import { orderSpectrum, valueAtOrder } from './order-spectrum.js';
import type { ShaftAngle } from './shaft-angle.js';

export interface RunUpOptions {
  /** Orders to track. */
  orders: readonly number[];
  /** Predicted natural frequencies to mark on the map (e.g. from the torsional model or the point's resonances). */
  naturalFrequenciesHz?: readonly number[];
  /** Samples per block of the frequency map; default the power of two nearest a quarter second. */
  segmentLength?: number;
  /** Revolutions per block of the order tracks; default 8. */
  trackRevolutions?: number;
  overlapFraction?: number;
  /** Default 'peak'. */
  scaling?: SpectrumScaling;
  window?: WindowName;
  unit?: string;
  /** Passed to the order resampler (samplesPerRev, maxOrder, interpolation). */
  resampling?: AngleResamplingOptions;
}

export interface RunUpMap {
  /** Spectra against time and speed: one row per block. */
  frequencyMap: {
    frequenciesHz: Float64Array;
    rows: Array<{ timeS: number; speedRpm: number; values: Float64Array }>;
    scaling: SpectrumScaling;
    valueUnit: string;
  };
  /** Amplitude of each chosen order against speed, from order spectra of short angle blocks. */
  orderTracks: Array<{ order: number; points: Array<{ timeS: number; speedRpm: number; frequencyHz: number; amplitude: number }> }>;
  /** Where each tracked order meets each natural frequency: speed = 60·f_n/order, and the first time the record passes it. */
  crossings: Array<{ naturalFrequencyHz: number; order: number; speedRpm: number; timeS: number | null }>;
  minSpeedRpm: number;
  maxSpeedRpm: number;
}

/**
 * The data behind a run-up or coast-down plot: a frequency map (spectra of successive time blocks,
 * each with the shaft's mean speed), order tracks (each order's amplitude in successive blocks of whole
 * revolutions, so the order stays in one bin while the speed changes), and the speeds at which each
 * order crosses each predicted natural frequency, where a resonance shows as a peak in the track.
 */
// Common practice: waterfall / order-track presentation of run-ups (e.g. Randall 2011, ch. 3; from memory).
export function runUpMap(samples: Float64Array, sampleRateHz: number, angle: ShaftAngle, options: RunUpOptions): RunUpMap {
  if (!options || !Array.isArray(options.orders) || options.orders.length === 0) {
    throw new SignalInputError('invalid_parameter', 'orders must list at least one order to track');
  }
  for (const o of options.orders) if (!(o > 0)) throw new SignalInputError('invalid_parameter', `orders must be > 0 (got ${o})`);
  const scaling = options.scaling ?? 'peak';
  const window = options.window ?? 'hann';
  const unit = options.unit ?? '';
  const first = angle.firstSample;
  const last = angle.lastSample;
  const span = last - first + 1;
  const quarter = Math.max(16, 2 ** Math.round(Math.log2(sampleRateHz / 4)));
  const segmentLength = options.segmentLength ?? Math.min(quarter, 2 ** Math.floor(Math.log2(span)));
  if (!(Number.isInteger(segmentLength) && segmentLength >= 16 && segmentLength <= span)) {
    throw new SignalInputError('invalid_parameter', `segmentLength (${segmentLength}) must be a whole number from 16 to ${span}`);
  }
  const overlap = options.overlapFraction ?? 0.5;
  const hop = Math.max(1, Math.round(segmentLength * (1 - overlap)));
  const rows: RunUpMap['frequencyMap']['rows'] = [];
  let frequenciesHz: Float64Array = new Float64Array(0);
  let valueUnit = '';
  for (let start = first; start + segmentLength <= last + 1; start += hop) {
    const block = samples.subarray(start, start + segmentLength);
    const s = welchSpectrum(Float64Array.from(block), sampleRateHz, { scaling, window, segmentLength, overlapFraction: 0, unit });
    frequenciesHz = s.frequenciesHz;
    valueUnit = s.valueUnit;
    const revs = angle.revolutions[start + segmentLength - 1]! - angle.revolutions[start]!;
    const durationS = (segmentLength - 1) / sampleRateHz;
    rows.push({ timeS: (start + segmentLength / 2) / sampleRateHz, speedRpm: (60 * revs) / durationS, values: s.values });
  }

  const maxOrder = Math.max(...options.orders);
  const signal = resampleToAngle(samples, sampleRateHz, angle, { maxOrder: options.resampling?.maxOrder ?? Math.min(maxOrder * 1.25, (0.4 * sampleRateHz) / maxSpeed(angle)), ...options.resampling });
  const perBlock = options.trackRevolutions ?? 8;
  if (!(Number.isInteger(perBlock) && perBlock >= 1 && perBlock <= signal.revolutions)) {
    throw new SignalInputError('invalid_parameter', `trackRevolutions (${perBlock}) must be a whole number from 1 to ${signal.revolutions}`);
  }
  const timeAt = timeOfAngle(angle, sampleRateHz);
  const tracks = options.orders.map((order) => ({ order, points: [] as RunUpMap['orderTracks'][number]['points'] }));
  const blockHop = Math.max(1, Math.round(perBlock * (1 - overlap)));
  for (let r = 0; r + perBlock <= signal.revolutions; r += blockHop) {
    const block = signal.samples.subarray(r * signal.samplesPerRev, (r + perBlock) * signal.samplesPerRev);
    const spectrum = orderSpectrum({ samples: Float64Array.from(block), samplesPerRev: signal.samplesPerRev, revolutions: perBlock }, { scaling, window, unit });
    const t0 = timeAt(signal.startRevolution + r);
    const t1 = timeAt(signal.startRevolution + r + perBlock);
    const speedHz = perBlock / (t1 - t0);
    for (const track of tracks) {
      track.points.push({
        timeS: (t0 + t1) / 2,
        speedRpm: 60 * speedHz,
        frequencyHz: track.order * speedHz,
        amplitude: valueAtOrder(spectrum, track.order, 0.5 * spectrum.orderResolution).value,
      });
    }
  }

  const crossings: RunUpMap['crossings'] = [];
  for (const fn of options.naturalFrequenciesHz ?? []) {
    for (const order of options.orders) {
      const speedHz = fn / order;
      let timeS: number | null = null;
      for (let i = first + 1; i <= last; i++) {
        const a = angle.speedHz[i - 1]!;
        const b = angle.speedHz[i]!;
        if ((a - speedHz) * (b - speedHz) <= 0 && a !== b) {
          timeS = (i - 1 + (speedHz - a) / (b - a)) / sampleRateHz;
          break;
        }
      }
      crossings.push({ naturalFrequencyHz: fn, order, speedRpm: 60 * speedHz, timeS });
    }
  }
  return {
    frequencyMap: { frequenciesHz, rows, scaling, valueUnit },
    orderTracks: tracks,
    crossings,
    minSpeedRpm: 60 * signal.minSpeedHz,
    maxSpeedRpm: 60 * signal.maxSpeedHz,
  };
}

function maxSpeed(angle: ShaftAngle): number {
  let max = 0;
  for (let i = angle.firstSample; i <= angle.lastSample; i++) if (angle.speedHz[i]! > max) max = angle.speedHz[i]!;
  return max;
}

/** Time (s) at which the shaft reaches an angle, by linear inversion of the per-sample angle; ascending calls are fastest. */
function timeOfAngle(angle: ShaftAngle, sampleRateHz: number): (revolutions: number) => number {
  let i = angle.firstSample;
  return (target) => {
    if (target < angle.revolutions[i]!) i = angle.firstSample;
    while (i < angle.lastSample - 1 && angle.revolutions[i + 1]! < target) i++;
    const a = angle.revolutions[i]!;
    const b = angle.revolutions[i + 1]!;
    return (i + (target - a) / (b - a)) / sampleRateHz;
  };
}
