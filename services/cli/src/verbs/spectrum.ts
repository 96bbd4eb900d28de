import { basename } from 'node:path';
import { analyseRecording, DiagnosisInputError } from '@kinespec/diagnosis';
import { componentLines, type MachineModel } from '@kinespec/kinematics';
import {
  DEFAULT_SEGMENT_LENGTH,
  ISO_VELOCITY_BAND_HZ,
  PREFERRED_UNIT,
  WINDOW_NAMES,
  bandRms,
  clipBandToNyquist,
  convertUnit,
  envelopeSpectrum,
  findPeaks,
  integrateSignal,
  integrateSpectrum,
  isMotionUnit,
  largestPowerOfTwoAtMost,
  normalizeUnit,
  quantityOfUnit,
  welchSpectrum,
  withScaling,
  type BandHz,
  type DetrendMode,
  type Quantity,
  type Recording,
  type Spectrum,
  type SpectrumScaling,
  type WindowName,
  SignalInputError,
  UNSTATED_UNIT,
  recordingWarnings,
} from '@kinespec/signal';
import { CliError } from '../cli-error.js';
import { numberFlag, oneOf, parseBand, parseFlags, positiveNumber, wholeNumber } from '../flags.js';
import type { CliIo } from '../io.js';
import { loadMachineFile } from '../machine-file.js';
import { frequencyDecimals, linesUnderPeaks } from '../peak-lines.js';
import { alignColumns } from '../text-table.js';
import { decoderHint, loadRecordingFile, recordingFileArgument, recordingHintFlags, selectChannel, withFileNameOnInputErrors, type DecoderHint } from '../recording-file.js';
import { significant as sig } from '../significant-figures.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec spectrum <file> [--channel N|name] [--window hann|flattop|rectangular|hamming|blackman-harris] ' +
  '[--segment 8192] [--overlap 0.5] [--scaling peak|rms|psd] [--quantity acceleration|velocity] [--sample-rate-hz F] ' +
  '[--unit g] [--detrend mean|linear|none] [--band LOW-HIGH] [--envelope LOW-HIGH] [--machine <machine.json> [--point id] [--speed-rpm N]] [--json]';

const SCALINGS = ['peak', 'rms', 'psd'] as const;
const QUANTITIES = ['acceleration', 'velocity'] as const;
const DETRENDS = ['mean', 'linear', 'none'] as const;
/** Peaks listed in the JSON output; the human summary shows the first five. */
const PEAK_COUNT = 10;

export interface SpectrumSettings {
  channel?: string;
  window: WindowName;
  segmentLength: number;
  overlapFraction: number;
  scaling: SpectrumScaling;
  quantity?: 'acceleration' | 'velocity';
  detrend: DetrendMode;
  bandHz?: BandHz;
  envelopeBandHz?: BandHz;
}

/** With --machine: the model whose component lines name the peaks, the point, and a speed to refine. */
export interface SpectrumMachine {
  model: MachineModel;
  pointId?: string;
  speedRpm?: number;
}

function parseSettings(args: string[]): { file: string; settings: SpectrumSettings; json: boolean; hint: DecoderHint; machine?: { path: string; pointId?: string; speedRpm?: number } } {
  const { values: v, positionals } = parseFlags(
    args,
    {
      channel: { type: 'string' },
      window: { type: 'string' },
      segment: { type: 'string' },
      overlap: { type: 'string' },
      scaling: { type: 'string' },
      quantity: { type: 'string' },
      ...recordingHintFlags,
      detrend: { type: 'string' },
      band: { type: 'string' },
      envelope: { type: 'string' },
      machine: { type: 'string' },
      point: { type: 'string' },
      'speed-rpm': { type: 'string' },
      json: { type: 'boolean' },
    },
    USAGE,
  );
  if (v.machine === undefined && (v.point !== undefined || v['speed-rpm'] !== undefined)) {
    throw new CliError('--point and --speed-rpm name a point and speed of a machine: give --machine <machine.json> too');
  }
  const speedRpm = positiveNumber('speed-rpm', v['speed-rpm']);
  const machine = v.machine === undefined ? undefined : { path: v.machine, ...(v.point !== undefined ? { pointId: v.point } : {}), ...(speedRpm !== undefined ? { speedRpm } : {}) };
  const file = recordingFileArgument(positionals, USAGE);
  const segmentLength = wholeNumber('segment', v.segment, 16, 'a whole number of samples >= 16') ?? DEFAULT_SEGMENT_LENGTH;
  const overlapFraction = numberFlag('overlap', v.overlap, (x) => x >= 0 && x < 1, 'a fraction >= 0 and < 1') ?? 0.5;
  const hint = decoderHint(v['sample-rate-hz'], v.unit);
  const settings: SpectrumSettings = {
    channel: v.channel,
    window: oneOf('window', v.window, WINDOW_NAMES, 'hann'),
    segmentLength,
    overlapFraction,
    scaling: oneOf('scaling', v.scaling, SCALINGS, 'rms'),
    quantity: oneOf('quantity', v.quantity, QUANTITIES),
    detrend: oneOf('detrend', v.detrend, DETRENDS, 'mean'),
    bandHz: parseBand('band', v.band),
    envelopeBandHz: parseBand('envelope', v.envelope),
  };
  return { file, settings, json: v.json === true, hint, ...(machine ? { machine } : {}) };
}

export interface SpectrumReport {
  file: string;
  channel: string;
  sampleRateHz: number;
  samples: number;
  quantity: Quantity | 'unknown';
  unit: string;
  valueUnit: string;
  scaling: SpectrumScaling;
  window: WindowName;
  detrend: DetrendMode;
  segmentLength: number;
  overlapFraction: number;
  averages: number;
  frequencyResolutionHz: number;
  enbwBins: number;
  envelope?: { bandHz: [number, number]; squared: boolean };
  overall: { rms: number; unit: string; bandHz: [number, number] };
  velocityRmsMmPerS?: number;
  velocityBandHz?: [number, number];
  /** where peaks were looked for (the overall band, above the window's skirt around 0 Hz) */
  peakBandHz: [number, number];
  /** decimal places a peak frequency is worth at this resolution (down to a tenth of a bin) */
  frequencyDecimals: number;
  peaks: { frequencyHz: number; amplitude: number; rmsAmplitude: number; prominenceDb: number; line?: string | null; formula?: string; alsoLines?: string[] }[];
  /** with --machine: the running speed the lines were placed at */
  speed?: { rpm: number; uncertaintyRpm: number | null; source: string; point: string | null };
  notes: string[];
  frequenciesHz: number[];
  values: number[];
}

/** The whole analysis behind the verb: channel samples in, the report the verb prints out. */
export function spectrumReport(recording: Recording, file: string, settings: SpectrumSettings, machine?: SpectrumMachine): SpectrumReport {
  const channel = selectChannel(recording, settings.channel);
  const fs = recording.sampleRateHz;
  const notes: string[] = [];
  for (const w of recordingWarnings(recording.metadata)) notes.push(`file: ${w}`);
  if (channel.unit === UNSTATED_UNIT) notes.push(`the file states no unit for channel '${channel.name}' and none was given: values are as recorded; give --unit (e.g. g)`);
  const motion = isMotionUnit(channel.unit);
  const channelQuantity: Quantity | undefined = motion ? quantityOfUnit(channel.unit) : undefined;
  const unitName = motion ? normalizeUnit(channel.unit) : channel.unit;
  let quantity: Quantity | undefined = settings.quantity ?? channelQuantity;
  if (settings.quantity !== undefined && !motion) {
    throw new CliError(`channel '${channel.name}' is in '${channel.unit || 'no unit'}', not a motion unit: give its unit with --unit (e.g. g)`);
  }
  if (settings.quantity === 'acceleration' && channelQuantity !== 'acceleration') {
    throw new CliError(`channel '${channel.name}' holds ${channelQuantity} (${channel.unit}); acceleration cannot be derived from it`);
  }
  if (settings.quantity === 'velocity' && channelQuantity === 'displacement') {
    throw new CliError(`channel '${channel.name}' holds displacement (${channel.unit}); velocity cannot be derived from it`);
  }
  if (settings.envelopeBandHz && settings.quantity === 'velocity') {
    throw new CliError('--envelope analyses the channel as recorded; leave out --quantity velocity');
  }

  let segmentLength = settings.segmentLength;
  const n = channel.samples.length;
  if (n < 16) throw new CliError(`channel '${channel.name}' has ${n} samples; a spectrum needs at least 16`);
  if (segmentLength > n) {
    const fitted = largestPowerOfTwoAtMost(n);
    notes.push(`segment ${segmentLength} is longer than the record (${n} samples); used ${fitted}`);
    segmentLength = fitted;
  }

  let samples = channel.samples;
  let unit = unitName;
  if (quantity === 'velocity' && channelQuantity === 'acceleration') {
    // integrate the whole record once, then analyse: exact for lines between bins, unlike dividing the spectrum
    samples = integrateSignal(channel.samples, fs, unitName, PREFERRED_UNIT.velocity);
    unit = PREFERRED_UNIT.velocity;
  } else if (quantity === 'velocity') {
    samples = convertUnit(channel.samples, unitName, PREFERRED_UNIT.velocity);
    unit = PREFERRED_UNIT.velocity;
  }

  const welch = {
    window: settings.window,
    segmentLength,
    overlapFraction: settings.overlapFraction,
    detrend: settings.detrend,
    scaling: settings.scaling,
    unit,
  };
  let spectrum: Spectrum;
  let envelope: SpectrumReport['envelope'];
  if (settings.envelopeBandHz) {
    const band = clipBandToNyquist(settings.envelopeBandHz, fs, '--envelope');
    spectrum = envelopeSpectrum(samples, fs, { ...welch, bandHz: band });
    envelope = { bandHz: band, squared: false };
  } else {
    spectrum = welchSpectrum(samples, fs, welch);
  }

  const nyquist = fs / 2;
  const defaultBand: BandHz = quantity === 'velocity' && !envelope ? ISO_VELOCITY_BAND_HZ : [0, nyquist];
  const requested = settings.bandHz ?? defaultBand;
  const band = clipBandToNyquist(requested, fs, '--band');
  if (band[1] < requested[1] && settings.bandHz) notes.push(`band ${requested[0]}-${requested[1]} Hz clipped to the Nyquist frequency, ${band[1]} Hz`);
  else if (band[1] < requested[1] && quantity === 'velocity') notes.push(`velocity band clipped to the Nyquist frequency: ${band[0]}-${band[1]} Hz`);
  const overall = { rms: bandRms(spectrum, band), unit, bandHz: band };

  let velocityRmsMmPerS: number | undefined;
  let velocityBandHz: [number, number] | undefined;
  if (!envelope && quantity === 'velocity') {
    velocityBandHz = band;
    velocityRmsMmPerS = overall.rms;
  } else if (!envelope && channelQuantity === 'acceleration') {
    // ISO 20816 overall from the same averaged spectrum: PSD divided by (2 pi f)^2, no second pass over the samples
    velocityBandHz = clipBandToNyquist(ISO_VELOCITY_BAND_HZ, fs);
    velocityRmsMmPerS = bandRms(integrateSpectrum(withScaling(spectrum, 'psd'), PREFERRED_UNIT.velocity), velocityBandHz);
  }

  // Peaks are looked for in the overall band and above the window's skirt around 0 Hz (the Hann main lobe is
  // two bins each side): below that, and below 10 Hz on a spectrum integrated to velocity, what stands out is
  // the 1/(2 pi f) gain of integration on low-frequency noise, not a line of the machine.
  const df = spectrum.frequencyResolutionHz;
  const peakBandHz: [number, number] = [Math.max(band[0], 2 * df), band[1]];
  const found = findPeaks(spectrum, { count: PEAK_COUNT, bandHz: peakBandHz });
  const named = machine ? machineLines(recording, channel.name, machine, found.map((p) => p.frequencyHz), df) : null;
  if (named) notes.push(...named.notes);
  const peaks = found.map((p, i) => ({
    frequencyHz: p.frequencyHz,
    amplitude: p.amplitude,
    rmsAmplitude: p.rmsAmplitude,
    prominenceDb: p.prominenceDb,
    ...(named ? named.lines[i]! : {}),
  }));

  return {
    file,
    channel: channel.name,
    sampleRateHz: fs,
    samples: n,
    quantity: quantity ?? 'unknown',
    unit,
    valueUnit: spectrum.valueUnit,
    scaling: spectrum.scaling,
    window: spectrum.window,
    detrend: spectrum.detrend,
    segmentLength: spectrum.segmentLength,
    overlapFraction: spectrum.overlapFraction,
    averages: spectrum.averages,
    frequencyResolutionHz: spectrum.frequencyResolutionHz,
    enbwBins: spectrum.enbwBins,
    ...(envelope ? { envelope } : {}),
    overall,
    ...(velocityRmsMmPerS !== undefined ? { velocityRmsMmPerS, velocityBandHz } : {}),
    peakBandHz,
    frequencyDecimals: frequencyDecimals(df),
    peaks,
    ...(named ? { speed: named.speed } : {}),
    notes,
    frequenciesHz: Array.from(spectrum.frequenciesHz),
    values: Array.from(spectrum.values),
  };
}

/**
 * The component lines under the peaks: the running speed as the diagnosis finds it (tach, spectrum comb
 * around the given or nominal speed), then the model's lines at that speed matched within the diagnosis's
 * tolerance.
 */
function machineLines(recording: Recording, channelName: string, machine: SpectrumMachine, peakHz: number[], resolutionHz: number) {
  const channel = recording.channels.findIndex((c) => c.name === channelName);
  const analysis = analyseRecording(recording, {
    model: machine.model,
    ...(machine.pointId !== undefined ? { pointId: machine.pointId } : {}),
    ...(machine.speedRpm !== undefined ? { speedRpm: machine.speedRpm } : {}),
    ...(channel >= 0 ? { channel } : {}),
  });
  const notes: string[] = [];
  const speedHz = analysis.speedHz ?? machine.model.speed.nominalRpm / 60;
  const given = machine.speedRpm !== undefined;
  const source =
    analysis.speedSource === 'given' || analysis.speedSource === null
      ? given ? 'the speed given (not found in the spectrum)' : "the model's nominal speed (not found in the spectrum)"
      : analysis.speedSource === 'spectrum' ? 'the spectrum' : `the ${analysis.speedSource}`;
  if (analysis.speedSource === 'given' || analysis.speedSource === null) notes.push(`lines placed at ${source}: their names are only as good as that speed`);
  const lines = componentLines(machine.model, speedHz);
  const uncertaintyHz = analysis.speedUncertaintyHz ?? 0.01 * speedHz;
  return {
    lines: linesUnderPeaks(peakHz, lines, { frequencyResolutionHz: resolutionHz, speedUncertaintyHz: uncertaintyHz }),
    speed: { rpm: speedHz * 60, uncertaintyRpm: analysis.speedUncertaintyHz !== undefined ? analysis.speedUncertaintyHz * 60 : null, source, point: analysis.pointId ?? null },
    notes,
  };
}

/** Peaks in the human summary (JSON lists PEAK_COUNT). */
const PEAKS_SHOWN = 5;

/** A speed in rpm: a tenth of an rpm at most (a spectrum seldom pins it closer), three figures below 100 rpm. */
function speedText(rpm: number): string {
  return rpm >= 100 ? rpm.toFixed(1) : sig(rpm, 3);
}

/** A unit for the human summary: the decoder's 'unknown' reads as what it is. */
function unitText(unit: string): string {
  return unit === UNSTATED_UNIT || unit === '' ? 'as recorded (no unit)' : unit;
}

const WINDOW_TITLE: Record<WindowName, string> = {
  rectangular: 'rectangular',
  hann: 'Hann',
  hamming: 'Hamming',
  'blackman-harris': 'Blackman-Harris (4-term)',
  flattop: 'flat-top',
};

function summary(r: SpectrumReport): string {
  const lines: string[] = [];
  const q = r.quantity === 'unknown' ? (r.unit === UNSTATED_UNIT || !r.unit ? 'no unit' : r.unit) : `${r.quantity}, ${r.unit}`;
  lines.push(`${r.file}, channel '${r.channel}' (${q}): ${sig(r.sampleRateHz, 6)} Hz, ${r.samples} samples`);
  if (r.envelope) lines.push(`envelope of the ${r.envelope.bandHz[0]}-${r.envelope.bandHz[1]} Hz band`);
  const detrend = r.detrend === 'mean' ? 'mean removed' : r.detrend === 'linear' ? 'linear trend removed' : 'no detrend';
  lines.push(
    `${WINDOW_TITLE[r.window]} window, ${r.segmentLength}-sample segments, ${Math.round(r.overlapFraction * 100)} % overlap, ` +
      `${r.averages} average${r.averages === 1 ? '' : 's'}, resolution ${sig(r.frequencyResolutionHz)} Hz, ${detrend}`,
  );
  let overall = `overall: ${sig(r.overall.rms)} ${unitText(r.overall.unit)} rms (${sig(r.overall.bandHz[0])}-${sig(r.overall.bandHz[1])} Hz)`;
  if (r.velocityRmsMmPerS !== undefined && r.quantity !== 'velocity') {
    overall += `; velocity ${sig(r.velocityRmsMmPerS)} mm/s rms (${r.velocityBandHz![0]}-${sig(r.velocityBandHz![1])} Hz)`;
  }
  lines.push(overall);
  if (r.speed) {
    const unc = r.speed.uncertaintyRpm !== null ? ` ± ${sig(r.speed.uncertaintyRpm, 2)}` : '';
    lines.push(`speed: ${speedText(r.speed.rpm)}${unc} rpm, from ${r.speed.source}${r.speed.point ? `; lines of point '${r.speed.point}'` : ''}`);
  }
  const label = r.scaling === 'psd' ? r.valueUnit : `${unitText(r.unit)} ${r.scaling}`;
  const band = `${sig(r.peakBandHz[0], 3)}-${sig(r.peakBandHz[1], 5)} Hz`;
  if (r.peaks.length === 0) lines.push(`no peak stands 6 dB above the noise floor in ${band}`);
  else {
    lines.push(`top peaks in ${band} (${label}):`);
    const rows = r.peaks.slice(0, PEAKS_SHOWN).map((p) => {
      const row = [`${p.frequencyHz.toFixed(r.frequencyDecimals)} Hz`, sig(p.amplitude)];
      if (r.speed) row.push(p.line ? `${p.line}${p.alsoLines?.length ? ` (or ${p.alsoLines.slice(0, 2).join(', ')}${p.alsoLines.length > 2 ? ', …' : ''})` : ''}` : 'no line of the model');
      return row;
    });
    for (const line of alignColumns(rows, new Set([0, 1]))) lines.push(`  ${line}`);
  }
  for (const note of r.notes) lines.push(`note: ${note}`);
  return lines.join('\n');
}

export const spectrumVerb: Verb = {
  name: 'spectrum',
  summary:
    'spectrum of one channel of a recording (WAV, CSV, JSON, raw float): Welch-averaged, scaled as peak, rms or PSD, ' +
    'with overall RMS and the strongest peaks; --envelope LOW-HIGH gives the envelope spectrum of that band.\n' +
    'Defaults: Hann, 8192-sample segments (or the largest power of two the record holds), 50 % overlap, rms, mean removed; ' +
    'the overall band is the whole spectrum, or 10-1000 Hz in mm/s for --quantity velocity. --channel takes a name or a 1-based number.\n' +
    'With --machine (and --point, --speed-rpm) each peak is named by the component line it sits on, at the running speed the diagnosis finds.',
  usage: USAGE,
  async run(args, io: CliIo) {
    const { file, settings, json, hint, machine } = parseSettings(args);
    const model = machine ? loadMachineFile(machine.path, io) : undefined;
    const report = withFileNameOnInputErrors(
      file,
      () => spectrumReport(loadRecordingFile(file, hint), basename(file), settings, model ? { ...machine!, model } : undefined),
      [SignalInputError, DiagnosisInputError],
    );
    io.out(json ? JSON.stringify(report) : summary(report));
    return 0;
  },
};
