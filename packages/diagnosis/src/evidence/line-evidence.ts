import type { CatalogueLine, LineCatalogue } from '../ambiguity.js';
import { firstAtOrAbove, lineToleranceHz, matchLine, type ExpectedLine, type LineMatch, type MatchableSpectrum } from '../line-matching.js';
import { chanceModel, chanceOfPeak, fisherCombined } from './chance.js';

/** A predicted line and what the spectrum showed there, with the chance of that by accident. */
export interface WeighedLine extends LineMatch {
  /** Probability of a peak this strong in the line's window by chance (1 when nothing was found). */
  chance: number;
  /** Another component (not an identical twin) or a line every running machine shows also puts a line there. */
  ambiguous: boolean;
  ambiguousWith: string[];
  /** A line every running machine shows (1×, 2×, mesh frequency, blade pass, twice line frequency). */
  running: boolean;
  /** An identical component elsewhere (a twin) also puts a line there: it says which fault, not which twin. */
  twin: boolean;
  /** The line counts towards the chance of the pattern (not a running line of a fault that does not own them, not ambiguous). */
  counted: boolean;
}

export interface LinePattern {
  lines: WeighedLine[];
  /** Fisher's combined chance of the counted lines. */
  chance: number;
  counted: number;
  found: number;
}

export interface LineEvidenceInputs {
  speedUncertaintyHz: number;
  minSnrDb: number;
  /** Component lines of the machine that the spectrum can show (for the ambiguity of a line). */
  catalogue: LineCatalogue;
  /** Lines every running machine of the model shows. */
  runningLines: LineCatalogue;
}

export interface PatternSpec {
  lines: readonly ExpectedLine[];
  /** Components whose catalogue lines are this pattern's own. */
  own: ReadonlySet<string>;
  /** The fault owns the running lines it predicts (unbalance its 1×); otherwise they prove nothing and are not counted. */
  ownsRunningLines: boolean;
  /** Whether a catalogue line belongs to an identical twin of the component (same fault, another place). */
  isTwin(line: CatalogueLine): boolean;
}

/**
 * Weighs every predicted line of a pattern: found or not (@kinespec/diagnosis matchLine: the strongest local maximum
 * in the line's tolerance, not window leakage, minSnrDb over the floor), and how likely a peak that strong is there
 * by chance in this spectrum (chance.ts: the density of the other peaks around it, those of this pattern left out).
 * Lines that cannot tell this fault from another cause are not counted: a running line of a fault that does not own
 * it (a tooth fault's 1×), a line another component also puts there. Counted lines combine by Fisher's method.
 */
export function weighPattern(spec: PatternSpec, measured: MatchableSpectrum, inputs: LineEvidenceInputs): LinePattern {
  const { spectrum, snrDb, maxima } = measured;
  const df = spectrum.frequencyResolutionHz;
  const n = spectrum.values.length;
  const tolerances = spec.lines.map((line) => lineToleranceHz(line, { frequencyResolutionHz: df, speedUncertaintyHz: inputs.speedUncertaintyHz }));
  // The pattern's own windows are left out of the neighbourhood its lines are weighed against.
  const own = new Uint8Array(n);
  spec.lines.forEach((line, i) => {
    const t = tolerances[i]!;
    for (let k = Math.max(0, Math.floor((line.frequencyHz - t) / df) - 1); k <= Math.min(n - 1, Math.ceil((line.frequencyHz + t) / df) + 1); k++) own[k] = 1;
  });
  const lines: WeighedLine[] = spec.lines.map((line, i) => {
    const tolerance = tolerances[i]!;
    const m = matchLine(measured, line, tolerance, inputs.minSnrDb);
    const at = m.measuredHz ?? line.frequencyHz;
    const runningLabels = spec.ownsRunningLines ? [] : inputs.runningLines.foreignNear(at, tolerance, NOTHING).map((l) => `${l} (running line)`);
    const foreign = inputs.catalogue.linesNear(at, tolerance, spec.own);
    const twins = foreign.filter((l) => spec.isTwin(l));
    const others = foreign.filter((l) => !spec.isTwin(l));
    const ambiguousWith = [...runningLabels, ...others.map((l) => l.label), ...twins.map((l) => `${l.label} (identical component)`)];
    const running = runningLabels.length > 0;
    const counted = !running && others.length === 0;
    let chance = 1;
    if (m.matched) {
      const c = Math.round(line.frequencyHz / df);
      const reach = Math.max(NEIGHBOURHOOD_MIN_BINS, Math.round(NEIGHBOURHOOD_FRACTION * c));
      const lo = Math.max(1, c - reach);
      const hi = Math.min(n - 2, c + reach);
      const peaks: number[] = [];
      let width = 0;
      for (let k = lo; k <= hi; k++) if (!own[k]) width++;
      for (let j = firstAtOrAbove(maxima, lo); j < maxima.length && maxima[j]! <= hi; j++) {
        const k = maxima[j]!;
        if (!own[k]) peaks.push(snrDb[k]!);
      }
      peaks.sort((a, b) => b - a);
      chance = chanceOfPeak(chanceModel({ peakSnrDb: peaks, widthBins: width }), m.snrDb, Math.max(1, Math.round((2 * tolerance) / df)));
    }
    return { ...m, chance, ambiguous: ambiguousWith.length > 0, ambiguousWith, running, twin: twins.length > 0, counted };
  });
  const counted = lines.filter((l) => l.counted);
  const found = counted.filter((l) => l.matched);
  return { lines, chance: fisherCombined(found.map((l) => l.chance), counted.length), counted: counted.length, found: found.length };
}

/** Smallest half-width of a line's chance neighbourhood, bins. */
const NEIGHBOURHOOD_MIN_BINS = 50;
/** Half-width of a line's chance neighbourhood as a share of its frequency: peaks within ±25 % of it. */
const NEIGHBOURHOOD_FRACTION = 0.25;
const NOTHING: ReadonlySet<string> = new Set();
