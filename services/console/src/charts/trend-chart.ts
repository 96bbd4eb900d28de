import uPlot from 'uplot';
import type { Trend, Zone } from '../api-types.js';
import { h } from '../dom.js';
import { displayUnit, formatDateTime, formatNumber, indicatorName } from '../format.js';
import { ink, okabeIto } from '../palette.js';
import { zoneFill } from '../zone.js';
import { levelRange } from '../forecast-view.js';
import { axis, numberTicks, trackWidth } from './chart-base.js';
import { traceMarker } from './marker-shape.js';
import { drawForecastOverlay, forecastOverlay } from './trend-forecast.js';

// One indicator over time: bucket means with a min–max band, the ISO zone bands behind (letters at
// the right edge, boundaries with their values), the point's alarm (long dashes) and trip (short dashes,
// heavier) levels, and the forecast (trend-forecast.ts): onset, and the soonest crossing with its band.

export interface TrendChart {
  element: HTMLElement;
  destroy(): void;
}

interface Band {
  zone: Zone;
  from: number;
  to: number;
}

export function zoneBands(boundaries: Trend['zoneBoundaries']): Band[] {
  if (!boundaries) return [];
  return [
    { zone: 'A', from: 0, to: boundaries.ab },
    { zone: 'B', from: boundaries.ab, to: boundaries.bc },
    { zone: 'C', from: boundaries.bc, to: boundaries.cd },
    { zone: 'D', from: boundaries.cd, to: Infinity },
  ];
}

export function createTrendChart(host: HTMLElement, trend: Trend, height = 170): TrendChart {
  const buckets = trend.buckets;
  const t = Float64Array.from(buckets, (b) => new Date(b.start).getTime() / 1000);
  const mean = Float64Array.from(buckets, (b) => b.mean);
  const min = Float64Array.from(buckets, (b) => b.min);
  const max = Float64Array.from(buckets, (b) => b.max);
  const bands = zoneBands(trend.zoneBoundaries);
  const alarm = trend.alarmLevel ?? null;
  const trip = trend.tripLevel ?? null;
  const name = indicatorName(trend.indicator);
  const lastBucket = buckets[buckets.length - 1];
  const unit = displayUnit(trend.unit);
  const overlay = forecastOverlay(trend, t.length ? t[t.length - 1]! : null, lastBucket ? lastBucket.last : null);
  // the running speed is an operating condition, not a level graded from zero: its axis spans its own range
  const fromZero = trend.indicator !== 'speed_rpm';

  const figure = h('figure', {
    class: 'chart trend-chart',
    'data-chart': 'trend',
    'data-indicator': trend.indicator,
    'data-buckets': buckets.length,
    'data-zone-bands': bands.length,
    'data-alarm-level': alarm ?? '',
    'data-trip-level': trip ?? '',
    'data-zone-labels': JSON.stringify(overlay.boundaries.map((b) => b.label)),
    'data-onset-at': trend.forecast?.onsetAt ?? '',
    'data-forecast-level': overlay.crossing?.level ?? '',
    'data-forecast-crossing-at': overlay.crossing?.crossingAt ?? '',
    'data-forecast-low-s': overlay.crossing?.lowS ?? '',
    'data-forecast-high-s': overlay.crossing?.highS ?? '',
  });
  const plotHost = h('div', {
    class: 'plot',
    role: 'img',
    'aria-label': `${name} by ${trend.bucket}, ${buckets.length} buckets${lastBucket ? `, last mean ${formatNumber(lastBucket.mean)} ${unit}` : ''}${alarm !== null ? `, alarm at ${formatNumber(alarm)}` : ''}${trip !== null ? `, trip at ${formatNumber(trip)}` : ''}.`,
  });
  const readout = h('output', { class: 'readout', 'aria-live': 'off' }, lastBucket ? `last: ${formatNumber(lastBucket.last)} ${unit}` : 'no data');
  figure.append(h('figcaption', {}, h('span', { class: 'chart-title' }, `${name}`, h('span', { class: 'unit' }, ` ${unit}`)), readout), plotHost);
  host.append(figure);

  if (buckets.length === 0) {
    plotHost.append(h('p', { class: 'msg msg-empty' }, 'No values in this period.'));
    return { element: figure, destroy: () => figure.remove() };
  }

  const drawBands = (u: uPlot) => {
    if (bands.length === 0) return;
    const ctx = u.ctx;
    const { left, width } = u.bbox;
    const yMin = u.scales.y!.min!;
    const yMax = u.scales.y!.max!;
    ctx.save();
    ctx.font = `600 ${11 * uPlot.pxRatio}px system-ui, sans-serif`;
    ctx.textAlign = 'right';
    ctx.textBaseline = 'middle';
    for (const band of bands) {
      const lo = Math.max(band.from, yMin);
      const hi = Math.min(band.to, yMax);
      if (hi <= lo) continue;
      const yTop = u.valToPos(hi, 'y', true);
      const yBottom = u.valToPos(lo, 'y', true);
      ctx.fillStyle = zoneFill[band.zone];
      ctx.fillRect(left, yTop, width, yBottom - yTop);
      if (yBottom - yTop > 12 * uPlot.pxRatio) {
        ctx.fillStyle = 'rgba(29,35,43,0.55)';
        ctx.fillText(band.zone, left + width - 4 * uPlot.pxRatio, (yTop + yBottom) / 2);
      }
    }
    ctx.restore();
  };

  const drawLevels = (u: uPlot) => {
    const ctx = u.ctx;
    const px = uPlot.pxRatio;
    const { left, width } = u.bbox;
    ctx.save();
    ctx.font = `${10 * px}px system-ui, sans-serif`;
    ctx.textAlign = 'left';
    ctx.textBaseline = 'bottom';
    const level = (value: number, label: string, dash: number[], lineWidth: number) => {
      const y = Math.round(u.valToPos(value, 'y', true)) + 0.5;
      ctx.strokeStyle = ink;
      ctx.lineWidth = lineWidth * px;
      ctx.setLineDash(dash.map((d) => d * px));
      ctx.beginPath();
      ctx.moveTo(left, y);
      ctx.lineTo(left + width, y);
      ctx.stroke();
      ctx.setLineDash([]);
      ctx.fillStyle = ink;
      ctx.fillText(`${label} ${formatNumber(value)}`, left + 4 * px, y - 2 * px);
    };
    if (alarm !== null) level(alarm, 'alarm', [8, 4], 1.2);
    if (trip !== null) level(trip, 'trip', [3, 2], 2);
    // Buckets in alarm get a triangle, in trip a diamond, on top of the mean line.
    buckets.forEach((b, i) => {
      if (b.alarmState !== 'alarm' && b.alarmState !== 'trip') return;
      const x = u.valToPos(t[i]!, 'x', true);
      const y = u.valToPos(mean[i]!, 'y', true);
      traceMarker(ctx, b.alarmState === 'trip' ? 'diamond' : 'triangle', x, y, 9 * px);
      ctx.fillStyle = okabeIto.vermillion;
      ctx.fill();
      ctx.strokeStyle = ink;
      ctx.lineWidth = px;
      ctx.stroke();
    });
    ctx.restore();
  };

  let dataMax = 0;
  let dataMin = Infinity;
  for (const v of max) if (Number.isFinite(v) && v > dataMax) dataMax = v;
  for (const v of min) if (Number.isFinite(v) && v < dataMin) dataMin = v;
  const top = Math.max(dataMax, alarm ?? 0, trip ?? 0, overlay.crossing?.threshold ?? 0) * 1.12 || 1;
  const yRange: [number, number] = fromZero ? [0, top] : levelRange(dataMin, dataMax);
  figure.dataset.yMin = String(yRange[0]);
  const xEnd = overlay.xMax;

  const options: uPlot.Options = {
    width: Math.max(200, host.clientWidth || 400),
    height,
    legend: { show: false },
    padding: [8, 10, 0, 0],
    scales: {
      x: { time: true, range: (_u, lo, hi) => [lo, xEnd !== null && xEnd > hi ? xEnd + 0.03 * (xEnd - lo) : hi] },
      y: { range: () => yRange },
    },
    axes: [axis('', { space: 70, size: 30 }), axis('', { values: numberTicks, size: 44 })],
    series: [
      {},
      { label: 'max', stroke: 'rgba(0,114,178,0.35)', width: 1, points: { show: false } },
      { label: 'min', stroke: 'rgba(0,114,178,0.35)', width: 1, points: { show: false } },
      { label: 'mean', stroke: okabeIto.blue, width: 1.6, points: { show: true, size: 4, stroke: okabeIto.blue, fill: okabeIto.blue } },
    ],
    bands: [{ series: [1, 2], fill: 'rgba(0,114,178,0.12)' }],
    cursor: { drag: { x: false, y: false }, y: false, points: { size: 7 } },
    hooks: {
      drawClear: [drawBands],
      draw: [drawLevels, (u) => drawForecastOverlay(u, overlay)],
      setCursor: [
        (u) => {
          const i = u.cursor.idx;
          if (i === null || i === undefined) return;
          const b = buckets[i]!;
          readout.textContent = `${formatDateTime(b.start).slice(0, 10)}: mean ${formatNumber(b.mean)}, ${formatNumber(b.min)}–${formatNumber(b.max)} ${unit} (${b.count})${b.zone ? ` · zone ${b.zone}` : ''}${b.alarmState && b.alarmState !== 'normal' ? ` · ${b.alarmState}` : ''}`;
        },
      ],
    },
  };
  const u = new uPlot(options, [t, max, min, mean], plotHost);
  const stopWidth = trackWidth(plotHost, u, height);
  return {
    element: figure,
    destroy() {
      stopWidth();
      u.destroy();
      figure.remove();
    },
  };
}
