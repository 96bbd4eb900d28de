// Plain-text report of `npm run eval`: a compact block per corpus, then every goal with its measured figure.
import type { CorpusReport } from './evaluate.js';
import type { GoalResult } from './goals.js';
import type { CaseOutcome, JudgedHypothesis } from './judge.js';
import { abbreviate, columnOf, type CorpusMetrics, type Rate } from './metrics.js';

const pct = (r: Rate) => (r.total === 0 ? '-' : `${((100 * r.hits) / r.total).toFixed(1)} %`);
const rateText = (r: Rate) => (r.total === 0 ? '-' : `${r.hits}/${r.total} (${pct(r)})`);
const hyp = (h: Pick<JudgedHypothesis, 'fault' | 'component' | 'score'>) => `${abbreviate(h.fault)}@${h.component} ${h.score.toFixed(2)}`;
const mark = (h: JudgedHypothesis, reportOnly = false) => (reportOnly || h.verdict === 'true' ? '' : h.verdict === 'equivalent' ? ` (${h.flag})` : ' ✗');

export function goalLine(g: GoalResult): string {
  const status = g.met === null ? '[n/a]   ' : g.met ? '[met]   ' : '[MISSED]';
  return `${status} ${g.goal} — ${g.measured}`;
}

function labelText(o: CaseOutcome): string {
  if (o.reportOnly && o.label.faults.length === 0) return o.tags.state ?? 'not labelled';
  if (o.label.faults.length === 0) return 'healthy';
  return o.label.faults.map((f) => `${abbreviate(f.fault)}@${f.component}${f.severity !== null ? ` s${f.severity}` : ''}`).join(' + ');
}

export function caseLine(o: CaseOutcome): string {
  if (o.error) return `${o.id}: ${labelText(o)} → analysis failed: ${o.error}`;
  const top = o.top ? `top ${hyp(o.top)}${o.top.score >= 0.5 ? mark(o.top, o.reportOnly) : ' (below 0.5)'}` : 'no hypothesis';
  const others = o.shown.slice(1, 5).map((h) => `${hyp(h)}${mark(h, o.reportOnly)}`);
  const truth = o.label.faults.length > 0 ? `; labelled fault scored ${o.labelScores.map((s) => s.toFixed(2)).join(', ')}` : '';
  const speed = o.speedErrorPercent !== null && o.speedSource === 'spectrum' ? `; speed ${o.speedErrorPercent >= 0 ? '+' : ''}${o.speedErrorPercent.toFixed(2)} %` : '';
  const undecidable = o.undecidable ? ` [undecidable: ${o.undecidable}]` : '';
  return `${o.id}: ${labelText(o)} → ${top}${others.length ? `; also ${others.join(', ')}` : ''}${o.shown.length > 5 ? ` (+${o.shown.length - 5})` : ''}${truth}${speed}${undecidable}`;
}

/** A recording the analysis got wrong in any way the metrics count. */
export function isMiss(o: CaseOutcome): boolean {
  if (o.error) return true;
  if (o.label.faults.length === 0) return o.anyShown;
  return (o.undecidable === null && o.top1 !== true) || o.wrongGearBearing || (o.label.faults.length > 1 && o.allShown !== true);
}

function confusionLines(m: CorpusMetrics, outcomes: readonly CaseOutcome[]): string[] {
  const rows = Object.keys(m.confusion).sort((a, b) => (a === 'healthy' ? -1 : b === 'healthy' ? 1 : a.localeCompare(b)));
  const cols = [...new Set(['healthy', ...outcomes.filter((o) => !o.reportOnly).map(columnOf)])].sort((a, b) =>
    a === 'healthy' ? -1 : b === 'healthy' ? 1 : a.localeCompare(b),
  );
  const rowName = (r: string) => r.split(' + ').map(abbreviate).join(' + ');
  const w = Math.max('labelled \\ top'.length, ...rows.map((r) => rowName(r).length));
  const cw = Math.max(6, ...cols.map((c) => c.length));
  const out = [`  ${'labelled \\ top'.padEnd(w)} ${cols.map((c) => c.padStart(cw)).join(' ')}`];
  for (const r of rows) out.push(`  ${rowName(r).padEnd(w)} ${cols.map((c) => String(m.confusion[r]![c] ?? '·').padStart(cw)).join(' ')}`);
  return out;
}

export interface PrintOptions {
  /** Print every case, not only the misses. */
  allCases: boolean;
  /** Most misses printed per corpus (all are in --json). */
  maxMisses: number;
}

/** Corpora whose every case is printed (small, real, or report-only). */
const LIST_ALL = new Set(['cwru-de', 'cwru-fe', 'femto-end']);

export function corpusBlock(r: CorpusReport, options: PrintOptions): string[] {
  const out: string[] = [];
  out.push('', `━━ ${r.id}: ${r.title}`, `   source: ${r.source}`);
  if (!r.available) {
    out.push(`   not available: ${r.reason}`);
    return out;
  }
  for (const n of r.notes) out.push(`   note: ${n}`);
  const m = r.metrics!;
  out.push(
    `   ${m.recordings} recordings (${m.faulty} faulty, ${m.healthy} healthy${m.reportOnly ? `, ${m.reportOnly} report-only` : ''}${m.failed ? `, ${m.failed} FAILED to analyse` : ''}), ${r.elapsedS.toFixed(1)} s`,
  );
  if (m.recordings > 0) {
    out.push('   confusion (rows: labelled; columns: top hypothesis at >= 0.5, else healthy; * = a labelled kind on another component):');
    out.push(...confusionLines(m, r.outcomes).map((l) => `  ${l}`));
    const t = m.top1;
    if (m.faulty > 0) {
      const classes = [t.clear.total ? `clear ${rateText(t.clear)}` : '', t.shallow.total ? `shallow ${rateText(t.shallow)}` : ''].filter(Boolean).join(', ');
      out.push(
        `   top-1 (top hypothesis >= 0.5 names a labelled fault): ${rateText(t.all)}${classes ? `; ${classes}` : ''}; exact kind ${rateText(t.exactKind)}` +
          `${t.undecidable ? `; ${t.undecidable} undecidable by record length not counted` : ''}${t.flagged ? `; ${t.flagged} shown as equivalents (flagged)` : ''}`,
      );
      const kinds = Object.entries(t.byKind).map(([k, v]) => `${abbreviate(k)} ${v.top1.hits}/${v.top1.total}${v.exact.hits !== v.top1.hits ? ` (exact ${v.exact.hits})` : ''}`);
      if (kinds.length) out.push(`     by kind: ${kinds.join(', ')}`);
      if (t.twoFaults.top1.total) out.push(`     two faults: top-1 ${rateText(t.twoFaults.top1)}, both shown at >= 0.5 ${rateText(t.twoFaults.bothShown)}`);
      out.push(`   detection (a labelled fault at >= 0.5 anywhere in the list): ${rateText(m.detection)}`);
    }
    if (m.healthy > 0) {
      out.push(`   false alarms on healthy recordings: gear/bearing ${rateText(m.falseAlarms.gearBearing)}; any hypothesis ${rateText(m.falseAlarms.any)}`);
    }
    out.push(`   recordings with a wrong gear/bearing hypothesis at >= 0.5: ${rateText(m.wrongGearBearing)}`);
    const bins = m.calibration.bins.map((b) => `${b.lowScore.toFixed(1)}-${b.highScore.toFixed(1)} ${b.total ? `${b.true}/${b.total}` : '-'}`);
    out.push(`   calibration (true/shown per score bin): ${bins.join(' | ')} | all >= 0.5: ${rateText(m.calibration.all)}`);
    const s = m.speed;
    out.push(
      `   speed from the spectrum: ${s.fromSpectrum ? `${s.fromSpectrum} recordings, median |error| ${s.medianAbsErrorPercent!.toFixed(3)} %, max ${s.maxAbsErrorPercent!.toFixed(3)} %` : 'none'}` +
        `${s.given ? `; speed given to the analysis in ${s.given}` : '; speed never given'}${s.nominalFallback ? `; no speed found, nominal used, in ${s.nominalFallback}` : ''}; analysis time median ${m.analysisMs.median?.toFixed(0) ?? '-'} ms, max ${m.analysisMs.max?.toFixed(0) ?? '-'} ms`,
    );
  }
  const listAll = options.allCases || LIST_ALL.has(r.id);
  const listed = listAll ? r.outcomes : r.outcomes.filter((o) => !o.reportOnly && isMiss(o));
  if (listed.length) {
    out.push(listAll ? '   cases:' : `   misses (${listed.length}; ✗ = names no labelled fault):`);
    for (const o of listed.slice(0, listAll ? listed.length : options.maxMisses)) out.push(`     ${caseLine(o)}`);
    if (!listAll && listed.length > options.maxMisses) out.push(`     … and ${listed.length - options.maxMisses} more (--json or --all-cases for every case)`);
  }
  if (r.goals.length) {
    out.push('   goals:');
    for (const g of r.goals) out.push(`     ${goalLine(g)}`);
  }
  return out;
}

export function summaryBlock(reports: readonly CorpusReport[]): { lines: string[]; missed: number } {
  const lines = ['', '══ Goals (issue 13; tuned and ramp corpora: issues 4 and 7)'];
  let missed = 0;
  for (const r of reports) {
    if (!r.available) {
      lines.push(`  ${r.id.padEnd(18)} not available: ${r.reason}`);
      continue;
    }
    if (r.goals.length === 0) {
      lines.push(`  ${r.id.padEnd(18)} reported only (no goal), ${r.metrics?.recordings ?? 0} counted recordings, ${r.outcomes.length} in all`);
      continue;
    }
    for (const g of r.goals) {
      if (g.met === false) missed += 1;
      lines.push(`  ${r.id.padEnd(18)} ${goalLine(g)}`);
    }
  }
  const total = reports.reduce((s, r) => s + r.elapsedS, 0);
  lines.push('', `${missed === 0 ? 'All goals met' : `${missed} goal${missed === 1 ? '' : 's'} missed`}; ${total.toFixed(1)} s in all (${reports.map((r) => `${r.id} ${r.elapsedS.toFixed(1)} s`).join(', ')})`);
  return { lines, missed };
}
