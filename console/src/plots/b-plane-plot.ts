/**
 * B-plane figure drawn from the plan: the whole plane (body disc, impact radius, aim point) and a close
 * view around the aim point (target, achieved point, 1σ and 3σ dispersion ellipses, Monte Carlo samples).
 * Axes B·T (right) and B·R (up) in km; the reference plane that defines T is named in the caption.
 */
import { h, svg, uid } from '../dom.ts';
import { fixed } from '../format.ts';
import type { BPlaneEllipse, PlanBPlane } from '../plan-types.ts';
import { View, clipTo, grid } from './svg-kit.ts';

const W = 460;
const H = 400;
const MARGIN = { left: 62, right: 14, top: 14, bottom: 44 };

/** A k-σ dispersion ellipse centred at (cx, cy) km in the view. */
export function ellipse(view: View, cx: number, cy: number, e: BPlaneEllipse, k: number, cls: string): SVGEllipseElement {
  // Data angle from T toward R; SVG y is flipped, so the rotation turns the other way.
  return svg('ellipse', {
    cx: view.px(cx), cy: view.py(cy), rx: e.semiMajorKm * k * view.scale, ry: e.semiMinorKm * k * view.scale,
    transform: `rotate(${-e.orientationDeg} ${view.px(cx)} ${view.py(cy)})`, class: cls,
  });
}

function marker(view: View, x: number, y: number, kind: 'target' | 'achieved'): SVGGElement {
  const X = view.px(x); const Y = view.py(y);
  if (kind === 'target') {
    return svg('g', { class: 'mk-target' },
      svg('circle', { cx: X, cy: Y, r: 7 }),
      svg('line', { x1: X - 11, x2: X + 11, y1: Y, y2: Y }), svg('line', { x1: X, x2: X, y1: Y - 11, y2: Y + 11 }));
  }
  return svg('g', { class: 'mk-achieved' }, svg('circle', { cx: X, cy: Y, r: 4.5 }));
}

function panel(bp: PlanBPlane, view: View, title: string, showSamples: boolean): SVGSVGElement {
  const clip = uid('bclip');
  const titleId = uid('btitle');
  const ax = bp.achievedBDotTKm ?? bp.targetBDotTKm;
  const ay = bp.achievedBDotRKm ?? bp.targetBDotRKm;
  const body = svg('g', { 'clip-path': `url(#${clip})` });
  if (bp.impactRadiusKm) body.append(svg('circle', { cx: view.px(0), cy: view.py(0), r: bp.impactRadiusKm * view.scale, class: 'impact-circle' }));
  body.append(svg('circle', { cx: view.px(0), cy: view.py(0), r: bp.bodyRadiusKm * view.scale, class: 'body-disc' }));
  if (showSamples) {
    const dots = svg('g', { class: 'samples' });
    for (const s of bp.samples) dots.append(svg('circle', { cx: view.px(s.bDotTKm), cy: view.py(s.bDotRKm), r: 1.6 }));
    body.append(dots);
  }
  if (bp.ellipse) {
    body.append(ellipse(view, ax, ay, bp.ellipse, 3, 'sigma3'));
    body.append(ellipse(view, ax, ay, bp.ellipse, 1, 'sigma1'));
  }
  body.append(marker(view, bp.targetBDotTKm, bp.targetBDotRKm, 'target'));
  if (bp.achievedBDotTKm !== null && bp.achievedBDotRKm !== null) body.append(marker(view, ax, ay, 'achieved'));
  const midX = (view.left + view.right) / 2;
  const midY = (view.top + view.bottom) / 2;
  return svg('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot', role: 'img', 'aria-labelledby': titleId },
    svg('title', { id: titleId }, title),
    svg('defs', {}, clipTo(view, clip)),
    grid(view, 5),
    body,
    svg('text', { x: midX, y: H - 8, 'text-anchor': 'middle', class: 'axis-label' }, 'B·T (km) →'),
    svg('text', { x: 14, y: midY, 'text-anchor': 'middle', class: 'axis-label', transform: `rotate(-90 14 ${midY})` }, 'B·R (km) →'));
}

/** The figure: two panels, a legend and a caption naming the body and reference plane. */
export function bPlaneFigure(bp: PlanBPlane): HTMLElement {
  const ax = bp.achievedBDotTKm ?? bp.targetBDotTKm;
  const ay = bp.achievedBDotRKm ?? bp.targetBDotRKm;
  const sigma3 = bp.ellipse ? 3 * bp.ellipse.semiMajorKm : 0;
  const far = Math.max(bp.impactRadiusKm ?? bp.bodyRadiusKm, Math.hypot(ax, ay) + sigma3, Math.hypot(bp.targetBDotTKm, bp.targetBDotRKm));
  const whole = new View(W, H, MARGIN, [0, 0], far * 1.12);
  const miss = Math.hypot(ax - bp.targetBDotTKm, ay - bp.targetBDotRKm);
  const closeHalf = Math.max(sigma3 * 1.25, miss * 2.5, 5);
  const close = new View(W, H, MARGIN, [bp.targetBDotTKm, bp.targetBDotRKm], closeHalf);
  const plane = bp.referencePlane === 'ecliptic' ? 'J2000 mean ecliptic' : 'J2000 mean Earth equator';
  const body = bp.body.charAt(0).toUpperCase() + bp.body.slice(1);
  const legend = h('ul', { class: 'legend' },
    h('li', {}, h('span', { class: 'sw sw-target', 'aria-hidden': 'true' }), `Target B·T ${fixed(bp.targetBDotTKm, 1)} km, B·R ${fixed(bp.targetBDotRKm, 1)} km`),
    h('li', {}, h('span', { class: 'sw sw-achieved', 'aria-hidden': 'true' }), bp.achievedBDotTKm === null ? 'Achieved point: not found' : `Achieved B·T ${fixed(bp.achievedBDotTKm, 3)} km, B·R ${fixed(bp.achievedBDotRKm, 3)} km`),
    bp.ellipse ? h('li', {}, h('span', { class: 'sw sw-sigma1', 'aria-hidden': 'true' }), `1σ ellipse ${fixed(bp.ellipse.semiMajorKm, 1)} × ${fixed(bp.ellipse.semiMinorKm, 1)} km, major axis ${fixed(bp.ellipse.orientationDeg, 1)}° from T toward R`) : h('li', {}, 'No dispersion ellipse (no execution-error model or not converged)'),
    bp.ellipse ? h('li', {}, h('span', { class: 'sw sw-sigma3', 'aria-hidden': 'true' }), `3σ ellipse ${fixed(3 * bp.ellipse.semiMajorKm, 1)} × ${fixed(3 * bp.ellipse.semiMinorKm, 1)} km`) : null,
    h('li', {}, h('span', { class: 'sw sw-body', 'aria-hidden': 'true' }), `${body} radius ${fixed(bp.bodyRadiusKm, 1)} km`),
    bp.impactRadiusKm ? h('li', {}, h('span', { class: 'sw sw-impact', 'aria-hidden': 'true' }), `Impact radius (gravity-focused) ${fixed(bp.impactRadiusKm, 1)} km`) : null,
    bp.samples.length ? h('li', {}, h('span', { class: 'sw sw-samples', 'aria-hidden': 'true' }), `${bp.samples.length} Monte Carlo samples`) : null);
  return h('figure', { class: 'figure', 'data-testid': 'b-plane-plot' },
    h('figcaption', {}, h('strong', {}, `B-plane at ${body}`), ` — T axis in the ${plane} (reference plane: ${bp.referencePlane}); B·T and B·R in km.`),
    h('div', { class: 'panels' },
      h('div', {}, h('p', { class: 'panel-title' }, 'Whole plane'), panel(bp, whole, `B-plane at ${body}, whole plane: body radius, impact radius and aim point`, false)),
      h('div', {}, h('p', { class: 'panel-title' }, `Around the aim point (±${fixed(closeHalf, closeHalf < 10 ? 1 : 0)} km)`), panel(bp, close, `B-plane at ${body}, around the aim point: target, achieved point, 1σ and 3σ ellipses`, true))),
    legend);
}
