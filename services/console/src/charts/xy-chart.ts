import uPlot from 'uplot';
import { h, svg } from '../dom.js';
import { formatNumber } from '../format.js';
import { seriesColours } from '../palette.js';
import { attachKeys, attachZoomPan, axis, numberTicks, positiveFloor, trackWidth, type XBounds } from './chart-base.js';

// A plain x–y chart for the signature explorer: lines or stems, each series with its own dash so
// the legend reads without colour. `annotate` draws extras (labels, crossings) after the series.

export interface XySeries {
  label: string;
  y: ArrayLike<number | null>;
  colour?: string;
  dash?: number[];
  width?: number;
}

export interface XyChartOptions {
  kind: string;
  title: string;
  xLabel: string;
  yLabel: string;
  x: ArrayLike<number>;
  series: XySeries[];
  stems?: boolean;
  logY?: boolean;
  height?: number;
  yRange?: [number, number];
  annotate?: (u: uPlot) => void;
  /** write each series' label at the right end of its curve (for charts whose curves share a colour) */
  endLabels?: boolean;
  attributes?: Record<string, string | number>;
}

export interface XyChart {
  element: HTMLElement;
  destroy(): void;
}

const dashes = [[], [6, 3], [2, 2], [8, 3, 2, 3], [1, 3], [12, 4]];

// Vertical lines from the axis to each value: a stem plot, so discrete lines never read as a curve.
const stemPaths: uPlot.Series.PathBuilder = (u, seriesIdx, idx0, idx1) => {
  const stroke = new Path2D();
  const xs = u.data[0];
  const ys = u.data[seriesIdx]!;
  const base = u.valToPos(u.scales.y!.distr === 3 ? u.scales.y!.min! : Math.max(0, u.scales.y!.min!), 'y', true);
  for (let i = idx0; i <= idx1; i++) {
    const v = ys[i];
    if (v === null || v === undefined) continue;
    const x = Math.round(u.valToPos(xs[i]!, 'x', true));
    stroke.moveTo(x, base);
    stroke.lineTo(x, u.valToPos(v, 'y', true));
    stroke.moveTo(x + 2.5 * uPlot.pxRatio, u.valToPos(v, 'y', true));
    stroke.arc(x, u.valToPos(v, 'y', true), 2.5 * uPlot.pxRatio, 0, 2 * Math.PI);
  }
  return { stroke, fill: undefined, clip: undefined, band: undefined, gaps: undefined, flags: 0 } as unknown as uPlot.Series.Paths;
};

export function createXyChart(host: HTMLElement, opts: XyChartOptions): XyChart {
  const height = opts.height ?? 240;
  const xs = Float64Array.from(opts.x);
  const figure = h('figure', {
    class: 'chart xy-chart',
    'data-chart': opts.kind,
    'data-series': opts.series.length,
    'data-series-points': xs.length,
    ...(opts.attributes ?? {}),
  });
  const readout = h('output', { class: 'readout', 'aria-live': 'off' }, '');
  const plotHost = h('div', { class: 'plot', tabindex: 0, role: 'img', 'aria-label': `${opts.title}: ${opts.series.map((s) => s.label).join(', ')}` });
  const legend = h('div', { class: 'chart-legend' });
  opts.series.forEach((s, i) => {
    const colour = s.colour ?? seriesColours[i % seriesColours.length]!;
    const dash = s.dash ?? dashes[i % dashes.length]!;
    legend.append(
      h(
        'span',
        { class: 'legend-item' },
        svg('svg', { width: 26, height: 10, viewBox: '0 0 26 10', 'aria-hidden': 'true', class: 'swatch' }, svg('line', { x1: 1, y1: 5, x2: 25, y2: 5, stroke: colour, 'stroke-width': 2, 'stroke-dasharray': dash.join(' ') })),
        s.label,
      ),
    );
  });
  figure.append(h('figcaption', {}, h('span', { class: 'chart-title' }, opts.title), readout), plotHost, legend);
  host.append(figure);

  if (xs.length === 0) {
    plotHost.append(h('p', { class: 'msg msg-empty' }, 'Nothing to draw.'));
    return { element: figure, destroy: () => figure.remove() };
  }

  const data: uPlot.AlignedData = [
    xs,
    ...opts.series.map((s) => {
      const ys = Array.from(s.y, (v) => (v === null || !Number.isFinite(v) ? null : v));
      if (!opts.logY) return ys;
      const floor = positiveFloor(ys.map((v) => v ?? 0));
      return ys.map((v) => (v === null ? null : Math.max(v, floor)));
    }),
  ];
  // Each curve's name at its right end. Labels are spread apart vertically (one row each, in the order of their
  // curves' ends) so none covers another; those the plot has no room for are left to the legend below.
  const drawEndLabels = (u: uPlot) => {
    const c = u.ctx;
    const px = uPlot.pxRatio;
    const row = 12 * px;
    c.save();
    c.font = `${10 * px}px system-ui, sans-serif`;
    c.textAlign = 'right';
    c.textBaseline = 'bottom';
    const wanted: Array<{ i: number; text: string; x: number; y: number; w: number }> = [];
    opts.series.forEach((s, i) => {
      const ys = u.data[i + 1]!;
      // the last visible point of the curve
      let j = ys.length - 1;
      while (j >= 0 && (ys[j] === null || ys[j] === undefined || (u.data[0][j] as number) > u.scales.x!.max!)) j--;
      if (j < 0) return;
      const y = u.valToPos(ys[j] as number, 'y', true) - 2 * px;
      if (y < u.bbox.top || y > u.bbox.top + u.bbox.height + row) return;
      const text = s.label.split(' · ')[0]!;
      const x = Math.min(u.valToPos(u.data[0][j] as number, 'x', true), u.bbox.left + u.bbox.width) - 3 * px;
      wanted.push({ i, text, x, y: Math.max(u.bbox.top + row, y), w: c.measureText(text).width });
    });
    wanted.sort((a, b) => a.y - b.y);
    const placed: typeof wanted = [];
    for (const label of wanted) {
      // a label whose box would reach into an earlier one's box moves down a row at a time
      let y = label.y;
      const clash = (yy: number) => placed.some((p) => yy - row < p.y && yy > p.y - row && label.x - label.w < p.x && label.x > p.x - p.w);
      while (clash(y)) y += row;
      if (y > u.bbox.top + u.bbox.height) continue;
      placed.push({ ...label, y });
    }
    for (const p of placed) {
      c.fillStyle = 'rgba(255,255,255,0.85)';
      c.fillRect(p.x - p.w - 2 * px, p.y - row, p.w + 4 * px, row);
      c.fillStyle = opts.series[p.i]!.colour ?? seriesColours[p.i % seriesColours.length]!;
      c.fillText(p.text, p.x, p.y);
    }
    c.restore();
    // the boxes in CSS pixels of the plot, for checks that no two overlap
    figure.dataset.endLabels = JSON.stringify(placed.map((p) => ({ text: p.text, left: (p.x - p.w - 2 * px) / px, right: (p.x + 2 * px) / px, top: (p.y - row) / px, bottom: p.y / px })));
  };
  const bounds: XBounds = { min: Math.min(...xs), max: Math.max(...xs) };
  const options: uPlot.Options = {
    width: Math.max(200, host.clientWidth || 500),
    height,
    legend: { show: false },
    padding: [12, 14, 0, 4],
    scales: {
      x: {
        time: false,
        range: (_u, lo, hi) => {
          if (lo === hi) return [lo - 1, hi + 1];
          if (!opts.stems) return [lo, hi];
          // stems of a spectrum stand on a frequency axis from 0, so the first line sits clear of the frame
          const pad = (hi - lo) * 0.04;
          return [lo >= 0 ? 0 : lo - pad, hi + pad];
        },
      },
      // on a log axis a stem needs room below its value, or the smallest line stands at the axis with no height
      y: opts.logY
        ? { distr: 3, log: 10, ...(opts.stems ? { range: (_u: uPlot, lo: number, hi: number) => [10 ** Math.floor(Math.log10(lo / 1.5)), hi * 2] as [number, number] } : {}) }
        : opts.yRange
          ? { range: () => opts.yRange! }
          : {},
    },
    axes: [axis(opts.xLabel, { values: numberTicks, space: 60, size: 34 }), axis(opts.yLabel, { values: numberTicks, size: 54 })],
    series: [
      {},
      ...opts.series.map((s, i) => ({
        label: s.label,
        stroke: s.colour ?? seriesColours[i % seriesColours.length]!,
        width: s.width ?? 1.5,
        dash: s.dash ?? dashes[i % dashes.length]!,
        points: { show: false },
        spanGaps: false,
        ...(opts.stems ? { paths: stemPaths } : {}),
      })),
    ],
    cursor: { drag: { x: true, y: false, setScale: true }, y: false },
    hooks: {
      draw: [...(opts.endLabels ? [drawEndLabels] : []), ...(opts.annotate ? [opts.annotate] : [])],
      setCursor: [
        (u) => {
          const i = u.cursor.idx;
          if (i === null || i === undefined) return;
          readout.textContent = `${opts.xLabel} ${formatNumber(xs[i]!, 4)}: ` + opts.series.map((s) => `${s.label} ${formatNumber(s.y[i] ?? NaN)}`).slice(0, 4).join(' · ');
        },
      ],
    },
  };
  const u = new uPlot(options, data, plotHost);
  const stopWidth = trackWidth(plotHost, u, height);
  const stopZoom = attachZoomPan(u, plotHost, bounds);
  const stopKeys = attachKeys(u, plotHost, bounds);
  return {
    element: figure,
    destroy() {
      stopWidth();
      stopZoom();
      stopKeys();
      u.destroy();
      figure.remove();
    },
  };
}
