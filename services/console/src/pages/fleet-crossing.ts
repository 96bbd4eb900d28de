import type { MachineSummary } from '../api-types.js';
import { h } from '../dom.js';
import { formatDateTime, formatNumber, indicatorName } from '../format.js';
import { aheadInWords, crossingPhrase } from '../forecast-view.js';

// The fleet's forecast column: the machine's soonest foreseen crossing of a zone boundary, alarm or trip level
// ("zone C in about 3 weeks"), with its point and the 10-90 % range on hover; "none foreseen" otherwise.

export function crossingCell(m: MachineSummary): HTMLElement {
  const c = m.soonestCrossing;
  if (!c) return h('span', { class: 'muted', 'data-crossing': '' }, 'none foreseen');
  const range = `${c.lowS === null ? '–' : aheadInWords(c.lowS)} to ${c.highS === null ? 'beyond the history' : aheadInWords(c.highS)}`;
  return h(
    'span',
    {
      class: 'crossing',
      'data-crossing': c.level,
      'data-remaining-s': c.remainingS,
      title: `${indicatorName(c.indicator)} at ${c.pointId} reaches ${formatNumber(c.threshold)} ${c.unit} around ${formatDateTime(c.crossingAt)} (10-90 %: ${range}). A forecast, not a verdict.`,
    },
    crossingPhrase(c),
    h('span', { class: 'crossing-point' }, ` · ${c.pointId}`),
  );
}
