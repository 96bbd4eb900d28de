// What the evaluation runs on: a corpus is a generator of labelled recordings. The shape of a case is the one
// every source shares (our corpora, the second physics `@kinespec/lumped-rig`, real data sets), so a new corpus
// is one generator and a line in corpora/index.ts.
import type { AnalyseOptions } from '@kinespec/diagnosis';
import type { MachineModel } from '@kinespec/kinematics';
import type { Recording } from '@kinespec/signal';

/** One fault built into (or known to be in) a recording. */
export interface LabelledFault {
  /** A fault kind of the machine-model contract (`faultKinds` of @kinespec/kinematics). */
  fault: string;
  /** The model's component id: shaft or rotor, gear, gear mesh, bearing, motor. */
  component: string;
  /** 0..1 where the source defines it (simulators); null for real records (see goals.ts for clear / shallow). */
  severity: number | null;
}

export interface CaseLabel {
  /** Empty for a healthy recording. */
  faults: LabelledFault[];
  /** The reference shaft's speed the recording ran at (mean over the record), rpm; null if unknown. */
  speedRpm: number | null;
  /** Whether the analysis is told `speedRpm` (as a user who read it off a display would give it). */
  speedGiven: boolean;
}

export interface LabelledCase {
  id: string;
  /** The machine model the analysis uses (a real user's model of the rig). */
  machine: MachineModel;
  pointId: string;
  recording: Recording;
  label: CaseLabel;
  /** Extra analysis options: which channel to read, the domain to force. */
  analysis?: Pick<AnalyseOptions, 'channel' | 'domain' | 'tachChannel'>;
  /** Free tags for breakdowns and case-by-case goals (e.g. record 'IR007', phase 'first hour'). */
  tags?: Record<string, string>;
  /** Reported, never counted in metrics or goals (e.g. badly damaged bearings whose fault kind is unknown). */
  reportOnly?: boolean;
  /** Why the record cannot decide its labelled fault (too short to resolve it): kept out of top-1, counted elsewhere. */
  undecidable?: string;
}

/** A source of labelled cases; `load` says why it is not available instead of throwing. */
export interface Corpus {
  id: string;
  title: string;
  /** Where the recordings come from, with the citation a reader needs. */
  source: string;
  load(options: CorpusOptions): Promise<CorpusLoad>;
}

export interface CorpusOptions {
  /** Fewer cases (the CI subset and `--quick`). */
  quick: boolean;
}

export type CorpusLoad =
  | { available: true; cases: Iterable<LabelledCase> | AsyncIterable<LabelledCase>; notes?: string[] }
  | { available: false; reason: string };

/** Iterates a corpus's cases whether the generator is sync or async. */
export async function* casesOf(cases: Iterable<LabelledCase> | AsyncIterable<LabelledCase>): AsyncGenerator<LabelledCase> {
  for await (const c of cases as AsyncIterable<LabelledCase>) yield c;
}
