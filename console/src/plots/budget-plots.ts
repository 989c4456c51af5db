/**
 * Figures of a Δv budget study: the histogram of one burn's |Δv| over the samples (m/s, equal bins from 0,
 * with the 95th and 99th percentiles marked), and the delivery dispersion in the B-plane (mean delivered
 * point, 1σ and 3σ sample ellipses, sample points; B·T right, B·R up, km).
 */
import type { BudgetSummary, BurnBudgetSummary } from '../../../contract/index.ts';
import { h, svg, uid } from '../dom.ts';
import { fixed } from '../format.ts';
import { ellipse } from './b-plane-plot.ts';
import { View, clipTo, grid, ticks } from './svg-kit.ts';

const W = 460;
const H = 240;
const M = { left: 52, right: 14, top: 12, bottom: 40 };

/** Histogram of one burn's |Δv| (m/s) with Δv95 and Δv99 marked. */
export function deltaVHistogram(burn: BurnBudgetSummary, path: string): HTMLElement {
  const titleId = uid('htitle');
  const { counts, binWidthMS } = burn.histogram;
  const top = Math.max(1, ...counts);
  const maxX = binWidthMS * counts.length;
  const x = (v: number): number => M.left + (v / maxX) * (W - M.left - M.right);
  const y = (c: number): number => H - M.bottom - (c / top) * (H - M.top - M.bottom);
  const g = svg('g', { class: 'bars' });
  counts.forEach((c, i) => {
    if (c > 0) g.append(svg('rect', { x: x(i * binWidthMS), y: y(c), width: Math.max(0.5, x(binWidthMS) - x(0) - 0.5), height: H - M.bottom - y(c), class: 'bar' }));
  });
  const axis = svg('g', { class: 'grid' });
  for (const t of ticks(0, maxX, 5)) {
    axis.append(svg('line', { x1: x(t), x2: x(t), y1: M.top, y2: H - M.bottom, class: 'grid-line' }));
    axis.append(svg('text', { x: x(t), y: H - M.bottom + 14, 'text-anchor': 'middle', class: 'tick' }, fixed(t, t < 1 ? 3 : 2)));
  }
  for (const t of ticks(0, top, 4)) axis.append(svg('text', { x: M.left - 5, y: y(t) + 4, 'text-anchor': 'end', class: 'tick' }, String(Math.round(t))));
  axis.append(svg('rect', { x: M.left, y: M.top, width: W - M.left - M.right, height: H - M.top - M.bottom, class: 'frame' }));
  const mark = (v: number, label: string, cls: string) => svg('g', { class: cls },
    svg('line', { x1: x(v), x2: x(v), y1: M.top, y2: H - M.bottom }), svg('text', { x: x(v) - 3, y: M.top + 12, 'text-anchor': 'end', class: 'mk-label' }, label));
  const d = burn.deltaVMS;
  return h('figure', { class: 'figure', 'data-testid': 'budget-histogram' },
    h('figcaption', {}, h('strong', {}, `${burn.label} (${path})`), ` — |Δv| over ${d.count} samples: mean ${fixed(d.mean, 4)} m/s, σ ${fixed(d.sigma, 4)} m/s, Δv95 ${fixed(d.p95, 4)} m/s, Δv99 ${fixed(d.p99, 4)} m/s.`),
    svg('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot', role: 'img', 'aria-labelledby': titleId },
      svg('title', { id: titleId }, `Histogram of ${burn.label} Δv magnitude, ${path} path`),
      axis, g, mark(d.p95, 'Δv95', 'mk-p95'), mark(d.p99, 'Δv99', 'mk-p99'),
      svg('text', { x: (M.left + W - M.right) / 2, y: H - 6, 'text-anchor': 'middle', class: 'axis-label' }, '|Δv| (m/s) →'),
      svg('text', { x: 12, y: (M.top + H - M.bottom) / 2, 'text-anchor': 'middle', class: 'axis-label', transform: `rotate(-90 12 ${(M.top + H - M.bottom) / 2})` }, 'samples')));
}

/** Delivery dispersion in the B-plane from the samples; null without a B-plane target. */
export function deliveryFigure(summary: BudgetSummary): HTMLElement | null {
  const e = summary.delivery.bPlane;
  const mt = summary.delivery.meanBDotTKm;
  const mr = summary.delivery.meanBDotRKm;
  if (!e || mt === null || mr === null) return null;
  const height = 400;
  const view = new View(W, height, { left: 62, right: 14, top: 14, bottom: 44 }, [mt, mr], 3.6 * e.semiMajorKm);
  const clip = uid('dclip');
  const titleId = uid('dtitle');
  const body = svg('g', { 'clip-path': `url(#${clip})` });
  const dots = svg('g', { class: 'samples' });
  for (const p of summary.delivery.points) dots.append(svg('circle', { cx: view.px(p.bDotTKm), cy: view.py(p.bDotRKm), r: 1.6 }));
  body.append(dots, ellipse(view, mt, mr, e, 3, 'sigma3'), ellipse(view, mt, mr, e, 1, 'sigma1'),
    svg('g', { class: 'mk-achieved' }, svg('circle', { cx: view.px(mt), cy: view.py(mr), r: 4.5 })));
  const midY = (view.top + view.bottom) / 2;
  return h('figure', { class: 'figure', 'data-testid': 'budget-delivery' },
    h('figcaption', {}, h('strong', {}, `Delivery (${summary.path})`), ` — mean B·T ${fixed(mt, 2)} km, B·R ${fixed(mr, 2)} km; 1σ ellipse ${fixed(e.semiMajorKm, 2)} × ${fixed(e.semiMinorKm, 2)} km at ${fixed(e.orientationDeg, 1)}° from T toward R; 3σ dashed; closest-approach time σ ${fixed(summary.delivery.closestApproachSigmaS, 2)} s.`),
    svg('svg', { viewBox: `0 0 ${W} ${height}`, class: 'plot', role: 'img', 'aria-labelledby': titleId },
      svg('title', { id: titleId }, `Delivered B-plane points and dispersion ellipses, ${summary.path} path`),
      svg('defs', {}, clipTo(view, clip)), grid(view, 5), body,
      svg('text', { x: (view.left + view.right) / 2, y: height - 8, 'text-anchor': 'middle', class: 'axis-label' }, 'B·T (km) →'),
      svg('text', { x: 14, y: midY, 'text-anchor': 'middle', class: 'axis-label', transform: `rotate(-90 14 ${midY})` }, 'B·R (km) →')));
}
