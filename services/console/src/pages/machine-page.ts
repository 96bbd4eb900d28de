import { ApiProblem } from '../api-client.js';
import type { MachineDetail, MeasurementPoint, RecordingAnalysis, RecordingMeta, RecordingRow } from '../api-types.js';
import type { AppContext, Cleanup } from '../app-context.js';
import { clear, h, message, uid } from '../dom.js';
import { faultName, formatDateTime, formatFixed, formatNumber } from '../format.js';
import { landingPoint, type PointLatest } from '../landing-point.js';
import { routeHref, type Route } from '../route.js';
import type { Quantity } from '../spectrum-quantity.js';
import { isQueued } from '../upload-summary.js';
import { zoneBadge } from '../zone-badge.js';
import { renderAlarmPanel } from './alarm-panel.js';
import { renderAnalysisView, type AnalysisViewState } from './analysis-view.js';
import { describeEntry, renderAuditPanel, renderCorrectionForm } from './correction-panel.js';
import { renderDevelopingPanel } from './developing-panel.js';
import { renderTrendPanel } from './trend-panel.js';

// Machine: its points; for the chosen point its recordings, the chosen recording's analysis, the
// point's trends; the machine's alarms and corrections. Choices are kept in the URL so a view can be
// shared. Without a point in the URL the page opens on the point whose newest recording is worst.

export function safetyNote(): HTMLElement {
  return h(
    'aside',
    { class: 'safety', role: 'note', 'aria-label': 'Safety note' },
    h('strong', {}, 'Safety. '),
    'A diagnosis here supports, and never replaces, the judgement of a qualified engineer. ',
    'Work on the machine, mounting or moving sensors included, follows the site’s lock-out/tag-out and guarding rules, the maker’s limits and local codes; ',
    'a machine in zone D or with a trip alarm is assessed on site before it keeps running.',
  );
}

const isVibration = (p: MeasurementPoint) => p.quantity !== 'tach' && p.quantity !== 'encoder';

function pointLabel(p: MeasurementPoint): string {
  const where = [p.near ? `near ${p.near}` : null, p.shaft ? `on ${p.shaft}` : null, p.direction ?? null].filter(Boolean).join(', ');
  return `${p.id} · ${p.quantity}${p.unit ? ` (${p.unit})` : ''}${where ? ` · ${where}` : ''}`;
}

function recordingLabel(r: RecordingRow): string {
  const top = r.topHypothesis && r.topHypothesis.score >= 0.5 ? ` · ${faultName(r.topHypothesis.fault)} ${r.topHypothesis.score.toFixed(2)}` : '';
  return `${formatDateTime(r.recordedAt)} · ${r.velocityRmsMmPerS !== null ? `${formatFixed(r.velocityRmsMmPerS, 2)} mm/s` : '–'} · zone ${r.zone ?? '–'}${top}`;
}

export async function renderMachinePage(main: HTMLElement, ctx: AppContext, route: Route): Promise<Cleanup> {
  const machineId = route.id!;
  let machine: MachineDetail;
  try {
    machine = await ctx.machine(machineId);
  } catch (err) {
    if (err instanceof ApiProblem && err.status === 404) {
      main.append(h('h1', {}, 'Machine not found'), message('error', `No machine “${machineId}” on this site.`), h('p', {}, h('a', { href: '#/fleet' }, 'Back to the fleet')));
      return () => {};
    }
    throw err;
  }
  const cleanups: Cleanup[] = [];
  const vibrationPoints = machine.points.filter(isVibration);
  const pointsPath = (p: string) => `/api/v1/machines/${encodeURIComponent(machineId)}/points/${encodeURIComponent(p)}/recordings`;

  // the newest recording of every vibration point: the landing choice and a zone beside each point
  const latest = new Map<string, PointLatest>();
  await Promise.all(
    vibrationPoints.map(async (p) => {
      try {
        const [r] = await ctx.api.get<RecordingRow[]>(pointsPath(p.id), { limit: 1 });
        if (r) latest.set(p.id, { pointId: p.id, zone: r.zone, velocityRmsMmPerS: r.velocityRmsMmPerS, topHypothesis: r.topHypothesis });
      } catch {
        // the point's own load below reports the error
      }
    }),
  );
  const landing = route.params.point ? null : landingPoint([...latest.values()]);
  const state = {
    point: machine.points.find((p) => p.id === route.params.point)?.id ?? landing?.pointId ?? vibrationPoints[0]?.id ?? machine.points[0]?.id ?? null,
    recording: (route.params.recording ?? null) as string | null,
    view: {
      hypothesis: route.params.hypothesis ?? landing?.hypothesis ?? null,
      logY: route.params.scale === 'log' ? true : route.params.scale === 'linear' ? false : null,
      quantity: (route.params.quantity === 'velocity' || route.params.quantity === 'acceleration' ? route.params.quantity : null) as Quantity | null,
    } as AnalysisViewState,
  };
  const remember = () =>
    ctx.remember(
      routeHref('machine', machineId, {
        point: state.point,
        recording: state.recording,
        hypothesis: state.view.hypothesis,
        scale: state.view.logY === null ? null : state.view.logY ? 'log' : 'linear',
        quantity: state.view.quantity,
      }),
    );

  main.append(
    h(
      'div',
      { class: 'page-head compact' },
      h('p', { class: 'crumbs' }, h('a', { href: '#/fleet' }, 'Fleet'), ' /'),
      h('h1', { 'data-machine-id': machine.id }, machine.name),
      h(
        'p',
        { class: 'meta' },
        h('span', { class: 'id' }, machine.id),
        ` · model version ${machine.modelVersion ?? '–'} · ${machine.points.length} point${machine.points.length === 1 ? '' : 's'} · `,
        h('a', { href: routeHref('signatures', null, { machine: machine.id }) }, 'signature explorer'),
        ' · ',
        h('a', { href: routeHref('upload', null, { machine: machine.id, point: state.point }), id: 'upload-link' }, 'upload recordings'),
        landing ? h('span', { class: 'landing-note', id: 'landing-note' }, ` · opened on ${landing.pointId}, the point whose newest recording is worst`) : null,
      ),
    ),
    safetyNote(),
  );

  const pointsBox = h('fieldset', { class: 'panel points', id: 'points' }, h('legend', {}, 'Measurement points'));
  const recordingId = uid('recording');
  const recordingSelect = h('select', { id: recordingId, class: 'recording-select' });
  const correctionHost = h('div', { class: 'correction-host' });
  const correctionDone = h('p', { class: 'msg msg-note', id: 'correction-done', role: 'status', hidden: true });
  const recordingsBox = h(
    'div',
    { class: 'panel recordings' },
    h('label', { for: recordingId, class: 'block-label' }, 'Recording'),
    recordingSelect,
    h('p', { class: 'help', id: 'recording-count' }),
    correctionDone,
    correctionHost,
  );
  const developingHost = h('div', { class: 'machine-developing' });
  const side = h('div', { class: 'machine-side' }, pointsBox, recordingsBox, developingHost);
  const analysisHost = h('div', { class: 'machine-analysis', id: 'analysis-host', 'aria-live': 'polite' });
  const trendsHost = h('div', { class: 'machine-trends' });
  const alarmsHost = h('div', { class: 'machine-alarms' });
  const auditHost = h('div', { class: 'machine-audit' });
  main.append(h('div', { class: 'machine-layout' }, side, analysisHost), trendsHost, alarmsHost, auditHost);

  if (machine.points.length === 0) pointsBox.append(message('empty', 'This machine has no measurement points.'));
  for (const p of machine.points) {
    const id = uid('point');
    const input = h('input', { type: 'radio', name: 'point', id, value: p.id, checked: p.id === state.point });
    input.addEventListener('change', () => {
      if (!input.checked) return;
      state.point = p.id;
      state.recording = null;
      remember();
      const link = document.getElementById('upload-link') as HTMLAnchorElement | null;
      if (link) link.href = routeHref('upload', null, { machine: machine.id, point: p.id });
      void loadPoint();
    });
    // alarm and trip levels are velocity levels: they mean nothing on a tach or encoder point
    const levels = isVibration(p)
      ? [p.alarmLevel ? `alarm ${formatNumber(p.alarmLevel)} mm/s` : null, p.tripLevel ? `trip ${formatNumber(p.tripLevel)} mm/s` : null].filter(Boolean).join(' · ')
      : '';
    const now = latest.get(p.id);
    pointsBox.append(
      h(
        'div',
        { class: 'radio point-option', 'data-point-id': p.id, 'data-zone': now?.zone ?? '' },
        input,
        h(
          'label',
          { for: id },
          pointLabel(p),
          now ? h('span', { class: 'point-now' }, zoneBadge(now.zone), ` ${formatFixed(now.velocityRmsMmPerS, 2)} mm/s newest`) : null,
          levels ? h('span', { class: 'levels' }, levels) : null,
        ),
      ),
    );
  }

  let analysisCleanup: Cleanup | null = null;
  let trendCleanup: Cleanup | null = null;
  let loadToken = 0;

  const showAnalysis = async (recording: RecordingRow | undefined, token: number) => {
    analysisCleanup?.();
    analysisCleanup = null;
    clear(analysisHost);
    clear(correctionHost);
    if (!recording) {
      analysisHost.append(message('empty', 'No recording on this point yet. Upload one from the Upload page.'));
      return;
    }
    analysisHost.append(message('note', 'Loading the analysis…'));
    let analysis: RecordingAnalysis;
    let meta: RecordingMeta | null = null;
    try {
      [analysis, meta] = await Promise.all([
        ctx.api.get<RecordingAnalysis>(`/api/v1/recordings/${encodeURIComponent(recording.id)}/analysis`),
        ctx.api.get<RecordingMeta>(`/api/v1/recordings/${encodeURIComponent(recording.id)}`).catch(() => null),
      ]);
    } catch (err) {
      if (token !== loadToken) return;
      clear(analysisHost);
      analysisHost.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
      return;
    }
    if (token !== loadToken) return;
    clear(analysisHost);
    if (isQueued(analysis)) {
      // stored, its analysis still waiting in the queue (202): say so rather than draw nothing
      analysisHost.append(message('note', 'This recording is stored; its analysis is still queued (behind the demo’s or other uploads). Choose the point again in a moment.'));
    } else {
      analysisCleanup = renderAnalysisView(analysisHost, analysis, state.view, (s) => {
        state.view = s;
        remember();
      }, meta);
    }
    if (meta) {
      renderCorrectionForm(correctionHost, ctx, meta, (entry) => {
        correctionDone.hidden = false;
        correctionDone.dataset.action = entry.action;
        correctionDone.textContent = `Done: ${describeEntry(entry)}.`;
        // the recording left this point or this time: show the point again, and the log
        state.recording = entry.action === 'move' && entry.after?.pointId === state.point ? entry.recordingId : null;
        void loadPoint();
        void loadAudit();
      });
    }
  };

  const loadPoint = async () => {
    const token = ++loadToken;
    trendCleanup?.();
    trendCleanup = null;
    clear(trendsHost);
    clear(recordingSelect);
    if (!state.point) return;
    const pointId = state.point;
    trendCleanup = renderTrendPanel(trendsHost, ctx, machineId, pointId);
    let recordings: RecordingRow[];
    try {
      recordings = await ctx.api.get<RecordingRow[]>(pointsPath(pointId), { limit: 100 });
    } catch (err) {
      if (token !== loadToken) return;
      clear(analysisHost);
      analysisHost.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
      return;
    }
    if (token !== loadToken) return;
    for (const r of recordings) recordingSelect.append(h('option', { value: r.id, selected: r.id === state.recording }, recordingLabel(r)));
    document.getElementById('recording-count')!.textContent = recordings.length ? `${recordings.length} recordings, newest first${recordings.length === 100 ? ' (latest 100)' : ''}.` : 'No recordings.';
    const chosen = recordings.find((r) => r.id === state.recording) ?? recordings[0];
    if (chosen) {
      recordingSelect.value = chosen.id;
      state.recording = chosen.id;
    }
    remember();
    await showAnalysis(chosen, token);
  };

  recordingSelect.addEventListener('change', () => {
    state.recording = recordingSelect.value;
    remember();
    const token = ++loadToken;
    void showAnalysis({ id: recordingSelect.value } as RecordingRow, token);
  });

  const loadAudit = () => renderAuditPanel(auditHost, ctx, machineId);
  cleanups.push(() => analysisCleanup?.(), () => trendCleanup?.());
  void renderAlarmPanel(alarmsHost, ctx, machineId);
  void loadAudit();
  let alive = true;
  cleanups.push(() => (alive = false));
  void renderDevelopingPanel(developingHost, ctx, machineId, machine.points, () => alive);
  await loadPoint();
  return () => {
    loadToken += 1;
    for (const c of cleanups) c();
  };
}
