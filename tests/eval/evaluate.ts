import { analyseRecording, type RecordingAnalysis } from '@kinespec/diagnosis';
import type { MachineModel } from '@kinespec/kinematics';
import { simulateRecording } from '@kinespec/simulator';
import { SEVERE, type EvalCase, type RampCase } from './eval-cases.js';

/** What the pipeline said about one labelled recording. */
export interface CaseResult {
  case: EvalCase;
  /** Top hypothesis when its score is >= 0.5, else 'healthy'. */
  predictedFault: string;
  predictedComponent: string | null;
  topScore: number;
  /**
   * Score of the true fault in the true component; for a tooth fault the better of missing and broken tooth on that
   * gear (one drop of the mesh torque at two depths, see GOALS), the exact kind's own score in `exactScore`.
   */
  trueScore: number;
  exactScore: number;
  /** Highest score of any gear or bearing hypothesis (false alarms on healthy recordings). */
  maxGearBearingScore: number;
  /** Highest score of any hypothesis. */
  maxScore: number;
  speedErrorPercent: number;
  analysisMs: number;
}

export type FaultFamily = 'healthy' | 'unbalance' | 'misalignment' | 'gear tooth' | 'bearing' | 'other';

export function familyOf(fault: string): FaultFamily {
  if (fault === 'healthy') return 'healthy';
  if (fault === 'unbalance') return 'unbalance';
  if (fault === 'misalignment') return 'misalignment';
  if (fault === 'gear-missing-tooth' || fault === 'gear-broken-tooth') return 'gear tooth';
  if (fault.startsWith('bearing-')) return 'bearing';
  return 'other';
}

/** An unbalance of a rotor is an unbalance of its shaft: the same lines, the same remedy. */
function sameComponent(model: MachineModel, fault: string, a: string | null, b: string | null): boolean {
  if (a === b) return true;
  if (fault !== 'unbalance' || a === null || b === null) return false;
  const shaftOf = (id: string) => model.rotors.find((r) => r.id === id)?.shaft ?? id;
  return shaftOf(a) === shaftOf(b);
}

function isGearOrBearing(fault: string): boolean {
  return fault.startsWith('gear-') || fault.startsWith('bearing-');
}

/** Simulates one case (@kinespec/simulator) and runs the real pipeline on it (@kinespec/diagnosis). */
export function runCase(model: MachineModel, c: EvalCase): CaseResult {
  const recording = simulateRecording(model, {
    pointId: c.pointId,
    sampleRateHz: c.sampleRateHz,
    durationS: c.durationS,
    speedRpm: c.speedRpm,
    faults: c.fault === 'healthy' ? [] : [{ fault: c.fault, component: c.component!, severity: c.severity }],
    noise: { accelerationRmsG: c.noiseG },
    seed: c.seed,
  });
  const start = performance.now();
  const analysis: RecordingAnalysis = analyseRecording(recording, { model, pointId: c.pointId });
  const analysisMs = performance.now() - start;
  const top = analysis.hypotheses[0];
  const shown = top !== undefined && top.score >= 0.5;
  const truth = c.fault === 'healthy'
    ? null
    : analysis.hypotheses.find((h) => h.fault === c.fault && sameComponent(model, c.fault, h.component, c.component));
  const family = c.fault === 'healthy'
    ? []
    : analysis.hypotheses.filter((h) => familyOf(h.fault) === familyOf(c.fault) && (familyOf(c.fault) === 'gear tooth' ? true : h.fault === c.fault) && sameComponent(model, c.fault, h.component, c.component));
  const gearBearing = analysis.hypotheses.filter((h) => isGearOrBearing(h.fault));
  return {
    case: c,
    predictedFault: shown ? top.fault : 'healthy',
    predictedComponent: shown ? top.component : null,
    topScore: top?.score ?? 0,
    trueScore: Math.max(0, ...family.map((h) => h.score)),
    exactScore: truth?.score ?? 0,
    maxGearBearingScore: Math.max(0, ...gearBearing.map((h) => h.score)),
    maxScore: Math.max(0, ...analysis.hypotheses.map((h) => h.score)),
    speedErrorPercent: analysis.speedHz === null ? Number.NaN : ((analysis.speedHz * 60 - c.speedRpm) / c.speedRpm) * 100,
    analysisMs,
  };
}

export interface EvalSummary {
  total: number;
  /** Exact kind and component of the top hypothesis (healthy counted as right when nothing reaches 0.5). */
  top1Accuracy: number;
  /** Same, with a missing and a broken tooth counted as one family (the same pattern at different depths). */
  top1FamilyAccuracy: number;
  /** Severe gear-tooth and bearing faults whose true fault (tooth faults: missing or broken) and component scored >= 0.5. */
  severeGearBearingDetection: number;
  /** Healthy recordings with any gear or bearing hypothesis >= 0.5. */
  gearBearingFalseAlarmRate: number;
  /** Healthy recordings with any hypothesis at all >= 0.5. */
  anyFalseAlarmRate: number;
  /** Per fault family: recordings, detection (true fault >= 0.5 with the right component), top-1. */
  families: Array<{ family: FaultFamily; recordings: number; detectionRate: number; top1: number; severeDetectionRate: number }>;
  /** confusion[trueKind][predictedKind] = count. */
  confusion: Record<string, Record<string, number>>;
  meanAnalysisMs: number;
  maxSpeedErrorPercent: number;
}

export function summarise(models: Readonly<Record<string, MachineModel>>, results: readonly CaseResult[]): EvalSummary {
  const right = (r: CaseResult, family: boolean) => {
    const c = r.case;
    if (c.fault === 'healthy') return r.predictedFault === 'healthy';
    const kindOk = family ? familyOf(r.predictedFault) === familyOf(c.fault) && familyOf(c.fault) !== 'other' : r.predictedFault === c.fault;
    return kindOk && sameComponent(models[c.machine]!, c.fault, r.predictedComponent, c.component);
  };
  const rate = (xs: readonly CaseResult[], ok: (r: CaseResult) => boolean) => (xs.length === 0 ? Number.NaN : xs.filter(ok).length / xs.length);
  const healthy = results.filter((r) => r.case.fault === 'healthy');
  const severeGB = results.filter((r) => r.case.severity >= SEVERE && isGearOrBearing(r.case.fault));
  const families: EvalSummary['families'] = (['healthy', 'unbalance', 'misalignment', 'gear tooth', 'bearing'] as const).map((family) => {
    const xs = results.filter((r) => familyOf(r.case.fault) === family);
    const found = (r: CaseResult) => (family === 'healthy' ? r.maxScore < 0.5 : r.trueScore >= 0.5);
    return {
      family,
      recordings: xs.length,
      detectionRate: rate(xs, found),
      top1: rate(xs, (r) => right(r, false)),
      severeDetectionRate: rate(xs.filter((r) => r.case.severity >= SEVERE || family === 'healthy'), found),
    };
  });
  const confusion: EvalSummary['confusion'] = {};
  for (const r of results) {
    const row = (confusion[r.case.fault] ??= {});
    const col = r.predictedFault === 'healthy' ? 'healthy' : r.predictedFault;
    row[col] = (row[col] ?? 0) + 1;
  }
  return {
    total: results.length,
    top1Accuracy: rate(results, (r) => right(r, false)),
    top1FamilyAccuracy: rate(results, (r) => right(r, true)),
    severeGearBearingDetection: rate(severeGB, (r) => r.trueScore >= 0.5),
    gearBearingFalseAlarmRate: rate(healthy, (r) => r.maxGearBearingScore >= 0.5),
    anyFalseAlarmRate: rate(healthy, (r) => r.maxScore >= 0.5),
    families,
    confusion,
    meanAnalysisMs: results.reduce((s, r) => s + r.analysisMs, 0) / Math.max(1, results.length),
    maxSpeedErrorPercent: Math.max(0, ...results.map((r) => Math.abs(r.speedErrorPercent)).filter(Number.isFinite)),
  };
}

/** The goals `npm run eval` holds the pipeline to; a miss fails the run. */
export const GOALS = {
  /**
   * Issue 4: top-1 at least 90 %: the top hypothesis names the fault and the component (healthy when nothing reaches
   * 0.5). A missing and a broken tooth count as one fault here: they are the same drop of the mesh torque at two
   * depths, and the simulator scales the depth with severity, so a missing tooth at 0.4 is a 40 % drop, which is a
   * broken tooth by definition. The exact-kind figure is printed beside it.
   */
  top1FamilyAccuracy: 0.9,
  /** At least 90 % of severe gear and bearing faults found with the right component at score >= 0.5 (a tooth fault: missing or broken tooth on that gear). */
  severeGearBearingDetection: 0.9,
  /** At most 5 % of healthy recordings with a gear or bearing hypothesis at 0.5 or more. */
  gearBearingFalseAlarmRate: 0.05,
  /** At most 5 % of healthy recordings with any hypothesis at 0.5 or more (issue 4: false alarms at most 5 %). */
  anyFalseAlarmRate: 0.05,
} as const;

export function missedGoals(s: EvalSummary): string[] {
  const missed: string[] = [];
  const pct = (x: number) => `${(100 * x).toFixed(1)} %`;
  if (!(s.top1FamilyAccuracy >= GOALS.top1FamilyAccuracy)) missed.push(`top-1 accuracy ${pct(s.top1FamilyAccuracy)} < ${pct(GOALS.top1FamilyAccuracy)}`);
  if (!(s.severeGearBearingDetection >= GOALS.severeGearBearingDetection)) {
    missed.push(`severe gear/bearing detection ${pct(s.severeGearBearingDetection)} < ${pct(GOALS.severeGearBearingDetection)}`);
  }
  if (!(s.gearBearingFalseAlarmRate <= GOALS.gearBearingFalseAlarmRate)) {
    missed.push(`gear/bearing false alarms ${pct(s.gearBearingFalseAlarmRate)} > ${pct(GOALS.gearBearingFalseAlarmRate)}`);
  }
  if (!(s.anyFalseAlarmRate <= GOALS.anyFalseAlarmRate)) missed.push(`false alarms ${pct(s.anyFalseAlarmRate)} > ${pct(GOALS.anyFalseAlarmRate)}`);
  return missed;
}

/** A variable-speed recording diagnosed twice: forced into the frequency domain, and order-tracked from its tach. */
export interface RampResult {
  case: RampCase;
  frequencyScore: number;
  angleScore: number;
  /** Highest gear or bearing score other than the true one (a false alarm on a healthy ramp). */
  frequencyFalse: number;
  angleFalse: number;
  angleDomainUsed: boolean;
}

export function runRamp(model: MachineModel, c: RampCase): RampResult {
  const recording = simulateRecording(model, {
    pointId: c.pointId,
    sampleRateHz: c.sampleRateHz,
    durationS: c.durationS,
    speedProfile: c.rampRpm,
    includeTach: true,
    faults: c.fault === 'healthy' ? [] : [{ fault: c.fault, component: c.component!, severity: c.severity }],
    seed: c.seed,
  });
  const frequency = analyseRecording(recording, { model, pointId: c.pointId, domain: 'frequency' });
  const angle = analyseRecording(recording, { model, pointId: c.pointId });
  // A tooth fault counts as found when missing or broken tooth on the right gear reaches 0.5 (as in runCase).
  const sameFault = (fault: string) => fault === c.fault || (familyOf(c.fault) === 'gear tooth' && familyOf(fault) === 'gear tooth');
  const truth = (a: RecordingAnalysis) => Math.max(0, ...a.hypotheses.filter((h) => sameFault(h.fault) && h.component === c.component).map((h) => h.score));
  const falseAlarm = (a: RecordingAnalysis) =>
    Math.max(0, ...a.hypotheses.filter((h) => isGearOrBearing(h.fault) && !(sameFault(h.fault) && h.component === c.component)).map((h) => h.score));
  return {
    case: c,
    frequencyScore: truth(frequency),
    angleScore: truth(angle),
    frequencyFalse: falseAlarm(frequency),
    angleFalse: falseAlarm(angle),
    angleDomainUsed: angle.domain === 'angle',
  };
}

/** Goals of the variable-speed set: every order-tracked fault found, no order-tracked false alarm. */
export const RAMP_GOALS = { angleDetection: 0.9, angleFalseAlarmRate: 0.05 } as const;
