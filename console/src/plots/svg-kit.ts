/** Shared plot pieces: nice tick steps, an equal-aspect view box mapping data km to SVG units, number labels. */
import { svg } from '../dom.ts';
import { fixed } from '../format.ts';

/** 1, 2 or 5 × 10^k at or above `raw`. */
export function niceStep(raw: number): number {
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p;
}

/** Ticks covering [min, max] at a nice step giving about `count` intervals. */
export function ticks(min: number, max: number, count: number): number[] {
  const step = niceStep((max - min) / count);
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

/** Tick label: plain km, or thousands/millions with a suffix when large. */
export function tickLabel(km: number, step: number): string {
  const a = Math.max(Math.abs(km), step);
  if (a >= 1e7) return `${fixed(km / 1e6, Math.max(0, -Math.floor(Math.log10(step / 1e6))))}M`;
  return fixed(km, Math.max(0, -Math.floor(Math.log10(step))));
}

/**
 * An equal-aspect mapping of a data window (centre, half-width in km along the shorter side) into a plot
 * area inside a `width`×`height` SVG; data y points up, SVG y points down.
 */
export class View {
  readonly scale: number;
  readonly x0: number; readonly x1: number; readonly y0: number; readonly y1: number;
  constructor(
    readonly width: number, readonly height: number,
    readonly margin: { left: number; right: number; top: number; bottom: number },
    centre: [number, number], halfSpanKm: number,
  ) {
    const w = width - margin.left - margin.right;
    const hgt = height - margin.top - margin.bottom;
    this.scale = Math.min(w, hgt) / (2 * halfSpanKm);
    const halfX = w / 2 / this.scale; const halfY = hgt / 2 / this.scale;
    this.x0 = centre[0] - halfX; this.x1 = centre[0] + halfX;
    this.y0 = centre[1] - halfY; this.y1 = centre[1] + halfY;
  }
  px(x: number): number { return this.margin.left + (x - this.x0) * this.scale; }
  py(y: number): number { return this.margin.top + (this.y1 - y) * this.scale; }
  get left(): number { return this.margin.left; }
  get right(): number { return this.width - this.margin.right; }
  get top(): number { return this.margin.top; }
  get bottom(): number { return this.height - this.margin.bottom; }
}

/** Grid lines with labels on the left and bottom edges, and a frame. */
export function grid(view: View, count: number): SVGGElement {
  const g = svg('g', { class: 'grid' });
  const xs = ticks(view.x0, view.x1, count);
  const ys = ticks(view.y0, view.y1, Math.round(count * (view.y1 - view.y0) / (view.x1 - view.x0)) || 1);
  const stepX = xs.length > 1 ? xs[1] - xs[0] : 1;
  const stepY = ys.length > 1 ? ys[1] - ys[0] : 1;
  for (const x of xs) {
    g.append(svg('line', { x1: view.px(x), x2: view.px(x), y1: view.top, y2: view.bottom, class: x === 0 ? 'axis-zero' : 'grid-line' }));
    g.append(svg('text', { x: view.px(x), y: view.bottom + 14, 'text-anchor': 'middle', class: 'tick' }, tickLabel(x, stepX)));
  }
  for (const y of ys) {
    g.append(svg('line', { x1: view.left, x2: view.right, y1: view.py(y), y2: view.py(y), class: y === 0 ? 'axis-zero' : 'grid-line' }));
    g.append(svg('text', { x: view.left - 5, y: view.py(y) + 4, 'text-anchor': 'end', class: 'tick' }, tickLabel(y, stepY)));
  }
  g.append(svg('rect', { x: view.left, y: view.top, width: view.right - view.left, height: view.bottom - view.top, class: 'frame' }));
  return g;
}

/** A clip path for the plot area, so large circles do not spill over the labels. */
export function clipTo(view: View, id: string): SVGClipPathElement {
  return svg('clipPath', { id }, svg('rect', { x: view.left, y: view.top, width: view.right - view.left, height: view.bottom - view.top }));
}

/**
 * Text labels inside a plot area that neither leave it nor cover one another: a label that would cross the
 * area's left or right side is mirrored to the other side of its point (then held inside), and one that would
 * overlap a label placed before it moves a line at a time toward the area's middle. Widths are estimated
 * from the character count (the figure's label font, about 6.4 SVG units per character).
 */
export class LabelPlacer {
  private readonly taken: { x0: number; x1: number; y0: number; y1: number }[] = [];
  constructor(private readonly view: View, private readonly charWidth = 6.4, private readonly lineHeight = 13) {}

  /** A label for the point (pointX, ·) wanted at (x, y) (baseline) with `anchor`. */
  place(text: string, pointX: number, x: number, y: number, anchor: 'start' | 'end' | 'middle', cls = 'mk-label'): SVGTextElement {
    const v = this.view;
    const w = text.length * this.charWidth;
    let x0 = anchor === 'start' ? x : anchor === 'end' ? x - w : x - w / 2;
    if (x0 < v.left + 2 && anchor === 'end') x0 = 2 * pointX - x;
    if (x0 + w > v.right - 2 && anchor === 'start') x0 = 2 * pointX - x - w;
    x0 = Math.min(Math.max(x0, v.left + 2), v.right - 2 - w);
    const step = y < (v.top + v.bottom) / 2 ? this.lineHeight : -this.lineHeight;
    let yb = Math.min(Math.max(y, v.top + this.lineHeight), v.bottom - 3);
    for (let k = 0; k < 12 && this.overlaps(x0, x0 + w, yb - this.lineHeight + 3, yb + 3); k++) yb += step;
    this.taken.push({ x0, x1: x0 + w, y0: yb - this.lineHeight + 3, y1: yb + 3 });
    return svg('text', { x: x0, y: yb, 'text-anchor': 'start', class: cls }, text);
  }

  private overlaps(x0: number, x1: number, y0: number, y1: number): boolean {
    return this.taken.some((b) => x0 < b.x1 && x1 > b.x0 && y0 < b.y1 && y1 > b.y0);
  }
}
