// Adds up the judged cases of one corpus: confusion table, top-1 by severity class and fault kind, false alarms,
// wrong gear/bearing hypotheses, calibration of the scores, speed error and analysis time.
import { isToothFault, type CaseOutcome } from './judge.js';
import { CALIBRATION_BINS } from './goals.js';

/** `hits` of `total`; the rate is undefined when `total` is 0. */
export interface Rate {
  hits: number;
  total: number;
}

export interface CalibrationBin {
  lowScore: number;
  highScore: number;
  /** Hypotheses in the bin that name a labelled fault (true or equivalent). */
  true: number;
  total: number;
}

export interface CorpusMetrics {
  /** Counted recordings (report-only ones left out). */
  recordings: number;
  faulty: number;
  healthy: number;
  reportOnly: number;
  failed: number;
  /** confusion[label row][top column] = count; rows are the labelled kinds ('a + b' for two faults), columns the top kind at >= 0.5 ('*': a labelled kind on another component). */
  confusion: Record<string, Record<string, number>>;
  top1: {
    /** Faulty recordings the record can decide. */
    all: Rate;
    clear: Rate;
    shallow: Rate;
    /** Real records: severity not defined. */
    unknown: Rate;
    /** Exact kind (tooth faults not pooled), all decidable faulty recordings. */
    exactKind: Rate;
    /** Every recording, healthy ones right when nothing reaches 0.5 (the earlier eval's figure). */
    withHealthy: Rate;
    undecidable: number;
    /** Per labelled fault kind (single-fault recordings): top-1 and exact kind. */
    byKind: Record<string, { top1: Rate; exact: Rate }>;
    /** Two-fault recordings: top-1 names one, and both shown at >= 0.5. */
    twoFaults: { top1: Rate; bothShown: Rate };
    /** Shown with an 'equivalent' flag (identical bearing, tooth fault): counted true, reported. */
    flagged: number;
  };
  /** Faulty, decidable recordings with a labelled fault at >= 0.5 anywhere in the list. */
  detection: Rate;
  falseAlarms: { gearBearing: Rate; any: Rate };
  /** All counted recordings with a gear or bearing hypothesis at >= 0.5 naming no labelled fault. */
  wrongGearBearing: Rate;
  calibration: { bins: CalibrationBin[]; all: Rate };
  /**
   * Speed the analysis used against the labelled one, where it came from the spectrum; `given`: recordings whose speed
   * the analysis was told; `nominalFallback`: recordings with no speed given whose spectrum showed none, so the
   * analysis ran at the model's nominal speed (it reports that source as 'given' too).
   */
  speed: { fromSpectrum: number; medianAbsErrorPercent: number | null; maxAbsErrorPercent: number | null; given: number; nominalFallback: number };
  analysisMs: { median: number | null; max: number | null };
}

const rate = (xs: readonly CaseOutcome[], ok: (o: CaseOutcome) => boolean): Rate => ({ hits: xs.filter(ok).length, total: xs.length });

function median(xs: readonly number[]): number | null {
  if (xs.length === 0) return null;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

export const KIND_ABBREVIATIONS: Record<string, string> = {
  healthy: 'healthy',
  unbalance: 'unbal',
  misalignment: 'misal',
  looseness: 'loose',
  'gear-missing-tooth': 'missing',
  'gear-broken-tooth': 'broken',
  'gear-wear': 'wear',
  'gear-eccentricity': 'eccentr',
  'bearing-outer-race': 'outer',
  'bearing-inner-race': 'inner',
  'bearing-rolling-element': 'ball',
  'bearing-cage': 'cage',
  electrical: 'electr',
};

export const abbreviate = (kind: string) => KIND_ABBREVIATIONS[kind] ?? kind;

export function rowOf(o: CaseOutcome): string {
  if (o.label.faults.length === 0) return 'healthy';
  return [...new Set(o.label.faults.map((f) => f.fault))].sort().join(' + ');
}

export function columnOf(o: CaseOutcome): string {
  const top = o.top;
  if (!top || top.score < 0.5) return 'healthy';
  const kind = abbreviate(top.fault);
  if (top.verdict !== 'false') return kind;
  // A labelled kind (tooth faults pooled) named on a component that is not the labelled one.
  const labelledKind = o.label.faults.some((f) => f.fault === top.fault || (isToothFault(f.fault) && isToothFault(top.fault)));
  return labelledKind ? `${kind}*` : kind;
}

export function corpusMetrics(outcomes: readonly CaseOutcome[]): CorpusMetrics {
  const counted = outcomes.filter((o) => !o.reportOnly);
  const faulty = counted.filter((o) => o.label.faults.length > 0);
  const healthy = counted.filter((o) => o.label.faults.length === 0);
  const decidable = faulty.filter((o) => o.undecidable === null);
  const single = decidable.filter((o) => o.label.faults.length === 1);
  const two = decidable.filter((o) => o.label.faults.length >= 2);

  const confusion: CorpusMetrics['confusion'] = {};
  for (const o of counted) {
    const row = (confusion[rowOf(o)] ??= {});
    const col = columnOf(o);
    row[col] = (row[col] ?? 0) + 1;
  }
  const byKind: CorpusMetrics['top1']['byKind'] = {};
  for (const kind of [...new Set(single.map((o) => o.label.faults[0]!.fault))].sort()) {
    const xs = single.filter((o) => o.label.faults[0]!.fault === kind);
    byKind[kind] = { top1: rate(xs, (o) => o.top1 === true), exact: rate(xs, (o) => o.top1Exact === true) };
  }
  const bins: CalibrationBin[] = CALIBRATION_BINS.map(([lowScore, highScore]) => ({ lowScore, highScore, true: 0, total: 0 }));
  let allTrue = 0;
  let allTotal = 0;
  let flagged = 0;
  for (const o of counted) {
    for (const h of o.shown) {
      const bin = bins.find((b) => h.score >= b.lowScore && (h.score < b.highScore || (b.highScore >= 1 && h.score <= 1)));
      const ok = h.verdict !== 'false';
      if (bin) {
        bin.total += 1;
        if (ok) bin.true += 1;
      }
      allTotal += 1;
      if (ok) allTrue += 1;
      if (h.verdict === 'equivalent') flagged += 1;
    }
  }
  const spectrumErrors = counted
    .filter((o) => o.speedSource === 'spectrum' && o.speedErrorPercent !== null)
    .map((o) => Math.abs(o.speedErrorPercent!));
  const times = counted.filter((o) => o.error === null).map((o) => o.analysisMs);
  return {
    recordings: counted.length,
    faulty: faulty.length,
    healthy: healthy.length,
    reportOnly: outcomes.length - counted.length,
    failed: counted.filter((o) => o.error !== null).length,
    confusion,
    top1: {
      all: rate(decidable, (o) => o.top1 === true),
      clear: rate(decidable.filter((o) => o.severityClass === 'clear'), (o) => o.top1 === true),
      shallow: rate(decidable.filter((o) => o.severityClass === 'shallow'), (o) => o.top1 === true),
      unknown: rate(decidable.filter((o) => o.severityClass === 'unknown'), (o) => o.top1 === true),
      exactKind: rate(decidable, (o) => o.top1Exact === true),
      withHealthy: rate(counted, (o) => (o.label.faults.length === 0 ? !o.anyShown : o.top1 === true)),
      undecidable: faulty.length - decidable.length,
      byKind,
      twoFaults: { top1: rate(two, (o) => o.top1 === true), bothShown: rate(two, (o) => o.allShown === true) },
      flagged,
    },
    detection: rate(decidable, (o) => o.detected === true),
    falseAlarms: { gearBearing: rate(healthy, (o) => o.gearBearingShown), any: rate(healthy, (o) => o.anyShown) },
    wrongGearBearing: rate(counted, (o) => o.wrongGearBearing),
    calibration: { bins, all: { hits: allTrue, total: allTotal } },
    speed: {
      fromSpectrum: spectrumErrors.length,
      medianAbsErrorPercent: median(spectrumErrors),
      maxAbsErrorPercent: spectrumErrors.length ? Math.max(...spectrumErrors) : null,
      given: counted.filter((o) => o.label.speedGiven).length,
      nominalFallback: counted.filter((o) => !o.label.speedGiven && o.speedSource === 'given').length,
    },
    analysisMs: { median: median(times), max: times.length ? Math.max(...times) : null },
  };
}
