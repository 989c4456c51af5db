/**
 * The Sun, the central body and the planets on the trajectory figure: a disc where the body lies inside the
 * plot, or — when the frame (fitted to the spacecraft's path) leaves it outside — a disc at the frame's edge on
 * the line from the plot's centre toward the body, with an arrow pointing at it.
 */
import { svg } from '../dom.ts';
import type { LabelPlacer, View } from './svg-kit.ts';

/** A body to mark: name, position in plot data coordinates (km along the projection's two axes), role. */
export interface BodyMark { body: string; label: string; u: number; v: number; kind: 'central' | 'approached' | 'other' }

/** Distance kept between an edge mark and the frame, SVG units: room for the arrow inside the frame. */
const EDGE_INSET = 18;

/** Where the ray from the plot area's centre toward (x, y) (SVG units) leaves the frame inset by EDGE_INSET. */
export function edgePoint(view: View, x: number, y: number): { x: number; y: number; dx: number; dy: number } {
  const cx = (view.left + view.right) / 2; const cy = (view.top + view.bottom) / 2;
  const len = Math.hypot(x - cx, y - cy) || 1;
  const dx = (x - cx) / len; const dy = (y - cy) / len;
  const halfW = (view.right - view.left) / 2 - EDGE_INSET; const halfH = (view.bottom - view.top) / 2 - EDGE_INSET;
  const t = Math.min(dx === 0 ? Infinity : halfW / Math.abs(dx), dy === 0 ? Infinity : halfH / Math.abs(dy));
  return { x: cx + dx * t, y: cy + dy * t, dx, dy };
}

function inside(view: View, x: number, y: number): boolean {
  return x >= view.left && x <= view.right && y >= view.top && y <= view.bottom;
}

/** One body's mark, as an SVG group carrying `data-testid="body-<name>"` and `data-placement` inside|edge. */
export function drawBody(view: View, m: BodyMark, labels: LabelPlacer): SVGGElement {
  const x = view.px(m.u); const y = view.py(m.v);
  const cls = `body-mark body-${m.kind}${m.body === 'sun' ? ' body-sun' : ''}`;
  if (inside(view, x, y)) {
    return svg('g', { class: cls, 'data-testid': `body-${m.body}`, 'data-placement': 'inside' },
      svg('circle', { cx: x, cy: y, r: m.kind === 'central' || m.body === 'sun' ? 6 : 4.5 }),
      labels.place(m.label, x, x + 8, y + 16, 'start'));
  }
  const e = edgePoint(view, x, y);
  const px = -e.dy; const py = e.dx; // perpendicular to the direction, for the arrow's base
  const tip = [e.x + e.dx * 15, e.y + e.dy * 15];
  const base = [e.x + e.dx * 7, e.y + e.dy * 7];
  const anchor = e.dx > 0.35 ? 'end' : e.dx < -0.35 ? 'start' : 'middle';
  return svg('g', { class: cls, 'data-testid': `body-${m.body}`, 'data-placement': 'edge' },
    svg('circle', { cx: e.x, cy: e.y, r: 4.5 }),
    svg('path', { class: 'edge-arrow', d: `M${tip[0]} ${tip[1]} L${base[0] + px * 5} ${base[1] + py * 5} L${base[0] - px * 5} ${base[1] - py * 5} Z` }),
    labels.place(m.label, e.x, e.x - e.dx * 10, e.y - e.dy * 12 + 4, anchor));
}
