import uPlot from 'uplot';
import { h, svg } from '../dom.js';
import { formatNumber } from '../format.js';
import { familyColours, ink, okabeIto } from '../palette.js';
import { familyCaptions, type PredictedLine } from '../predicted-lines.js';
import { attachKeys, attachZoomPan, axis, numberTicks, panX, positiveFloor, setXRange, trackWidth, zoomX, type XBounds } from './chart-base.js';
import { markerPath, traceMarker, type MarkerShape } from './marker-shape.js';

// A measured spectrum (frequency or order axis) with a hypothesis's predicted lines drawn over it.
// Matched lines: solid, with a filled down-pointing triangle; matched but ambiguous (another line of
// the model falls on the same peak): solid, hollow triangle; missing lines: dashed, hollow circle.
// Family colours (harmonics, sidebands) add to, never replace, those shapes and dashes.

export interface SpectrumChartOptions {
  /** names the chart for screen readers and the data-chart attribute */
  kind: 'spectrum' | 'envelope' | 'order';
  title: string;
  xLabel: string;
  /** what the x axis counts: hertz or orders of the reference shaft */
  xUnit: 'Hz' | 'order';
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  yUnit: string;
  logY: boolean;
  /** running speed of the reference shaft, for reading orders from hertz and back */
  speedHz: number | null;
  lines: PredictedLine[];
  /** "fault:component" of the hypothesis whose lines are drawn, or null */
  hypothesis: string | null;
  height?: number;
  /** an x range to open at (kept across a rebuild when the user toggles log or quantity) */
  initialRange?: XBounds | null;
}

export interface SpectrumChart {
  element: HTMLElement;
  range(): XBounds | null;
  destroy(): void;
}

/** Labels drawn at most on one chart; the others are named under the pointer and in the evidence table. */
const MAX_LABELS = 10;
const LABEL_FONT_PX = 10;
const LABEL_ROW_PX = 12;
const LABEL_GAP_PX = 6;

const lineStyle = (line: PredictedLine): { shape: MarkerShape; dash: number[]; filled: boolean } =>
  line.matched
    ? { shape: 'triangle-down', dash: [], filled: !line.ambiguous }
    : { shape: 'circle', dash: [5, 4], filled: false };

function legendSwatch(shape: MarkerShape, dash: string, filled: boolean): SVGSVGElement {
  return svg(
    'svg',
    { width: 30, height: 14, viewBox: '0 0 30 14', 'aria-hidden': 'true', class: 'swatch' },
    svg('line', { x1: 2, y1: 7, x2: 16, y2: 7, stroke: ink, 'stroke-width': 1.5, 'stroke-dasharray': dash }),
    svg('path', { d: markerPath(shape), transform: 'translate(17 1)', fill: filled ? ink : 'white', stroke: ink, 'stroke-width': 1.3 }),
  );
}

export function createSpectrumChart(host: HTMLElement, opts: SpectrumChartOptions): SpectrumChart {
  const height = opts.height ?? 300;
  const n = opts.x.length;
  const xs = Float64Array.from(opts.x);
  let ys = Float64Array.from(opts.y);
  if (opts.logY) {
    const floor = positiveFloor(ys);
    ys = ys.map((v) => (v > floor ? v : floor));
  }
  const bounds: XBounds = { min: n ? xs[0]! : 0, max: n ? xs[n - 1]! : 1 };

  const toHz = (x: number) => (opts.xUnit === 'Hz' ? x : opts.speedHz ? x * opts.speedHz : NaN);
  const toOrder = (x: number) => (opts.xUnit === 'order' ? x : opts.speedHz ? x / opts.speedHz : NaN);
  const matchedCount = opts.lines.filter((l) => l.matched).length;

  const readout = h('output', { class: 'readout', 'aria-live': 'off' }, 'Point at the chart to read frequency, order and amplitude.');
  const plotHost = h('div', {
    class: 'plot',
    tabindex: 0,
    role: 'img',
    'aria-label': `${opts.title}. ${n} points. ${opts.lines.length} predicted lines, ${matchedCount} matched. Arrow keys pan, plus and minus zoom, 0 resets.`,
  });
  const figure = h('figure', {
    class: 'chart spectrum-chart',
    'data-chart': opts.kind,
    'data-series-points': n,
    'data-log-y': opts.logY ? 'true' : 'false',
    'data-x-unit': opts.xUnit,
    'data-y-unit': opts.yUnit,
    'data-hypothesis': opts.hypothesis ?? '',
    'data-predicted-count': opts.lines.length,
    'data-matched-count': matchedCount,
    'data-predicted-lines': JSON.stringify(opts.lines.map((l) => ({ x: l.x, frequencyHz: l.frequencyHz, label: l.label, family: l.family, matched: l.matched }))),
    'data-drawn': '0',
  });

  let u: uPlot | null = null;
  const button = (label: string, text: string, act: () => void) =>
    h('button', { type: 'button', class: 'tool', 'aria-label': label, title: label, onclick: () => u && act() }, text);
  const tools = h(
    'div',
    { class: 'chart-tools', role: 'group', 'aria-label': `${opts.title} zoom and pan` },
    button('Zoom in', '+', () => zoomX(u!, bounds, 0.5)),
    button('Zoom out', '−', () => zoomX(u!, bounds, 2)),
    button('Pan left', '◀', () => panX(u!, bounds, -0.25)),
    button('Pan right', '▶', () => panX(u!, bounds, 0.25)),
    button('Show the whole range', 'all', () => setXRange(u!, bounds, bounds.min, bounds.max)),
  );

  const legend = h('div', { class: 'chart-legend' });
  if (opts.lines.length > 0) {
    const ambiguous = opts.lines.filter((l) => l.matched && l.ambiguous).length;
    legend.append(h('span', { class: 'legend-item' }, legendSwatch('triangle-down', '', true), `matched (${matchedCount - ambiguous})`));
    if (ambiguous) legend.append(h('span', { class: 'legend-item' }, legendSwatch('triangle-down', '', false), `matched, shared with another line (${ambiguous})`));
    legend.append(h('span', { class: 'legend-item' }, legendSwatch('circle', '5 4', false), `missing (${opts.lines.length - matchedCount})`));
    legend.append(h('span', { class: 'legend-families' }, familyCaptions(opts.lines).join(' · ')));
  } else {
    legend.append(h('span', { class: 'legend-item muted' }, opts.hypothesis ? 'This hypothesis predicts no lines on this chart.' : 'No hypothesis drawn.'));
  }

  figure.append(
    h('figcaption', {}, h('span', { class: 'chart-title' }, opts.title), h('span', { class: 'caption-right' }, readout, tools)),
    plotHost,
    legend,
  );
  host.append(figure);

  let drawCount = 0;
  const visible = (self: uPlot) => {
    const min = self.scales.x!.min!;
    const max = self.scales.x!.max!;
    return opts.lines.filter((l) => l.x >= min && l.x <= max);
  };
  const xOf = (self: uPlot, line: PredictedLine) => Math.round(self.valToPos(line.x, 'x', true)) + 0.5;

  // The vertical lines go behind the measured curve (drawAxes runs before the series), so a matched
  // peak stays visible on top of its prediction.
  const drawLinesBehind = (self: uPlot) => {
    const ctx = self.ctx;
    const px = uPlot.pxRatio;
    const { top, height: plotHeight } = self.bbox;
    ctx.save();
    for (const line of visible(self)) {
      const x = xOf(self, line);
      ctx.strokeStyle = familyColours[line.family];
      ctx.globalAlpha = line.matched ? 0.85 : 0.7;
      ctx.lineWidth = (line.matched ? 1.6 : 1.2) * px;
      ctx.setLineDash(lineStyle(line).dash.map((d) => d * px));
      ctx.beginPath();
      ctx.moveTo(x, top);
      ctx.lineTo(x, top + plotHeight);
      ctx.stroke();
    }
    ctx.restore();
  };

  // Markers above the plot area, after everything else; labels as text over the chart (placeLabels).
  const drawMarkers = (self: uPlot) => {
    const ctx = self.ctx;
    const px = uPlot.pxRatio;
    const { left, top, width } = self.bbox;
    ctx.save();
    ctx.beginPath();
    ctx.rect(left - 6 * px, 0, width + 12 * px, top);
    ctx.clip();
    const markerY = top - 6 * px;
    for (const line of visible(self)) {
      const x = xOf(self, line);
      const style = lineStyle(line);
      const colour = familyColours[line.family];
      traceMarker(ctx, style.shape, x, markerY, 8 * px);
      ctx.strokeStyle = colour;
      ctx.lineWidth = 1.4 * px;
      ctx.fillStyle = style.filled ? colour : '#fff';
      ctx.fill();
      if (!style.filled) ctx.stroke();
    }
    ctx.restore();
    placeLabels(self);
    drawCount += 1;
    figure.dataset.drawn = String(drawCount);
  };

  // Labels for the lines that matter most, never on top of each other: matched lines first, the strongest
  // measured peaks first among them, then the rest; at most MAX_LABELS, in two rows above the markers. A line
  // left unlabelled is named by the readout when the pointer is over it, and in the evidence table.
  const labelLayer = h('div', { class: 'line-labels', 'aria-hidden': 'true' });
  const placeLabels = (self: uPlot) => {
    labelLayer.replaceChildren();
    const ctx = self.ctx;
    ctx.save();
    ctx.font = `${LABEL_FONT_PX * uPlot.pxRatio}px system-ui, sans-serif`;
    const widthOf = (text: string) => ctx.measureText(text).width / uPlot.pxRatio + 4;
    ctx.restore();
    const overLeft = self.over.offsetLeft;
    const overTop = self.over.offsetTop;
    const plotWidth = self.over.clientWidth;
    const priority = (l: PredictedLine) => (l.matched ? 2 : 0) + (l.matched && !l.ambiguous ? 1 : 0);
    const candidates = visible(self)
      .filter((l) => l.label)
      .sort((p, q) => priority(q) - priority(p) || (q.measured ?? 0) - (p.measured ?? 0) || Math.abs(q.predicted) - Math.abs(p.predicted));
    const placed: Array<{ row: number; from: number; to: number }> = [];
    let shown = 0;
    for (const line of candidates) {
      if (shown >= MAX_LABELS) break;
      const centre = self.valToPos(line.x, 'x');
      const w = widthOf(line.label);
      const from = Math.max(-overLeft, Math.min(centre - w / 2, plotWidth - w + 8));
      const to = from + w;
      const row = [0, 1].find((r) => placed.every((b) => b.row !== r || to + LABEL_GAP_PX <= b.from || from >= b.to + LABEL_GAP_PX));
      if (row === undefined) continue;
      placed.push({ row, from, to });
      shown += 1;
      labelLayer.append(
        h(
          'span',
          {
            class: `line-label${line.matched ? ' matched' : ''}`,
            'data-frequency': line.frequencyHz,
            style: `left:${(overLeft + from).toFixed(1)}px;top:${(overTop - 16 - (row + 1) * LABEL_ROW_PX).toFixed(1)}px;width:${w.toFixed(1)}px`,
          },
          line.label,
        ),
      );
    }
    figure.dataset.labelsShown = String(shown);
  };

  const nearestLine = (xVal: number, pxTolerance: number, self: uPlot): PredictedLine | null => {
    let best: PredictedLine | null = null;
    let bestPx = pxTolerance;
    const cursorPx = self.valToPos(xVal, 'x');
    for (const line of opts.lines) {
      const d = Math.abs(self.valToPos(line.x, 'x') - cursorPx);
      if (d < bestPx) {
        bestPx = d;
        best = line;
      }
    }
    return best;
  };

  const updateReadout = (self: uPlot) => {
    const left = self.cursor.left ?? -1;
    if (left < 0 || self.cursor.idx === null || self.cursor.idx === undefined) return;
    const idx = self.cursor.idx;
    const xVal = xs[idx]!;
    const hz = toHz(xVal);
    const order = toOrder(xVal);
    const amplitude = opts.y[idx]!;
    const near = nearestLine(self.posToVal(left, 'x'), 6, self);
    readout.textContent =
      `${Number.isFinite(hz) ? `${formatNumber(hz, 5)} Hz` : '– Hz'} · ` +
      `order ${Number.isFinite(order) ? formatNumber(order, 4) : '–'} · ` +
      `${formatNumber(amplitude, 3)} ${opts.yUnit}` +
      (near ? ` · ${near.label || 'line'} (${near.matched ? (near.ambiguous ? 'matched, shared' : 'matched') : 'missing'})` : '');
  };

  const plotOptions: uPlot.Options = {
    width: Math.max(200, host.clientWidth || 800),
    height,
    // room above the plot for the markers and two rows of labels
    padding: [44, 12, 0, 4],
    legend: { show: false },
    scales: {
      x: { time: false, range: (_u, lo, hi) => [lo, hi] },
      y: opts.logY ? { distr: 3, log: 10 } : { range: (_u, _lo, hi) => [0, hi > 0 ? hi * 1.05 : 1] },
    },
    axes: [
      axis(opts.xLabel, { values: numberTicks, space: 60, size: 34 }),
      axis(opts.yUnit, { values: numberTicks, size: 56 }),
    ],
    series: [
      {},
      { label: opts.yUnit, stroke: okabeIto.blue, width: 1, points: { show: false } },
    ],
    cursor: { drag: { x: true, y: false, setScale: true }, points: { show: false }, y: false },
    hooks: {
      drawAxes: [drawLinesBehind],
      draw: [drawMarkers],
      setCursor: [updateReadout],
      setScale: [
        (self, key) => {
          if (key !== 'x') return;
          figure.dataset.xMin = String(self.scales.x!.min);
          figure.dataset.xMax = String(self.scales.x!.max);
        },
      ],
    },
  };

  u = new uPlot(plotOptions, [xs, ys], plotHost);
  plotHost.append(labelLayer);
  if (opts.initialRange && n > 1) setXRange(u, bounds, opts.initialRange.min, opts.initialRange.max);
  const stopWidth = trackWidth(plotHost, u, height);
  const stopZoom = attachZoomPan(u, plotHost, bounds);
  const stopKeys = attachKeys(u, plotHost, bounds);

  return {
    element: figure,
    range: () => (u ? { min: u.scales.x!.min!, max: u.scales.x!.max! } : null),
    destroy() {
      stopWidth();
      stopZoom();
      stopKeys();
      u?.destroy();
      u = null;
      figure.remove();
    },
  };
}
