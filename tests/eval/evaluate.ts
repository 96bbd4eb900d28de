// Runs the real pipeline (@kinespec/diagnosis analyseRecording) on every case of a corpus and judges it.
import { analyseRecording, type AnalyseOptions, type RecordingAnalysis } from '@kinespec/diagnosis';
import { casesOf, type Corpus, type CorpusOptions, type LabelledCase } from './corpus.js';
import { judgeGoals, type GoalResult } from './goals.js';
import { judgeCase, type CaseOutcome } from './judge.js';
import { corpusMetrics, type CorpusMetrics } from './metrics.js';

/** The options a user would give: the model, the point, the channel, and the speed only where the source states it. */
export function analysisOptions(c: LabelledCase): AnalyseOptions {
  return {
    model: c.machine,
    pointId: c.pointId,
    ...(c.analysis ?? {}),
    ...(c.label.speedGiven && c.label.speedRpm !== null ? { speedRpm: c.label.speedRpm } : {}),
  };
}

/** Analyses one case and judges the result; a thrown error is an outcome too (a miss, reported with its message). */
export function evaluateCase(c: LabelledCase): CaseOutcome {
  let analysis: RecordingAnalysis | null = null;
  let error: string | null = null;
  const start = performance.now();
  try {
    analysis = analyseRecording(c.recording, analysisOptions(c));
  } catch (err) {
    error = err instanceof Error ? `${err.name}: ${err.message}` : String(err);
  }
  return judgeCase(c, analysis, performance.now() - start, error);
}

export interface CorpusReport {
  id: string;
  title: string;
  source: string;
  available: boolean;
  /** Why the corpus was skipped. */
  reason?: string;
  notes: string[];
  elapsedS: number;
  outcomes: CaseOutcome[];
  metrics: CorpusMetrics | null;
  goals: GoalResult[];
}

export async function runCorpus(corpus: Corpus, options: CorpusOptions, onCase?: (o: CaseOutcome) => void): Promise<CorpusReport> {
  const t0 = performance.now();
  const base = { id: corpus.id, title: corpus.title, source: corpus.source };
  const loaded = await corpus.load(options);
  if (!loaded.available) {
    return { ...base, available: false, reason: loaded.reason, notes: [], elapsedS: (performance.now() - t0) / 1000, outcomes: [], metrics: null, goals: [] };
  }
  const outcomes: CaseOutcome[] = [];
  for await (const c of casesOf(loaded.cases)) {
    const o = evaluateCase(c);
    outcomes.push(o);
    onCase?.(o);
  }
  const metrics = corpusMetrics(outcomes);
  return {
    ...base,
    available: true,
    notes: loaded.notes ?? [],
    elapsedS: (performance.now() - t0) / 1000,
    outcomes,
    metrics,
    goals: judgeGoals(corpus.id, metrics, outcomes),
  };
}
