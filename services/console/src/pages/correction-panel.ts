import { ApiProblem } from '../api-client.js';
import type { AuditEntry, MachineDetail, RecordingMeta } from '../api-types.js';
import type { AppContext } from '../app-context.js';
import { clear, h, message, uid } from '../dom.js';
import { formatDateTime, formatFixed } from '../format.js';
import { utcInputValue, utcFromInput } from '../utc-time.js';

// Corrections of a stored recording: move it to the point or time it really belongs to, or delete one
// uploaded by mistake. The service re-files its trends and alarms; each change lands in the audit log,
// which the machine page lists below its alarms.

export function describeEntry(e: AuditEntry): string {
  const from = `${e.before.machineId} / ${e.before.pointId} at ${formatDateTime(e.before.recordedAt)}`;
  const what = e.action === 'delete' ? `deleted the recording of ${from}` : `moved the recording of ${from} to ${e.after!.machineId} / ${e.after!.pointId} at ${formatDateTime(e.after!.recordedAt)}`;
  return `${formatDateTime(e.at)} · ${e.by} ${what}${e.reason ? ` · “${e.reason}”` : ''}`;
}

/** The "Correct this recording" fold under the recording list. `onDone` reloads the page's point. */
export function renderCorrectionForm(host: HTMLElement, ctx: AppContext, recording: RecordingMeta, onDone: (entry: AuditEntry) => void): void {
  clear(host);
  const ids = { machine: uid('move-machine'), point: uid('move-point'), at: uid('move-at'), reason: uid('fix-reason'), confirm: uid('delete-confirm') };
  const machineSelect = h('select', { id: ids.machine });
  const pointSelect = h('select', { id: ids.point });
  const atInput = h('input', { id: ids.at, type: 'datetime-local', step: 1, value: utcInputValue(recording.recordedAt), required: true });
  const reasonInput = h('input', { id: ids.reason, type: 'text', maxlength: 500, placeholder: 'e.g. logger was on the fan, not the pump', autocomplete: 'off' });
  const confirm = h('input', { id: ids.confirm, type: 'checkbox' });
  const moveButton = h('button', { type: 'submit', class: 'primary small', id: 'move-recording' }, 'Move');
  const deleteButton = h('button', { type: 'button', class: 'danger small', id: 'delete-recording', disabled: true }, 'Delete recording');
  const outcome = h('div', { class: 'correction-outcome', 'aria-live': 'polite' });
  const form = h(
    'form',
    { class: 'correction-form', 'aria-label': 'Move or delete this recording' },
    h('p', { class: 'help' }, `Filed under ${recording.machineId} / ${recording.pointId}, ${formatDateTime(recording.recordedAt)} (${recording.sourceFormat}, ${recording.channels} channel${recording.channels === 1 ? '' : 's'}). Each change is kept in the audit log with your key's name.`),
    h('span', { class: 'field' }, h('label', { for: ids.machine }, 'Machine'), machineSelect),
    h('span', { class: 'field' }, h('label', { for: ids.point }, 'Point'), pointSelect),
    h('span', { class: 'field' }, h('label', { for: ids.at }, 'Recorded at (UTC)'), atInput),
    h('span', { class: 'field' }, h('label', { for: ids.reason }, 'Reason (kept in the log)'), reasonInput),
    h('div', { class: 'correction-actions' }, moveButton),
    h('div', { class: 'correction-delete' }, h('span', { class: 'check' }, confirm, h('label', { for: ids.confirm }, 'I want to delete this recording, its analyses and trend values')), deleteButton),
    outcome,
  );
  host.append(h('details', { class: 'correction', id: 'correction' }, h('summary', {}, 'Correct this recording (move or delete)'), form));

  const fillPoints = async () => {
    let m: MachineDetail;
    try {
      m = await ctx.machine(machineSelect.value);
    } catch {
      return;
    }
    clear(pointSelect);
    for (const p of m.points.filter((q) => q.quantity !== 'tach' && q.quantity !== 'encoder')) {
      pointSelect.append(h('option', { value: p.id, selected: m.id === recording.machineId && p.id === recording.pointId }, `${p.id} · ${p.quantity}${p.unit ? ` (${p.unit})` : ''}`));
    }
  };
  void ctx.machines().then(async (machines) => {
    for (const m of machines) machineSelect.append(h('option', { value: m.id, selected: m.id === recording.machineId }, m.name));
    await fillPoints();
  });
  machineSelect.addEventListener('change', () => void fillPoints());
  confirm.addEventListener('change', () => (deleteButton.disabled = !confirm.checked));

  // the page reloads the point after a change, which redraws this form: the page shows the outcome itself
  const done = (entry: AuditEntry) => {
    clear(outcome);
    onDone(entry);
  };
  const failed = (err: unknown) => {
    clear(outcome);
    outcome.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
  };

  form.addEventListener('submit', (e) => {
    e.preventDefault();
    const at = utcFromInput(atInput.value);
    const body: Record<string, string> = { reason: reasonInput.value.trim() };
    if (!pointSelect.value) {
      failed(new Error('The points of that machine are still loading; try again in a moment.'));
      return;
    }
    if (machineSelect.value && machineSelect.value !== recording.machineId) body.machineId = machineSelect.value;
    if (pointSelect.value !== recording.pointId || body.machineId) body.pointId = pointSelect.value;
    if (at && at !== new Date(recording.recordedAt).toISOString()) body.recordedAt = at;
    if (!body.pointId && !body.recordedAt) {
      failed(new Error('Choose another point or time first: the recording is already filed there.'));
      return;
    }
    moveButton.disabled = true;
    ctx.api
      .patch<{ audit: AuditEntry }>(`/api/v1/recordings/${encodeURIComponent(recording.id)}`, body)
      .then((r) => done(r.audit), failed)
      .finally(() => (moveButton.disabled = false));
  });
  deleteButton.addEventListener('click', () => {
    if (!confirm.checked) return;
    deleteButton.disabled = true;
    ctx.api
      .delete<{ audit: AuditEntry }>(`/api/v1/recordings/${encodeURIComponent(recording.id)}`, { reason: reasonInput.value.trim() })
      .then((r) => done(r.audit), (err) => {
        deleteButton.disabled = false;
        failed(err);
      });
  });
}

/** The machine's corrections, newest first. */
export async function renderAuditPanel(host: HTMLElement, ctx: AppContext, machineId: string): Promise<void> {
  let entries: AuditEntry[];
  try {
    entries = await ctx.api.get<AuditEntry[]>('/api/v1/audit', { machine: machineId, limit: 50 });
  } catch (err) {
    host.replaceChildren(message('error', err instanceof ApiProblem ? err.message : String(err)));
    return;
  }
  const section = h('section', { class: 'panel audit', id: 'audit-panel', 'aria-labelledby': 'audit-title', 'data-entries': entries.length }, h('h2', { id: 'audit-title' }, 'Corrections (audit log)'));
  if (entries.length === 0) section.append(message('empty', 'No recording of this machine has been moved or deleted.'));
  else {
    section.append(
      h(
        'table',
        { class: 'data compact' },
        h('thead', {}, h('tr', {}, ...['When (local)', 'Who', 'What', 'Before', 'After', 'Why'].map((t) => h('th', { scope: 'col' }, t)))),
        h(
          'tbody',
          {},
          ...entries.map((e) =>
            h(
              'tr',
              { 'data-audit-id': e.id, 'data-action': e.action, 'data-recording-id': e.recordingId },
              h('td', {}, formatDateTime(e.at)),
              h('td', {}, e.by),
              h('td', {}, e.action === 'delete' ? 'deleted' : 'moved'),
              h('td', {}, `${e.before.machineId} / ${e.before.pointId}, ${formatDateTime(e.before.recordedAt)}`, e.before.velocityRmsMmPerS !== null ? h('span', { class: 'muted' }, ` (${formatFixed(e.before.velocityRmsMmPerS, 2)} mm/s, zone ${e.before.zone ?? '–'})`) : null),
              h('td', {}, e.after ? `${e.after.machineId} / ${e.after.pointId}, ${formatDateTime(e.after.recordedAt)}` : '–'),
              h('td', {}, e.reason || h('span', { class: 'muted' }, 'no reason given')),
            ),
          ),
        ),
      ),
    );
  }
  host.replaceChildren(section);
}
