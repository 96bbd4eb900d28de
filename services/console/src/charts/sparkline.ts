import type { SparklineBucket } from '../api-types.js';
import { svg } from '../dom.js';
import { formatNumber } from '../format.js';
import { ink, okabeIto } from '../palette.js';

// A word-sized line of weekly means: shape only, no axes; the last value gets a dot.

export function sparkline(buckets: readonly SparklineBucket[], describe: string, width = 96, height = 22): SVGSVGElement {
  const values = buckets.map((b) => b.mean).filter((v) => Number.isFinite(v));
  const box = svg('svg', {
    width,
    height,
    viewBox: `0 0 ${width} ${height}`,
    class: 'sparkline',
    preserveAspectRatio: 'none',
    role: 'img',
    'aria-label': values.length ? `${describe}: ${values.length} weeks, from ${formatNumber(values[0])} to ${formatNumber(values[values.length - 1])}` : `${describe}: no history`,
    'data-points': values.length,
  });
  if (values.length === 0) return box;
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const span = hi - lo || Math.abs(hi) || 1;
  const pad = 2.5;
  const x = (i: number) => (values.length === 1 ? width / 2 : pad + (i * (width - 2 * pad)) / (values.length - 1));
  const y = (v: number) => height - pad - ((v - lo) / span) * (height - 2 * pad);
  const points = values.map((v, i) => `${x(i).toFixed(1)},${y(v).toFixed(1)}`).join(' ');
  box.append(
    svg('line', { x1: pad, x2: width - pad, y1: height - pad, y2: height - pad, stroke: 'rgba(29,35,43,0.15)', 'stroke-width': 1 }),
    svg('polyline', { points, fill: 'none', stroke: okabeIto.blue, 'stroke-width': 1.4, 'stroke-linejoin': 'round' }),
    svg('circle', { cx: x(values.length - 1), cy: y(values[values.length - 1]!), r: 2.2, fill: ink }),
  );
  return box;
}
