import uPlot from 'uplot';
import { formatNumber } from '../format.js';
import { gridInk, ink } from '../palette.js';

// Shared uPlot settings and interactions: axis style, width tracking, wheel zoom, drag pan, keys.

export const chartFont = '11px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
export const labelFont = '600 11px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';

export function axis(label: string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label,
    stroke: ink,
    font: chartFont,
    labelFont,
    labelSize: 16,
    grid: { stroke: gridInk, width: 1 },
    ticks: { stroke: gridInk, width: 1, size: 4 },
    ...extra,
  };
}

export function numberTicks(_u: uPlot, splits: number[]): string[] {
  return splits.map((v) => formatNumber(v, 3));
}

/** Keeps the chart as wide as its host; returns the stop function. */
export function trackWidth(host: HTMLElement, u: uPlot, height: number): () => void {
  let last = 0;
  const observer = new ResizeObserver(() => {
    const width = Math.max(200, Math.floor(host.clientWidth));
    if (width !== last) {
      last = width;
      u.setSize({ width, height });
    }
  });
  observer.observe(host);
  return () => observer.disconnect();
}

export interface XBounds {
  min: number;
  max: number;
}

/** Sets the x scale inside the data bounds, keeping at least a sliver of span. */
export function setXRange(u: uPlot, bounds: XBounds, min: number, max: number): void {
  const full = bounds.max - bounds.min;
  let span = Math.min(Math.max(max - min, full * 1e-5), full);
  let lo = Math.max(bounds.min, min);
  if (lo + span > bounds.max) lo = bounds.max - span;
  if (!Number.isFinite(lo) || !Number.isFinite(span) || span <= 0) return;
  span = Math.max(span, Number.EPSILON);
  u.setScale('x', { min: lo, max: lo + span });
}

export function zoomX(u: uPlot, bounds: XBounds, factor: number, centre?: number): void {
  const min = u.scales.x!.min!;
  const max = u.scales.x!.max!;
  const c = centre ?? (min + max) / 2;
  setXRange(u, bounds, c - (c - min) * factor, c + (max - c) * factor);
}

export function panX(u: uPlot, bounds: XBounds, fraction: number): void {
  const min = u.scales.x!.min!;
  const max = u.scales.x!.max!;
  const shift = (max - min) * fraction;
  setXRange(u, bounds, min + shift, max + shift);
}

/**
 * Wheel zooms around the pointer; shift-drag, middle-drag or a touch drag pans. Plain drag keeps
 * uPlot's own box zoom. Moves are batched to one redraw per animation frame, so panning a spectrum
 * of tens of thousands of points stays smooth.
 */
export function attachZoomPan(u: uPlot, plotHost: HTMLElement, bounds: XBounds): () => void {
  let pending: { min: number; max: number } | null = null;
  let frame = 0;
  const schedule = (min: number, max: number) => {
    pending = { min, max };
    if (!frame) {
      frame = requestAnimationFrame(() => {
        frame = 0;
        if (pending) setXRange(u, bounds, pending.min, pending.max);
        pending = null;
      });
    }
  };

  const onWheel = (e: WheelEvent) => {
    e.preventDefault();
    const rect = u.over.getBoundingClientRect();
    const centre = u.posToVal(e.clientX - rect.left, 'x');
    const base = pending ?? { min: u.scales.x!.min!, max: u.scales.x!.max! };
    const factor = e.deltaY < 0 ? 0.8 : 1.25;
    schedule(centre - (centre - base.min) * factor, centre + (base.max - centre) * factor);
  };

  let drag: { startX: number; min: number; max: number; id: number } | null = null;
  const onPointerDown = (e: PointerEvent) => {
    const wantsPan = e.shiftKey || e.button === 1 || e.pointerType === 'touch';
    if (!wantsPan || !u.over.contains(e.target as Node)) return;
    // Capture phase: stop uPlot's own box selection from starting.
    e.stopPropagation();
    e.preventDefault();
    drag = { startX: e.clientX, min: u.scales.x!.min!, max: u.scales.x!.max!, id: e.pointerId };
    plotHost.setPointerCapture(e.pointerId);
  };
  const onPointerMove = (e: PointerEvent) => {
    if (!drag || e.pointerId !== drag.id) return;
    const perPx = (drag.max - drag.min) / u.over.clientWidth;
    const shift = -(e.clientX - drag.startX) * perPx;
    schedule(drag.min + shift, drag.max + shift);
  };
  const onPointerUp = (e: PointerEvent) => {
    if (drag && e.pointerId === drag.id) {
      drag = null;
      if (plotHost.hasPointerCapture(e.pointerId)) plotHost.releasePointerCapture(e.pointerId);
    }
  };
  const stopMouse = (e: MouseEvent) => {
    if (e.shiftKey || e.button === 1) e.stopPropagation();
  };

  u.over.addEventListener('wheel', onWheel, { passive: false });
  plotHost.addEventListener('pointerdown', onPointerDown, true);
  plotHost.addEventListener('mousedown', stopMouse, true);
  plotHost.addEventListener('pointermove', onPointerMove);
  plotHost.addEventListener('pointerup', onPointerUp);
  plotHost.addEventListener('pointercancel', onPointerUp);
  return () => {
    if (frame) cancelAnimationFrame(frame);
    u.over.removeEventListener('wheel', onWheel);
    plotHost.removeEventListener('pointerdown', onPointerDown, true);
    plotHost.removeEventListener('mousedown', stopMouse, true);
    plotHost.removeEventListener('pointermove', onPointerMove);
    plotHost.removeEventListener('pointerup', onPointerUp);
    plotHost.removeEventListener('pointercancel', onPointerUp);
  };
}

/** Arrow keys pan, + and − zoom, 0 resets, when the plot has keyboard focus. */
export function attachKeys(u: uPlot, plotHost: HTMLElement, bounds: XBounds): () => void {
  const onKey = (e: KeyboardEvent) => {
    if (e.key === 'ArrowLeft') panX(u, bounds, -0.2);
    else if (e.key === 'ArrowRight') panX(u, bounds, 0.2);
    else if (e.key === '+' || e.key === '=') zoomX(u, bounds, 0.5);
    else if (e.key === '-' || e.key === '_') zoomX(u, bounds, 2);
    else if (e.key === '0' || e.key === 'Home') setXRange(u, bounds, bounds.min, bounds.max);
    else return;
    e.preventDefault();
  };
  plotHost.addEventListener('keydown', onKey);
  return () => plotHost.removeEventListener('keydown', onKey);
}

/** Smallest positive value, for a floor under a log axis (zeros cannot be drawn on it). */
export function positiveFloor(values: ArrayLike<number>): number {
  let minPositive = Infinity;
  let max = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (v > 0 && v < minPositive) minPositive = v;
    if (v > max) max = v;
  }
  if (!Number.isFinite(minPositive)) return 1e-12;
  // never more than eight decades below the top, so noise-free zeros do not flatten the plot
  return Math.max(minPositive, max * 1e-8);
}
