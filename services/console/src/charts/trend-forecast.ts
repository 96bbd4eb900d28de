import uPlot from 'uplot';
import type { LevelForecast, Trend } from '../api-types.js';
import { formatNumber } from '../format.js';
import { aheadInWords, boundaryLabels, crossingToDraw } from '../forecast-view.js';
import { ink, okabeIto } from '../palette.js';

// What a trend chart draws of its forecast: the zone boundaries with their values, the onset of the current rise
// (a dotted vertical line), and the soonest foreseen crossing — a dashed path from the last value to the crossing,
// its 10-90 % band in time, and a marker at the median crossing with its level and time in words.

export interface ForecastOverlay {
  crossing: LevelForecast | null;
  /** The last bucket's time and value, where the dashed path starts (s, value). */
  from: { t: number; value: number } | null;
  /** Crossing times (s since the epoch): median, low and high (null: beyond the horizon). */
  atS: number | null;
  lowAtS: number | null;
  highAtS: number | null;
  onsetS: number | null;
  boundaries: Array<{ value: number; label: string }>;
  /** How far the time axis must reach to show the crossing and its band. */
  xMax: number | null;
}

export function forecastOverlay(trend: Trend, lastT: number | null, lastValue: number | null): ForecastOverlay {
  const crossing = crossingToDraw(trend.forecast);
  // the forecast counts from the service's last value; without a crossing, the last bucket stands for it
  const lastAt = crossing?.crossingAt ? Date.parse(crossing.crossingAt) / 1000 - crossing.remainingS! : lastT;
  const at = (s: number | null) => (crossing && s !== null && lastAt !== null ? lastAt + s : null);
  const atS = crossing?.crossingAt ? Date.parse(crossing.crossingAt) / 1000 : null;
  const highAtS = at(crossing?.highS ?? null);
  return {
    crossing,
    from: lastAt !== null && lastValue !== null ? { t: lastAt, value: lastValue } : null,
    atS,
    lowAtS: at(crossing?.lowS ?? null),
    highAtS,
    onsetS: trend.forecast?.onsetAt ? Date.parse(trend.forecast.onsetAt) / 1000 : null,
    boundaries: boundaryLabels(trend.zoneBoundaries, (x) => formatNumber(x)),
    xMax: crossing ? (highAtS ?? atS) : null,
  };
}

/** Draws the overlay (a uPlot draw hook). */
export function drawForecastOverlay(u: uPlot, o: ForecastOverlay): void {
  const ctx = u.ctx;
  const px = uPlot.pxRatio;
  const { left, top, width, height } = u.bbox;
  const x = (t: number) => u.valToPos(t, 'x', true);
  const y = (v: number) => u.valToPos(v, 'y', true);
  ctx.save();
  ctx.font = `${10 * px}px system-ui, sans-serif`;
  // zone boundaries: a hairline and the value at the right edge, above the zone letter
  ctx.textAlign = 'right';
  ctx.textBaseline = 'bottom';
  for (const b of o.boundaries) {
    const yb = Math.round(y(b.value)) + 0.5;
    if (yb < top || yb > top + height) continue;
    ctx.strokeStyle = 'rgba(29,35,43,0.35)';
    ctx.lineWidth = px;
    ctx.beginPath();
    ctx.moveTo(left, yb);
    ctx.lineTo(left + width, yb);
    ctx.stroke();
    ctx.fillStyle = ink;
    ctx.fillText(b.label, left + width - 16 * px, yb - 1 * px);
  }
  // onset of the current rise
  if (o.onsetS !== null) {
    const xo = Math.round(x(o.onsetS)) + 0.5;
    if (xo >= left && xo <= left + width) {
      ctx.strokeStyle = okabeIto.reddishPurple;
      ctx.lineWidth = 1.5 * px;
      ctx.setLineDash([2 * px, 3 * px]);
      ctx.beginPath();
      ctx.moveTo(xo, top);
      ctx.lineTo(xo, top + height);
      ctx.stroke();
      ctx.setLineDash([]);
      ctx.fillStyle = okabeIto.reddishPurple;
      ctx.textAlign = 'left';
      ctx.textBaseline = 'top';
      ctx.fillText('onset', xo + 3 * px, top + 2 * px);
    }
  }
  const c = o.crossing;
  if (c && o.atS !== null && o.from) {
    // the 10-90 % band of the crossing time, as a shaded column
    const x0 = x(o.lowAtS ?? o.atS);
    const x1 = o.highAtS !== null ? x(o.highAtS) : left + width;
    ctx.fillStyle = 'rgba(213,94,0,0.12)';
    ctx.fillRect(Math.min(x0, x1), top, Math.abs(x1 - x0), height);
    // the median path from the last value to the crossing
    ctx.strokeStyle = okabeIto.vermillion;
    ctx.lineWidth = 1.6 * px;
    ctx.setLineDash([6 * px, 4 * px]);
    ctx.beginPath();
    ctx.moveTo(x(o.from.t), y(o.from.value));
    ctx.lineTo(x(o.atS), y(c.threshold));
    ctx.stroke();
    ctx.setLineDash([]);
    // a ring at the median crossing, and words
    ctx.beginPath();
    ctx.arc(x(o.atS), y(c.threshold), 4.5 * px, 0, 2 * Math.PI);
    ctx.fillStyle = '#ffffff';
    ctx.fill();
    ctx.strokeStyle = okabeIto.vermillion;
    ctx.stroke();
    ctx.fillStyle = okabeIto.vermillion;
    ctx.textAlign = 'right';
    ctx.textBaseline = 'top';
    ctx.fillText(`${c.level} in ~${aheadInWords(c.remainingS!)}`, Math.min(x(o.atS), left + width) - 6 * px, y(c.threshold) + 4 * px);
  }
  ctx.restore();
}
