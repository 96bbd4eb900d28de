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
  /** The comb's spacing in multiples of the labelled rate (2 for twice BSF): harmonic h is labelled h·multiple. */
  labelMultiple?: number;
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
  foreignRates: ReadonlyArray<ForeignRate>;
  /** Relative standard uncertainty of the speed (0 in the angle domain). */
  speedUncertaintyFraction: number;
  /** Largest relative departure of the defect rate from the kinematic one searched (slip). */
  slipFraction: number;
  /** Highest harmonic of the defect rate looked at. */
  maxHarmonics: number;
  /** Lines weaker than this over the floor are not candidates at all (dB). */
  minLineSnrDb: number;
}

/**
 * A rate whose harmonics belong to something else, each harmonic h·rate shifted by every one of `offsetsHz` (a gear
 * mesh's lattice n·f₁ + m·f₂: offsets m·f₂), known to a relative standard uncertainty.
 */
export interface ForeignRate {
  rateHz: number;
  relativeUncertainty: number;
  offsetsHz?: readonly number[];
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
 * rate's fundamental (the slip range over the width of the fundamental's window).
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
    // Distinct positions of the fundamental's window over the slip range: its width is twice its tolerance.
    const fundamentalTolerance = df + 3 * options.speedUncertaintyFraction * comb.defectHz;
    positions = Math.max(positions, Math.floor((2 * options.slipFraction * comb.defectHz) / (2 * fundamentalTolerance)) + 1);
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
/** Foreign rates under this many exclusion zones' widths apart are too dense to exclude (see foreignHarmonicBins). */
const DENSE_RATE_FACTOR = 3;
/** Sidebands of each modulation rate, either side of every harmonic, that belong to a pattern found (a strongly modulated impact train has many). */
const OWN_SIDEBANDS = 6;
/** Of those, the ones left out of the pattern's own chance neighbourhood. */
const NEAR_SIDEBANDS = 2;
/** Share of a harmonic's frequency within which a found pattern's broadened lines still count as its own. */
const OWN_SPREAD_FRACTION = 0.005;
/** Smallest half-width of a chance neighbourhood, bins. */
const NEIGHBOURHOOD_MIN_BINS = 50;
/** Peaks this strong are the ones whose sidebands tell how modulated the whole spectrum is (dB over the floor). */
const MODULATION_PROBE_DB = 10;
/** When at least half the strong peaks carry sidebands at a rate, sidebands at that rate are no evidence of anything. */
const UBIQUITOUS_MODULATION = 0.5;
/** A sideband of a probe counts when it stands this far over the floor (the matching threshold of the ordinary spectrum). */
const MODULATION_SIDEBAND_DB = 6;
/** Fewer strong peaks than this outside the pattern say nothing about how modulated the spectrum is. */
const MIN_MODULATION_PROBES = 4;

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
  // The pattern's own lines, once the slip is known: the peaks standing on its modulation lattice (each harmonic the
  // spectrum holds, with its sidebands at the rates the resolution separates). Only peaks are taken, not the
  // lattice's empty positions. Within ±2 sidebands they are left out of the chance neighbourhood (a found pattern must
  // not be its own clutter); out to ±OWN_SIDEBANDS they are left out of the modulation probes too (a strongly modulated
  // impact train carries many sidebands, each with its neighbours: it must not make the spectrum look modulated
  // everywhere). Beyond ±2 they stay clutter: a hypothesis must not clear its neighbourhood of everything its wide
  // lattice happens to touch.
  const own = slip === null ? new Uint8Array(n) : ownPeaks(comb, measured, slip, NEAR_SIDEBANDS, options);
  const ownWide = slip === null ? own : ownPeaks(comb, measured, slip, OWN_SIDEBANDS, options);
  // ±max(50 bins, its frequency), widened until it holds NEIGHBOURHOOD_MIN_BINS bins that are neither the pattern's
  // nor a foreign harmonic's (a strongly modulated pattern can own most of the bins near its first harmonics).
  const localChanceModel = (c: number): ChanceModel => {
    let reach = Math.max(NEIGHBOURHOOD_MIN_BINS, c);
    let lo = Math.max(1, c - reach);
    let hi = Math.min(n - 2, c + reach);
    let width = 0;
    for (let k = lo; k <= hi; k++) if (!own[k] && !foreign[k]) width++;
    while (width < NEIGHBOURHOOD_MIN_BINS && (lo > 1 || hi < n - 2)) {
      reach *= 2;
      const lo2 = Math.max(1, c - reach);
      const hi2 = Math.min(n - 2, c + reach);
      for (let k = lo2; k < lo; k++) if (!own[k] && !foreign[k]) width++;
      for (let k = hi + 1; k <= hi2; k++) if (!own[k] && !foreign[k]) width++;
      lo = lo2;
      hi = hi2;
    }
    const neighbourhood: number[] = [];
    for (let i = firstAtOrAbove(maxima, lo); i < maxima.length && maxima[i]! <= hi; i++) {
      const k = maxima[i]!;
      if (!own[k] && !foreign[k]) neighbourhood.push(snrDb[k]!);
    }
    neighbourhood.sort((a, b) => b - a);
    return chanceModel({ peakSnrDb: neighbourhood, widthBins: width });
  };
  const harmonics: HarmonicContext[] = [];
  // The search (no slip yet) weighs every harmonic against the whole spectrum's peaks, computed once per spectrum: it
  // only ranks bands and slips. The pattern found is weighed against each harmonic's own neighbourhood.
  const searchModel = slip === null ? spectrumChanceModel(measured, foreign) : null;
  for (let h = 1; h <= harmonicCount; h++) {
    const c = Math.round((h * comb.defectHz) / df);
    const chance = searchModel ?? localChanceModel(c);
    // Half a bin for where a tone falls, a bin for the slip grid and the peak's own spread, and three standard
    // uncertainties of the speed scaled to this harmonic.
    const toleranceHz = df + 3 * options.speedUncertaintyFraction * h * comb.defectHz;
    // The slip is searched, so the h-th harmonic roams h times as far as the fundamental while the fundamental stays in
    // one window: its chance is weighed over that reach (the search correction counts the fundamental's positions only).
    const fundamentalWindow = 2 * (df + 3 * options.speedUncertaintyFraction * comb.defectHz);
    const windowBins = Math.max(1, Math.round(Math.max(2 * toleranceHz, h * fundamentalWindow) / df));
    const reachLo = Math.max(1, Math.ceil((h * comb.defectHz * (1 - options.slipFraction) - toleranceHz) / df));
    const reachHi = Math.min(n - 2, Math.floor((h * comb.defectHz * (1 + options.slipFraction) + toleranceHz) / df));
    const peaks: CandidatePeak[] = [];
    for (let i = firstAtOrAbove(maxima, reachLo); i < maxima.length && maxima[i]! <= reachHi; i++) {
      const k = maxima[i]!;
      if (!eligible(k)) continue;
      // The search places peaks at their bins; the pattern found is placed at interpolated frequencies.
      const frequencyHz = slip === null ? k * df : peakAt(measured, k).frequencyHz;
      peaks.push({ bin: k, frequencyHz, snrDb: snrDb[k]!, chance: chanceOfPeak(chance, snrDb[k]!, windowBins) });
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
  const modulated = comb.sidebandHz ? modulationRate(measured, comb.sidebandHz, ownWide, foreign, options.minLineSnrDb) : { rate: 1, probes: Infinity };
  const sidebandsInform = modulated.probes < MIN_MODULATION_PROBES || modulated.rate < UBIQUITOUS_MODULATION;
  const sidebandFloor = modulated.probes < MIN_MODULATION_PROBES ? 0 : modulated.rate;
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
          const frequencyHz = slip === null ? best * df : peakAt(measured, best).frequencyHz;
          if (Math.abs(frequencyHz - at) <= df * 1.1) {
            peak = { bin: best, frequencyHz, snrDb: snrDb[best]!, chance: Math.max(sidebandFloor, chanceOfPeak(harmonic.chance, snrDb[best]!, 2)) };
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

/** The chance model of a whole spectrum's peaks off the foreign harmonics (memoized per spectrum and mask). */
function spectrumChanceModel(measured: MatchableSpectrum, foreign: Uint8Array): ChanceModel {
  let memo = spectrumModelMemo.get(measured);
  if (!memo) {
    memo = new WeakMap();
    spectrumModelMemo.set(measured, memo);
  }
  const known = memo.get(foreign);
  if (known) return known;
  const n = measured.spectrum.values.length;
  const peaks: number[] = [];
  let width = 0;
  for (let k = 1; k < n - 1; k++) if (!foreign[k]) width++;
  for (const k of measured.maxima) if (!foreign[k]) peaks.push(measured.snrDb[k]!);
  peaks.sort((a, b) => b - a);
  const model = chanceModel({ peakSnrDb: peaks, widthBins: width });
  memo.set(foreign, model);
  return model;
}

const spectrumModelMemo = new WeakMap<MatchableSpectrum, WeakMap<Uint8Array, ChanceModel>>();

/** The bins of the peaks on a comb's modulation lattice at a slip, with sidebands out to ±sidebands (see bandContext). */
function ownPeaks(comb: BearingComb, measured: MatchableSpectrum, slip: number, sidebands: number, options: CombSearchOptions): Uint8Array {
  const { spectrum, snrDb, maxima } = measured;
  const df = spectrum.frequencyResolutionHz;
  const n = spectrum.values.length;
  const own = new Uint8Array(n);
  const rates = [...comb.modulationHz, ...(comb.sidebandHz ? [comb.sidebandHz] : [])].filter((m) => m >= 2 * SYNC_BINS * df);
  const mods = [0, ...rates.flatMap((m) => Array.from({ length: sidebands }, (_, j) => [(j + 1) * m, -(j + 1) * m]).flat())];
  const top = Math.floor(((n - 1) * df) / (comb.defectHz * slip));
  for (let h = 1; h <= top; h++) {
    // Random slip broadens the higher harmonics of a found pattern: half a percent of each is still its own.
    const tol = df + 3 * options.speedUncertaintyFraction * h * comb.defectHz + OWN_SPREAD_FRACTION * h * comb.defectHz;
    for (const m of mods) {
      const c = h * comb.defectHz * slip + m;
      const a = Math.max(1, Math.ceil((c - tol) / df));
      const b = Math.min(n - 2, Math.floor((c + tol) / df));
      for (let i = firstAtOrAbove(maxima, a); i < maxima.length && maxima[i]! <= b; i++) {
        const k = maxima[i]!;
        if (snrDb[k]! >= options.minLineSnrDb) for (let j = k - 1; j <= k + 1; j++) own[j] = 1;
      }
    }
  }
  return own;
}

/**
 * How often a strong peak of this spectrum (MODULATION_PROBE_DB over the floor, outside the pattern and the foreign
 * harmonics) has a line at ±rate beside it: the chance that a sideband at that rate is there anyway, by Laplace's rule
 * (k + 1)/(n + 2); with fewer than MIN_MODULATION_PROBES such peaks the spectrum says nothing about it.
 */
function modulationRate(measured: MatchableSpectrum, rateHz: number, own: Uint8Array, foreign: Uint8Array, minSnrDb: number): { rate: number; probes: number } {
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
      for (let j = c - 1; j <= c + 1; j++) if (snrDb[j]! >= Math.max(minSnrDb, MODULATION_SIDEBAND_DB) && snrDb[j]! > snrDb[j - 1]! && snrDb[j]! >= snrDb[j + 1]!) found = true;
    }
    probes++;
    if (found) modulated++;
  }
  return { rate: (modulated + 1) / (probes + 2), probes };
}

/**
 * Bins of a spectrum that lie on a harmonic of a foreign rate whose comb the spectrum shows: within SYNC_BINS of it,
 * widened by three standard uncertainties of the rate times the harmonic's number (a speed known to 0.1 % puts its
 * 10th harmonic 1 % × rate either way). A rate's comb is shown when more of its harmonics carry a peak (6 dB over the
 * floor, within the zone) than twice what the spectrum's density of such peaks would put there, and at least a quarter
 * of them: a slow shaft without a comb of its own must not blank a bearing's lines, while a once-per-revolution impact's
 * comb must; the first LOW_HARMONICS harmonics are the shaft's own lines wherever a peak stands on them. Rates so slow that their zones would cover a third of the axis cannot be told from anything by position:
 * their comb, if present, is clutter that the chance neighbourhoods weigh instead. Memoized per spectrum and rates.
 */
function foreignHarmonicBins(measured: MatchableSpectrum, rates: ReadonlyArray<ForeignRate>): Uint8Array {
  const key = rates.map((r) => `${r.rateHz}±${r.relativeUncertainty}+${(r.offsetsHz ?? [0]).join('/')}`).join(',');
  let memo = foreignMemo.get(measured);
  if (!memo) {
    memo = new Map();
    foreignMemo.set(measured, memo);
  }
  const known = memo.get(key);
  if (known) return known;
  const { snrDb, maxima } = measured;
  const df = measured.spectrum.frequencyResolutionHz;
  const n = measured.spectrum.values.length;
  const isPeak = new Uint8Array(n);
  let peaks = 0;
  for (const k of maxima) {
    if (snrDb[k]! >= COMB_PEAK_DB) {
      isPeak[k] = 1;
      peaks++;
    }
  }
  const out = new Uint8Array(n);
  for (const { rateHz, relativeUncertainty, offsetsHz } of rates) {
    // A rate so slow that its harmonics' zones would cover a third of the axis cannot be told from anything by
    // position: its comb, if present, is clutter that the chance neighbourhoods weigh instead.
    if (!(rateHz >= DENSE_RATE_FACTOR * 2 * SYNC_BINS * df)) continue;
    for (const offset of offsetsHz ?? [0]) {
      const zones: Array<[number, number]> = [];
      let carrying = 0;
      let zoneBins = 0;
      for (let h = offset === 0 ? 1 : 0; h * rateHz + offset <= (n - 1) * df; h++) {
        const f = h * rateHz + offset;
        if (f <= 0) continue;
        const c = f / df;
        const half = SYNC_BINS + (3 * relativeUncertainty * (h * rateHz + Math.abs(offset))) / df;
        const a = Math.max(0, Math.ceil(c - half));
        const b = Math.min(n - 1, Math.floor(c + half));
        zones.push([a, b]);
        zoneBins += b - a + 1;
        for (let k = a; k <= b; k++) if (isPeak[k]) { carrying++; break; }
      }
      if (zones.length === 0) continue;
      const expected = Math.min(1, (peaks / n) * (zoneBins / zones.length));
      const combShown = carrying / zones.length >= Math.max(MIN_COMB_SHARE, 2 * expected);
      zones.forEach(([a, b], i) => {
        // The first harmonics of a running shaft are its own lines wherever they carry a peak, comb or no comb.
        let carries = false;
        for (let k = a; k <= b && !carries; k++) if (isPeak[k]) carries = true;
        if (combShown || (i < LOW_HARMONICS && carries)) for (let k = a; k <= b; k++) out[k] = 1;
      });
    }
  }
  memo.set(key, out);
  return out;
}

/** A peak this far over the floor on a foreign harmonic counts towards that rate's comb (the matching threshold). */
const COMB_PEAK_DB = 6;
/** Harmonics of a foreign rate up to this one are its own lines wherever a peak stands on them (1×…10×). */
const LOW_HARMONICS = 10;
/** At least this share of a rate's harmonics must carry a peak for its comb to be shown. */
const MIN_COMB_SHARE = 0.25;

const foreignMemo = new WeakMap<MatchableSpectrum, Map<string, Uint8Array>>();

/** The evidence rows of a comb at the slip chosen. */
function combLines(comb: BearingComb, context: BandContext, slip: number): CombLine[] {
  const lines: CombLine[] = [];
  for (const h of context.harmonics) {
    const predictedHz = h.harmonic * comb.defectHz;
    const searchedHz = predictedHz * slip;
    const label = `${h.harmonic * (comb.labelMultiple ?? 1)}×${comb.rateLabel}`;
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
 * Lines already explained elsewhere (`external`: the modulation lattice of a shown tooth fault) are claimed before any
 * comb. Only a comb that stands out (chance under CLAIM_CHANCE) claims, and secondary patterns (the cage rate, itself a
 * modulation of the others) come after every primary one. An identical twin, whose lines are all shared, is
 * grouped with its twin before this step and never reaches it.
 */
export function claimShared(
  combs: readonly BearingComb[],
  evidence: readonly CombEvidence[],
  external: ReadonlyArray<{ hz: number; tolerance: number; by: string }> = [],
): CombEvidence[] {
  const combOf = new Map(combs.map((c) => [c.key, c]));
  const secondary = (e: CombEvidence) => (combOf.get(e.key)?.secondary ? 1 : 0);
  const order = [...evidence].sort((a, b) => secondary(a) - secondary(b) || a.chance - b.chance || a.rawChance - b.rawChance);
  const claimed: Array<{ hz: number; tolerance: number; by: string }> = [...external];
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
