import { ApiProblem } from '../api-client.js';
import type { Alarm } from '../api-types.js';
import type { AppContext } from '../app-context.js';
import { clear, h, message } from '../dom.js';
import { formatDateTime, formatNumber, indicatorName } from '../format.js';

// The machine's alarms, newest first; an active, unacknowledged alarm has an Acknowledge button.

export async function renderAlarmPanel(host: HTMLElement, ctx: AppContext, machineId: string): Promise<void> {
  const section = h('section', { class: 'panel alarms', 'aria-labelledby': 'alarms-title', id: 'alarm-panel' }, h('h2', { id: 'alarms-title' }, 'Alarms'));
  host.append(section);
  const body = h('div');
  section.append(body);

  const load = async () => {
    let alarms: Alarm[];
    try {
      alarms = (await ctx.api.get<Alarm[]>('/api/v1/alarms', { state: 'all' })).filter((a) => a.machineId === machineId);
    } catch (err) {
      clear(body);
      body.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
      return;
    }
    clear(body);
    alarms.sort((a, b) => (a.clearedAt ? 1 : 0) - (b.clearedAt ? 1 : 0) || b.raisedAt.localeCompare(a.raisedAt));
    const active = alarms.filter((a) => !a.clearedAt).length;
    section.dataset.active = String(active);
    if (alarms.length === 0) {
      body.append(message('empty', 'No alarms raised on this machine.'));
      return;
    }
    // every open alarm, then the ten most recently cleared
    const shown = [...alarms.filter((a) => !a.clearedAt), ...alarms.filter((a) => a.clearedAt).slice(0, 10)];
    const rows = shown.map((a) => {
      const state = a.clearedAt ? 'cleared' : a.acknowledgedAt ? 'acknowledged' : 'active';
      const ack = h('button', { type: 'button', class: 'small', 'aria-label': `Acknowledge ${a.level} on ${a.pointId}, ${indicatorName(a.indicator)}` }, 'Acknowledge');
      ack.addEventListener('click', async () => {
        ack.disabled = true;
        try {
          await ctx.api.post(`/api/v1/alarms/${encodeURIComponent(a.id)}/acknowledge`);
          await load();
        } catch (err) {
          ack.disabled = false;
          ack.after(message('error', err instanceof ApiProblem ? err.message : String(err)));
        }
      });
      return h(
        'tr',
        { 'data-alarm-id': a.id, 'data-state': state },
        h('td', {}, h('span', { class: `level level-${a.level}` }, a.level === 'trip' ? '◆ trip' : '▲ alarm')),
        h('td', {}, a.pointId),
        h('td', {}, indicatorName(a.indicator)),
        h('td', { class: 'num', 'data-raised-value': a.value }, `${formatNumber(a.value)} / ${formatNumber(a.threshold)}`),
        h('td', { class: 'num', 'data-current-value': a.currentValue ?? '', title: a.currentAt ? `recorded ${formatDateTime(a.currentAt)}` : '' }, formatNumber(a.currentValue ?? null)),
        h('td', {}, formatDateTime(a.raisedAt)),
        h('td', {}, state === 'active' ? ack : state === 'acknowledged' ? `ack. ${a.acknowledgedBy ?? ''} ${formatDateTime(a.acknowledgedAt)}` : `cleared ${formatDateTime(a.clearedAt)}`),
      );
    });
    body.append(
      h(
        'div',
        { class: 'table-scroll' },
        h(
        'table',
        { class: 'data compact' },
        h('thead', {}, h('tr', {}, ...['Level', 'Point', 'Indicator', 'Raised at / threshold', 'Value now', 'Raised', 'State'].map((t) => h('th', { scope: 'col' }, t)))),
        h('tbody', {}, ...rows),
        ),
      ),
    );
    if (shown.length < alarms.length) body.append(h('p', { class: 'help' }, `${alarms.length - shown.length} older cleared alarms not shown.`));
  };
  await load();
}
