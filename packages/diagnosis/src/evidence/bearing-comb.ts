import { firstAtOrAbove, isLeakagePeak, peakAt, type MatchableSpectrum } from '../line-matching.js';
import { chanceModel, chanceOfPeak, correctedForSearch, fisherCombined, type ChanceModel } from './chance.js';

/**
 * A bearing defect hypothesis as the envelope spectrum sees it: a comb of the defect rate's harmonics, with the
 * modulation sidebands the defect's kind makes, at a rate that may differ from the kinematic one by the rolling
 * elements' slip. All frequencies in the unit of the spectra searched (Hz, or orders of the reference shaft).
 */
export interface BearingComb {
  /** Identifies the hypothesis (fault:component). */
  key: string;
  /** First-order defect rate from the kinematics: BPFO, BPFI, BSF (spin) or FTF. */
  defectHz: number;
  /** Label of the rate in evidence rows, e.g. 'BPFO de'. */
  rateLabel: string;
  /** Sidebands that are evidence of this kind around the first harmonics (inner race: shaft rate; rolling element: FTF). */
  sidebandHz: number | null;
  sidebandLabel: string | null;
  /** Modulation rates whose sidebands belong to this pattern (left out of its chance neighbourhood). */
  modulationHz: readonly number[];
  /** Narrowest demodulation band that can hold this pattern. */
  minBandwidthHz: number;
  /** A pattern that is itself a modulation of others (the cage rate): it never claims lines from them (claimShared). */
  secondary?: boolean;
}

export interface CombSearchOptions {
  /**
   * Rates whose harmonics belong to something else: every shaft of the machine (a once-per-revolution impact fills the
   * envelope with its shaft's comb) and the motor's line frequency (electrical forces and pick-up at its multiples).
   */
  foreignRates: ReadonlyArray<{ rateHz: number; relativeUncertainty: number }>;
  /** Relative standard uncertainty of the speed (0 in the angle domain). */
  speedUncertaintyFraction: number;
  /** Largest relative departure of the defect rate from the kinematic one searched (slip). */
  slipFraction: number;
  /** Highest harmonic of the defect rate looked at. */
  maxHarmonics: number;
  /** Lines weaker than this over the floor are not candidates at all (dB). */
  minLineSnrDb: number;
}

export interface CombLine {
  label: string;
  harmonic: number;
  /** -1 or +1 for a sideband, 0 for the harmonic itself. */
  sideband: number;
  /** Where the kinematics puts the line (no slip). */
  predictedHz: number;
  /** Centre of the window searched (slip applied). */
  searchedHz: number;
  toleranceHz: number;
  measuredHz: number | null;
  measuredAmplitude: number | null;
  snrDb: number | null;
  /** Probability of meeting a peak this strong in the window by chance (1 when none was found). */
  chance: number;
  matched: boolean;
  /** The line cannot be told from a harmonic of a shaft (or of line frequency) at this resolution: it counts neither way. */
  synchronous: boolean;
  /** A stronger hypothesis claimed the peak (see claimShared). */
  claimedBy?: string;
}

export interface CombEvidence {
  key: string;
  /** Probability of the pattern by chance, corrected for the bands and slips searched. */
  chance: number;
  /** The same before the correction. */
  rawChance: number;
  trials: number;
  band: { lowHz: number; highHz: number } | null;
  slip: number;
  lines: CombLine[];
  spectrum: MatchableSpectrum | null;
}

/** Where a hypothesis is looked for: candidate bands, each with its envelope spectrum made on demand. */
export interface BandSource {
  bands: ReadonlyArray<{ lowHz: number; highHz: number }>;
  spectrumOf(band: { lowHz: number; highHz: number }): MatchableSpectrum | null;
}

/**
 * The evidence for each comb: for each band wide enough and each slip on a grid fine enough to move the highest
 * harmonic by half a bin, the harmonics are looked for (each line the strongest local maximum in its window that is
 * neither window leakage nor a shaft or line-frequency harmonic), each found line weighed by its chance, the chances
 * combined (Fisher), and the band and slip where the pattern stands out most kept. Its lines are then weighed again
 * against a neighbourhood without the pattern's own lines at the slip found (so that a true pattern does not count as
 * its own clutter), and its chance corrected for the search: Šidák over bands × distinct positions of the defect
 * rate's fundamental (2·slip·rate/bin).
 * A harmonic whose whole window lies on a foreign harmonic is left out: at this resolution the recording cannot tell
 * the bearing from the shaft, and a bearing pattern must not be read from a shaft's comb.
 */
export function searchCombs(combs: readonly BearingComb[], source: BandSource, options: CombSearchOptions): CombEvidence[] {
  return combs.map((comb) => searchComb(comb, source, options));
}

function searchComb(comb: BearingComb, source: BandSource, options: CombSearchOptions): CombEvidence {
  let bestChance = 1;
  let best: { band: { lowHz: number; highHz: number }; measured: MatchableSpectrum; harmonics: number; slip: number } | null = null;
  let bandsSearched = 0;
  let positions = 1;
  for (const band of source.bands) {
    if (band.highHz - band.lowHz < comb.minBandwidthHz) continue;
    const measured = source.spectrumOf(band);
    if (!measured) continue;
    const spectrum = measured.spectrum;
    const df = spectrum.frequencyResolutionHz;
    const topHz = spectrum.frequenciesHz[spectrum.frequenciesHz.length - 2]!;
    const harmonics = Math.min(options.maxHarmonics, Math.floor((HARMONIC_REACH * (band.highHz - band.lowHz)) / comb.defectHz), Math.floor(topHz / (comb.defectHz * (1 + options.slipFraction))));
    if (harmonics < 1) continue;
    bandsSearched++;
    positions = Math.max(positions, Math.floor((2 * options.slipFraction * comb.defectHz) / df) + 1);
    const context = bandContext(comb, measured, harmonics, options, null);
    const step = Math.max(1e-4, (0.5 * df) / (harmonics * comb.defectHz));
    for (let slip = 1 - options.slipFraction; slip <= 1 + options.slipFraction + 1e-12; slip += step) {
      const p = patternChance(comb, context, slip);
      if (p !== null && (p < bestChance || best === null)) {
        bestChance = p;
        best = { band: { lowHz: band.lowHz, highHz: band.highHz }, measured, harmonics, slip };
      }
    }
  }
  const trials = Math.max(1, bandsSearched * positions);
  if (!best) return { key: comb.key, chance: 1, rawChance: 1, trials, band: null, slip: 1, lines: [], spectrum: null };
  // The pattern found, weighed again without its own lines in the neighbourhood.
  const context = bandContext(comb, best.measured, best.harmonics, options, best.slip);
  const lines = combLines(comb, context, best.slip);
  const counted = lines.filter((l) => !l.synchronous);
  const raw = fisherCombined(counted.filter((l) => l.matched).map((l) => l.chance), counted.length);
  return { key: comb.key, chance: correctedForSearch(raw, trials), rawChance: raw, trials, band: best.band, slip: best.slip, lines, spectrum: best.measured };
}

/** Fisher's chance of the comb at one slip, or null when every harmonic lies on a foreign harmonic. */
function patternChance(comb: BearingComb, context: BandContext, slip: number): number | null {
  const chances: number[] = [];
  let counted = 0;
  for (const h of context.harmonics) {
    const at = h.harmonic * comb.defectHz * slip;
    if (h.synchronousAt(at)) continue;
    counted++;
    const peak = h.strongestNear(at);
    if (!peak) continue;
    chances.push(peak.chance);
    if (comb.sidebandHz && h.harmonic <= SIDEBAND_HARMONICS) {
      const sidebands = context.sidebandsOf(peak, h);
      counted += sidebands.counted;
      for (const c of sidebands.chances) chances.push(c);
    }
  }
  return counted === 0 ? null : fisherCombined(chances, counted);
}

/** Harmonics of the defect rate are read up to this share of the band's width (a band of width B modulates up to B). */
const HARMONIC_REACH = 0.8;
/** Sidebands are looked for around the first harmonics only (they weaken faster than the carriers). */
const SIDEBAND_HARMONICS = 3;
/**
 * Lines closer than this many bins to a foreign harmonic cannot be told from it: two tones are resolved by a Hann
 * window only about its 6-dB bandwidth apart, 2.0 bins (Harris, Proc. IEEE 66:51–83, 1978, table 1).
 */
const SYNC_BINS = 2;
/** Smallest half-width of a chance neighbourhood, bins. */
const NEIGHBOURHOOD_MIN_BINS = 50;
/** Peaks this strong are the ones whose sidebands tell how modulated the whole spectrum is (dB over the floor). */
const MODULATION_PROBE_DB = 10;
/** When at least half the strong peaks carry sidebands at a rate, sidebands at that rate are no evidence of anything. */
const UBIQUITOUS_MODULATION = 0.5;

/** A candidate peak for a line: where it is, how strong, and its chance in the line's window. */
interface CandidatePeak {
  bin: number;
  frequencyHz: number;
  snrDb: number;
  chance: number;
}

interface HarmonicContext {
  harmonic: number;
  toleranceHz: number;
  chance: ChanceModel;
  /** Eligible peaks (neither leakage nor on a foreign harmonic, over the SNR floor) anywhere the slip range can put the window. */
  peaks: CandidatePeak[];
  synchronousAt(frequencyHz: number): boolean;
  strongestNear(frequencyHz: number): CandidatePeak | null;
}

interface BandContext {
  measured: MatchableSpectrum;
  harmonics: HarmonicContext[];
  sidebandsOf(carrier: CandidatePeak, harmonic: HarmonicContext): { counted: number; chances: number[]; lines: Array<{ sign: number; at: number; peak: CandidatePeak | null }> };
}

/**
 * One band's spectrum as a comb reads it: per harmonic, its chance model (the peaks around it, ±max(50 bins, its
 * frequency), without the foreign harmonics, from which no bearing line is ever taken, and — once the slip is known —
 * without the pattern's own lines) and the peaks its window can reach. Sidebands weigh against the larger of their own
 * chance and how often strong peaks of this spectrum carry such sidebands anyway: if every line of the machine is
 * modulated at the shaft rate, a shaft sideband says nothing of an inner race.
 */
function bandContext(comb: BearingComb, measured: MatchableSpectrum, harmonicCount: number, options: CombSearchOptions, slip: number | null): BandContext {
  const { spectrum, snrDb, maxima } = measured;
  const df = spectrum.frequencyResolutionHz;
  const n = spectrum.values.length;
  const foreign = foreignHarmonicBins(measured, options.foreignRates);
  const eligible = (k: number) => !foreign[k] && snrDb[k]! >= options.minLineSnrDb && !isLeakagePeak(measured, k);
  const own = new Uint8Array(n);
  if (slip !== null) {
    const mods = [0, ...comb.modulationHz.flatMap((m) => [m, -m, 2 * m, -2 * m]), ...(comb.sidebandHz ? [comb.sidebandHz, -comb.sidebandHz] : [])];
    for (let h = 1; h <= harmonicCount; h++) {
      const tol = df + 3 * options.speedUncertaintyFraction * h * comb.defectHz;
      for (const m of mods) {
        const c = h * comb.defectHz * slip + m;
        for (let k = Math.max(0, Math.floor((c - tol) / df) - 1); k <= Math.min(n - 1, Math.ceil((c + tol) / df) + 1); k++) own[k] = 1;
      }
    }
  }
  const harmonics: HarmonicContext[] = [];
  for (let h = 1; h <= harmonicCount; h++) {
    const c = Math.round((h * comb.defectHz) / df);
    const reach = Math.max(NEIGHBOURHOOD_MIN_BINS, c);
    const lo = Math.max(1, c - reach);
    const hi = Math.min(n - 2, c + reach);
    const neighbourhood: number[] = [];
    let width = 0;
    for (let k = lo; k <= hi; k++) if (!own[k] && !foreign[k]) width++;
    for (let i = firstAtOrAbove(maxima, lo); i < maxima.length && maxima[i]! <= hi; i++) {
      const k = maxima[i]!;
      if (!own[k] && !foreign[k]) neighbourhood.push(snrDb[k]!);
    }
    neighbourhood.sort((a, b) => b - a);
    const chance = chanceModel({ peakSnrDb: neighbourhood, widthBins: width });
    // Half a bin for where a tone falls, a bin for the slip grid and the peak's own spread, and three standard
    // uncertainties of the speed scaled to this harmonic.
    const toleranceHz = df + 3 * options.speedUncertaintyFraction * h * comb.defectHz;
    const windowBins = Math.max(1, Math.round((2 * toleranceHz) / df));
    const reachLo = Math.max(1, Math.ceil((h * comb.defectHz * (1 - options.slipFraction) - toleranceHz) / df));
    const reachHi = Math.min(n - 2, Math.floor((h * comb.defectHz * (1 + options.slipFraction) + toleranceHz) / df));
    const peaks: CandidatePeak[] = [];
    for (let i = firstAtOrAbove(maxima, reachLo); i < maxima.length && maxima[i]! <= reachHi; i++) {
      const k = maxima[i]!;
      if (!eligible(k)) continue;
      const p = peakAt(measured, k);
      peaks.push({ bin: k, frequencyHz: p.frequencyHz, snrDb: snrDb[k]!, chance: chanceOfPeak(chance, snrDb[k]!, windowBins) });
    }
    harmonics.push({
      harmonic: h,
      toleranceHz,
      chance,
      peaks,
      // A foreign harmonic anywhere in the window: the line cannot be told from it at this resolution.
      synchronousAt: (f) => {
        const a = Math.max(1, Math.ceil((f - toleranceHz) / df));
        const b = Math.min(n - 2, Math.floor((f + toleranceHz) / df));
        for (let k = a; k <= b; k++) if (foreign[k]) return true;
        return false;
      },
      strongestNear: (f) => {
        let best: CandidatePeak | null = null;
        for (const p of peaks) {
          if (Math.abs(p.bin * df - f) > toleranceHz || Math.abs(p.frequencyHz - f) > toleranceHz + 0.1 * df) continue;
          if (!best || p.snrDb > best.snrDb) best = p;
        }
        return best;
      },
    });
  }
  // Sidebands say something only where most strong peaks of the spectrum do not carry them anyway.
  const modulated = comb.sidebandHz ? modulationRate(measured, comb.sidebandHz, own, foreign, options.minLineSnrDb) : 1;
  const sidebandsInform = modulated < UBIQUITOUS_MODULATION;
  const sidebandMemo = new Map<number, ReturnType<BandContext['sidebandsOf']>>();
  const sidebandsOf: BandContext['sidebandsOf'] = (carrier, harmonic) => {
    const memo = sidebandMemo.get(carrier.bin);
    if (memo) return memo;
    const out: ReturnType<BandContext['sidebandsOf']> = { counted: 0, chances: [], lines: [] };
    if (comb.sidebandHz && sidebandsInform) {
      for (const sign of [-1, 1]) {
        // Placed from the measured carrier: the modulation rate is known exactly, the carrier's slip is not.
        const at = carrier.frequencyHz + sign * comb.sidebandHz;
        const a = Math.max(1, Math.ceil((at - df) / df));
        const b = Math.min(n - 2, Math.floor((at + df) / df));
        if (at <= 2 * df || b < a) continue;
        let free = false;
        for (let k = a; k <= b; k++) if (!foreign[k]) free = true;
        if (!free) continue;
        let best = -1;
        for (let i = firstAtOrAbove(maxima, a); i < maxima.length && maxima[i]! <= b; i++) {
          const k = maxima[i]!;
          if (eligible(k) && (best < 0 || snrDb[k]! > snrDb[best]!)) best = k;
        }
        out.counted++;
        let peak: CandidatePeak | null = null;
        if (best >= 0) {
          const p = peakAt(measured, best);
          if (Math.abs(p.frequencyHz - at) <= df * 1.1) {
            peak = { bin: best, frequencyHz: p.frequencyHz, snrDb: snrDb[best]!, chance: Math.max(modulated, chanceOfPeak(harmonic.chance, snrDb[best]!, 2)) };
            out.chances.push(peak.chance);
          }
        }
        out.lines.push({ sign, at, peak });
      }
    }
    sidebandMemo.set(carrier.bin, out);
    return out;
  };
  return { measured, harmonics, sidebandsOf };
}

/**
 * How often a strong peak of this spectrum (MODULATION_PROBE_DB over the floor, outside the pattern and the foreign
 * harmonics) has a line at ±rate beside it: the chance that a sideband at that rate is there anyway. Laplace's rule,
 * (k + 1)/(n + 2), so that a spectrum with few strong peaks is not taken as free of modulation.
 */
function modulationRate(measured: MatchableSpectrum, rateHz: number, own: Uint8Array, foreign: Uint8Array, minSnrDb: number): number {
  const { spectrum, snrDb, maxima } = measured;
  const df = spectrum.frequencyResolutionHz;
  const n = spectrum.values.length;
  let probes = 0;
  let modulated = 0;
  for (const k of maxima) {
    if (own[k] || foreign[k] || snrDb[k]! < MODULATION_PROBE_DB) continue;
    const f = peakAt(measured, k).frequencyHz;
    let found = false;
    for (const sign of [-1, 1]) {
      const c = Math.round((f + sign * rateHz) / df);
      if (c < 1 || c > n - 2) continue;
      for (let j = c - 1; j <= c + 1; j++) if (snrDb[j]! >= minSnrDb && snrDb[j]! > snrDb[j - 1]! && snrDb[j]! >= snrDb[j + 1]!) found = true;
    }
    probes++;
    if (found) modulated++;
  }
  return (modulated + 1) / (probes + 2);
}

/**
 * Bins of a spectrum that lie on a harmonic of any of the rates: within SYNC_BINS of it, widened by three standard
 * uncertainties of the rate times the harmonic's number (a speed known to 0.1 % puts its 10th harmonic 1 % × rate
 * either way). Memoized per spectrum and rates.
 */
function foreignHarmonicBins(measured: MatchableSpectrum, rates: ReadonlyArray<{ rateHz: number; relativeUncertainty: number }>): Uint8Array {
  const key = rates.map((r) => `${r.rateHz}±${r.relativeUncertainty}`).join(',');
  let memo = foreignMemo.get(measured);
  if (!memo) {
    memo = new Map();
    foreignMemo.set(measured, memo);
  }
  const known = memo.get(key);
  if (known) return known;
  const df = measured.spectrum.frequencyResolutionHz;
  const n = measured.spectrum.values.length;
  const out = new Uint8Array(n);
  for (const { rateHz, relativeUncertainty } of rates) {
    if (!(rateHz > 0)) continue;
    for (let h = 1; h * rateHz <= (n - 1) * df; h++) {
      const c = (h * rateHz) / df;
      const half = SYNC_BINS + (3 * relativeUncertainty * h * rateHz) / df;
      for (let k = Math.max(0, Math.ceil(c - half)); k <= Math.min(n - 1, Math.floor(c + half)); k++) out[k] = 1;
    }
  }
  memo.set(key, out);
  return out;
}

const foreignMemo = new WeakMap<MatchableSpectrum, Map<string, Uint8Array>>();

/** The evidence rows of a comb at the slip chosen. */
function combLines(comb: BearingComb, context: BandContext, slip: number): CombLine[] {
  const lines: CombLine[] = [];
  for (const h of context.harmonics) {
    const predictedHz = h.harmonic * comb.defectHz;
    const searchedHz = predictedHz * slip;
    const label = `${h.harmonic}×${comb.rateLabel}`;
    const base = { label, harmonic: h.harmonic, sideband: 0, predictedHz, searchedHz, toleranceHz: h.toleranceHz };
    if (h.synchronousAt(searchedHz)) {
      lines.push({ ...base, measuredHz: null, measuredAmplitude: null, snrDb: null, chance: 1, matched: false, synchronous: true });
      continue;
    }
    const peak = h.strongestNear(searchedHz);
    lines.push(peak
      ? { ...base, measuredHz: peak.frequencyHz, measuredAmplitude: peakAt(context.measured, peak.bin).amplitude, snrDb: peak.snrDb, chance: peak.chance, matched: true, synchronous: false }
      : { ...base, measuredHz: null, measuredAmplitude: null, snrDb: null, chance: 1, matched: false, synchronous: false });
    if (peak && comb.sidebandHz && h.harmonic <= SIDEBAND_HARMONICS) {
      for (const sb of context.sidebandsOf(peak, h).lines) {
        lines.push({
          label: `${label} ${sb.sign > 0 ? '+' : '−'} ${comb.sidebandLabel}`, harmonic: h.harmonic, sideband: sb.sign,
          predictedHz: predictedHz + sb.sign * comb.sidebandHz, searchedHz: sb.at, toleranceHz: context.measured.spectrum.frequencyResolutionHz,
          measuredHz: sb.peak?.frequencyHz ?? null, measuredAmplitude: sb.peak ? peakAt(context.measured, sb.peak.bin).amplitude : null,
          snrDb: sb.peak?.snrDb ?? null, chance: sb.peak?.chance ?? 1, matched: sb.peak !== null, synchronous: false,
        });
      }
    }
  }
  return lines;
}

/**
 * One peak, one explanation: the combs are taken strongest first (lowest chance after the search correction), and a
 * line of a weaker comb whose peak lies on the pattern of a stronger one (within either line's tolerance) no longer
 * counts for the weaker one, whose chance is combined again without it (with the same corrections). The stronger
 * pattern is its harmonics at its slip and their modulation sidebands (±1…3 of each modulation rate), matched or
 * not: a sideband family of an inner-race defect must not make a rolling-element comb of the same or another bearing.
 * Only a comb that stands out (chance under CLAIM_CHANCE) claims, and secondary patterns (the cage rate, itself a
 * modulation of the others) come after every primary one. An identical twin, whose lines are all shared, is
 * grouped with its twin before this step and never reaches it.
 */
export function claimShared(combs: readonly BearingComb[], evidence: readonly CombEvidence[]): CombEvidence[] {
  const combOf = new Map(combs.map((c) => [c.key, c]));
  const secondary = (e: CombEvidence) => (combOf.get(e.key)?.secondary ? 1 : 0);
  const order = [...evidence].sort((a, b) => secondary(a) - secondary(b) || a.chance - b.chance || a.rawChance - b.rawChance);
  const claimed: Array<{ hz: number; tolerance: number; by: string }> = [];
  const out = new Map<string, CombEvidence>();
  for (const e of order) {
    let changed = false;
    const lines = e.lines.map((l) => {
      if (!l.matched || l.measuredHz === null) return l;
      const taken = claimed.find((c) => Math.abs(c.hz - l.measuredHz!) <= Math.max(c.tolerance, l.toleranceHz));
      if (!taken) return l;
      changed = true;
      return { ...l, matched: false, chance: 1, claimedBy: taken.by };
    });
    let result = e;
    if (changed) {
      const counted = lines.filter((l) => !l.synchronous);
      const raw = fisherCombined(counted.filter((l) => l.matched).map((l) => l.chance), counted.length);
      result = { ...e, lines, rawChance: raw, chance: correctedForSearch(raw, e.trials) };
    }
    out.set(e.key, result);
    const comb = combOf.get(e.key);
    if (result.chance < CLAIM_CHANCE && comb && result.spectrum) {
      const df = result.spectrum.spectrum.frequencyResolutionHz;
      const topHz = result.spectrum.spectrum.frequenciesHz[result.spectrum.spectrum.frequenciesHz.length - 1]!;
      const mods = [0, ...comb.modulationHz.flatMap((m) => [1, 2, 3].flatMap((j) => [j * m, -j * m]))];
      // From h = 0: the modulation rates' own first harmonics belong to the pattern too (an FTF line beside a ball pass).
      for (let h = 0; h * comb.defectHz * result.slip <= topHz; h++) {
        const carrier = result.lines.find((l) => l.harmonic === h && l.sideband === 0 && l.matched)?.measuredHz ?? h * comb.defectHz * result.slip;
        for (const m of mods) if (carrier + m > 0) claimed.push({ hz: carrier + m, tolerance: df, by: e.key });
      }
    }
  }
  return evidence.map((e) => out.get(e.key)!);
}

/** A comb claims its pattern from weaker ones only when its own chance is under this (1 %, after the search correction). */
const CLAIM_CHANCE = 0.01;
