import type { CatalogueLine, LineCatalogue } from './ambiguity.js';
import { lineToleranceHz, matchLine, type ExpectedLine, type LineMatch, type MatchableSpectrum } from './line-matching.js';
import type { Evidence, HypothesisDomain } from './recording-analysis.js';

/** A fault hypothesis ready to be scored: its predicted lines on one spectrum. */
export interface Candidate {
  fault: string;
  component: string;
  domain: Exclude<HypothesisDomain, 'order'>;
  lines: ExpectedLine[];
  /** Candidates with the same context compete for the same lines (one shaft, one gear, one bearing). */
  context: string;
  /** Components whose catalogue lines are this candidate's own (never make its lines ambiguous). */
  own: ReadonlySet<string>;
  /**
   * False for faults whose lines a healthy machine does not show (tooth faults, eccentricity, bearings): for them a
   * predicted line that falls on a running line (1×, 2×, mesh frequency, blade pass) proves nothing by being there.
   */
  ownsRunningLines: boolean;
  /** What the component is, for telling a twin (an identical component at the same speed) from another fault. */
  kind: 'shaft' | 'gear' | 'mesh' | 'bearing' | 'motor';
  /** Speed of the component's shaft over the reference shaft's. */
  shaftRatio: number;
  /** The component is the one the sensor sits on (its bearing, its shaft): preferred over an identical twin elsewhere. */
  atPoint: boolean;
}

export interface ScoreParts {
  detection: number;
  shape: number;
  level: number;
  exclusivity: number;
  support: number;
  /** 1, or the share of a broader shown hypothesis' matched lines that this one's lines amount to (see explainAway). */
  explainedAway: number;
  /** The broader hypothesis (`fault:component`) that explains every line this one matched, when there is one. */
  explainedBy?: string;
}

export interface ScoredCandidate {
  candidate: Candidate;
  matches: Array<LineMatch & { ambiguous: boolean; ambiguousWith: string[] }>;
  parts: ScoreParts;
  score: number;
}

export interface ScoringInputs {
  spectra: Record<Candidate['domain'], MatchableSpectrum | null>;
  speedUncertaintyHz: number;
  /** Component lines each spectrum can show (bearing defect lines only in the envelope), for the ambiguity flag. */
  catalogue: Record<Candidate['domain'], LineCatalogue>;
  /** Lines every running machine of this model shows, whatever its condition. */
  runningLines: LineCatalogue;
  minSnrDb: number;
  /** Level against the baseline or an absolute reference, 0..1 (1 when nothing says otherwise). */
  level: (candidate: Candidate, matches: LineMatch[]) => number;
  /** Supporting evidence outside the line match (e.g. the cepstrum for gear faults), 0..1; 1 when there is none to ask. */
  support: (candidate: Candidate) => number;
}

/** SNR (dB) at which a matched line counts fully as detected; a line at the 6 dB threshold counts a third. */
const FULL_DETECTION_DB = 12;
const DETECTION_FLOOR_DB = 3;
/** Weight of an ambiguous line against an unambiguous one of the same predicted amplitude. */
const AMBIGUOUS_WEIGHT = 0.3;
/** Detection kept by a hypothesis whose detected lines are all ambiguous. */
const AMBIGUOUS_ONLY_FACTOR = 0.4;

/**
 * Scores every candidate (see README "Score"):
 *   score = detection × (0.5 + 0.5 × shape) × level × exclusivity × support.
 */
export function scoreCandidates(candidates: readonly Candidate[], inputs: ScoringInputs): ScoredCandidate[] {
  const matched = candidates.map((candidate) => matchCandidate(candidate, inputs));
  // Exclusivity: of the energy in the lines any candidate of the same context matched, the share this one predicts.
  const byContext = new Map<string, number[]>();
  matched.forEach((m, i) => {
    const list = byContext.get(m.candidate.context) ?? [];
    list.push(i);
    byContext.set(m.candidate.context, list);
  });
  const scored = matched.map((m) => {
    const rivals = (byContext.get(m.candidate.context) ?? []).map((i) => matched[i]!).filter((r) => r !== m && r.candidate.domain === m.candidate.domain);
    const exclusivity = exclusivityOf(m, rivals);
    const level = clamp01(inputs.level(m.candidate, m.matches));
    // With an identical twin elsewhere, the component under the sensor is the likelier (its impacts arrive strongest).
    const twinned = m.matches.some((x) => x.matched && x.twin);
    const support = clamp01(inputs.support(m.candidate)) * (twinned && !m.candidate.atPoint ? TWIN_AWAY_FACTOR : 1);
    const parts: ScoreParts = { detection: m.detection, shape: m.shape, level, exclusivity, support, explainedAway: 1 };
    const score = clamp01(parts.detection * (0.5 + 0.5 * parts.shape) * parts.level * parts.exclusivity * parts.support);
    return { candidate: m.candidate, matches: m.matches, parts, score };
  });
  return explainAway(scored);
}

/** A broader hypothesis explains a narrower one away when it matched at least this many times as many lines. */
const EXPLAIN_AWAY_MIN_RATIO = 2;

/**
 * Explaining away (Occam's razor between hypotheses): when a shown hypothesis (score >= 0.5) in the same domain, on
 * another kind of component (a gear against a shaft, say),
 * predicts every line a narrower one matched, and matched at least twice as many lines itself, the narrower one
 * adds no explanation of its own. Its score is multiplied by (its matched lines / the broader one's), so that, say,
 * the 1×-2×-3× of a shaft carrying a broken tooth (whose comb of shaft harmonics and mesh sidebands holds those
 * three lines and dozens more) is not reported as misalignment. The price: a real second fault whose lines all lie
 * inside a stronger fault's pattern is under-scored while the stronger one is present; `parts.explainedBy` says so.
 */
function explainAway(scored: ScoredCandidate[]): ScoredCandidate[] {
  const matchedOf = (s: ScoredCandidate) => s.matches.filter((x) => x.matched && x.measuredHz !== null && x.measuredHz !== undefined);
  return scored.map((s) => {
    const mine = matchedOf(s);
    if (s.score === 0 || mine.length === 0) return s;
    let factor = 1;
    let by: string | undefined;
    for (const r of scored) {
      // Between faults of one kind of component (unbalance, misalignment, looseness of a shaft) exclusivity decides.
      if (r === s || r.score < 0.5 || r.candidate.domain !== s.candidate.domain || r.candidate.kind === s.candidate.kind) continue;
      const theirs = matchedOf(r);
      if (theirs.length < EXPLAIN_AWAY_MIN_RATIO * mine.length) continue;
      const covered = mine.every((x) =>
        r.matches.some((p) => Math.abs((p.measuredHz ?? p.predictedHz) - x.measuredHz!) <= Math.max(p.toleranceHz, x.toleranceHz)),
      );
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

interface Matched {
  candidate: Candidate;
  matches: Array<LineMatch & { ambiguous: boolean; ambiguousWith: string[]; running: boolean; otherSource: boolean; twin: boolean }>;
  detection: number;
  shape: number;
}

function matchCandidate(candidate: Candidate, inputs: ScoringInputs): Matched {
  const spectrum = inputs.spectra[candidate.domain];
  if (!spectrum || candidate.lines.length === 0) return { candidate, matches: [], detection: 0, shape: 0 };
  const df = spectrum.spectrum.frequencyResolutionHz;
  const matches = candidate.lines.map((line) => {
    const tol = lineToleranceHz(line, { frequencyResolutionHz: df, speedUncertaintyHz: inputs.speedUncertaintyHz });
    const m = matchLine(spectrum, line, tol, inputs.minSnrDb);
    const at = m.measuredHz ?? line.frequencyHz;
    const running = candidate.ownsRunningLines ? [] : inputs.runningLines.foreignNear(at, tol, NOTHING).map((l) => `${l} (running line)`);
    const foreign = inputs.catalogue[candidate.domain].linesNear(at, tol, candidate.own);
    const twins = foreign.filter((l) => isTwin(candidate, l));
    const others = foreign.filter((l) => !isTwin(candidate, l));
    const ambiguousWith = [...running, ...others.map((l) => l.label), ...twins.map((l) => `${l.label} (identical component)`)];
    return {
      label: m.label,
      predictedHz: m.predictedHz,
      predictedAmplitude: m.predictedAmplitude,
      toleranceHz: m.toleranceHz,
      measuredHz: m.measuredHz,
      measuredAmplitude: m.measuredAmplitude,
      snrDb: m.snrDb,
      matched: m.matched,
      upperBoundAmplitude: m.upperBoundAmplitude,
      ambiguous: ambiguousWith.length > 0,
      ambiguousWith,
      running: running.length > 0,
      // Lines an identical twin shares say which fault, not which twin: they keep their full weight.
      otherSource: running.length > 0 || others.length > 0,
      twin: twins.length > 0,
    };
  });
  // Lines a healthy machine shows anyway are left out of detection when the fault predicts any others.
  const counted = matches.some((m) => !m.running) ? matches.filter((m) => !m.running) : matches;
  let weightSum = 0;
  let detected = 0;
  let detectedAlone = 0;
  for (const m of counted) {
    const w = m.predictedAmplitude * (m.otherSource ? AMBIGUOUS_WEIGHT : 1);
    weightSum += w;
    if (!m.matched) continue;
    const d = w * clamp01((m.snrDb - DETECTION_FLOOR_DB) / (FULL_DETECTION_DB - DETECTION_FLOOR_DB));
    detected += d;
    if (!m.otherSource) detectedAlone += d;
  }
  // Lines another component also explains cannot prove this one alone: a hypothesis seen only through such
  // lines keeps at most 40 % of its detection.
  const alone = detected > 0 ? detectedAlone / detected : 0;
  const detection = weightSum > 0 ? (detected / weightSum) * (AMBIGUOUS_ONLY_FACTOR + (1 - AMBIGUOUS_ONLY_FACTOR) * alone) : 0;
  return { candidate, matches, detection, shape: shapeOf(matches) };
}

/**
 * How well the measured relative amplitudes follow the predicted ones, on log amplitudes (an unmatched line enters
 * at its upper bound, the floor there):
 *  - five lines or more: (1 + r)/2, r the Pearson correlation of log predicted and log measured amplitudes (the trend
 *    of a long family, robust to the level the model cannot know);
 *  - three or four lines: exp(−e²/(2·12²)), e the r.m.s. misfit in dB after the best common scale (with so few
 *    points a correlation says little, while a 2× line 30 dB under 1× plainly is not misalignment);
 *  - fewer than three lines, or fewer than two matched: 1 (relative sizes say nothing).
 */
function shapeOf(matches: readonly LineMatch[]): number {
  const usable = matches.filter((m) => m.predictedAmplitude > 0 && (m.measuredAmplitude ?? m.upperBoundAmplitude) > 0);
  if (usable.length < 3 || usable.filter((m) => m.matched).length < 2) return 1;
  const x = usable.map((m) => Math.log(m.predictedAmplitude));
  const y = usable.map((m) => Math.log(m.measuredAmplitude ?? m.upperBoundAmplitude));
  if (usable.length >= 5) {
    const r = pearson(x, y);
    return Number.isFinite(r) ? (1 + r) / 2 : 1;
  }
  const offset = y.reduce((a, v, i) => a + (v - x[i]!), 0) / y.length;
  const misfitDb = Math.sqrt(y.reduce((a, v, i) => a + (v - x[i]! - offset) ** 2, 0) / y.length) * (20 / Math.LN10);
  return Math.exp(-(misfitDb * misfitDb) / (2 * FEW_LINES_MISFIT_DB * FEW_LINES_MISFIT_DB));
}

/** Misfit (dB r.m.s.) at which a short pattern's shape falls to exp(−½) ≈ 0.61. */
const FEW_LINES_MISFIT_DB = 12;

function pearson(x: readonly number[], y: readonly number[]): number {
  const n = x.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i]!;
    my += y[i]!;
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i]! - mx) * (y[i]! - my);
    sxx += (x[i]! - mx) ** 2;
    syy += (y[i]! - my) ** 2;
  }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : Number.NaN;
}

/**
 * 1 − (power of the lines that rivals in the same context matched and this candidate does not predict)
 *   / (power of every line matched by any of them, this one included).
 * Unbalance (1× only) loses to misalignment when 2× is the strongest line, looseness wins over both when
 * half orders and high harmonics carry the energy.
 */
function exclusivityOf(m: Matched, rivals: readonly Matched[]): number {
  // Running lines (1×, mesh frequency...) are a healthy machine's own: they tell nothing between faults that do not
  // predict them, so only candidates that own them count them.
  const counts = (x: Matched['matches'][number]) => x.matched && (m.candidate.ownsRunningLines || !x.running);
  const own = m.matches.filter(counts);
  const counted: number[] = [];
  let total = 0;
  let foreign = 0;
  const add = (hz: number, amplitude: number, isOwn: boolean) => {
    if (counted.some((c) => Math.abs(c - hz) < 1e-9)) return;
    counted.push(hz);
    total += amplitude * amplitude;
    if (!isOwn) foreign += amplitude * amplitude;
  };
  for (const x of own) add(x.measuredHz!, x.measuredAmplitude!, true);
  for (const r of rivals) {
    for (const x of r.matches) {
      if (!counts(x)) continue;
      // A rival line this candidate also predicts (matched here or not) is not foreign to it.
      const predicted = m.matches.some((p) => Math.abs((p.measuredHz ?? p.predictedHz) - x.measuredHz!) <= Math.max(p.toleranceHz, x.toleranceHz));
      add(x.measuredHz!, x.measuredAmplitude!, predicted);
    }
  }
  return total > 0 ? 1 - foreign / total : 1;
}

const NOTHING: ReadonlySet<string> = new Set();
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

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.min(1, Math.max(0, x)) : 0;
}

/** Evidence rows of a scored candidate, strongest predicted line first (at most `limit`); `unitHz` turns orders into Hz. */
export function evidenceOf(scored: ScoredCandidate, unitHz = 1, limit = 40): Evidence[] {
  return [...scored.matches]
    .sort((a, b) => b.predictedAmplitude - a.predictedAmplitude)
    .slice(0, limit)
    .map((m) => ({
      label: m.label,
      frequencyHz: m.predictedHz * unitHz,
      predicted: m.predictedAmplitude,
      measured: m.measuredAmplitude,
      measuredFrequencyHz: m.measuredHz === null ? null : m.measuredHz * unitHz,
      snrDb: Number.isFinite(m.snrDb) ? Math.round(m.snrDb * 10) / 10 : null,
      matched: m.matched,
      ...(m.ambiguous ? { ambiguous: true, ambiguousWith: m.ambiguousWith.slice(0, 3) } : {}),
    }));
}
