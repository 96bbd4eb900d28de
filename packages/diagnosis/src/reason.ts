import { faultKindFacts, isFaultKind } from '@kinespec/kinematics';
import type { Judged } from './hypotheses.js';

function hz(x: number): string {
  return x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x.toFixed(2);
}

function phraseOf(fault: string): string {
  return isFaultKind(fault) ? faultKindFacts[fault].phrase : fault;
}

/** "1 in 3,000": a chance in words, rounded to two significant figures. */
export function chanceInWords(p: number): string {
  if (!(p < 0.5)) return 'likely by chance';
  const odds = 1 / p;
  if (odds >= 1e6) return `under 1 in a million by chance`;
  const rounded = Number(odds.toPrecision(2));
  return `about 1 in ${rounded.toLocaleString('en-GB')} by chance`;
}

/**
 * One plain-language sentence saying why a hypothesis scored as it did: how many of the predicted lines that can tell
 * it apart were found and where (the same counts as `linesMatched` / `linesPredicted`), the strongest of them, how
 * likely that pattern is by chance, and the first thing that held the score down.
 */
export function reasonFor(j: Judged, score: number, unitHz = 1, domainName: 'spectrum' | 'envelope' | 'order' = j.candidate.domain): string {
  const where = j.candidate.twins.length > 0 ? `${j.candidate.component} (or ${j.candidate.twins.join(', ')}: the same part or identical, not told apart from here)` : j.candidate.component;
  const what = `${phraseOf(j.candidate.fault)} in ${where}`;
  const spectrum = domainName === 'envelope'
    ? `envelope spectrum${j.band ? ` of ${hz(j.band.lowHz * unitHz)}–${hz(j.band.highHz * unitHz)} Hz` : ''}`
    : domainName === 'order' ? 'order spectrum' : 'spectrum';
  const counted = j.lines.filter((l) => l.counted && !l.synchronous);
  const found = counted.filter((l) => l.matched).sort((a, b) => (b.snrDb ?? 0) - (a.snrDb ?? 0));
  if (j.lines.length === 0) return `No line of ${what} falls inside the recorded band, so the recording cannot show it.`;
  if (counted.length === 0) {
    return `Every line of ${what} lies on a running line or a line of another component at this resolution, so the recording cannot tell it apart.`;
  }
  if (found.length === 0) return `None of the ${counted.length} lines that would tell ${what} apart stands above the noise in the ${spectrum}.`;
  const best = found
    .slice(0, 3)
    .map((m) => `${m.label} at ${hz(m.measuredHz! * unitHz)} Hz (${(m.snrDb ?? 0).toFixed(0)} dB)`)
    .join(', ');
  const p = j.parts;
  let caveat = '';
  if (j.gateReasons.length > 0 && p.gate < 0.5) caveat = `, but ${j.gateReasons[0]}`;
  else if (p.explainedBy !== undefined && p.explainedAway < 0.5) {
    const [fault, component] = p.explainedBy.split(':');
    caveat = `, but every one of them belongs to the broader pattern of ${phraseOf(fault!)} in ${component}, which explains them better`;
  } else if (p.exclusivity < 0.5) caveat = ', but stronger lines that it does not explain point to another fault of the same part';
  else if (p.level < 0.5) caveat = j.candidate.descriptor.level === 'iso-velocity' ? ', but at a level a healthy machine also shows' : j.candidate.descriptor.level === 'tooth-drop' ? ', but its mesh is modulated less than such a tooth would' : ', but no higher than on the baseline';
  else if (p.detection < 0.5) caveat = `, but a pattern like this is ${chanceInWords(p.chance)} in this spectrum`;
  else if (p.shape < 0.5) caveat = ', but their relative sizes do not follow the prediction';
  const verdict = score >= 0.5 ? 'The recording shows' : 'Weak evidence of';
  const chance = p.detection >= 0.5 || score >= 0.5 ? ` (${chanceInWords(p.chance)})` : '';
  return `${verdict} ${what}: ${found.length} of ${counted.length} predicted lines found in the ${spectrum}${chance}, strongest ${best}${caveat}.`;
}
