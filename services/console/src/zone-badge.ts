import type { Zone } from './api-types.js';
import { h, svg } from './dom.js';
import { markerPath } from './charts/marker-shape.js';
import { zoneColour, zoneMeaning, zoneShape } from './zone.js';

/** A zone as shape + letter + colour, readable without colour; "–" when there is no zone. */
export function zoneBadge(zone: Zone | null | undefined): HTMLElement {
  if (!zone) return h('span', { class: 'zone zone-none', 'aria-label': 'no zone', title: 'no zone' }, '–');
  const icon = svg(
    'svg',
    { width: 14, height: 14, viewBox: '0 0 12 12', 'aria-hidden': 'true' },
    svg('path', { d: markerPath(zoneShape[zone]), fill: zoneColour[zone], stroke: '#1d232b', 'stroke-width': 0.8 }),
  );
  return h(
    'span',
    { class: `zone zone-${zone}`, 'data-zone': zone, title: `zone ${zone}: ${zoneMeaning[zone]}`, 'aria-label': `zone ${zone}, ${zoneMeaning[zone]}` },
    icon,
    h('b', {}, zone),
  );
}

/** A score as a number with a small bar; 0.5 and above marked as a fault in words too. */
export function scoreBadge(score: number | null | undefined): HTMLElement {
  if (score === null || score === undefined || !Number.isFinite(score)) return h('span', { class: 'score muted' }, '–');
  const pct = Math.round(Math.min(1, Math.max(0, score)) * 100);
  const bar = h('span', { class: 'score-bar', 'aria-hidden': 'true' }, h('span', { style: `width:${pct}%` }));
  return h('span', { class: `score${score >= 0.5 ? ' score-fault' : ''}`, 'data-score': score.toFixed(3) }, bar, h('span', { class: 'num' }, score.toFixed(2)), score >= 0.5 ? h('span', { class: 'fault-flag' }, 'fault') : null);
}
