// Judges one analysis against its label: which hypotheses at 0.5 or more name a labelled fault, whether the top one
// does, and the rates the metrics add up. The equivalences (what counts as naming the same fault) live here only.
import type { Hypothesis, RecordingAnalysis } from '@kinespec/diagnosis';
import { shaftRatios, type Bearing, type MachineModel } from '@kinespec/kinematics';
import type { CaseLabel, LabelledCase, LabelledFault } from './corpus.js';
import { severityClassOf, SHOWN_SCORE, type SeverityClass } from './goals.js';

/** How a shown hypothesis relates to the label. */
export type Verdict =
  /** The labelled kind on the labelled component (an unbalance of a rotor is one of its shaft: the same lines and remedy). */
  | 'true'
  /** Counted as true, flagged: a missing for a broken tooth (or back) on the labelled gear, the same kind of defect in a bearing identical to the labelled one on the same shaft, or in a gear whose lines are the labelled gear's (a 1:1 pair). */
  | 'equivalent'
  | 'false';

export interface JudgedHypothesis {
  fault: string;
  component: string;
  score: number;
  verdict: Verdict;
  /** Why an 'equivalent' counts: 'tooth fault' or 'identical bearing'. */
  flag?: string;
  /** Index in label.faults of the fault it names (true or equivalent). */
  labelIndex?: number;
}

export interface CaseOutcome {
  id: string;
  tags: Record<string, string>;
  reportOnly: boolean;
  undecidable: string | null;
  label: CaseLabel;
  severityClass: SeverityClass;
  /** The highest hypothesis at any score (null when the analysis failed or had none). */
  top: JudgedHypothesis | null;
  /** Every hypothesis at 0.5 or more, highest first. */
  shown: JudgedHypothesis[];
  /** Hypotheses below 0.5 down to 0.2, for the JSON report (what nearly made it). */
  near: Array<{ fault: string; component: string; score: number }>;
  /** Faulty recordings: the top hypothesis is shown and names a labelled fault. null for healthy ones. */
  top1: boolean | null;
  /** Same, kind matched exactly (a missing tooth not accepted for a broken one). */
  top1Exact: boolean | null;
  /** Faulty recordings: every labelled fault has a hypothesis at 0.5 or more that names it. */
  allShown: boolean | null;
  /** Faulty recordings: at least one labelled fault is shown at 0.5 or more (top or not). */
  detected: boolean | null;
  /** Best score of a hypothesis naming each labelled fault. */
  labelScores: number[];
  /** A gear or bearing hypothesis at 0.5 or more that names no labelled fault. */
  wrongGearBearing: boolean;
  gearBearingShown: boolean;
  anyShown: boolean;
  speedRpm: number | null;
  speedSource: string | null;
  /** (found − labelled) / labelled, percent; null without both. */
  speedErrorPercent: number | null;
  domain: 'frequency' | 'angle' | null;
  analysisMs: number;
  error: string | null;
}

export function isGearOrBearing(fault: string): boolean {
  return fault.startsWith('gear-') || fault.startsWith('bearing-');
}

export function isToothFault(fault: string): boolean {
  return fault === 'gear-missing-tooth' || fault === 'gear-broken-tooth';
}

function shaftOfRotor(model: MachineModel, id: string): string {
  return model.rotors.find((r) => r.id === id)?.shaft ?? id;
}

/** Two bearings that no spectrum can tell apart: the same shaft and the same geometry (so the same defect orders). */
function identicalBearings(model: MachineModel, a: string, b: string): boolean {
  const x = model.bearings.find((r) => r.id === a);
  const y = model.bearings.find((r) => r.id === b);
  if (!x || !y || x.shaft !== y.shaft) return false;
  const key = (r: Bearing) =>
    JSON.stringify(r.faultOrders ?? [r.rollingElements, r.rollingElementDiameterMm, r.pitchDiameterMm, r.contactAngleDeg ?? 0]);
  return key(x) === key(y);
}

/**
 * Two gears that no spectrum can tell apart: the same mesh frequency and the same sideband spacing (teeth × shaft
 * speed and shaft speed equal), as the two gears of a 1:1 pair of timing gears.
 */
function identicalGears(model: MachineModel, a: string, b: string): boolean {
  const gears = model.gearMeshes.flatMap((m) => [m.driver, m.driven]);
  const x = gears.find((g) => g.gear === a);
  const y = gears.find((g) => g.gear === b);
  if (!x || !y) return false;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const rx = ratio.get(x.shaft) ?? Number.NaN;
  const ry = ratio.get(y.shaft) ?? Number.NaN;
  return Math.abs(rx - ry) <= 1e-9 * rx && x.teeth === y.teeth;
}

/** How hypothesis `h` relates to one labelled fault. */
function relation(model: MachineModel, h: Pick<Hypothesis, 'fault' | 'component'>, f: LabelledFault): { verdict: Verdict; flag?: string } {
  const sameKind = h.fault === f.fault;
  const toothPair = isToothFault(h.fault) && isToothFault(f.fault);
  if (!sameKind && !toothPair) return { verdict: 'false' };
  let samePart = h.component === f.component;
  if (!samePart && h.fault === 'unbalance') samePart = shaftOfRotor(model, h.component) === shaftOfRotor(model, f.component);
  if (samePart) return sameKind ? { verdict: 'true' } : { verdict: 'equivalent', flag: 'tooth fault' };
  if (sameKind && h.fault.startsWith('bearing-') && identicalBearings(model, h.component, f.component)) {
    return { verdict: 'equivalent', flag: 'identical bearing' };
  }
  if (h.fault.startsWith('gear-') && identicalGears(model, h.component, f.component)) {
    return { verdict: 'equivalent', flag: sameKind ? 'identical gear' : 'tooth fault, identical gear' };
  }
  return { verdict: 'false' };
}

export function judgeHypothesis(model: MachineModel, h: Pick<Hypothesis, 'fault' | 'component' | 'score'>, label: CaseLabel): JudgedHypothesis {
  let best: JudgedHypothesis = { fault: h.fault, component: h.component, score: h.score, verdict: 'false' };
  label.faults.forEach((f, i) => {
    const r = relation(model, h, f);
    if (r.verdict === 'true' || (r.verdict === 'equivalent' && best.verdict === 'false')) {
      best = { fault: h.fault, component: h.component, score: h.score, verdict: r.verdict, labelIndex: i, ...(r.flag ? { flag: r.flag } : {}) };
    }
  });
  return best;
}

/** Judges an analysis (or its failure) of one labelled case. */
export function judgeCase(c: LabelledCase, analysis: RecordingAnalysis | null, analysisMs: number, error: string | null): CaseOutcome {
  const model = c.machine;
  const hypotheses = analysis?.hypotheses ?? [];
  const judged = hypotheses.map((h) => judgeHypothesis(model, h, c.label));
  const shown = judged.filter((h) => h.score >= SHOWN_SCORE);
  const faulty = c.label.faults.length > 0;
  const top = judged[0] ?? null;
  const topShown = top !== null && top.score >= SHOWN_SCORE;
  const labelScores = c.label.faults.map((_, i) => Math.max(0, ...judged.filter((h) => h.labelIndex === i).map((h) => h.score)));
  const speedRpm = analysis?.speedHz != null ? analysis.speedHz * 60 : null;
  return {
    id: c.id,
    tags: c.tags ?? {},
    reportOnly: c.reportOnly ?? false,
    undecidable: c.undecidable ?? null,
    label: c.label,
    severityClass: severityClassOf(c.label),
    top,
    shown,
    near: judged.filter((h) => h.score < SHOWN_SCORE && h.score >= 0.2).map((h) => ({ fault: h.fault, component: h.component, score: h.score })),
    top1: faulty ? topShown && top!.verdict !== 'false' : null,
    top1Exact: faulty ? topShown && top!.verdict === 'true' : null,
    allShown: faulty ? labelScores.every((s) => s >= SHOWN_SCORE) : null,
    detected: faulty ? labelScores.some((s) => s >= SHOWN_SCORE) : null,
    labelScores,
    wrongGearBearing: shown.some((h) => isGearOrBearing(h.fault) && h.verdict === 'false'),
    gearBearingShown: shown.some((h) => isGearOrBearing(h.fault)),
    anyShown: shown.length > 0,
    speedRpm,
    speedSource: analysis?.speedSource ?? null,
    speedErrorPercent: speedRpm !== null && c.label.speedRpm ? ((speedRpm - c.label.speedRpm) / c.label.speedRpm) * 100 : null,
    domain: analysis?.domain ?? null,
    analysisMs,
    error,
  };
}
