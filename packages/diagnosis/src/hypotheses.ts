import type { MachineModel, Point } from '@kinespec/kinematics';
import type { CatalogueLine, LineCatalogue } from './ambiguity.js';
import type { Candidate } from './candidates.js';
import { cepstralPeak, type Cepstrum } from './cepstrum.js';
import { claimShared, searchCombs, type BandSource, type BearingComb, type CombEvidence, type ForeignRate } from './evidence/bearing-comb.js';
import { evidenceOf } from './evidence/chance.js';
import { weighPattern } from './evidence/line-evidence.js';
import { GATE_CLOSED_FACTOR, gates, type GateContext } from './faults/gates.js';
import { judgedLevel, type LevelContext } from './level.js';
import { firstAtOrAbove, type MatchableSpectrum } from './line-matching.js';

/** One predicted line of a judged hypothesis, as the evidence table and the reasons read it. */
export interface JudgedLine {
  label: string;
  /** Where the model puts the line, in the spectrum's frequency unit. */
  predictedHz: number;
  predictedAmplitude: number;
  toleranceHz: number;
  measuredHz: number | null;
  measuredAmplitude: number | null;
  snrDb: number | null;
  /** Probability of a peak this strong in the line's window by chance (1 when none was found). */
  chance: number;
  matched: boolean;
  /** The line counts towards the pattern's chance (see line-evidence.ts, bearing-comb.ts). */
  counted: boolean;
  ambiguous: boolean;
  ambiguousWith: string[];
  running: boolean;
  twin: boolean;
  /** Bearing lines the resolution cannot tell from a shaft harmonic. */
  synchronous: boolean;
  /** The line's frequency over its shaft's rate (NaN for lines that are no order of it). */
  harmonic: number;
  /** For a tooth fault's line near one of its mesh harmonics: the sideband's order (−3 for GMF − 3×), else null. */
  sidebandOrder: number | null;
}

export interface ScoreParts {
  /** Strength of the evidence, 0..1, from the pattern's chance (evidence.ts). */
  detection: number;
  shape: number;
  level: number;
  exclusivity: number;
  support: number;
  explainedAway: number;
  explainedBy?: string;
  /** Probability of the pattern by chance, corrected for the bands and slips searched. */
  chance: number;
  /** Product of the fault kind's gates (1 when every requirement is met). */
  gate: number;
}

export interface Judged {
  candidate: Candidate;
  score: number;
  parts: ScoreParts;
  lines: JudgedLine[];
  /** Counted lines found, and counted lines in all. */
  linesFound: number;
  linesCounted: number;
  /** Why a gate lowered the score. */
  gateReasons: string[];
  /** For envelope hypotheses: the demodulation band the pattern was found in, and its envelope spectrum. */
  band?: { lowHz: number; highHz: number };
  bandSpectrum?: MatchableSpectrum;
}

export interface JudgeInputs {
  model: MachineModel;
  point: Point;
  candidates: readonly Candidate[];
  /** The ordinary spectrum (or order spectrum) and its unit and quantity. */
  main: MatchableSpectrum;
  unit: string;
  quantity: 'acceleration' | 'velocity' | 'displacement';
  /** Hz per unit of the spectra's frequency axis (the mean speed in the angle domain, else 1). */
  unitHz: number;
  /** Reference shaft speed in the spectra's frequency unit (1 in the angle domain) and in Hz. */
  lineSpeedHz: number;
  referenceSpeedHz: number;
  /** Standard uncertainty of the reference speed, in the spectra's frequency unit. */
  speedUncertaintyHz: number;
  speed: GateContext['speed'];
  minSnrDb: number;
  isoAbMmPerS: number;
  isoBcMmPerS: number;
  baseline: LevelContext['baseline'];
  baselineOrders: LevelContext['baselineOrders'];
  pointUnit: string | null;
  catalogue: LineCatalogue;
  runningLines: LineCatalogue;
  /** Where bearing combs are looked for; null when the record cannot carry an envelope analysis. */
  envelope: {
    source: BandSource;
    speedUncertaintyFraction: number;
    /** The envelope spectrum of any band of the record (for the once-per-turn comb of a tooth fault). */
    band(band: { lowHz: number; highHz: number }): MatchableSpectrum;
    topHz: number;
  } | null;
  cepstrum: () => Cepstrum;
}

/** Largest departure of a bearing's defect rate from the kinematic one searched: slip of 1–2 % (Randall & Antoni 2011, §2.1). */
export const BEARING_SLIP_SEARCH = 0.02;
/** Highest harmonic of a bearing defect rate looked at (random slip smears the higher ones; Randall & Antoni 2011, §2.1). */
const BEARING_HARMONICS = 10;
/**
 * A demodulation band must be this many times the defect rate wide: the squared envelope of a band of width B holds
 * modulation up to B, and the first harmonics with their sidebands must fit (3 harmonics need 3×, with margin).
 */
export const BAND_WIDTH_FACTOR = 3.5;
/** Lines closer than this many bins are not told apart (Hann's 6-dB bandwidth, Harris 1978). */
const RESOLVABLE_BINS = 2;
/** A bearing line weaker than this over the envelope floor is no candidate at all (dB). */
const BEARING_LINE_FLOOR_DB = 3;

/**
 * Judges every candidate: the chance of its pattern (line-evidence.ts for the ordinary spectrum, bearing-comb.ts for
 * the envelope), how big it is (level.ts), whether its relative sizes follow the prediction up to a smooth path,
 * whether rivals of the same part explain the lines better (exclusivity), outside support (the cepstrum), the fault
 * kind's gates (gates.ts), and Occam's razor between kinds of component (explainAway). See README "Score".
 *   score = evidence × (0.5 + 0.5·shape) × level × exclusivity × support × gates × explainedAway
 */
export function judgeHypotheses(inputs: JudgeInputs): Judged[] {
  const spectrumCandidates = inputs.candidates.filter((c) => c.domain === 'spectrum');
  const envelopeCandidates = inputs.candidates.filter((c) => c.domain === 'envelope' && c.descriptor.comb && c.bearingOrders);
  const judged: Judged[] = [];
  const patterns = spectrumCandidates.map((candidate) => ({ candidate, lines: spectrumLines(candidate, inputs) }));
  for (const { candidate, lines } of patterns) {
    const rivals = patterns.filter((r) => r.candidate !== candidate && r.candidate.context === candidate.context);
    judged.push(finish(candidate, lines.lines, lines.chance, { exclusivity: exclusivityOf(candidate, lines.lines, rivals.map((r) => r.lines.lines)), shape: pathShape(lines.lines) }, inputs));
  }
  if (inputs.envelope && envelopeCandidates.length > 0) {
    const combs = envelopeCandidates.map((c) => combOf(c, inputs));
    const found = claimShared(combs, searchCombs(combs, inputs.envelope.source, {
      foreignRates: foreignRates(inputs), speedUncertaintyFraction: inputs.envelope.speedUncertaintyFraction,
      slipFraction: BEARING_SLIP_SEARCH, maxHarmonics: BEARING_HARMONICS, minLineSnrDb: BEARING_LINE_FLOOR_DB,
    }), toothFaultLattice(judged, inputs));
    envelopeCandidates.forEach((candidate, i) => {
      const e = found[i]!;
      const j = finish(candidate, combLinesOf(candidate, e, inputs), e.chance, { exclusivity: 1, shape: 1 }, inputs);
      if (e.band) {
        j.band = e.band;
        if (e.spectrum) j.bandSpectrum = e.spectrum;
      }
      judged.push(j);
    });
  } else {
    for (const candidate of envelopeCandidates) judged.push(finish(candidate, [], 1, { exclusivity: 1, shape: 1 }, inputs));
  }
  return withBearingDamage(explainAway(judged));
}

function finish(candidate: Candidate, lines: JudgedLine[], chance: number, rivalry: { exclusivity: number; shape: number }, inputs: JudgeInputs): Judged {
  const detection = candidate.descriptor.evidence === 'chance' ? evidenceOf(chance) : presenceOf(lines);
  const judgedAt = judgedLevel(candidate, lines, {
    model: inputs.model, unit: candidate.domain === 'envelope' ? `${inputs.unit}^2` : inputs.unit, isoAbMmPerS: inputs.isoAbMmPerS, isoBcMmPerS: inputs.isoBcMmPerS, baseline: inputs.baseline,
    speedHz: inputs.lineSpeedHz, measured: inputs.main, uncertaintyHz: inputs.speedUncertaintyHz, unitHz: inputs.unitHz,
    referenceSpeedHz: inputs.referenceSpeedHz, baselineOrders: inputs.baselineOrders, pointUnit: inputs.pointUnit,
  });
  const level = clamp01(judgedAt.level);
  const context: GateContext = {
    candidate, lines, quantity: inputs.quantity, speed: inputs.speed, hasBaseline: judgedAt.againstBaseline,
    oncePerTurn: () => oncePerTurnComb(candidate, inputs),
  };
  let gate = 1;
  const gateReasons: string[] = [];
  // Only what the record's resolution can decide: a shaft's lines (its harmonics, its sidebands) must lie further apart
  // than two tones a Hann window resolves, its 6-dB bandwidth of 2.0 bins (Harris 1978, table 1). A 0.1 s snapshot keeps
  // its overall levels and the hypotheses its bins can separate.
  const binHz = candidate.domain === 'envelope' ? null : inputs.main.spectrum.frequencyResolutionHz;
  const shaftHz = candidate.shaftRatio * inputs.lineSpeedHz;
  if (binHz !== null && shaftHz < RESOLVABLE_BINS * binHz) {
    gate *= GATE_CLOSED_FACTOR;
    gateReasons.push(`the record is too short to separate lines ${(shaftHz * inputs.unitHz).toFixed(1)} Hz apart (bins of ${(binHz * inputs.unitHz).toFixed(1)} Hz)`);
  }
  for (const name of candidate.descriptor.gates) {
    const r = gates[name](context);
    gate *= r.factor;
    if (r.reason && r.factor < 1) gateReasons.push(r.reason);
  }
  const twinned = lines.some((l) => l.matched && l.twin);
  const support = cepstralSupport(candidate, inputs) * (twinned && !candidate.atPoint ? TWIN_AWAY_FACTOR : 1);
  const parts: ScoreParts = { detection, shape: rivalry.shape, level, exclusivity: rivalry.exclusivity, support, explainedAway: 1, chance, gate };
  const score = clamp01(detection * (0.5 + 0.5 * parts.shape) * level * parts.exclusivity * support * gate);
  const counted = lines.filter((l) => l.counted && !l.synchronous);
  return { candidate, score, parts, lines, linesFound: counted.filter((l) => l.matched).length, linesCounted: counted.length, gateReasons };
}

/** A shaft order's sideband order around the nearest mesh harmonic of a gear with `teeth` teeth (null when not a gear's line). */
function sidebandOrderOf(order: number, teeth: number | null): number | null {
  if (teeth === null || !Number.isFinite(order)) return null;
  const mesh = Math.round(order / teeth);
  if (mesh < 1) return null;
  return Math.round(order - mesh * teeth);
}

/** SNR (dB) at which a found line counts fully as present; a line at the 6 dB threshold counts a third. */
const FULL_PRESENCE_DB = 12;
const PRESENCE_FLOOR_DB = 3;

/**
 * Presence of a pattern of running lines: Σ wᵢ·dᵢ / Σ wᵢ over the counted lines, wᵢ the predicted amplitude (strong
 * predicted lines matter most), dᵢ = clamp((SNRᵢ − 3 dB)/9 dB) for a found line (a third at the 6 dB threshold, all
 * from 12 dB), 0 otherwise.
 */
function presenceOf(lines: readonly JudgedLine[]): number {
  let weights = 0;
  let present = 0;
  for (const l of lines) {
    if (!l.counted) continue;
    weights += l.predictedAmplitude;
    if (l.matched && l.snrDb !== null) present += l.predictedAmplitude * clamp01((l.snrDb - PRESENCE_FLOOR_DB) / (FULL_PRESENCE_DB - PRESENCE_FLOOR_DB));
  }
  return weights > 0 ? present / weights : 0;
}

/** The candidate's predicted lines weighed in the ordinary (or order) spectrum. */
function spectrumLines(candidate: Candidate, inputs: JudgeInputs): { lines: JudgedLine[]; chance: number } {
  const shaftHz = candidate.shaftRatio * inputs.lineSpeedHz;
  const teeth = candidate.kind === 'gear' ? inputs.model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === candidate.component)?.teeth ?? null : null;
  const pattern = weighPattern(
    { lines: candidate.lines, own: candidate.own, ownsRunningLines: candidate.descriptor.ownsRunningLines, isTwin: (l) => isTwin(candidate, l) },
    inputs.main,
    { speedUncertaintyHz: inputs.speedUncertaintyHz, minSnrDb: inputs.minSnrDb, catalogue: inputs.catalogue, runningLines: inputs.runningLines },
  );
  const lines = pattern.lines.map((m, i): JudgedLine => ({
    label: m.label, predictedHz: m.predictedHz, predictedAmplitude: m.predictedAmplitude, toleranceHz: m.toleranceHz,
    measuredHz: m.measuredHz, measuredAmplitude: m.measuredAmplitude, snrDb: Number.isFinite(m.snrDb) ? m.snrDb : null, chance: m.chance,
    matched: m.matched, counted: m.counted, ambiguous: m.ambiguous, ambiguousWith: m.ambiguousWith, running: m.running, twin: m.twin,
    synchronous: false, harmonic: candidate.lines[i]!.order === 0 ? Number.NaN : m.predictedHz / shaftHz,
    sidebandOrder: sidebandOrderOf(m.predictedHz / shaftHz, teeth),
  }));
  return { lines, chance: pattern.chance };
}

/**
 * The envelope lines a shown local gear fault explains: a tooth fault strikes once per turn of its gear and modulates
 * its mesh, whose own running modulation carries the mating gear's shaft too, so the envelope of any band its impacts
 * ring holds combinations n·f₁ + m·f₂ of the two shafts' rates (sidebands at both shaft speeds: Randall, Vibration-based
 * Condition Monitoring, 2011, ch. 6, from memory). A bearing pattern read from those lines is the gear fault's, not
 * a bearing's: they are claimed before any bearing comb (|m| ≤ 3, up to the envelope's reach).
 */
function toothFaultLattice(judged: readonly Judged[], inputs: JudgeInputs): Array<{ hz: number; tolerance: number; by: string }> {
  const out: Array<{ hz: number; tolerance: number; by: string }> = [];
  const topHz = Math.max(0, ...inputs.envelope!.source.bands.map((b) => b.highHz - b.lowHz));
  for (const j of judged) {
    if (j.score < 0.5 || j.candidate.kind !== 'gear' || j.candidate.descriptor.evidence !== 'chance') continue;
    const f1 = j.candidate.shaftRatio * inputs.lineSpeedHz;
    const mesh = inputs.model.gearMeshes.find((m) => m.driver.gear === j.candidate.component || m.driven.gear === j.candidate.component);
    const mate = mesh ? (mesh.driver.gear === j.candidate.component ? mesh.driven : mesh.driver) : null;
    const mateRatio = mate ? inputs.candidates.find((c) => c.shaft === mate.shaft)?.shaftRatio : undefined;
    const f2 = mateRatio !== undefined ? mateRatio * inputs.lineSpeedHz : null;
    const by = `${j.candidate.fault}:${j.candidate.component}`;
    for (let n = 0; n * f1 <= topHz; n++) {
      for (let m = -LATTICE_ORDERS; m <= LATTICE_ORDERS; m++) {
        if (f2 === null && m !== 0) continue;
        const hz = n * f1 + m * (f2 ?? 0);
        if (hz <= 0 || hz > topHz) continue;
        const tolerance = 2 * inputs.speedUncertaintyHz * (n + Math.abs(m)) + LATTICE_TOLERANCE_BINS * bearingResolution(inputs);
        out.push({ hz, tolerance, by });
      }
    }
  }
  return out;
}

/**
 * How many of the first ONCE_PER_TURN_HARMONICS harmonics of a gear's shaft rate stand 6 dB over the floor in the
 * squared-envelope spectrum of the band holding its mesh harmonics (½ to 3½ × its mesh frequency), or null when the
 * record offers no such band. A local tooth fault strikes once per turn: the envelope of its mesh is periodic at the
 * shaft rate and impulsive, so its comb has many harmonics; a runout modulates the mesh smoothly (1×, 2×).
 */
function oncePerTurnComb(candidate: Candidate, inputs: JudgeInputs): number | null {
  if (!inputs.envelope || candidate.kind !== 'gear') return null;
  const teeth = inputs.model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === candidate.component)?.teeth;
  if (teeth === undefined) return null;
  const shaftHz = candidate.shaftRatio * inputs.lineSpeedHz;
  const meshHz = teeth * shaftHz;
  const band = { lowHz: 0.5 * meshHz, highHz: Math.min(3.5 * meshHz, inputs.envelope.topHz) };
  if (band.highHz - band.lowHz < (ONCE_PER_TURN_HARMONICS + 1) * shaftHz) return null;
  const measured = inputs.envelope.band(band);
  const { snrDb, maxima, spectrum } = measured;
  const df = spectrum.frequencyResolutionHz;
  if (shaftHz < RESOLVABLE_BINS * df) return null;
  let count = 0;
  for (let h = 1; h <= ONCE_PER_TURN_HARMONICS; h++) {
    const c = (h * shaftHz) / df;
    const i0 = firstAtOrAbove(maxima, Math.ceil(c - 1.5));
    if (i0 < maxima.length && maxima[i0]! <= c + 1.5 && snrDb[maxima[i0]!]! >= 6) count++;
  }
  return count;
}

/** Harmonics of a gear's shaft rate looked for in its mesh's envelope (see oncePerTurnComb). */
const ONCE_PER_TURN_HARMONICS = 8;

/** Orders of the mating shaft's rate combined with the faulty gear's shaft harmonics. */
const LATTICE_ORDERS = 3;
/** Half-width of a lattice line, envelope bins (as the foreign harmonics: Hann's 6-dB bandwidth). */
const LATTICE_TOLERANCE_BINS = 2;

/** The resolution of the envelope spectra searched (the first band's). */
function bearingResolution(inputs: JudgeInputs): number {
  const first = inputs.envelope!.source.bands[0];
  return first ? inputs.envelope!.source.spectrumOf(first)?.spectrum.frequencyResolutionHz ?? 1 : 1;
}

/** The bearing comb of an envelope candidate, in the spectra's frequency unit. */
function combOf(candidate: Candidate, inputs: JudgeInputs): BearingComb {
  const rule = candidate.descriptor.comb!;
  const orders = candidate.bearingOrders!;
  const shaftHz = candidate.shaftRatio * inputs.lineSpeedHz;
  const cageHz = orders.ftf * shaftHz;
  const rateOf = (m: 'shaft' | 'cage') => (m === 'shaft' ? shaftHz : cageHz);
  const rate = orders[rule.rate] * rule.multiple;
  const widest = rule.rate === 'ftf' ? Math.max(orders.bpfi, 2 * orders.bsf) : rate;
  return {
    key: `${candidate.fault}:${candidate.component}`,
    defectHz: rate * shaftHz,
    rateLabel: `${rule.rateLabel} ${candidate.component}`,
    labelMultiple: rule.multiple,
    sidebandHz: rule.sideband ? rateOf(rule.sideband) : null,
    sidebandLabel: rule.sideband === 'shaft' ? `1× ${candidate.shaft}` : rule.sideband === 'cage' ? 'FTF' : null,
    modulationHz: rule.modulation.map(rateOf),
    minBandwidthHz: BAND_WIDTH_FACTOR * widest * shaftHz,
    secondary: candidate.descriptor.gates.includes('with-bearing-damage'),
  };
}

/**
 * Rates whose harmonics are no bearing's, in the spectra's frequency unit: every shaft's (a once-per-revolution impact
 * or rub fills the envelope with its shaft's comb); every gear mesh's lattice n·f₁ + m·f₂ of its two shafts, |m| ≤ 2
 * (each gear's runout modulates the mesh, so the envelope of a band holding mesh harmonics carries both shaft rates and
 * their combinations: Randall 2011, ch. 2, from memory); every mesh frequency and blade pass; and, with a motor, the line frequency's (electromagnetic
 * forces and electrical pick-up put lines at its multiples; in the angle domain they wander and are not excluded).
 */
function foreignRates(inputs: JudgeInputs): ForeignRate[] {
  const relative = inputs.speedUncertaintyHz / inputs.lineSpeedHz;
  const out: ForeignRate[] = [];
  const seen = new Set<number>();
  for (const c of inputs.candidates) {
    const rate = c.shaftRatio * inputs.lineSpeedHz;
    if (!seen.has(rate)) out.push({ rateHz: rate, relativeUncertainty: relative });
    seen.add(rate);
  }
  const ratioOf = new Map(inputs.candidates.map((c) => [c.shaft, c.shaftRatio]));
  for (const mesh of inputs.model.gearMeshes) {
    const r1 = ratioOf.get(mesh.driver.shaft);
    const r2 = ratioOf.get(mesh.driven.shaft);
    if (r1 === undefined || r2 === undefined || Math.abs(r1 - r2) < 1e-9 * r1) continue;
    const f1 = r1 * inputs.lineSpeedHz;
    const f2 = r2 * inputs.lineSpeedHz;
    const offsets = (f: number) => [-2, -1, 1, 2].map((m) => m * f);
    out.push({ rateHz: f1, relativeUncertainty: relative, offsetsHz: offsets(f2) });
    out.push({ rateHz: f2, relativeUncertainty: relative, offsetsHz: offsets(f1) });
  }
  // Each mesh's own frequency and blade pass: every tooth or blade passage is an event, so their harmonics
  // stand in the envelope too (and are high orders of their shafts, beyond the shafts' first harmonics).
  for (const mesh of inputs.model.gearMeshes) {
    const r = ratioOf.get(mesh.driver.shaft);
    if (r !== undefined) out.push({ rateHz: mesh.driver.teeth * r * inputs.lineSpeedHz, relativeUncertainty: relative });
  }
  for (const rotor of inputs.model.rotors) {
    const r = ratioOf.get(rotor.shaft);
    if (r !== undefined && (rotor.blades ?? 0) > 0) out.push({ rateHz: rotor.blades! * r * inputs.lineSpeedHz, relativeUncertainty: relative });
  }
  if (inputs.model.motor && inputs.unitHz === 1) out.push({ rateHz: inputs.model.motor.lineFrequencyHz, relativeUncertainty: 0 });
  return out;
}

/** A comb's evidence as judged lines, each beside the predicted line of the signature nearest to it. */
function combLinesOf(candidate: Candidate, evidence: CombEvidence, inputs: JudgeInputs): JudgedLine[] {
  const shaftHz = candidate.shaftRatio * inputs.lineSpeedHz;
  return evidence.lines.map((l) => {
    const spread = l.toleranceHz + BEARING_SLIP_SEARCH * l.predictedHz;
    let predicted = 0;
    let nearest = Infinity;
    for (const p of candidate.lines) {
      const d = Math.abs(p.frequencyHz - l.predictedHz);
      if (d <= spread && d < nearest) {
        nearest = d;
        predicted = p.amplitude;
      }
    }
    return {
      label: l.label, predictedHz: l.predictedHz, predictedAmplitude: predicted, toleranceHz: l.toleranceHz,
      measuredHz: l.measuredHz, measuredAmplitude: l.measuredAmplitude, snrDb: l.snrDb, chance: l.chance, matched: l.matched,
      counted: !l.synchronous, ambiguous: l.claimedBy !== undefined || l.synchronous,
      ambiguousWith: l.claimedBy ? [l.claimedBy.replace(':', ' in ')] : l.synchronous ? ['a shaft harmonic (not separable at this resolution)'] : [],
      running: false, twin: false, synchronous: l.synchronous, harmonic: l.predictedHz / shaftHz, sidebandOrder: null,
    };
  });
}

/**
 * Shape up to an unknown path: between the excitation and the sensor lies a structure the model does not know, which
 * reshapes amplitudes smoothly over a wide band. The measured-over-predicted ratio of the found lines is fitted by a
 * quadratic in log frequency (three parameters: a level, a tilt and a bow of the unknown path), and only what that
 * smooth path cannot explain judges the shape: exp(−e²/(2·10²)), e the r.m.s. residual in dB. Ten dB is about the
 * scatter random-phase sums of overlapping line families and noise give; six found lines at least (three to fit the
 * path, three to judge it), else 1.
 */
export function pathShape(lines: readonly JudgedLine[]): number {
  const usable = lines.filter((l) => l.counted && l.matched && l.predictedAmplitude > 0 && (l.measuredAmplitude ?? 0) > 0 && l.measuredHz! > 0);
  if (usable.length < PATH_SHAPE_MIN_LINES) return 1;
  const x = usable.map((l) => Math.log(l.measuredHz!));
  const y = usable.map((l) => Math.log(l.measuredAmplitude!) - Math.log(l.predictedAmplitude));
  const residual = quadraticResidualRms(x, y);
  if (!Number.isFinite(residual)) return 1;
  const db = residual * (20 / Math.LN10);
  return Math.exp(-(db * db) / (2 * PATH_SHAPE_DB * PATH_SHAPE_DB));
}

const PATH_SHAPE_MIN_LINES = 6;

const PATH_SHAPE_DB = 10;

/** R.m.s. residual of the least-squares fit y ≈ a + b·x + c·x² (normal equations, centred x). */
function quadraticResidualRms(x: readonly number[], y: readonly number[]): number {
  const n = x.length;
  const mx = x.reduce((a, v) => a + v, 0) / n;
  const u = x.map((v) => v - mx);
  let s0 = n, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
  for (let i = 0; i < n; i++) {
    const a = u[i]!;
    const b = y[i]!;
    s1 += a; s2 += a * a; s3 += a * a * a; s4 += a * a * a * a;
    t0 += b; t1 += a * b; t2 += a * a * b;
  }
  // Solve [[s0 s1 s2][s1 s2 s3][s2 s3 s4]]·[a b c] = [t0 t1 t2] by Cramer's rule.
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (!(Math.abs(det) > 1e-12)) return Number.NaN;
  const a = (t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2)) / det;
  const b = (s0 * (t1 * s4 - t2 * s3) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2)) / det;
  const c = (s0 * (s2 * t2 - s3 * t1) - s1 * (s1 * t2 - s3 * t0) + t0 * (s1 * s3 - s2 * s2)) / det;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += (y[i]! - (a + b * u[i]! + c * u[i]! * u[i]!)) ** 2;
  return Math.sqrt(sum / n);
}

/**
 * 1 − (power of the lines that rivals of the same part matched and this candidate does not predict)
 *   / (power of every line matched by any of them, this one included).
 * Unbalance (1× only) loses to misalignment when 2× is the strongest line, looseness wins over both when half orders
 * and high harmonics carry the energy. Running lines count only for candidates that own them.
 */
function exclusivityOf(candidate: Candidate, mine: readonly JudgedLine[], rivals: ReadonlyArray<readonly JudgedLine[]>): number {
  const counts = (x: JudgedLine) => x.matched && x.measuredHz !== null && (candidate.descriptor.ownsRunningLines || !x.running);
  const seen: number[] = [];
  let total = 0;
  let foreign = 0;
  const add = (hz: number, amplitude: number, isOwn: boolean) => {
    if (seen.some((c) => Math.abs(c - hz) < 1e-9)) return;
    seen.push(hz);
    total += amplitude * amplitude;
    if (!isOwn) foreign += amplitude * amplitude;
  };
  for (const x of mine) if (counts(x)) add(x.measuredHz!, x.measuredAmplitude!, true);
  for (const lines of rivals) {
    for (const x of lines) {
      if (!counts(x)) continue;
      // A rival line this candidate also predicts (matched here or not) is not foreign to it.
      const predicted = mine.some((p) => Math.abs((p.measuredHz ?? p.predictedHz) - x.measuredHz!) <= Math.max(p.toleranceHz, x.toleranceHz));
      add(x.measuredHz!, x.measuredAmplitude!, predicted);
    }
  }
  return total > 0 ? 1 - foreign / total : 1;
}

/** Support kept by a component away from the sensor when an identical twin could show the same lines. */
const TWIN_AWAY_FACTOR = 0.9;

/** An identical component elsewhere: another shaft (or rotor) turning at the same speed, another bearing, a gear's twin shaft. */
function isTwin(candidate: Candidate, line: CatalogueLine): boolean {
  const sameSpeed = line.shaftRatio !== undefined && Math.abs(line.shaftRatio - candidate.shaftRatio) <= 1e-9 * candidate.shaftRatio;
  switch (candidate.kind) {
    case 'shaft':
      return (line.kind === 'shaft' || line.kind === 'rotor') && sameSpeed;
    case 'gear':
      return line.kind === 'shaft' && sameSpeed;
    case 'bearing':
      return line.kind === 'bearing';
    default:
      return false;
  }
}

/**
 * Cepstral support of a gear fault: a rahmonic at the period of the gear's shaft (common practice), prominence p in
 * robust deviations: 3 says nothing, 8 or more is clear; without it the score keeps 85 %.
 */
function cepstralSupport(candidate: Candidate, inputs: JudgeInputs): number {
  if (!candidate.descriptor.cepstralSupport) return 1;
  const periodS = 1 / (candidate.shaftRatio * inputs.lineSpeedHz);
  const memo = cepstralMemo.get(inputs.main) ?? new Map<number, number>();
  cepstralMemo.set(inputs.main, memo);
  let prominence = memo.get(periodS);
  if (prominence === undefined) {
    prominence = cepstralPeak(inputs.cepstrum(), periodS, 0.02)?.prominence ?? 0;
    memo.set(periodS, prominence);
  }
  return 0.85 + 0.15 * clamp01((prominence - 3) / 5);
}

const cepstralMemo = new WeakMap<MatchableSpectrum, Map<number, number>>();

/** A broader hypothesis explains a narrower one away when it matched at least this many times as many lines. */
const EXPLAIN_AWAY_MIN_RATIO = 2;

/**
 * Explaining away (Occam's razor between hypotheses): when a shown hypothesis (score >= 0.5) in the same domain, on
 * another kind of component (a gear against a shaft, say), predicts every line a narrower one matched, and matched at
 * least twice as many lines itself, the narrower one adds no explanation of its own. Its score is multiplied by (its
 * matched lines / the broader one's), so that, say, the 1×-2×-3× of a shaft carrying a broken tooth (whose comb of
 * shaft harmonics and mesh sidebands holds those three lines and dozens more) is not reported as misalignment. The
 * price: a real second fault whose lines all lie inside a stronger fault's pattern is under-scored while the stronger
 * one is present; `parts.explainedBy` says so.
 */
function explainAway(judged: Judged[]): Judged[] {
  const matchedOf = (s: Judged) => s.lines.filter((x) => x.matched && x.measuredHz !== null);
  return judged.map((s) => {
    const mine = matchedOf(s);
    if (s.score === 0 || mine.length === 0) return s;
    let factor = 1;
    let by: string | undefined;
    for (const r of judged) {
      if (r === s || r.score < 0.5 || r.candidate.domain !== s.candidate.domain || r.candidate.kind === s.candidate.kind) continue;
      const theirs = matchedOf(r);
      if (theirs.length < EXPLAIN_AWAY_MIN_RATIO * mine.length) continue;
      const covered = mine.every((x) => r.lines.some((p) => Math.abs((p.measuredHz ?? p.predictedHz) - x.measuredHz!) <= Math.max(p.toleranceHz, x.toleranceHz)));
      const f = mine.length / theirs.length;
      if (covered && f < factor) {
        factor = f;
        by = `${r.candidate.fault}:${r.candidate.component}`;
      }
    }
    if (by === undefined) return s;
    return { ...s, parts: { ...s.parts, explainedAway: factor, explainedBy: by }, score: clamp01(s.score * factor) };
  });
}

/**
 * The cage gate: a cage defect goes with damage of its bearing (worn pockets let the rolling elements skid and strike,
 * a failing race breaks the cage), while the cage rate alone is also what a healthy bearing under load gives as its
 * rolling-element set passes the load zone. A cage comb is shown only beside another shown defect of the same bearing.
 */
function withBearingDamage(judged: Judged[]): Judged[] {
  return judged.map((j) => {
    if (!j.candidate.descriptor.gates.includes('with-bearing-damage') || j.score < 0.5) return j;
    const damaged = judged.some((o) => o !== j && o.candidate.context === j.candidate.context && o.candidate.kind === 'bearing' && o.score >= 0.5);
    if (damaged) return j;
    return {
      ...j,
      score: clamp01(j.score * GATE_CLOSED_FACTOR),
      parts: { ...j.parts, gate: j.parts.gate * GATE_CLOSED_FACTOR },
      gateReasons: [...j.gateReasons, 'no other defect of this bearing is shown, and a cage rate alone is a healthy bearing’s load-zone modulation too'],
    };
  });
}

/** The least-squares level of the prediction on the found lines (log amplitudes): the factor the evidence table scales it by. */
export function predictionScale(lines: readonly JudgedLine[]): { factor: number; lines: number } | null {
  const usable = lines.filter((l) => l.matched && l.counted && l.predictedAmplitude > 0 && (l.measuredAmplitude ?? 0) > 0);
  if (usable.length === 0) return null;
  const meanLog = usable.reduce((a, l) => a + Math.log(l.measuredAmplitude!) - Math.log(l.predictedAmplitude), 0) / usable.length;
  return { factor: Math.exp(meanLog), lines: usable.length };
}

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.min(1, Math.max(0, x)) : 0;
}
