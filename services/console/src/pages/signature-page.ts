import uPlot from 'uplot';
import { ApiProblem } from '../api-client.js';
import type { FaultCandidate, MachineDetail, SignatureLine, SignatureResponse } from '../api-types.js';
import type { AppContext, Cleanup } from '../app-context.js';
import { campbellView } from '../campbell-data.js';
import { createXyChart, type XyChart } from '../charts/xy-chart.js';
import { clear, h, message } from '../dom.js';
import { faultName, formatFixed, formatNumber } from '../format.js';
import { ink, okabeIto } from '../palette.js';
import { classifyLabel } from '../predicted-lines.js';
import { routeHref, type Route } from '../route.js';

// Signature explorer: a fault in a component at a speed → its predicted lines, the excitation
// waveform with Fourier partial sums, the machine's magnification at each harmonic, and the
// Campbell data (natural frequencies against excitation orders over the speed range).

interface ModelSpeed {
  nominalRpm?: number;
  minRpm?: number;
  maxRpm?: number;
}

function modelSpeed(machine: MachineDetail | null): ModelSpeed {
  const speed = (machine?.model as { speed?: ModelSpeed } | null | undefined)?.speed;
  return speed && typeof speed === 'object' ? speed : {};
}

/** Partial sums: Okabe–Ito hues (ink is the exact waveform's) and a dash pattern each, so they read without colour. */
const partialSumColours = [okabeIto.vermillion, okabeIto.blue, okabeIto.bluishGreen, okabeIto.reddishPurple, okabeIto.orange, okabeIto.skyBlue];
const partialSumDashes = [[2, 2], [6, 3], [10, 3, 2, 3], [1, 3], [14, 4], [4, 2, 1, 2], [8, 2], [3, 3, 1, 3]];

/**
 * The signature the explorer opens on: a fault the diagnosis shows on this machine (score from 0.5); else, where
 * the machine has gears, a missing tooth (its comb of shaft harmonics through the torsional chain is what the
 * explorer shows best), on the gear of the strongest hypothesis when that is a gear; else the strongest hypothesis.
 */
export function defaultCandidate(candidates: readonly FaultCandidate[], top: { fault: string; component: string; score: number } | null): string | null {
  const key = (c: { fault: string; component: string }) => `${c.fault}|${c.component}`;
  if (top && top.score >= 0.5 && candidates.some((c) => key(c) === key(top))) return key(top);
  const teeth = candidates.filter((c) => c.fault === 'gear-missing-tooth');
  if (teeth.length) return key(teeth.find((c) => c.component === top?.component) ?? teeth[0]!);
  if (top && candidates.some((c) => key(c) === key(top))) return key(top);
  return candidates[0] ? key(candidates[0]) : null;
}

function lineLabel(line: SignatureLine, i: number): string {
  return typeof line.label === 'string' && line.label ? line.label : typeof line.harmonic === 'number' ? `${line.harmonic}×` : `line ${i + 1}`;
}

export async function renderSignaturePage(main: HTMLElement, ctx: AppContext, route: Route): Promise<Cleanup> {
  const charts: XyChart[] = [];
  const machines = await ctx.machines();
  main.append(
    h('div', { class: 'page-head' }, h('h1', {}, 'Signature explorer'), h('p', { class: 'meta' }, 'What a fault would look like on this machine, before any measurement: lines from the excitation’s Fourier series passed through the machine’s response.')),
  );
  if (machines.length === 0) {
    main.append(message('empty', 'No machines on this site.'));
    return () => {};
  }

  // without a machine in the link: one whose gears show a fault (a tooth fault's comb through the torsional chain is
  // what the explorer shows best), else the one whose strongest hypothesis scores highest
  const gearFault = (m: (typeof machines)[number]) => (m.topHypothesis && m.topHypothesis.score >= 0.5 && m.topHypothesis.fault.startsWith('gear-') ? 1 : 0);
  const defaultMachine =
    route.params.machine ?? [...machines].sort((a, b) => gearFault(b) - gearFault(a) || (b.topHypothesis?.score ?? -1) - (a.topHypothesis?.score ?? -1))[0]?.id;
  const machineSelect = h('select', { id: 'sig-machine', name: 'machine' }, ...machines.map((m) => h('option', { value: m.id, selected: m.id === defaultMachine }, m.name)));
  const faultSelect = h('select', { id: 'sig-fault', name: 'fault' });
  const speedInput = h('input', { id: 'sig-speed', name: 'speedRpm', type: 'number', min: 1, step: 'any', required: true, inputmode: 'decimal' });
  const harmonicsInput = h('input', { id: 'sig-harmonics', name: 'harmonics', type: 'number', min: 1, max: 200, step: 1, value: route.params.harmonics ?? '10', required: true });
  const pointSelect = h('select', { id: 'sig-point', name: 'point' });
  const form = h(
    'form',
    { class: 'toolbar signature-form', 'aria-label': 'Choose a signature' },
    h('span', { class: 'field' }, h('label', { for: 'sig-machine' }, 'Machine'), machineSelect),
    h('span', { class: 'field wide' }, h('label', { for: 'sig-fault' }, 'Fault and component'), faultSelect),
    h('span', { class: 'field' }, h('label', { for: 'sig-speed' }, 'Speed (rpm, reference shaft)'), speedInput),
    h('span', { class: 'field' }, h('label', { for: 'sig-harmonics' }, 'Harmonics'), harmonicsInput),
    h('span', { class: 'field' }, h('label', { for: 'sig-point' }, 'Point (transfer path)'), pointSelect),
    h('button', { type: 'submit', class: 'primary', id: 'sig-show' }, 'Show'),
  );
  const output = h('div', { class: 'signature-output', id: 'signature-output', 'aria-live': 'polite' });
  main.append(form, output);

  let machine: MachineDetail | null = null;
  const loadMachine = async () => {
    machine = await ctx.machine(machineSelect.value);
    const speed = modelSpeed(machine);
    speedInput.value = route.params.speedRpm && machine.id === route.params.machine ? route.params.speedRpm : speed.nominalRpm ? String(speed.nominalRpm) : '';
    clear(pointSelect);
    pointSelect.append(h('option', { value: '' }, 'none (source only)'), ...machine.points.map((p) => h('option', { value: p.id, selected: p.id === route.params.point }, p.id)));
    clear(faultSelect);
    let candidates: FaultCandidate[] = [];
    try {
      candidates = await ctx.api.get<FaultCandidate[]>('/api/v1/faults', { machine: machine.id });
    } catch (err) {
      output.replaceChildren(message('error', err instanceof ApiProblem ? err.message : String(err)));
    }
    const top = machines.find((m) => m.id === machine!.id)?.topHypothesis ?? null;
    const wanted =
      route.params.fault && route.params.component && route.params.machine === machine.id
        ? `${route.params.fault}|${route.params.component}`
        : defaultCandidate(candidates, top);
    for (const c of candidates) {
      const value = `${c.fault}|${c.component}`;
      faultSelect.append(h('option', { value, selected: value === wanted }, `${faultName(c.fault)} @ ${c.component}`));
    }
    if (candidates.length === 0) faultSelect.append(h('option', { value: '' }, 'no candidates (no machine model?)'));
  };

  const destroyCharts = () => {
    for (const c of charts.splice(0)) c.destroy();
  };

  // A newer request (Show, or a change of the harmonics) supersedes one still in flight.
  let requestSeq = 0;
  const show = async () => {
    const seq = ++requestSeq;
    destroyCharts();
    clear(output);
    const [fault, component] = faultSelect.value.split('|');
    if (!fault || !component) {
      output.append(message('empty', 'Choose a fault and component.'));
      return;
    }
    const speedRpm = Number(speedInput.value);
    const harmonics = Math.round(Number(harmonicsInput.value));
    ctx.remember(routeHref('signatures', null, { machine: machineSelect.value, fault, component, speedRpm: speedInput.value, harmonics: String(harmonics), point: pointSelect.value || null }));
    output.append(message('note', 'Computing…'));
    let sig: SignatureResponse;
    try {
      sig = await ctx.api.get<SignatureResponse>('/api/v1/signatures', { machine: machineSelect.value, fault, component, speedRpm, harmonics, point: pointSelect.value || undefined });
    } catch (err) {
      if (seq !== requestSeq) return;
      clear(output);
      output.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
      if (err instanceof ApiProblem) for (const e of err.errors) output.append(message('error', `${e.path}: ${e.message}`));
      return;
    }
    if (seq !== requestSeq) return;
    destroyCharts();
    clear(output);
    output.dataset.fault = fault;
    output.dataset.component = component;
    output.dataset.harmonics = String(harmonics);
    const lines = [...(sig.lines ?? [])].filter((l) => Number.isFinite(l.frequencyHz)).sort((a, b) => a.frequencyHz - b.frequencyHz);
    if (sig.warnings?.length) output.append(h('ul', { class: 'warnings', 'aria-label': 'Signature warnings' }, ...sig.warnings.map((w) => h('li', {}, `⚠ ${typeof w === 'string' ? w : w.message}`))));
    if (sig.assumptions?.length) output.append(h('p', { class: 'help' }, `Assumptions: ${sig.assumptions.join('; ')}.`));

    // Predicted lines
    const linesPanel = h('section', { class: 'panel', 'aria-labelledby': 'sig-lines-title' }, h('h2', { id: 'sig-lines-title' }, `Predicted lines · ${faultName(fault)} @ ${component} · ${formatNumber(speedRpm, 5)} rpm`));
    output.append(linesPanel);
    const amplitude = (l: SignatureLine) => (typeof l.amplitude === 'number' ? l.amplitude : null);
    const hasAmplitudes = lines.some((l) => amplitude(l) !== null);
    charts.push(
      createXyChart(linesPanel, {
        kind: 'signature-lines',
        title: `${hasAmplitudes ? 'Predicted amplitude at each line' : 'Predicted line positions'}${sig.domain === 'envelope' ? ' (envelope spectrum)' : ''}`,
        xLabel: sig.domain === 'envelope' ? 'Envelope frequency (Hz)' : 'Frequency (Hz)',
        yLabel: hasAmplitudes ? (sig.amplitudeBasis === 'relative' || !sig.unit ? 'relative amplitude' : `${sig.unit} (peak)`) : '',
        x: lines.map((l) => l.frequencyHz),
        series: [{ label: 'predicted line', y: lines.map((l) => amplitude(l) ?? 1), colour: okabeIto.vermillion, dash: [] }],
        stems: true,
        logY: hasAmplitudes && lines.some((l) => (amplitude(l) ?? 0) > 0),
        height: 220,
        attributes: { 'data-predicted-count': lines.length },
      }),
    );
    linesPanel.append(
      h(
        'details',
        { class: 'lines-table' },
        h('summary', {}, `Table of ${lines.length} lines`),
        h(
          'div',
          { class: 'table-scroll' },
          h(
            'table',
            { class: 'data compact' },
            h('thead', {}, h('tr', {}, ...['Line', 'Family', 'Frequency (Hz)', 'Order', 'Amplitude', 'Magnification'].map((t) => h('th', { scope: 'col' }, t)))),
            h(
              'tbody',
              {},
              ...lines.map((l, i) => {
                const label = lineLabel(l, i);
                const family = typeof l.sideband === 'number' ? (l.sideband === 0 ? 'harmonic' : `sideband ${l.sideband > 0 ? '+' : ''}${l.sideband}`) : typeof l.family === 'string' ? l.family : classifyLabel(label).family;
                return h('tr', {}, h('td', {}, label), h('td', {}, family), h('td', { class: 'num' }, formatNumber(l.frequencyHz, 5)), h('td', { class: 'num' }, formatNumber(typeof l.order === 'number' ? l.order : (l.frequencyHz * 60) / speedRpm, 4)), h('td', { class: 'num' }, formatNumber(amplitude(l))), h('td', { class: 'num' }, typeof l.magnification === 'number' ? formatFixed(l.magnification, 3) : '–'));
              }),
            ),
          ),
        ),
      ),
    );

    // Excitation and partial sums
    const grid = h('div', { class: 'signature-grid' });
    output.append(grid);
    const excitationPanel = h('section', { class: 'panel', 'aria-labelledby': 'sig-exc-title' }, h('h2', { id: 'sig-exc-title' }, 'Excitation over one period and its Fourier partial sums'));
    grid.append(excitationPanel);
    const exc = sig.excitation;
    if (exc?.formula) excitationPanel.append(h('p', { class: 'formula' }, `${exc.template ? `${exc.template}: ` : ''}${exc.formula}`));
    if (exc && exc.angleRev?.length && exc.waveform?.length) {
      const sums = Object.entries(exc.partialSums ?? {}).sort((a, b) => Number(a[0]) - Number(b[0]));
      // each partial sum has its own dash pattern as well as its own colour; the exact waveform is solid ink
      const sumStyles = sums.map((_, i) => ({ colour: partialSumColours[i % partialSumColours.length]!, dash: partialSumDashes[i % partialSumDashes.length]! }));
      const shaftName = exc.shaft ? ` of ${exc.shaft}` : '';
      const period = typeof exc.periodRev === 'number' && Math.abs(exc.periodRev - 1) > 1e-9 ? ` (one period = ${formatNumber(exc.periodRev, 4)} rev)` : '';
      excitationPanel.append(
        h('p', { class: 'help' }, `Solid: the excitation itself, evaluated exactly. Dashed: the sum of its first N harmonics for N = ${sums.map(([n]) => n).join(', ')}; near a jump each overshoots by about 9 % of the jump however many harmonics it has (Gibbs). Change “Harmonics” above to add another N.`),
      );
      charts.push(
        createXyChart(excitationPanel, {
          kind: 'excitation',
          title: `Waveform and partial sums of ${sums.map(([n]) => n).join(', ') || harmonics} harmonics${period}`,
          xLabel: `Angle (rev${shaftName})`,
          yLabel: exc.reference ? `× ${exc.reference}` : 'excitation',
          x: exc.angleRev,
          series: [
            { label: 'excitation (exact)', y: exc.waveform, colour: ink, width: 2, dash: [] },
            ...sums.map(([n, values], i) => ({ label: `sum of ${n} harmonic${n === '1' ? '' : 's'}`, y: values, colour: sumStyles[i]!.colour, dash: sumStyles[i]!.dash, width: 1.4 })),
          ],
          height: 260,
          attributes: {
            'data-partial-sums': sums.map(([n]) => n).join(','),
            'data-waveform-points': exc.waveform.filter((v) => Number.isFinite(v)).length,
            'data-partial-sum-dashes': JSON.stringify(sumStyles.map((st) => st.dash)),
            'data-harmonics': harmonics,
          },
        }),
      );
    } else {
      // a fault with fixed lines (unbalance, misalignment) has no waveform to draw: its formula goes beside the lines
      // and the panel makes way for the magnification
      excitationPanel.remove();
      if (exc?.formula) linesPanel.append(h('p', { class: 'formula' }, `Excitation: ${exc.template ? `${exc.template}: ` : ''}${exc.formula}. Its lines are fixed in size, so there is no waveform to sum.`));
      grid.classList.add('single');
    }

    // Magnification
    const magPanel = h('section', { class: 'panel', 'aria-labelledby': 'sig-mag-title' }, h('h2', { id: 'sig-mag-title' }, 'Magnification at each harmonic'));
    grid.append(magPanel);
    // The endpoint's own table, else each excitation line's |H| (sidebands left out: they share their carrier's path)
    type Magnification = NonNullable<SignatureResponse['magnification']>[number];
    const mag = [
      ...(sig.magnification ??
        lines
          .filter((l) => typeof l.magnification === 'number')
          .map((l): Magnification => ({ harmonic: typeof l.harmonic === 'number' ? l.harmonic : Math.round((l.frequencyHz * 60) / speedRpm), sideband: l.sideband ?? 0, frequencyHz: l.frequencyHz, factor: l.magnification as number }))),
    ]
      // one bar per harmonic: sidebands share their carrier's path
      .filter((m, _i, all) => (m.sideband ?? 0) === 0 || !all.some((x) => (x.sideband ?? 0) === 0))
      .sort((a, b) => a.frequencyHz - b.frequencyHz);
    if (mag.length) {
      charts.push(
        createXyChart(magPanel, {
          kind: 'magnification',
          title: 'Dynamic magnification factor |H| / |H(0)|',
          xLabel: 'Frequency (Hz)',
          yLabel: 'factor',
          x: mag.map((m) => m.frequencyHz),
          series: [{ label: 'magnification', y: mag.map((m) => m.factor), colour: okabeIto.blue, dash: [] }],
          stems: true,
          logY: mag.some((m) => m.factor > 0),
          height: 240,
          attributes: { 'data-harmonics': mag.length, 'data-max-factor': Math.max(...mag.map((m) => m.factor)) },
          annotate: (u) => {
            // the static line (factor 1) for reference
            const y = u.valToPos(1, 'y', true);
            if (!Number.isFinite(y)) return;
            const ctx2 = u.ctx;
            ctx2.save();
            ctx2.strokeStyle = ink;
            ctx2.setLineDash([4 * uPlot.pxRatio, 3 * uPlot.pxRatio]);
            ctx2.beginPath();
            ctx2.moveTo(u.bbox.left, y);
            ctx2.lineTo(u.bbox.left + u.bbox.width, y);
            ctx2.stroke();
            ctx2.restore();
          },
        }),
      );
      magPanel.append(
        h('p', { class: 'help' }, `Largest: ${formatFixed(Math.max(...mag.map((m) => m.factor)), 2)}× at ${formatNumber(mag.reduce((a, b) => (b.factor > a.factor ? b : a)).frequencyHz, 4)} Hz. Dashed: factor 1 (static response).`),
      );
    } else magPanel.append(message('empty', 'No response model (torsional data or resonances) for this fault’s path.'));

    // Campbell
    const campbellPanel = h('section', { class: 'panel wide-panel', 'aria-labelledby': 'sig-campbell-title' }, h('h2', { id: 'sig-campbell-title' }, 'Natural frequencies against excitation orders (Campbell data)'));
    output.append(campbellPanel);
    const speed = modelSpeed(machine);
    const lineOrders = lines.map((l, i) => ({ order: typeof l.order === 'number' ? l.order : (l.frequencyHz * 60) / speedRpm, label: lineLabel(l, i) }));
    const view = campbellView(sig.campbell, {
      naturalFrequenciesHz: sig.naturalFrequenciesHz,
      orders: lineOrders.slice(0, 6),
      minRpm: speed.minRpm ?? speedRpm * 0.5,
      maxRpm: speed.maxRpm ?? speedRpm * 1.2,
    });
    if (!view) {
      campbellPanel.append(message('empty', 'No natural frequencies for this machine (the model has no torsional data or resonances).'));
      return;
    }
    // The orders of this fault's own lines come first; the rest of the machine's orders on request.
    const isOwn = (order: number) => lineOrders.some((l) => Math.abs(l.order - order) <= 1e-6 * Math.max(1, order));
    const own = view.excitations.filter((e) => isOwn(e.order));
    const allBox = h('input', { type: 'checkbox', id: 'campbell-all', checked: own.length === 0 });
    const campbellHost = h('div');
    campbellPanel.append(
      h('div', { class: 'toolbar' }, h('span', { class: 'field check' }, allBox, h('label', { for: 'campbell-all' }, `Every excitation order of the machine (${view.excitations.length}), not only this fault’s (${own.length})`))),
      campbellHost,
    );
    const drawCampbell = () => {
      for (const c of charts.filter((c) => c.element.dataset.chart === 'campbell')) {
        c.destroy();
        charts.splice(charts.indexOf(c), 1);
      }
      clear(campbellHost);
      const rays = allBox.checked || own.length === 0 ? view.excitations : own;
      const rayColours = [okabeIto.vermillion, okabeIto.reddishPurple, okabeIto.orange, okabeIto.bluishGreen, okabeIto.black, okabeIto.skyBlue];
      const rayDashes = [[6, 3], [2, 2], [8, 3, 2, 3], [1, 3], [12, 4], [4, 2, 1, 2]];
      // Frequencies far above every ray (structural resonances in the kHz) would flatten the plot; they are listed below instead.
      const topHz = Math.max(1, ...rays.map((r) => r.frequenciesHz[r.frequenciesHz.length - 1] ?? 0)) * 1.15;
      const shownModes = view.modes.filter((m) => (m.frequenciesHz[0] ?? Infinity) <= topHz);
      const hiddenModes = view.modes.filter((m) => (m.frequenciesHz[0] ?? Infinity) > topHz);
      const fixed = view.fixedLines.filter((f) => f.frequencyHz <= topHz);
      const rayLabels = new Set(rays.map((r) => r.label));
      const crossings = view.crossings.filter((x) => x.frequencyHz <= topHz && (allBox.checked || [...rayLabels].some((l) => x.label.startsWith(l))));
      const series = [
        ...shownModes.map((m) => ({ label: m.label, y: m.frequenciesHz, colour: okabeIto.blue, dash: [] as number[], width: 2.2 })),
        ...fixed.map((f) => ({ label: f.label, y: view.speedsRpm.map(() => f.frequencyHz), colour: ink, dash: [1, 2], width: 1 })),
        ...rays.map((e, i) => ({ label: e.label, y: e.frequenciesHz, colour: rayColours[i % rayColours.length]!, dash: rayDashes[i % rayDashes.length]!, width: 1.3 })),
      ];
      charts.push(
        createXyChart(campbellHost, {
          kind: 'campbell',
          title: 'Frequency against reference-shaft speed: solid = natural frequency, dashed = excitation order; circles mark crossings',
          xLabel: 'Speed (rpm)',
          yLabel: 'Hz',
          x: view.speedsRpm,
          series,
          height: 300,
          yRange: [0, topHz],
          endLabels: true,
          attributes: { 'data-modes': view.modes.length, 'data-orders': rays.length, 'data-crossings': crossings.length },
          annotate: (u) => {
            const c = u.ctx;
            const px = uPlot.pxRatio;
            c.save();
            c.lineWidth = 1.5 * px;
            c.strokeStyle = ink;
            for (const x of crossings) {
              const cx = u.valToPos(x.speedRpm, 'x', true);
              const cy = u.valToPos(x.frequencyHz, 'y', true);
              c.fillStyle = x.nearNominal ? okabeIto.vermillion : '#fff';
              c.beginPath();
              c.arc(cx, cy, 4.5 * px, 0, 2 * Math.PI);
              c.fill();
              c.stroke();
            }
            // the chosen speed as a vertical reference
            const sx = u.valToPos(speedRpm, 'x', true);
            c.setLineDash([3 * px, 3 * px]);
            c.beginPath();
            c.moveTo(sx, u.bbox.top);
            c.lineTo(sx, u.bbox.top + u.bbox.height);
            c.stroke();
            c.restore();
          },
        }),
      );
      const near = crossings.filter((x) => x.nearNominal);
      campbellHost.append(
        h(
          'p',
          { class: 'help' },
          crossings.length
            ? `Crossings (a possible resonance when running at that speed): ${crossings
                .slice(0, 12)
                .map((x) => `${x.label || 'crossing'} at ${formatNumber(x.speedRpm, 4)} rpm`)
                .join('; ')}${crossings.length > 12 ? '; …' : ''}. `
            : 'No excitation order shown crosses a natural frequency in the speed range. ',
          near.length ? h('b', {}, `${near.length} near the nominal speed (filled circles). `) : null,
          'Dashed vertical: the chosen speed.',
          hiddenModes.length ? ` Above the plotted range: ${hiddenModes.map((m) => m.label).join('; ')}.` : '',
        ),
      );
    };
    allBox.addEventListener('change', drawCampbell);
    drawCampbell();
  };

  // a new number of harmonics re-requests at once (the partial sums and lines depend on it)
  harmonicsInput.addEventListener('change', () => {
    if (harmonicsInput.checkValidity() && faultSelect.value) void show();
  });
  form.addEventListener('submit', (e) => {
    e.preventDefault();
    void show();
  });
  machineSelect.addEventListener('change', () => {
    destroyCharts();
    clear(output);
    void loadMachine();
  });
  await loadMachine();
  if (faultSelect.value) await show();
  return destroyCharts;
}
