import type { Hypothesis, RecordingAnalysis, RecordingMeta } from '../api-types.js';
import type { Cleanup } from '../app-context.js';
import { createSpectrumChart, type SpectrumChart } from '../charts/spectrum-chart.js';
import type { XBounds } from '../charts/chart-base.js';
import { clear, h, message, uid } from '../dom.js';
import { faultName, formatDateTime, formatFixed, formatNumber } from '../format.js';
import { amplitudeUnits, evidenceCounts, prefersLogScale } from '../evidence-units.js';
import { chartForDomain, predictedLines, type PredictedLine } from '../predicted-lines.js';
import { convertSpectrum, type Quantity } from '../spectrum-quantity.js';
import { scoreBadge, zoneBadge } from '../zone-badge.js';

// One recording's analysis: overall levels, the hypotheses, the spectrum (plus envelope and order
// spectra when present) with the chosen hypothesis's predicted lines, and its evidence table.

export interface AnalysisViewState {
  hypothesis: string | null;
  /** null: each chart opens in the scale where its evidence shows (see prefersLogScale) */
  logY: boolean | null;
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

function summaryStrip(a: RecordingAnalysis, meta: RecordingMeta | null): HTMLElement {
  const item = (label: string, value: Node | string, attrs: Record<string, string> = {}) => h('div', { class: 'stat', ...attrs }, h('dt', {}, label), h('dd', {}, value));
  const fromVelocity = a.spectrum.quantity === 'velocity';
  const channel = typeof a.channel === 'number' && meta ? meta.channelInfo[a.channel] : undefined;
  return h(
    'dl',
    { class: 'stats', id: 'analysis-stats' },
    item('Velocity RMS', h('span', {}, zoneBadge(a.overall.zone), ` ${formatFixed(a.overall.velocityRmsMmPerS, 2)} mm/s`), { 'data-zone': a.overall.zone ?? '' }),
    item('Band', `${formatNumber(a.overall.bandHz[0])}–${formatNumber(a.overall.bandHz[1])} Hz`),
    item('Speed', speedText(a, meta), { 'data-speed-source': a.speedSource ?? '' }),
    // a velocity channel's peak, crest factor and kurtosis are of its derivative: say so beside the number
    item(fromVelocity ? 'Accel. peak (differentiated)' : 'Accel. peak', `${formatNumber(a.overall.accelerationPeak)} ${a.overall.accelerationUnit}`),
    item(fromVelocity ? 'Crest factor (differentiated)' : 'Crest factor', formatFixed(a.overall.crestFactor, 2)),
    item(fromVelocity ? 'Kurtosis (differentiated)' : 'Kurtosis', formatFixed(a.overall.kurtosis, 2)),
    a.overall.envelopeRms !== undefined ? item('Envelope RMS', `${formatNumber(a.overall.envelopeRms)} ${a.overall.envelopeRmsUnit ?? a.envelopeSpectrum?.unit ?? a.overall.accelerationUnit}`) : null,
    channel && meta && meta.channels > 1 ? item('Channel', `${a.channel! + 1} '${channel.name}' of ${meta.channels}`, { id: 'analysed-channel' }) : null,
    item('Analysed', `${formatDateTime(a.createdAt)} · ${/^\d/.test(a.softwareVersion) ? 'v' : ''}${a.softwareVersion} · model ${a.modelVersion ?? '–'}`),
  );
}

/**
 * "1479.1 rpm ± 0.6 rpm (spectrum) · 24.65 Hz": rpm to a tenth (a spectrum seldom pins the speed closer), the
 * uncertainty in rpm too, and where the speed came from. The analysis calls both a speed the uploader gave and
 * the model's nominal speed it fell back to 'given'; the recording says which.
 */
function speedText(a: RecordingAnalysis, meta: RecordingMeta | null): string {
  if (!a.speedHz) return 'unknown';
  const unc = a.speedUncertaintyHz ? ` ± ${formatFixed(a.speedUncertaintyHz * 60, 1)} rpm` : '';
  const source = a.speedSource === 'given' ? (meta && meta.speedRpm === null ? "model's nominal: not found in the spectrum" : 'given at upload') : a.speedSource ?? '–';
  return `${formatFixed(a.speedHz * 60, 1)} rpm${unc} (${source}) · ${formatFixed(a.speedHz, 2)} Hz`;
}

export function renderAnalysisView(host: HTMLElement, a: RecordingAnalysis, state: AnalysisViewState, onState: (s: AnalysisViewState) => void, meta: RecordingMeta | null = null): Cleanup {
  const charts: SpectrumChart[] = [];
  const ranges = new Map<string, XBounds | null>();
  const hypotheses = a.hypotheses ?? [];
  let chosen: Hypothesis | null = hypotheses.find((x) => hypothesisKey(x) === state.hypothesis) ?? hypotheses[0] ?? null;
  let logY = state.logY;
  let quantity: Quantity = state.quantity ?? a.spectrum.quantity;

  const root = h('div', { class: 'analysis', 'data-analysis-id': a.id, 'data-recording-id': a.recordingId, 'data-top-hypothesis': hypotheses[0] ? hypothesisKey(hypotheses[0]) : '' });
  host.append(root);
  root.append(summaryStrip(a, meta));
  // what was assumed or set aside: the file's (decoder) warnings, then the analysis's
  const warnings = [...(meta?.warnings ?? []).map((w) => `file: ${w}`), ...(a.warnings ?? [])];
  if (warnings.length) root.append(h('ul', { class: 'warnings', id: 'analysis-warnings', 'aria-label': 'Analysis warnings' }, ...warnings.map((w) => h('li', {}, `⚠ ${w}`))));

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
      const counts = evidenceCounts(x);
      hypBody.append(
        h(
          'tr',
          { class: x === chosen ? 'chosen' : null, 'data-hypothesis': hypothesisKey(x), 'data-rank': i + 1 },
          h('td', {}, radio),
          h('td', {}, h('label', { for: id }, faultName(x.fault))),
          h('td', { class: 'mono' }, x.component),
          h('td', {}, scoreBadge(x.score)),
          h('td', {}, x.domain),
          h('td', { class: 'num' }, `${counts.matched} of ${counts.predicted}`),
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
    radioGroup('amplitude-scale', 'Amplitude', [['auto', 'auto'], ['linear', 'linear'], ['log', 'log']], logY === null ? 'auto' : logY ? 'log' : 'linear', (v) => {
      logY = v === 'auto' ? null : v === 'log';
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
  controls.append(h('p', { class: 'help chart-help' }, 'Drag to zoom, wheel to zoom, shift-drag to pan, double-click to reset.'));

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
    // the chart that holds the drawn hypothesis's evidence comes first: the proof belongs at the top of the page
    const proof = chosen ? chartForDomain(chosen.domain) : 'spectrum';
    const builders: Array<{ kind: 'spectrum' | 'envelope' | 'order'; build: () => SpectrumChart | HTMLElement | null }> = [];
    builders.push({
      kind: 'spectrum',
      build: () => {
        const lines = linesFor('spectrum');
        let spectrum = { values: a.spectrum.values, unit: a.spectrum.unit };
        if (quantity !== a.spectrum.quantity && canConvert) spectrum = convertSpectrum(a.spectrum.frequenciesHz, a.spectrum.values, a.spectrum, quantity);
        const initialRange = rangeFor('spectrum', lines, a.spectrum.frequenciesHz);
        return createSpectrumChart(chartsBox, {
          kind: 'spectrum',
          title: `${quantity === 'velocity' ? 'Velocity' : 'Acceleration'} spectrum (${a.spectrum.scaling}, Δf ${formatNumber(a.spectrum.frequencyResolutionHz)} Hz)`,
          xLabel: 'Frequency (Hz)',
          xUnit: 'Hz',
          x: a.spectrum.frequenciesHz,
          y: spectrum.values,
          yUnit: `${spectrum.unit} ${a.spectrum.scaling}`,
          logY: logY ?? prefersLogScale(lines, a.spectrum.frequenciesHz, spectrum.values, initialRange),
          speedHz: a.speedHz,
          lines,
          hypothesis: drawnKey('spectrum'),
          height: proof === 'spectrum' ? 280 : 220,
          initialRange,
        });
      },
    });
    if (a.envelopeSpectrum) {
      const env = a.envelopeSpectrum;
      builders.push({
        kind: 'envelope',
        build: () => {
          const lines = linesFor('envelope');
          const initialRange = rangeFor('envelope', lines, env.frequenciesHz);
          return createSpectrumChart(chartsBox, {
            kind: 'envelope',
            title: `Envelope spectrum (band ${formatNumber(env.bandHz[0])}–${formatNumber(env.bandHz[1])} Hz)`,
            xLabel: 'Envelope frequency (Hz)',
            xUnit: 'Hz',
            x: env.frequenciesHz,
            y: env.values,
            yUnit: `${env.unit} peak`,
            logY: logY ?? prefersLogScale(lines, env.frequenciesHz, env.values, initialRange),
            speedHz: a.speedHz,
            lines,
            hypothesis: drawnKey('envelope'),
            height: proof === 'envelope' ? 280 : 200,
            initialRange,
          });
        },
      });
    } else if (chosen && chosen.domain === 'envelope') {
      builders.push({ kind: 'envelope', build: () => chartsBox.appendChild(message('note', 'This hypothesis is judged on the envelope spectrum, which this analysis does not include.')) });
    }
    if (a.orderSpectrum) {
      const ord = a.orderSpectrum;
      builders.push({
        kind: 'order',
        build: () => {
          const lines = linesFor('order');
          const initialRange = rangeFor('order', lines, ord.orders);
          return createSpectrumChart(chartsBox, {
            kind: 'order',
            title: `Order spectrum of shaft ${ord.shaft} (${a.speedSource ?? 'tach'})`,
            xLabel: `Order of ${ord.shaft}`,
            xUnit: 'order',
            x: ord.orders,
            y: ord.values,
            yUnit: `${a.spectrum.unit} ${a.spectrum.scaling}`,
            logY: logY ?? prefersLogScale(lines, ord.orders, ord.values, initialRange),
            speedHz: a.speedHz,
            lines,
            hypothesis: drawnKey('order'),
            height: proof === 'order' ? 280 : 200,
            initialRange,
          });
        },
      });
    }
    builders.sort((x, y) => Number(y.kind === proof) - Number(x.kind === proof));
    for (const b of builders) {
      const made = b.build();
      if (made && 'destroy' in made) charts.push(made);
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
    const units = amplitudeUnits(chosen, a);
    const counts = evidenceCounts(chosen);
    const byLine = new Map(chosen.evidence.map((e) => [`${e.label}@${e.frequencyHz}`, e]));
    const predictedOf = (l: PredictedLine) => {
      const e = byLine.get(`${l.label}@${l.frequencyHz}`);
      return e ? units.predictedOf(e) : null;
    };
    evidenceBox.append(
      h(
        'p',
        { class: 'evidence-summary', id: 'evidence-counts', 'data-matched': counts.matched, 'data-predicted': counts.predicted },
        `${counts.matched} of ${counts.predicted} predicted lines found, judged on the ${chosen.domain === 'envelope' ? 'envelope spectrum' : chosen.domain === 'order' ? 'order spectrum' : 'spectrum'}. `,
        chosen.scaleNote ?? (units.scaled ? '' : 'The predictions are on the model’s own scale (a nominal load), not fitted to this measurement: compare lines with each other, not with the measured column.'),
      ),
    );
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
          { class: 'data compact evidence-table', id: 'evidence-table', 'data-rows': lines.length, 'data-scaled': units.scaled ? 'true' : 'false' },
          h('thead', {}, h('tr', {}, ...['Line', 'Family', 'Frequency (Hz)', 'Order (× reference shaft speed)', units.predictedHeading, units.measuredHeading, 'SNR (dB)', 'Status'].map((t) => h('th', { scope: 'col' }, t)))),
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
                h('td', { class: 'num' }, formatNumber(predictedOf(l))),
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
            h('thead', {}, h('tr', {}, ...['Frequency (Hz)', 'Order (× reference shaft speed)', `Amplitude (${a.spectrum.unit} ${a.spectrum.scaling})`, 'SNR (dB)'].map((t) => h('th', { scope: 'col' }, t)))),
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
