import type { Hypothesis, RecordingAnalysis } from '../api-types.js';
import type { Cleanup } from '../app-context.js';
import { createSpectrumChart, type SpectrumChart } from '../charts/spectrum-chart.js';
import type { XBounds } from '../charts/chart-base.js';
import { clear, h, message, uid } from '../dom.js';
import { faultName, formatDateTime, formatFixed, formatNumber } from '../format.js';
import { chartForDomain, predictedLines, type PredictedLine } from '../predicted-lines.js';
import { convertSpectrum, type Quantity } from '../spectrum-quantity.js';
import { scoreBadge, zoneBadge } from '../zone-badge.js';

// One recording's analysis: overall levels, the hypotheses, the spectrum (plus envelope and order
// spectra when present) with the chosen hypothesis's predicted lines, and its evidence table.

export interface AnalysisViewState {
  hypothesis: string | null;
  logY: boolean;
  quantity: Quantity | null;
}

const hypothesisKey = (h: Hypothesis) => `${h.fault}:${h.component}`;

function radioGroup<T extends string>(name: string, legend: string, options: Array<[T, string]>, value: T, onChange: (v: T) => void): HTMLFieldSetElement {
  const set = h('fieldset', { class: 'radio-group' }, h('legend', {}, legend));
  for (const [v, text] of options) {
    const id = uid(name);
    const input = h('input', { type: 'radio', name, id, value: v, checked: v === value });
    input.addEventListener('change', () => input.checked && onChange(v));
    set.append(h('span', { class: 'radio' }, input, h('label', { for: id }, text)));
  }
  return set;
}

function summaryStrip(a: RecordingAnalysis): HTMLElement {
  const item = (label: string, value: Node | string, attrs: Record<string, string> = {}) => h('div', { class: 'stat', ...attrs }, h('dt', {}, label), h('dd', {}, value));
  const speed = a.speedHz
    ? `${formatFixed(a.speedHz, 3)} Hz · ${formatFixed(a.speedHz * 60, 1)} rpm${a.speedUncertaintyHz ? ` ± ${formatNumber(a.speedUncertaintyHz)} Hz` : ''}`
    : 'unknown';
  return h(
    'dl',
    { class: 'stats', id: 'analysis-stats' },
    item('Velocity RMS', h('span', {}, zoneBadge(a.overall.zone), ` ${formatFixed(a.overall.velocityRmsMmPerS, 2)} mm/s`), { 'data-zone': a.overall.zone ?? '' }),
    item('Band', `${formatNumber(a.overall.bandHz[0])}–${formatNumber(a.overall.bandHz[1])} Hz`),
    item('Speed', `${speed}${a.speedSource ? ` (${a.speedSource})` : ''}`),
    item('Accel. peak', `${formatNumber(a.overall.accelerationPeak)} ${a.overall.accelerationUnit}`),
    item('Crest factor', formatFixed(a.overall.crestFactor, 2)),
    item('Kurtosis', formatFixed(a.overall.kurtosis, 2)),
    a.overall.envelopeRms !== undefined ? item('Envelope RMS', formatNumber(a.overall.envelopeRms)) : null,
    item('Analysed', `${formatDateTime(a.createdAt)} · ${/^\d/.test(a.softwareVersion) ? 'v' : ''}${a.softwareVersion} · model ${a.modelVersion ?? '–'}`),
  );
}

export function renderAnalysisView(host: HTMLElement, a: RecordingAnalysis, state: AnalysisViewState, onState: (s: AnalysisViewState) => void): Cleanup {
  const charts: SpectrumChart[] = [];
  const ranges = new Map<string, XBounds | null>();
  const hypotheses = a.hypotheses ?? [];
  let chosen: Hypothesis | null = hypotheses.find((x) => hypothesisKey(x) === state.hypothesis) ?? hypotheses[0] ?? null;
  let logY = state.logY;
  let quantity: Quantity = state.quantity ?? a.spectrum.quantity;

  const root = h('div', { class: 'analysis', 'data-analysis-id': a.id, 'data-recording-id': a.recordingId, 'data-top-hypothesis': hypotheses[0] ? hypothesisKey(hypotheses[0]) : '' });
  host.append(root);
  root.append(summaryStrip(a));
  if (a.warnings?.length) root.append(h('ul', { class: 'warnings', 'aria-label': 'Analysis warnings' }, ...a.warnings.map((w) => h('li', {}, `⚠ ${w}`))));

  // Hypotheses, strongest first; the chosen one's lines are drawn.
  const hypSection = h('section', { class: 'panel hypotheses', 'aria-labelledby': 'hyp-title' }, h('h2', { id: 'hyp-title' }, 'Hypotheses'));
  const hypBody = h('tbody');
  if (hypotheses.length === 0) {
    hypSection.append(message('empty', 'No hypotheses: the machine has no model for this point, or diagnosis did not run. The spectrum and overall levels stand on their own.'));
  } else {
    hypSection.append(
      h(
        'div',
        { class: 'table-scroll' },
        h(
          'table',
          { class: 'data compact hyp-table' },
          h('thead', {}, h('tr', {}, ...['Draw', 'Fault', 'Component', 'Score', 'Seen in', 'Lines matched', 'Why'].map((t) => h('th', { scope: 'col' }, t)))),
          hypBody,
        ),
      ),
    );
  }

  const controls = h('div', { class: 'toolbar chart-controls' });
  const chartsBox = h('div', { class: 'spectra', id: 'spectra' });
  const evidenceBox = h('section', { class: 'panel evidence', 'aria-labelledby': 'evidence-title' });
  // charts first: the measured spectrum with the lines on it is what the engineer looks at
  root.append(controls, chartsBox, hypSection, evidenceBox);

  // The strongest few are shown; the long tail of near-zero candidates waits behind a button.
  let showAllHypotheses = false;
  const shortList = () => {
    const strong = hypotheses.filter((x) => x.score >= 0.1);
    const n = Math.min(hypotheses.length, Math.max(5, Math.min(strong.length, 10)));
    const list = hypotheses.slice(0, n);
    if (chosen && !list.includes(chosen)) list.push(chosen);
    return list;
  };
  const moreButton = h('button', { type: 'button', class: 'small', id: 'more-hypotheses' });
  moreButton.addEventListener('click', () => {
    showAllHypotheses = !showAllHypotheses;
    renderHypotheses();
  });
  const renderHypotheses = () => {
    clear(hypBody);
    fillDrawSelect();
    const list = showAllHypotheses ? hypotheses : shortList();
    list.forEach((x) => {
      const i = hypotheses.indexOf(x);
      const id = uid('hyp');
      const radio = h('input', { type: 'radio', name: 'draw-hypothesis', id, checked: x === chosen, 'aria-label': `Draw ${faultName(x.fault)} at ${x.component}` });
      radio.addEventListener('change', () => {
        if (!radio.checked) return;
        chosen = x;
        emit();
        // a new hypothesis opens on its own lines, not where the last one was zoomed
        renderCharts(true);
        renderEvidence();
        renderHypotheses();
      });
      const matched = x.evidence.filter((e) => e.matched).length;
      hypBody.append(
        h(
          'tr',
          { class: x === chosen ? 'chosen' : null, 'data-hypothesis': hypothesisKey(x), 'data-rank': i + 1 },
          h('td', {}, radio),
          h('td', {}, h('label', { for: id }, faultName(x.fault))),
          h('td', { class: 'mono' }, x.component),
          h('td', {}, scoreBadge(x.score)),
          h('td', {}, x.domain),
          h('td', { class: 'num' }, `${matched} / ${x.evidence.length}`),
          h('td', { class: 'reason', title: x.reason }, h('span', { class: 'clamp' }, x.reason)),
        ),
      );
    });
    const hidden = hypotheses.length - list.length;
    moreButton.textContent = showAllHypotheses ? 'Show the strongest only' : `Show all ${hypotheses.length} hypotheses (${hidden} more, weaker)`;
    moreButton.hidden = !showAllHypotheses && hidden === 0;
  };

  const emit = () => onState({ hypothesis: chosen ? hypothesisKey(chosen) : null, logY, quantity });

  const drawSelectId = uid('draw-select');
  const drawSelect = h('select', { id: drawSelectId, class: 'draw-select' });
  const fillDrawSelect = () => {
    clear(drawSelect);
    drawSelect.append(h('option', { value: '' }, 'none'));
    hypotheses.forEach((x, i) => drawSelect.append(h('option', { value: String(i), selected: x === chosen }, `${x.score.toFixed(2)} · ${faultName(x.fault)} @ ${x.component}`)));
  };
  drawSelect.addEventListener('change', () => {
    chosen = drawSelect.value === '' ? null : hypotheses[Number(drawSelect.value)] ?? null;
    emit();
    renderCharts(true);
    renderEvidence();
    renderHypotheses();
  });
  if (hypotheses.length) controls.append(h('span', { class: 'field' }, h('label', { for: drawSelectId }, 'Predicted lines of'), drawSelect));
  controls.append(
    radioGroup('amplitude-scale', 'Amplitude', [['linear', 'linear'], ['log', 'log']], logY ? 'log' : 'linear', (v) => {
      logY = v === 'log';
      emit();
      renderCharts();
    }),
  );
  const canConvert = (() => {
    try {
      convertSpectrum([1], [1], a.spectrum, a.spectrum.quantity === 'acceleration' ? 'velocity' : 'acceleration');
      return true;
    } catch {
      return false;
    }
  })();
  if (canConvert) {
    controls.append(
      radioGroup('spectrum-quantity', 'Spectrum of', [['acceleration', 'acceleration'], ['velocity', 'velocity']], quantity, (v) => {
        quantity = v;
        emit();
        renderCharts();
      }),
    );
  }
  controls.append(h('p', { class: 'help' }, 'Drag to zoom, wheel to zoom at the pointer, shift-drag (or touch) to pan, double-click to reset.'));

  // Open where the drawn lines are (with some room beyond the last), not on the full band, where a
  // family of low-order lines would crowd into a few pixels; "all" shows the whole band.
  const rangeFor = (kind: string, lines: PredictedLine[], xs: ArrayLike<number>): XBounds | null => {
    const kept = ranges.get(kind);
    if (kept) return kept;
    if (xs.length < 2) return null;
    const top = xs[xs.length - 1]!;
    if (lines.length === 0) {
      // Bearing defect rates and their first harmonics sit below about 40 × shaft speed, so an envelope
      // spectrum opens there rather than on its whole (empty) band; "all" shows the rest.
      if (kind !== 'envelope') return null;
      const max = Math.max(200, 40 * (a.speedHz ?? 25));
      return max < top * 0.6 ? { min: xs[0]!, max } : null;
    }
    const last = Math.max(...lines.map((l) => l.x));
    const first = Math.min(...lines.map((l) => l.x));
    const max = Math.min(top, last + Math.max((last - first) * 0.25, last * 0.15));
    return max < top * 0.6 ? { min: xs[0]!, max } : null;
  };

  const linesFor = (kind: 'spectrum' | 'envelope' | 'order'): PredictedLine[] => {
    if (!chosen || chartForDomain(chosen.domain) !== kind) return [];
    if (kind === 'order') return predictedLines(chosen, (f) => (a.speedHz ? f / a.speedHz : NaN)).filter((l) => Number.isFinite(l.x));
    return predictedLines(chosen);
  };

  const renderCharts = (forgetRanges = false) => {
    for (const c of charts.splice(0)) {
      ranges.set(c.element.dataset.chart ?? '', c.range());
      c.destroy();
    }
    if (forgetRanges) ranges.clear();
    clear(chartsBox);
    const key = chosen ? hypothesisKey(chosen) : null;
    const drawnKey = (kind: 'spectrum' | 'envelope' | 'order') => (chosen && chartForDomain(chosen.domain) === kind ? key : null);
    const spectrumLines = linesFor('spectrum');
    let spectrum = { values: a.spectrum.values, unit: a.spectrum.unit };
    if (quantity !== a.spectrum.quantity && canConvert) spectrum = convertSpectrum(a.spectrum.frequenciesHz, a.spectrum.values, a.spectrum, quantity);
    charts.push(
      createSpectrumChart(chartsBox, {
        kind: 'spectrum',
        title: `${quantity === 'velocity' ? 'Velocity' : 'Acceleration'} spectrum (${a.spectrum.scaling}, Δf ${formatNumber(a.spectrum.frequencyResolutionHz)} Hz)`,
        xLabel: 'Frequency (Hz)',
        xUnit: 'Hz',
        x: a.spectrum.frequenciesHz,
        y: spectrum.values,
        yUnit: spectrum.unit,
        logY,
        speedHz: a.speedHz,
        lines: spectrumLines,
        hypothesis: drawnKey('spectrum'),
        initialRange: rangeFor('spectrum', spectrumLines, a.spectrum.frequenciesHz),
      }),
    );
    if (a.envelopeSpectrum) {
      const envelopeLines = linesFor('envelope');
      charts.push(
        createSpectrumChart(chartsBox, {
          kind: 'envelope',
          title: `Envelope spectrum (band ${formatNumber(a.envelopeSpectrum.bandHz[0])}–${formatNumber(a.envelopeSpectrum.bandHz[1])} Hz)`,
          xLabel: 'Envelope frequency (Hz)',
          xUnit: 'Hz',
          x: a.envelopeSpectrum.frequenciesHz,
          y: a.envelopeSpectrum.values,
          yUnit: a.envelopeSpectrum.unit,
          logY,
          speedHz: a.speedHz,
          lines: envelopeLines,
          hypothesis: drawnKey('envelope'),
          height: 240,
          initialRange: rangeFor('envelope', envelopeLines, a.envelopeSpectrum.frequenciesHz),
        }),
      );
    } else if (chosen && chosen.domain === 'envelope') {
      chartsBox.append(message('note', 'This hypothesis is judged on the envelope spectrum, which this analysis does not include.'));
    }
    if (a.orderSpectrum) {
      const orderLines = linesFor('order');
      charts.push(
        createSpectrumChart(chartsBox, {
          kind: 'order',
          title: `Order spectrum of shaft ${a.orderSpectrum.shaft} (${a.speedSource ?? 'tach'})`,
          xLabel: `Order of ${a.orderSpectrum.shaft}`,
          xUnit: 'order',
          x: a.orderSpectrum.orders,
          y: a.orderSpectrum.values,
          yUnit: a.spectrum.unit,
          logY,
          speedHz: a.speedHz,
          lines: orderLines,
          hypothesis: drawnKey('order'),
          height: 240,
          initialRange: rangeFor('order', orderLines, a.orderSpectrum.orders),
        }),
      );
    }
  };

  const renderEvidence = () => {
    clear(evidenceBox);
    evidenceBox.append(h('h2', { id: 'evidence-title' }, chosen ? `Evidence · ${faultName(chosen.fault)} @ ${chosen.component}` : 'Evidence'));
    if (!chosen) {
      evidenceBox.append(message('empty', 'Choose a hypothesis to see its evidence.'));
      return;
    }
    const lines = predictedLines(chosen);
    const status = (l: PredictedLine) =>
      l.matched
        ? l.ambiguous
          ? h('span', { class: 'st st-ambiguous', title: l.ambiguousWith.length ? `also: ${l.ambiguousWith.join('; ')}` : 'another line of the model falls on this peak' }, '▽ matched, shared', l.ambiguousWith.length ? h('span', { class: 'also' }, ` with ${l.ambiguousWith.slice(0, 2).join('; ')}${l.ambiguousWith.length > 2 ? '…' : ''}`) : null)
          : h('span', { class: 'st st-matched' }, '▼ matched')
        : h('span', { class: 'st st-missing' }, '○ missing');
    evidenceBox.append(
      h(
        'div',
        { class: 'table-scroll' },
        h(
          'table',
          { class: 'data compact evidence-table', id: 'evidence-table', 'data-rows': lines.length },
          h('thead', {}, h('tr', {}, ...['Line', 'Family', 'Frequency (Hz)', 'Order', 'Predicted', 'Measured', 'SNR (dB)', 'Status'].map((t) => h('th', { scope: 'col' }, t)))),
          h(
            'tbody',
            {},
            ...lines.map((l) =>
              h(
                'tr',
                { 'data-matched': l.matched ? 'true' : 'false' },
                h('td', {}, l.label || '–'),
                h('td', {}, l.family === 'harmonic' ? `harmonic ${l.harmonic ?? ''} of ${l.familyName}` : l.family === 'sideband' ? `sideband of ${l.familyName}` : l.familyName),
                h('td', { class: 'num' }, formatNumber(l.frequencyHz, 5)),
                h('td', { class: 'num' }, a.speedHz ? formatNumber(l.frequencyHz / a.speedHz, 4) : '–'),
                h('td', { class: 'num' }, formatNumber(l.predicted)),
                h('td', { class: 'num' }, formatNumber(l.measured)),
                h('td', { class: 'num' }, formatFixed(l.snrDb, 1)),
                h('td', {}, status(l)),
              ),
            ),
          ),
        ),
      ),
    );
    if (a.unexplainedPeaks?.length) {
      const peaks = [...a.unexplainedPeaks].sort((x, y) => y.snrDb - x.snrDb).slice(0, 10);
      evidenceBox.append(
        h(
          'details',
          { class: 'unexplained' },
          h('summary', {}, `Peaks no hypothesis explains (${a.unexplainedPeaks.length})`),
          h(
            'table',
            { class: 'data compact' },
            h('thead', {}, h('tr', {}, ...['Frequency (Hz)', 'Order', 'Amplitude', 'SNR (dB)'].map((t) => h('th', { scope: 'col' }, t)))),
            h(
              'tbody',
              {},
              ...peaks.map((p) =>
                h('tr', {}, h('td', { class: 'num' }, formatNumber(p.frequencyHz, 5)), h('td', { class: 'num' }, a.speedHz ? formatNumber(p.frequencyHz / a.speedHz, 4) : '–'), h('td', { class: 'num' }, formatNumber(p.amplitude)), h('td', { class: 'num' }, formatFixed(p.snrDb, 1))),
              ),
            ),
          ),
        ),
      );
    }
  };

  renderHypotheses();
  renderCharts();
  renderEvidence();
  if (hypotheses.length) hypSection.append(moreButton);
  if (hypotheses.length) hypSection.append(h('p', { class: 'help' }, `Score ${'≥'} 0.5: the recording shows that fault. Predicted lines: ▼ solid = matched by a measured peak, ▽ = matched by a peak another line also explains, ○ dashed = predicted but not found.`));

  return () => {
    for (const c of charts.splice(0)) c.destroy();
    root.remove();
  };
}
