import type { IndicatorRow, MeasurementPoint, Trend } from '../api-types.js';
import type { AppContext } from '../app-context.js';
import { sparkline } from '../charts/sparkline.js';
import { h, message } from '../dom.js';
import { faultName, formatScore } from '../format.js';
import { routeHref } from '../route.js';
import { developingFaults, scoreRise, type ScoreRise } from '../score-rise.js';

// "Developing on this machine": every hypothesis score, at every vibration point, whose weekly
// trend climbed to the fault threshold. It answers "what is getting worse" even when another,
// steady hypothesis scores higher in the latest recording.

async function limited<T, R>(items: readonly T[], width: number, work: (item: T) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await work(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(width, items.length) }, worker));
  return out;
}

// A page view re-renders on every navigation; the trends behind this panel change only with new
// recordings, so a short-lived cache spares the service a hundred requests per click.
const cache = new Map<string, { at: number; list: ScoreRise[] }>();
const cacheMs = 120_000;

export async function renderDevelopingPanel(host: HTMLElement, ctx: AppContext, machineId: string, points: readonly MeasurementPoint[], isCurrent: () => boolean): Promise<void> {
  const section = h('section', { class: 'panel developing', id: 'developing-panel', 'aria-labelledby': 'developing-title', 'data-state': 'loading' }, h('h2', { id: 'developing-title' }, 'Developing on this machine'));
  const body = h('div', {}, message('note', 'Reading the hypothesis score trends of every point…'));
  section.append(body);
  host.append(section);
  const vibration = points.filter((p) => p.quantity !== 'tach' && p.quantity !== 'encoder');
  let rises: Array<ScoreRise | null> = [];
  const cached = cache.get(machineId);
  const fresh = cached !== undefined && Date.now() - cached.at < cacheMs;
  if (fresh) {
    rises = cached.list;
  } else {
    try {
      const perPoint = await Promise.all(
        vibration.map(async (p) => {
          const rows = await ctx.api.get<IndicatorRow[]>('/api/v1/indicators', { machine: machineId, point: p.id });
          return rows.filter((r) => r.indicator.startsWith('score:')).map((r) => ({ point: p.id, indicator: r.indicator }));
        }),
      );
      rises = await limited(perPoint.flat(), 6, async (w) => {
        if (!isCurrent()) return null;
        const t = await ctx.api.get<Trend>('/api/v1/trends', { machine: machineId, point: w.point, indicator: w.indicator, bucket: 'week' });
        return scoreRise(w.point, w.indicator, t.buckets);
      });
    } catch (err) {
      body.replaceChildren(message('error', `Score trends unavailable: ${(err as Error).message}`));
      section.dataset.state = 'failed';
      return;
    }
  }
  if (!isCurrent()) return;
  const list = developingFaults(rises);
  if (!fresh) cache.set(machineId, { at: Date.now(), list });
  section.dataset.state = 'done';
  section.dataset.count = String(list.length);
  if (list.length === 0) {
    body.replaceChildren(message('empty', 'No hypothesis score has climbed to 0.5 over the recorded weeks.'));
    return;
  }
  body.replaceChildren(
    h(
      'table',
      { class: 'data compact developing-table' },
      h('thead', {}, h('tr', {}, ...['Hypothesis, point', 'Weekly score'].map((t) => h('th', { scope: 'col' }, t)))),
      h(
        'tbody',
        {},
        ...list.slice(0, 8).map((r) =>
          h(
            'tr',
            { 'data-hypothesis': `${r.fault}:${r.component}`, 'data-point-id': r.pointId },
            h(
              'td',
              {},
              h('b', {}, faultName(r.fault)),
              h('span', { class: 'hyp-component' }, ` @ ${r.component}`),
              h('br'),
              h('span', { class: 'mono' }, r.pointId),
              ' · ',
              h('a', { href: routeHref('machine', machineId, { point: r.pointId, hypothesis: `${r.fault}:${r.component}` }) }, 'show on the spectrum'),
            ),
            h('td', {}, sparkline(r.means.map((mean, i) => ({ start: String(i), mean })), `${faultName(r.fault)} score`), h('br'), h('span', { class: 'num' }, `${formatScore(r.first)} → ${formatScore(r.last)}`)),
          ),
        ),
      ),
    ),
  );
  if (list.length > 8) body.append(h('p', { class: 'help' }, `${list.length - 8} more rising hypotheses not listed.`));
}
