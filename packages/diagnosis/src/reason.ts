import type { LineMatch } from './line-matching.js';
import type { Hypothesis } from './recording-analysis.js';

const faultNames: Record<string, string> = {
  unbalance: 'unbalance',
  misalignment: 'misalignment',
  looseness: 'mechanical looseness',
  'gear-missing-tooth': 'a missing tooth',
  'gear-broken-tooth': 'a broken or chipped tooth',
  'gear-wear': 'tooth wear',
  'gear-eccentricity': 'an eccentric gear',
  'bearing-outer-race': 'an outer-race defect',
  'bearing-inner-race': 'an inner-race defect',
  'bearing-rolling-element': 'a rolling-element defect',
  'bearing-cage': 'a cage defect',
  electrical: 'an electrical fault',
};

function hz(x: number): string {
  return x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x.toFixed(2);
}

/** One plain-language sentence saying why a hypothesis scored as it did. */
export function reasonFor(h: Hypothesis, matches: ReadonlyArray<LineMatch & { ambiguous?: boolean; running?: boolean }>, unitHz = 1): string {
  const what = `${faultNames[h.fault] ?? h.fault} in ${h.component}`;
  const where = h.domain === 'envelope' ? 'envelope spectrum' : h.domain === 'order' ? 'order spectrum' : 'spectrum';
  // Lines a healthy machine shows anyway (the mesh tone under a tooth fault) come last: they explain nothing.
  const found = matches.filter((m) => m.matched).sort((a, b) => Number(a.running ?? false) - Number(b.running ?? false) || b.snrDb - a.snrDb);
  const total = matches.length;
  if (total === 0) return `No line of ${what} falls inside the recorded band, so the recording cannot show it.`;
  if (found.length === 0) return `None of the ${total} lines predicted for ${what} stands above the noise in the ${where}.`;
  const best = found
    .slice(0, 3)
    .map((m) => `${m.label} at ${hz(m.measuredHz! * unitHz)} Hz (${m.snrDb.toFixed(0)} dB)`)
    .join(', ');
  const p = h.parts;
  let caveat = '';
  if (p.explainedBy !== undefined && p.explainedAway < 0.5) {
    const [fault, component] = p.explainedBy.split(':');
    caveat = `, but every one of them belongs to the broader pattern of ${faultNames[fault!] ?? fault} in ${component}, which explains them better`;
  } else if (p.exclusivity < 0.5) caveat = ', but stronger lines that it does not explain point to another fault of the same part';
  else if (p.level < 0.5) caveat = h.fault === 'unbalance' || h.fault === 'misalignment' || h.fault === 'looseness' || h.fault === 'electrical'
    ? ', but at a level a healthy machine also shows'
    : ', but no higher than on the baseline';
  else if (p.shape < 0.5) caveat = ', but their relative sizes do not follow the prediction';
  else if (p.detection < 0.5) caveat = ', but most of the predicted pattern is missing';
  const verdict = h.score >= 0.5 ? 'The recording shows' : 'Weak evidence of';
  return `${verdict} ${what}: ${found.length} of ${total} predicted lines found in the ${where}, strongest ${best}${caveat}.`;
}
