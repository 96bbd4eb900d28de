import { ApiProblem } from '../api-client.js';
import type { AnalysisSummary, RecordingAnalysis, RecordingMeta, UploadResult } from '../api-types.js';
import type { AppContext, Cleanup } from '../app-context.js';
import { clear, h, message } from '../dom.js';
import { faultName, formatFixed } from '../format.js';
import { routeHref, type Route } from '../route.js';
import { isQueued, summaryOfAnalysis } from '../upload-summary.js';
import { utcFromInput } from '../utc-time.js';
import { scoreBadge, zoneBadge } from '../zone-badge.js';

// Upload: drop one or more recordings (WAV, CSV, JSON, raw float32) onto a point; each file gets
// its own progress bar (XMLHttpRequest upload progress), then its analysis summary.

/**
 * Where the speed came from, in words: the analysis calls both a speed given at upload and the model's nominal
 * speed it fell back to 'given'; the page knows whether one was given.
 */
export function speedSourceText(source: string | null, speedGiven: boolean): string {
  if (source === 'given') return speedGiven ? 'as given' : 'the model’s nominal: not found in the spectrum';
  return source ?? '–';
}

function formatBytes(n: number): string {
  return n < 1024 ? `${n} B` : n < 1024 ** 2 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1024 ** 2).toFixed(1)} MiB`;
}

/** The summary's hypotheses: those at 0.5 or more as faults, the weaker ones folded away. */
function hypothesisList(a: AnalysisSummary): HTMLElement {
  const item = (x: AnalysisSummary['topHypotheses'][number]) =>
    h('li', {}, scoreBadge(x.score), ` ${faultName(x.fault)} @ ${x.component}`, h('span', { class: 'muted' }, ` — ${x.reason}`));
  const faults = a.topHypotheses.filter((x) => x.score >= 0.5);
  const weaker = a.topHypotheses.filter((x) => x.score < 0.5);
  return h(
    'div',
    { class: 'upload-hyps-box' },
    faults.length ? h('ul', { class: 'upload-hyps', 'aria-label': 'Fault hypotheses' }, ...faults.map(item)) : h('p', { class: 'muted' }, 'No fault hypothesis reaches 0.5.'),
    weaker.length ? h('details', {}, h('summary', {}, `Weaker hypotheses (${weaker.length})`), h('ul', { class: 'upload-hyps' }, ...weaker.map(item))) : null,
  );
}

export async function renderUploadPage(main: HTMLElement, ctx: AppContext, route: Route): Promise<Cleanup> {
  const machines = await ctx.machines();
  const aborts = new Set<() => void>();
  main.append(
    h(
      'div',
      { class: 'page-head' },
      h('h1', {}, 'Upload recordings'),
      h('p', { class: 'meta' }, 'WAV, CSV, JSON or raw float32 files from a field instrument. Each file is stored once (a repeated upload returns the first result) and analysed against the machine model current at its recording time.'),
    ),
    h(
      'aside',
      { class: 'safety', role: 'note', 'aria-label': 'Safety note' },
      h('strong', {}, 'Safety. '),
      'Recordings are taken under the site’s lock-out/tag-out and guarding rules; never remove a guard from a running machine to place a sensor.',
    ),
  );
  if (machines.length === 0) {
    main.append(message('empty', 'No machines on this site to upload to.'));
    return () => {};
  }

  const machineSelect = h('select', { id: 'up-machine', name: 'machine' }, ...machines.map((m) => h('option', { value: m.id, selected: m.id === route.params.machine }, m.name)));
  const pointSelect = h('select', { id: 'up-point', name: 'point' });
  const speedInput = h('input', { id: 'up-speed', name: 'speedRpm', type: 'number', min: 0, step: 'any', placeholder: 'from tach or spectrum', inputmode: 'decimal' });
  const rateInput = h('input', { id: 'up-rate', name: 'sampleRateHz', type: 'number', min: 1, step: 'any', placeholder: 'WAV: from the file', inputmode: 'decimal' });
  const unitInput = h('input', { id: 'up-unit', name: 'unit', type: 'text', placeholder: 'e.g. g, m/s^2, mm/s', autocomplete: 'off' });
  const recordedAtInput = h('input', { id: 'up-recorded-at', name: 'recordedAt', type: 'datetime-local', step: 1 });
  const channelInput = h('input', { id: 'up-channel', name: 'channel', type: 'text', placeholder: 'first vibration channel', autocomplete: 'off', size: 14 });
  const fileInput = h('input', { id: 'up-files', name: 'file', type: 'file', multiple: true, accept: '.wav,.csv,.json,.bin,.f32,audio/wav,text/csv,application/json,application/octet-stream', class: 'visually-hidden-file' });
  const drop = h(
    'div',
    { class: 'dropzone', id: 'dropzone', 'data-state': 'idle' },
    h('p', { class: 'drop-title' }, 'Drop recordings here'),
    h('p', {}, 'or ', h('label', { for: 'up-files', class: 'button-like' }, 'choose files…'), fileInput),
    h('p', { class: 'help', id: 'drop-target' }),
  );
  const list = h('ol', { class: 'upload-list', id: 'upload-list', 'aria-live': 'polite' });
  main.append(
    h(
      'form',
      { class: 'toolbar upload-form', 'aria-label': 'Where the recordings go', onsubmit: (e: Event) => e.preventDefault() },
      h('span', { class: 'field' }, h('label', { for: 'up-machine' }, 'Machine'), machineSelect),
      h('span', { class: 'field' }, h('label', { for: 'up-point' }, 'Point'), pointSelect),
      h('span', { class: 'field' }, h('label', { for: 'up-speed' }, 'Speed (rpm, optional)'), speedInput),
      h('span', { class: 'field' }, h('label', { for: 'up-rate' }, 'Sample rate (Hz, CSV/raw)'), rateInput),
      h('span', { class: 'field' }, h('label', { for: 'up-unit' }, 'Unit (if the file states none)'), unitInput),
      h('span', { class: 'field' }, h('label', { for: 'up-recorded-at' }, 'Recorded at (UTC, optional)'), recordedAtInput),
      h('span', { class: 'field' }, h('label', { for: 'up-channel' }, 'Channel to analyse (number from 1 or name)'), channelInput),
    ),
    h('p', { class: 'help' }, 'Left empty: the time is taken from the file’s metadata, else the time of upload; the unit from the file, else the point’s (the card says so); the speed from a tach or the spectrum.'),
    drop,
    list,
  );

  const setTarget = () => {
    document.getElementById('drop-target')!.textContent = `Files go to ${machineSelect.selectedOptions[0]?.textContent ?? ''} · point ${pointSelect.value || '–'}.`;
    ctx.remember(routeHref('upload', null, { machine: machineSelect.value, point: pointSelect.value }));
  };
  const loadPoints = async () => {
    const machine = await ctx.machine(machineSelect.value);
    clear(pointSelect);
    const sensors = machine.points.filter((p) => p.quantity !== 'tach' && p.quantity !== 'encoder');
    for (const p of sensors.length ? sensors : machine.points) pointSelect.append(h('option', { value: p.id, selected: p.id === route.params.point }, `${p.id} · ${p.quantity}`));
    setTarget();
  };
  machineSelect.addEventListener('change', () => void loadPoints());
  pointSelect.addEventListener('change', setTarget);
  await loadPoints();

  const uploadOne = (file: File) => {
    const machineId = machineSelect.value;
    const pointId = pointSelect.value;
    const progress = h('progress', { max: 100, value: 0, 'aria-label': `Upload progress of ${file.name}` });
    const status = h('span', { class: 'upload-status' }, 'waiting');
    const result = h('div', { class: 'upload-result' });
    const item = h('li', { class: 'upload-item', 'data-file': file.name, 'data-state': 'uploading' }, h('div', { class: 'upload-line' }, h('b', {}, file.name), h('span', { class: 'muted' }, ` ${formatBytes(file.size)} → ${pointId}`), progress, status), result);
    list.prepend(item);
    const speedGiven = speedInput.value !== '';
    const recordedAt = recordedAtInput.value ? utcFromInput(recordedAtInput.value) : null;
    const handle = ctx.api.upload<UploadResult>(
      `/api/v1/machines/${encodeURIComponent(machineId)}/points/${encodeURIComponent(pointId)}/recordings`,
      file,
      (p) => {
        const pct = p.totalBytes ? Math.round((100 * p.loadedBytes) / p.totalBytes) : 0;
        progress.value = pct;
        status.textContent = pct >= 100 ? 'analysing…' : `${pct} %`;
      },
      {
        speedRpm: speedInput.value || undefined,
        sampleRateHz: rateInput.value || undefined,
        unit: unitInput.value.trim() || undefined,
        recordedAt: recordedAt ?? undefined,
        channel: channelInput.value.trim() || undefined,
      },
    );
    aborts.add(handle.abort);
    const showSummary = (r: UploadResult, a: AnalysisSummary) => {
      item.dataset.state = 'done';
      status.textContent = r.duplicate ? 'already stored: first result shown' : 'analysed';
      const channels = a.channels ?? [];
      const analysed = a.analysedChannel ? channels[a.analysedChannel - 1] : undefined;
      result.append(
        h(
          'div',
          { class: 'upload-summary', 'data-analysis-id': a.analysisId },
          zoneBadge(a.zone),
          h('span', { class: 'num' }, ` ${formatFixed(a.velocityRmsMmPerS, 2)} mm/s RMS`),
          h('span', { class: 'upload-speed', 'data-speed-source': a.speedSource ?? '' }, ` · speed ${a.speedHz ? `${formatFixed(a.speedHz * 60, 1)} rpm (${speedSourceText(a.speedSource, speedGiven)})` : 'unknown'}`),
          channels.length > 1 && analysed ? h('span', { class: 'upload-channel' }, ` · channel ${a.analysedChannel} '${analysed.name}' of ${channels.length} analysed (${channels.map((c, i) => `${i + 1} '${c.name}'`).join(', ')}; choose another above and upload again)`) : null,
          ' · ',
          h('a', { href: routeHref('machine', machineId, { point: pointId, recording: r.recordingId }) }, 'open the analysis'),
        ),
        hypothesisList(a),
      );
      if (a.warnings?.length) result.insertBefore(h('ul', { class: 'warnings upload-warnings', 'aria-label': `What was assumed for ${file.name}` }, ...a.warnings.map((w) => h('li', {}, `⚠ ${w}`))), result.lastChild);
    };
    // 202: the recording is stored and its analysis queued behind others (the demo's, another upload's): ask
    // for it every second or two until it is stored or refused (a problem, shown as any other), for ten minutes
    // at most; the card says so meanwhile
    const awaitAnalysis = async (r: UploadResult): Promise<AnalysisSummary | null> => {
      item.dataset.state = 'queued';
      status.textContent = 'stored; analysis queued…';
      const path = `/api/v1/recordings/${encodeURIComponent(r.recordingId)}`;
      const deadline = Date.now() + 600_000;
      for (let attempt = 0; Date.now() < deadline; attempt++) {
        const body = await ctx.api.get<RecordingAnalysis | { analysisState: 'queued' }>(`${path}/analysis`);
        if (!isQueued(body)) return summaryOfAnalysis(body as RecordingAnalysis, await ctx.api.get<RecordingMeta>(path));
        await new Promise((resolve) => setTimeout(resolve, Math.min(2_000, 500 + 250 * attempt)));
      }
      return null;
    };
    handle.result
      .then(async (r) => {
        progress.value = 100;
        item.dataset.recordingId = r.recordingId;
        const a = r.analysis ?? (await awaitAnalysis(r));
        if (a) showSummary(r, a);
        else {
          status.textContent = 'stored; analysis still queued';
          result.append(message('note', 'The recording is stored; its analysis is still waiting for a worker and will appear on the machine page.'));
        }
      })
      .catch((err: unknown) => {
        item.dataset.state = 'failed';
        status.textContent = 'failed';
        result.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
        if (err instanceof ApiProblem) for (const e of err.errors) result.append(message('error', `${e.path}: ${e.message}`));
      })
      .finally(() => aborts.delete(handle.abort));
  };
  const uploadAll = (files: FileList | File[]) => {
    if (!pointSelect.value) {
      list.prepend(h('li', {}, message('error', 'Choose a point first.')));
      return;
    }
    for (const f of Array.from(files)) uploadOne(f);
  };

  fileInput.addEventListener('change', () => {
    if (fileInput.files?.length) uploadAll(fileInput.files);
    fileInput.value = '';
  });
  drop.addEventListener('dragover', (e) => {
    e.preventDefault();
    drop.dataset.state = 'over';
  });
  drop.addEventListener('dragleave', () => (drop.dataset.state = 'idle'));
  drop.addEventListener('drop', (e) => {
    e.preventDefault();
    drop.dataset.state = 'idle';
    if (e.dataTransfer?.files.length) uploadAll(e.dataTransfer.files);
  });
  // Dropping a file anywhere else must not navigate away from the console.
  const swallow = (e: DragEvent) => e.preventDefault();
  window.addEventListener('dragover', swallow);
  window.addEventListener('drop', swallow);

  return () => {
    window.removeEventListener('dragover', swallow);
    window.removeEventListener('drop', swallow);
    // uploads keep running in the background if the user navigates away; nothing to abort
    aborts.clear();
  };
}
