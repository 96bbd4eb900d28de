import type { MachineSummary, RankingRow, Zone } from '../api-types.js';
import type { AppContext, Cleanup } from '../app-context.js';
import { sparkline } from '../charts/sparkline.js';
import { clear, h, message } from '../dom.js';
import { concernLevel, concernWord, faultScoreThreshold, filterMachines, indicatorRise, risingRows, sortMachines, sparklineWeeks, type FleetFilter, type SortDirection, type SortKey } from '../fleet-order.js';
import { crossingCell } from './fleet-crossing.js';
import { faultName, formatAge, formatDateTime, formatNumber, indicatorName } from '../format.js';
import { routeHref, type Route } from '../route.js';
import { scoreBadge, zoneBadge } from '../zone-badge.js';
import { zoneRank } from '../zone.js';

// Fleet: one row per machine, ordered by concern; sortable headers, a text filter, a zone floor
// and a "fault hypotheses only" switch; the fastest risers over the last weeks beside it.

const columns: Array<{ key: SortKey | null; label: string; spoken: string; numeric?: boolean }> = [
  { key: 'concern', label: 'Concern', spoken: 'concern' },
  { key: 'name', label: 'Machine', spoken: 'machine name' },
  { key: 'zone', label: 'Zone', spoken: 'worst zone' },
  { key: 'score', label: 'Strongest hypothesis', spoken: 'score of the strongest hypothesis' },
  { key: 'lastMeasured', label: 'Measured', spoken: 'time last measured' },
  { key: 'alarms', label: 'Alarms', spoken: 'active alarms', numeric: true },
  { key: 'rise', label: 'Main indicator, weekly mean', spoken: 'change of the main indicator' },
  { key: 'crossing', label: 'Soonest crossing', spoken: 'soonest foreseen crossing' },
];

function concernCell(m: MachineSummary): HTMLElement {
  const level = concernLevel(m);
  return h('span', { class: `concern concern-${level}`, 'data-concern': level }, h('span', { class: 'concern-pips', 'aria-hidden': 'true' }, '▮'.repeat(level) + '▯'.repeat(3 - level)), concernWord[level]);
}

function hypothesisCell(m: MachineSummary): HTMLElement {
  const top = m.topHypothesis;
  if (!top) return h('span', { class: 'muted' }, 'none');
  return h(
    'span',
    { class: 'hyp' },
    h('span', { class: 'hyp-name' }, faultName(top.fault)),
    h('span', { class: 'hyp-component' }, ` @ ${top.component} `),
    scoreBadge(top.score),
  );
}

function indicatorCell(m: MachineSummary): HTMLElement {
  const main = m.mainIndicator;
  if (!main || main.sparkline.length === 0) return h('span', { class: 'muted' }, 'no history');
  const last = main.sparkline[main.sparkline.length - 1]!.mean;
  const rise = indicatorRise(m);
  const weeks = sparklineWeeks(m);
  const arrow = rise === null ? '' : rise > 0.05 ? '▲' : rise < -0.05 ? '▼' : '▶';
  return h(
    'span',
    { class: 'indicator-cell' },
    sparkline(main.sparkline, `${indicatorName(main.indicator)} of ${m.name}`),
    h('span', { class: 'num' }, `${formatNumber(last)} `, h('span', { class: 'unit' }, main.unit)),
    rise === null
      ? null
      : h(
          'span',
          { class: `rise${rise > 0.2 ? ' rise-strong' : ''}`, title: `weekly mean of the worst point, first week shown against the last (${weeks ?? '?'} weeks apart)` },
          `${arrow} ${rise >= 0 ? '+' : ''}${Math.round(rise * 100)} % in ${weeks ?? '?'} wk`,
        ),
  );
}

export async function renderFleetPage(main: HTMLElement, ctx: AppContext, route: Route): Promise<Cleanup> {
  const machines = await ctx.machines();
  let sortKey: SortKey = (columns.find((c) => c.key === route.params.sort)?.key as SortKey | undefined) ?? 'concern';
  let direction: SortDirection = route.params.dir === 'asc' ? 'asc' : route.params.dir === 'desc' ? 'desc' : sortKey === 'name' || sortKey === 'crossing' ? 'asc' : 'desc';
  const filter: FleetFilter = {
    text: route.params.q ?? '',
    minZone: (['A', 'B', 'C', 'D'] as const).find((z) => z === route.params.zone) ?? null,
    faultsOnly: route.params.faults === '1',
  };

  const inZoneCD = machines.filter((m) => zoneRank(m.worstZone) >= 3).length;
  const withFault = machines.filter((m) => (m.topHypothesis?.score ?? 0) >= faultScoreThreshold).length;
  const alarms = machines.reduce((n, m) => n + m.activeAlarms, 0);
  main.append(
    h(
      'div',
      { class: 'page-head' },
      h('h1', {}, 'Fleet'),
      h(
        'p',
        { class: 'summary', 'data-machines': machines.length },
        h('b', {}, String(machines.length)), ' machines · ',
        h('b', {}, String(inZoneCD)), ' in zone C or D · ',
        h('b', {}, String(withFault)), ` with a fault hypothesis ≥ ${faultScoreThreshold} · `,
        h('b', {}, String(alarms)), ' active alarms',
      ),
    ),
  );

  const search = h('input', { id: 'fleet-filter', type: 'search', value: filter.text, placeholder: 'name, fault or component', autocomplete: 'off' });
  const zoneSelect = h(
    'select',
    { id: 'fleet-zone' },
    h('option', { value: '' }, 'any zone'),
    ...(['B', 'C', 'D'] as Zone[]).map((z) => h('option', { value: z, selected: filter.minZone === z }, `${z} or worse`)),
  );
  const faultsOnly = h('input', { id: 'fleet-faults', type: 'checkbox', checked: filter.faultsOnly });
  const filters = h(
    'form',
    { class: 'toolbar', role: 'search', 'aria-label': 'Filter the fleet', onsubmit: (e: Event) => e.preventDefault() },
    h('span', { class: 'field' }, h('label', { for: 'fleet-filter' }, 'Filter'), search),
    h('span', { class: 'field' }, h('label', { for: 'fleet-zone' }, 'Worst zone'), zoneSelect),
    h('span', { class: 'field check' }, faultsOnly, h('label', { for: 'fleet-faults' }, `Only fault hypotheses (score ≥ ${faultScoreThreshold})`)),
  );
  const count = h('p', { class: 'count', 'aria-live': 'polite' });
  const table = h('table', { class: 'data fleet-table', id: 'fleet-table' });
  const caption = h('caption', { class: 'visually-hidden' }, 'Machines of the site, ordered by concern unless a column is chosen');
  const thead = h('thead');
  const tbody = h('tbody');
  table.append(caption, thead, tbody);

  const ranking = h(
    'section',
    { class: 'panel ranking', id: 'ranking', 'aria-labelledby': 'ranking-title' },
    h('h2', { id: 'ranking-title' }, 'Rising fastest over the last 4 weeks'),
    h('p', { class: 'help' }, 'Per point: the mean of the last 7 days against the mean of the 7 days ending 4 weeks ago. Follows the filter above.'),
  );
  const rankingBody = h('div');
  ranking.append(rankingBody);
  let rankingRows: RankingRow[] | null = null;
  const layout = h('div', { class: 'fleet-layout' }, h('section', { class: 'fleet-main', 'aria-label': 'Machines' }, filters, count, h('div', { class: 'table-scroll' }, table)), ranking);
  main.append(layout);

  const remember = () =>
    ctx.remember(routeHref('fleet', null, { sort: sortKey === 'concern' ? null : sortKey, dir: sortKey === 'concern' && direction === 'desc' ? null : direction, q: filter.text || null, zone: filter.minZone, faults: filter.faultsOnly ? '1' : null }));

  const renderHead = () => {
    clear(thead);
    const row = h('tr');
    for (const col of columns) {
      const active = col.key === sortKey;
      const th = h('th', { scope: 'col', 'aria-sort': active ? (direction === 'asc' ? 'ascending' : 'descending') : 'none', class: col.numeric ? 'num' : null });
      if (col.key) {
        const key = col.key;
        th.append(
          h(
            'button',
            {
              type: 'button',
              class: 'sort',
              'data-sort': key,
              'aria-label': `Sort by ${col.spoken}${active ? (direction === 'asc' ? ', now ascending' : ', now descending') : ''}`,
              onclick: () => {
                if (sortKey === key) direction = direction === 'asc' ? 'desc' : 'asc';
                else {
                  sortKey = key;
                  // names A to Z and the soonest crossing first; the rest worst first
                  direction = key === 'name' || key === 'crossing' ? 'asc' : 'desc';
                }
                remember();
                renderHead();
                renderBody();
              },
            },
            col.label,
            h('span', { class: 'sort-mark', 'aria-hidden': 'true' }, active ? (direction === 'asc' ? ' ↑' : ' ↓') : ' ↕'),
          ),
        );
      } else th.append(col.label);
      row.append(th);
    }
    thead.append(row);
  };

  const renderBody = () => {
    clear(tbody);
    const shown = sortMachines(filterMachines(machines, filter), sortKey, direction);
    count.textContent = shown.length === machines.length ? `${machines.length} machines` : `${shown.length} of ${machines.length} machines shown`;
    for (const m of shown) {
      tbody.append(
        h(
          'tr',
          { 'data-machine-id': m.id, 'data-concern': concernLevel(m) },
          h('td', {}, concernCell(m)),
          h('th', { scope: 'row' }, h('a', { href: routeHref('machine', m.id), class: 'machine-link' }, m.name), h('span', { class: 'id' }, m.id)),
          h('td', {}, zoneBadge(m.worstZone)),
          h('td', {}, hypothesisCell(m)),
          h('td', { title: formatDateTime(m.lastMeasuredAt) }, formatAge(m.lastMeasuredAt)),
          h('td', { class: 'num' }, m.activeAlarms > 0 ? h('span', { class: 'alarm-count' }, `⚠ ${m.activeAlarms}`) : '0'),
          h('td', {}, indicatorCell(m)),
          h('td', {}, crossingCell(m)),
        ),
      );
    }
    if (shown.length === 0) tbody.append(h('tr', {}, h('td', { colspan: columns.length }, message('empty', 'No machine matches the filter.'))));
    renderRanking(new Set(shown.map((m) => m.id)));
  };

  const renderRanking = (shown: ReadonlySet<string>) => {
    if (rankingRows === null) return;
    const names = new Map(machines.map((m) => [m.id, m.name]));
    const unitOf = (r: RankingRow) => {
      const main = machines.find((m) => m.id === r.machineId)?.mainIndicator;
      return main && main.indicator === r.indicator ? ` ${main.unit}` : '';
    };
    const rows = risingRows(rankingRows, shown).slice(0, 8);
    if (rows.length === 0) {
      rankingBody.replaceChildren(message('empty', rankingRows.length === 0 ? 'Not enough history yet.' : 'No machine shown above has an indicator that rose over the last 4 weeks.'));
      return;
    }
    rankingBody.replaceChildren(
      h(
        'table',
        { class: 'data compact', id: 'ranking-table', 'data-rows': rows.length },
        h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Machine'), h('th', { scope: 'col' }, 'Point'), h('th', { scope: 'col' }, 'Indicator'), h('th', { scope: 'col', class: 'num' }, '7-day mean, 4 weeks ago → now'), h('th', { scope: 'col', class: 'num' }, 'Rise in 4 wk'))),
        h(
          'tbody',
          {},
          ...rows.map((r) =>
            h(
              'tr',
              { 'data-machine-id': r.machineId, 'data-rise-percent': r.risePercent.toFixed(1) },
              h('td', {}, h('a', { href: routeHref('machine', r.machineId, { point: r.pointId }) }, names.get(r.machineId) ?? r.machineId)),
              h('td', { class: 'mono' }, r.pointId),
              h('td', {}, indicatorName(r.indicator)),
              h('td', { class: 'num' }, `${formatNumber(r.before)} → ${formatNumber(r.after)}${unitOf(r)}`),
              h('td', { class: 'num' }, `+${Math.round(r.risePercent)} %`),
            ),
          ),
        ),
      ),
    );
  };

  search.addEventListener('input', () => {
    filter.text = search.value;
    remember();
    renderBody();
  });
  zoneSelect.addEventListener('change', () => {
    filter.minZone = (zoneSelect.value || null) as Zone | null;
    remember();
    renderBody();
  });
  faultsOnly.addEventListener('change', () => {
    filter.faultsOnly = faultsOnly.checked;
    remember();
    renderBody();
  });
  renderHead();
  renderBody();

  // The ranking is a help, not a requirement: the fleet stays usable if it fails.
  ctx.api
    .get<RankingRow[]>('/api/v1/fleet/ranking', { weeks: 4, limit: 50 })
    .then((rows) => {
      rankingRows = rows;
      renderRanking(new Set(filterMachines(machines, filter).map((m) => m.id)));
    })
    .catch(() => rankingBody.replaceChildren(message('note', 'The ranking is not available.')));

  return () => {};
}
