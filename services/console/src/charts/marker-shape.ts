// Canvas marker shapes shared by charts, so meaning never rests on colour alone.

export type MarkerShape = 'circle' | 'square' | 'triangle' | 'triangle-down' | 'diamond';

/** Traces a marker of `size` (its full width, canvas pixels) centred on (x, y); the caller fills or strokes. */
export function traceMarker(ctx: CanvasRenderingContext2D, shape: MarkerShape, x: number, y: number, size: number): void {
  const r = size / 2;
  ctx.beginPath();
  switch (shape) {
    case 'circle':
      ctx.arc(x, y, r, 0, 2 * Math.PI);
      break;
    case 'square':
      ctx.rect(x - r * 0.85, y - r * 0.85, r * 1.7, r * 1.7);
      break;
    case 'triangle':
      ctx.moveTo(x, y - r);
      ctx.lineTo(x + r, y + r * 0.8);
      ctx.lineTo(x - r, y + r * 0.8);
      ctx.closePath();
      break;
    case 'triangle-down':
      ctx.moveTo(x, y + r);
      ctx.lineTo(x + r, y - r * 0.8);
      ctx.lineTo(x - r, y - r * 0.8);
      ctx.closePath();
      break;
    case 'diamond':
      ctx.moveTo(x, y - r * 1.15);
      ctx.lineTo(x + r, y);
      ctx.lineTo(x, y + r * 1.15);
      ctx.lineTo(x - r, y);
      ctx.closePath();
      break;
  }
}

/** The same shapes as SVG path data in a 12 × 12 box, for legends and badges. */
export function markerPath(shape: MarkerShape): string {
  switch (shape) {
    case 'circle':
      return 'M6 1a5 5 0 1 0 0.001 0z';
    case 'square':
      return 'M1.5 1.5h9v9h-9z';
    case 'triangle':
      return 'M6 1l5 9.5h-10z';
    case 'triangle-down':
      return 'M6 11l5-9.5h-10z';
    case 'diamond':
      return 'M6 0.5l5.2 5.5-5.2 5.5-5.2-5.5z';
  }
}
