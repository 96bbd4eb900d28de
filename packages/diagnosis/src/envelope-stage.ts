import { bearingFaultOrders, shaftRatios, type MachineModel, type Point } from '@kinespec/kinematics';
import { BandEnvelopes, bandPaving, noiseFloor, type Spectrum } from '@kinespec/signal';
import type { BandSource } from './evidence/bearing-comb.js';
import { BAND_WIDTH_FACTOR } from './hypotheses.js';
import { matchableSpectrum, type MatchableSpectrum } from './line-matching.js';

/** The envelope analysis of one record: where bearing combs are searched, and the band shown by default. */
export interface EnvelopeStage {
  source: BandSource;
  /** The band shown when no bearing hypothesis is: the point's resonance, else the most impulsive band. */
  defaultBand: { lowHz: number; highHz: number; source: 'resonance' | 'kurtogram'; kurtosis?: number };
  /** The analysed band's envelope spectrum and kurtosis (computed once per band). */
  band(band: { lowHz: number; highHz: number }): { spectrum: Spectrum; measured: MatchableSpectrum; kurtosis: number };
  /** Highest frequency a band may reach (0.45 × the sample rate: clear of the recorder's anti-alias roll-off). */
  topHz: number;
}

/** Mesh harmonics, and blade-pass harmonics, that stand strong in a gearbox or fan spectrum (common practice: 1-3x mesh, 1-2x blade pass). */
const STRONG_MESH_HARMONICS = 3;
const STRONG_BLADE_HARMONICS = 2;

/**
 * The strong discrete tones of the machine's running (mesh and blade-pass harmonics), each with its family, in the
 * record's frequency unit (the reference speed is 1 in the angle domain). Empty without a model or a speed.
 */
function strongRunningTones(model: MachineModel | null, referenceHz: number | null): Array<{ hz: number; family: string }> {
  if (!model || referenceHz === null) return [];
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const out: Array<{ hz: number; family: string }> = [];
  for (const m of model.gearMeshes) {
    const gmf = m.driver.teeth * (ratio.get(m.driver.shaft) ?? Number.NaN) * referenceHz;
    for (let h = 1; h <= STRONG_MESH_HARMONICS; h++) out.push({ hz: h * gmf, family: `mesh:${m.id}` });
  }
  for (const r of model.rotors) {
    if (!(r.blades && r.blades > 0)) continue;
    const bp = r.blades * (ratio.get(r.shaft) ?? Number.NaN) * referenceHz;
    for (let h = 1; h <= STRONG_BLADE_HARMONICS; h++) out.push({ hz: h * bp, family: `blades:${r.id}` });
  }
  return out.filter((t) => Number.isFinite(t.hz));
}

/**
 * A band that holds strong tones of two running families: its squared envelope beats at their difference
 * (|a1·e^{iω1t} + a2·e^{iω2t}|² = a1² + a2² + 2·a1·a2·cos((ω1 − ω2)t)), a line that is neither a mesh nor a shaft
 * harmonic and can stand in for a bearing's rate. Discrete components are to be kept out of the demodulated band
 * (Randall & Antoni 2011, §3: removed before the envelope, or the band chosen clear of them). Two harmonics of one
 * mesh beat at its own mesh frequency, which the comb search already keeps clear of.
 */
function beatsInBand(band: { lowHz: number; highHz: number }, tones: ReadonlyArray<{ hz: number; family: string }>): boolean {
  const families = new Set<string>();
  for (const t of tones) if (t.hz >= band.lowHz && t.hz <= band.highHz) families.add(t.family);
  return families.size >= 2;
}

/** Resonances below this carry the machine's own running lines, not ringing impacts: no demodulation band there. */
const LOWEST_DEMODULATION_HZ = 500;
/** At most this many samples are demodulated (from the start): 2^19, 5 s at 100 kHz, 40 s at 12.8 kHz. */
const MAX_ENVELOPE_SAMPLES = 1 << 19;

/**
 * The demodulation bands a record offers its bearing hypotheses. A structural resonance named on the point, the
 * highest one inside the record's band, is the band (impacts ring it: Randall & Antoni 2011, §3): ±3 half-power
 * bandwidths, at least as wide as the widest bearing pattern needs. Without one, every band of the fast kurtogram's
 * paving wide enough for some bearing of the machine is offered, and each hypothesis takes the band where its own
 * pattern stands out most, its chance corrected for the bands tried (bearing-comb.ts) — the target-driven choice of
 * the IESFOgram (Mauricio et al., MSSP 144:106891, 2020), rather than the band of largest kurtosis, which on real
 * rigs often lies where the fault's rate barely shows (Smith & Randall, MSSP 64-65:100–131, 2015).
 * Frequencies are in the record's own unit: Hz, or orders of the reference shaft for an angle-domain record
 * (`unitHz` Hz per order, for the point's resonances).
 * Null when the record is too short or too slowly sampled to demodulate any bearing of the machine.
 */
export function envelopeStage(
  samples: Float64Array,
  sampleRate: number,
  model: MachineModel | null,
  point: Point | null,
  speed: { referenceHz: number | null; unitHz: number },
  options: { resolution: number; unit: string; warnings: string[] },
): EnvelopeStage | null {
  const widest = widestBearingPattern(model, speed.referenceHz);
  const minBandwidth = Math.max(BAND_WIDTH_FACTOR * widest, MIN_BANDWIDTH_HZ / speed.unitHz);
  const topHz = 0.45 * sampleRate;
  if (minBandwidth > 0.5 * topHz || samples.length < 256) {
    if (model && model.bearings.length === 0) return null;
    options.warnings.push(`the record (${samples.length} samples at ${(sampleRate * speed.unitHz).toFixed(0)} Hz) cannot carry an envelope analysis of this machine's bearings`);
    return null;
  }
  const bank = new BandEnvelopes(samples, sampleRate, { maxSamples: MAX_ENVELOPE_SAMPLES });
  const resolution = Math.max(options.resolution, (2 * sampleRate) / bank.samplesUsed);
  const memo = new Map<string, { spectrum: Spectrum; measured: MatchableSpectrum; kurtosis: number }>();
  // Kurtosis alone (the default band's choice) needs no spectrum: a band's spectrum and floor are made when searched.
  const kurtosisOf = (b: { lowHz: number; highHz: number }) => memo.get(`${b.lowHz}|${b.highHz}`)?.kurtosis ?? bank.bandKurtosis(b);
  const band = (b: { lowHz: number; highHz: number }) => {
    const key = `${b.lowHz}|${b.highHz}`;
    let r = memo.get(key);
    if (!r) {
      const { spectrum, kurtosis } = bank.analyseBand(b, { resolutionHz: resolution, unit: options.unit });
      r = { spectrum, measured: matchableSpectrum(spectrum, noiseFloor(spectrum)), kurtosis };
      memo.set(key, r);
    }
    return r;
  };
  const resonances = (point?.resonances ?? [])
    .map((r) => ({ frequency: r.frequencyHz / speed.unitHz, dampingRatio: r.dampingRatio }))
    .filter((r) => r.frequency * speed.unitHz >= LOWEST_DEMODULATION_HZ && r.frequency < topHz);
  let bands: Array<{ lowHz: number; highHz: number }>;
  let defaultBand: EnvelopeStage['defaultBand'];
  if (resonances.length > 0) {
    const r = resonances.reduce((a, b) => (b.frequency > a.frequency ? b : a));
    const half = Math.max(3 * r.dampingRatio * r.frequency, minBandwidth / 2);
    let lo = Math.max(LOWEST_DEMODULATION_HZ / 2 / speed.unitHz, r.frequency - half);
    let hi = Math.min(topHz, r.frequency + half);
    // Near the top of the record's band, slide the band down rather than narrow it.
    if (hi - lo < minBandwidth) lo = Math.max(0, hi - minBandwidth);
    if (hi - lo < minBandwidth) hi = Math.min(topHz, lo + minBandwidth);
    bands = [{ lowHz: lo, highHz: hi }];
    defaultBand = { lowHz: lo, highHz: hi, source: 'resonance' };
  } else {
    // Narrower bands than the narrowest bearing pattern needs are of no use to any hypothesis.
    const narrowest = narrowestBearingPattern(model, speed.referenceHz) * BAND_WIDTH_FACTOR;
    bands = bandPaving(sampleRate, { minBandwidthHz: Math.max(narrowest, MIN_BANDWIDTH_HZ / speed.unitHz), topHz });
    const tones = strongRunningTones(model, speed.referenceHz);
    const clear = bands.filter((b) => !beatsInBand(b, tones));
    if (clear.length > 0) bands = clear;
    if (bands.length === 0) {
      options.warnings.push('no demodulation band of the record is wide enough for this machine\'s bearings');
      return null;
    }
    // The band shown by default: the most impulsive of those wide enough for every bearing pattern (Antoni 2007).
    let best: EnvelopeStage['defaultBand'] | null = null;
    for (const b of bands) {
      if (b.highHz - b.lowHz < minBandwidth) continue;
      const k = kurtosisOf(b);
      if (!best || k > (best.kurtosis ?? -Infinity)) best = { lowHz: b.lowHz, highHz: b.highHz, source: 'kurtogram', kurtosis: k };
    }
    defaultBand = best ?? { lowHz: bands[0]!.lowHz, highHz: bands[0]!.highHz, source: 'kurtogram', kurtosis: kurtosisOf(bands[0]!) };
  }
  return { source: { bands, spectrumOf: (b) => band(b).measured }, defaultBand, band, topHz };
}

/** Narrowest band that can hold any band's bearing pattern: 200 Hz (a resonance is not narrower). */
const MIN_BANDWIDTH_HZ = 200;

/** The highest first-order defect rate of the machine's bearings (BPFI, or twice BSF), in the record's unit. */
function widestBearingPattern(model: MachineModel | null, referenceHz: number | null): number {
  if (!model || referenceHz === null) return 0;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  let widest = 0;
  for (const b of model.bearings) {
    const o = bearingFaultOrders(b);
    widest = Math.max(widest, Math.max(o.bpfi, 2 * o.bsf) * ratio.get(b.shaft)! * referenceHz);
  }
  return widest;
}

/** The lowest first-order defect rate (BPFO) of the machine's bearings, in the record's unit. */
function narrowestBearingPattern(model: MachineModel | null, referenceHz: number | null): number {
  if (!model || referenceHz === null) return 0;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  let narrowest = Infinity;
  for (const b of model.bearings) narrowest = Math.min(narrowest, bearingFaultOrders(b).bpfo * ratio.get(b.shaft)! * referenceHz);
  return Number.isFinite(narrowest) ? narrowest : 0;
}
