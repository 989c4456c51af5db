/**
 * Trajectory figure: the plan's down-sampled path (central-body-relative, J2000 ecliptic, km) projected onto
 * the ecliptic (X–Y) or a side plane (X–Z, Y–Z), with the start, each burn, each closest approach and the
 * end marked (positions at those epochs by cubic Hermite interpolation of the tabulated states), and a scale bar.
 * The frame fits the spacecraft's path (and each approached body at its closest approach); the central body, the
 * Sun and the planets are marked where they are, or at the frame's edge with an arrow when outside (body-marks.ts).
 */
import { h, svg, uid } from '../dom.ts';
import { epochText, fixed } from '../format.ts';
import type { ManeuverPlan, TrajectoryPoint } from '../plan-types.ts';
import { drawBody, type BodyMark } from './body-marks.ts';
import { LabelPlacer, View, clipTo, niceStep } from './svg-kit.ts';

export const PROJECTIONS = {
  'ecliptic (X–Y)': [0, 1],
  'side (X–Z)': [0, 2],
  'side (Y–Z)': [1, 2],
} as const;
export type Projection = keyof typeof PROJECTIONS;
const AXIS_NAMES = ['X', 'Y', 'Z'];
const W = 720;
const H = 440;
const KM_PER_AU = 149_597_870.7; // IAU 2012 Resolution B2 (from memory)

/** Position at `tdbS` by cubic Hermite interpolation between the bracketing states; null outside the table. */
export function positionAt(points: TrajectoryPoint[], tdbS: number): [number, number, number] | null {
  if (points.length === 0 || tdbS < points[0].tdbS || tdbS > points[points.length - 1].tdbS) return null;
  let i = 0;
  while (i < points.length - 2 && points[i + 1].tdbS < tdbS) i += 1;
  const a = points[i]; const b = points[Math.min(i + 1, points.length - 1)];
  const dt = b.tdbS - a.tdbS;
  if (dt <= 0) return [...a.positionKm];
  const s = (tdbS - a.tdbS) / dt;
  const h00 = 2 * s ** 3 - 3 * s ** 2 + 1; const h10 = s ** 3 - 2 * s ** 2 + s;
  const h01 = -2 * s ** 3 + 3 * s ** 2; const h11 = s ** 3 - s ** 2;
  return [0, 1, 2].map((k) => h00 * a.positionKm[k] + h10 * dt * a.velocityKmS[k] + h01 * b.positionKm[k] + h11 * dt * b.velocityKmS[k]) as [number, number, number];
}

function capital(name: string): string {
  return name.charAt(0).toUpperCase() + name.slice(1);
}

function scaleLabel(km: number): string {
  const au = km / KM_PER_AU;
  return km >= 1e6 ? `${fixed(km / 1e6, km >= 1e7 ? 0 : 1)} million km (${fixed(au, au < 0.1 ? 3 : 2)} au)` : `${fixed(km, 0)} km`;
}

interface Mark { kind: 'start' | 'burn' | 'approach' | 'end'; label: string; at: [number, number, number] }

function drawMark(view: View, m: Mark, u: number, v: number, labels: LabelPlacer): SVGGElement {
  const x = view.px(m.at[u]); const y = view.py(m.at[v]);
  const g = svg('g', { class: `mk-${m.kind}` });
  if (m.kind === 'burn') g.append(svg('path', { d: `M${x} ${y - 9} L${x + 8} ${y + 6} L${x - 8} ${y + 6} Z` }));
  else if (m.kind === 'approach') g.append(svg('path', { d: `M${x} ${y - 8} L${x + 8} ${y} L${x} ${y + 8} L${x - 8} ${y} Z` }));
  else if (m.kind === 'start') g.append(svg('rect', { x: x - 5, y: y - 5, width: 10, height: 10 }));
  else g.append(svg('circle', { cx: x, cy: y, r: 5 }));
  // Labels sit on different sides per kind so markers close together (approach and end) stay readable.
  const place = { start: [-10, 18, 'end'], burn: [11, -9, 'start'], approach: [-12, -10, 'end'], end: [10, 18, 'start'] } as const;
  const [dx, dy, anchor] = place[m.kind];
  g.append(labels.place(m.label, x, x + dx, y + dy, anchor));
  return g;
}

/** The figure for one projection. */
export function trajectorySvg(plan: ManeuverPlan, projection: Projection): SVGSVGElement {
  const [u, v] = PROJECTIONS[projection];
  const pts = plan.trajectory;
  const titleId = uid('ttitle');
  const clip = uid('tclip');
  const approached = (plan.bodyPositions ?? []).filter((b) => b.at === 'closest-approach');
  const framed = pts.map((p) => p.positionKm).concat(approached.map((b) => b.positionKm));
  const xs = framed.map((p) => p[u]);
  const ys = framed.map((p) => p[v]);
  const minX = Math.min(...xs); const maxX = Math.max(...xs); const minY = Math.min(...ys); const maxY = Math.max(...ys);
  const margin = { left: 16, right: 16, top: 16, bottom: 46 };
  const plotW = W - margin.left - margin.right; const plotH = H - margin.top - margin.bottom;
  const spanKm = Math.max((maxX - minX) / plotW, (maxY - minY) / plotH) * Math.min(plotW, plotH) / 2 * 1.15 || 1;
  const view = new View(W, H, margin, [(minX + maxX) / 2, (minY + maxY) / 2], spanKm);
  const marks: Mark[] = [];
  if (pts.length) marks.push({ kind: 'start', label: 'start', at: pts[0].positionKm });
  for (const b of plan.burns) {
    const at = positionAt(pts, b.epoch.tdbS);
    if (at) marks.push({ kind: 'burn', label: b.label, at });
  }
  for (const a of plan.approaches) {
    const at = positionAt(pts, a.epoch.tdbS);
    if (at) marks.push({ kind: 'approach', label: `closest approach ${a.body}`, at });
  }
  if (pts.length > 1) marks.push({ kind: 'end', label: 'end', at: pts[pts.length - 1].positionKm });
  const path = pts.map((p, i) => `${i ? 'L' : 'M'}${view.px(p.positionKm[u]).toFixed(1)} ${view.py(p.positionKm[v]).toFixed(1)}`).join(' ');
  // Finite burns: the thrust arc from ignition to cut-off, drawn over the path (interpolated on the samples).
  const arcs = plan.burns.flatMap((b) => {
    const f = b.model === 'finite' ? b.finite : undefined;
    if (f === undefined) return [];
    const at = Array.from({ length: 25 }, (_, k) => positionAt(pts, f.startTdbS + (k / 24) * f.durationS)).filter((x) => x !== null);
    if (at.length < 2) return [];
    const d = at.map((p, i) => `${i ? 'L' : 'M'}${view.px(p[u]).toFixed(1)} ${view.py(p[v]).toFixed(1)}`).join(' ');
    return [svg('path', { d, class: 'burn-arc', 'data-testid': 'burn-arc' }, svg('title', {}, `${b.label}: thrust arc, ${f.durationS.toFixed(1)} s`))];
  });
  const bar = niceStep((view.x1 - view.x0) / 5);
  const barPx = bar * view.scale;
  const centre = plan.forceModel.centralBody;
  const labels = new LabelPlacer(view);
  const bodies: BodyMark[] = [{ body: centre, label: capital(centre), u: 0, v: 0, kind: 'central' },
    ...(plan.bodyPositions ?? []).map((b): BodyMark => ({
      body: b.body, u: b.positionKm[u], v: b.positionKm[v], kind: b.at === 'closest-approach' ? 'approached' : 'other',
      label: capital(b.body),
    }))];
  // Labels of the marks first: they take precedence in the placement over the bodies' labels.
  const markEls = marks.map((m) => drawMark(view, m, u, v, labels));
  const bodyEls = bodies.map((b) => drawBody(view, b, labels));
  return svg('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot', role: 'img', 'aria-labelledby': titleId },
    svg('title', { id: titleId }, `Trajectory of ${plan.spacecraftName} relative to ${centre}, projected on the ${projection} plane, with burns and closest approaches marked`),
    svg('defs', {}, clipTo(view, clip)),
    svg('rect', { x: view.left, y: view.top, width: view.right - view.left, height: view.bottom - view.top, class: 'frame' }),
    svg('rect', { x: view.left, y: view.top, width: view.right - view.left, height: view.bottom - view.top, class: 'plot-area', 'data-testid': 'plot-area' }),
    svg('g', { 'clip-path': `url(#${clip})` },
      bodyEls, // beneath the path and the marks (an approached body sits under its closest-approach mark)
      svg('path', { d: path, class: 'traj', 'data-testid': 'trajectory-path' }),
      arcs,
      markEls),
    // Axis directions (from the lower-left corner) and the scale bar (lower right).
    svg('g', { class: 'axes-key' },
      svg('line', { x1: view.left + 14, y1: view.bottom - 14, x2: view.left + 54, y2: view.bottom - 14 }),
      svg('line', { x1: view.left + 14, y1: view.bottom - 14, x2: view.left + 14, y2: view.bottom - 54 }),
      svg('text', { x: view.left + 58, y: view.bottom - 10 }, `+${AXIS_NAMES[u]}`),
      svg('text', { x: view.left + 8, y: view.bottom - 58 }, `+${AXIS_NAMES[v]}`)),
    svg('g', { class: 'scale-bar', 'data-testid': 'scale-bar' },
      svg('line', { x1: view.right - barPx - 10, x2: view.right - 10, y1: H - 22, y2: H - 22 }),
      svg('line', { x1: view.right - barPx - 10, x2: view.right - barPx - 10, y1: H - 27, y2: H - 17 }),
      svg('line', { x1: view.right - 10, x2: view.right - 10, y1: H - 27, y2: H - 17 }),
      svg('text', { x: view.right - 10 - barPx / 2, y: H - 6, 'text-anchor': 'middle' }, scaleLabel(bar))));
}

/** Legend lines for the bodies: the approached ones at closest approach, the others at the initial epoch. */
function bodyLegend(plan: ManeuverPlan): HTMLElement[] {
  const all = plan.bodyPositions ?? [];
  const others = all.filter((b) => b.at === 'initial');
  return [
    h('li', {}, h('span', { class: 'sw sw-central', 'aria-hidden': 'true' }), `${capital(plan.forceModel.centralBody)} (central body, origin)`),
    ...all.filter((b) => b.at === 'closest-approach').map((b) => h('li', {}, h('span', { class: 'sw sw-approached', 'aria-hidden': 'true' }),
      `${capital(b.body)} at closest approach ${epochText(b.epoch)}`)),
    ...(others.length ? [h('li', {}, h('span', { class: 'sw sw-other', 'aria-hidden': 'true' }),
      `${others.map((b) => capital(b.body)).join(', ')} at the start ${epochText(others[0].epoch)}`)] : []),
    h('li', { class: 'small' }, 'A body outside the plot is marked at its edge, the arrow pointing toward it.'),
  ];
}

/** The figure with its projection chooser and a legend listing every marker with its epoch. */
export function trajectoryFigure(plan: ManeuverPlan): HTMLElement {
  const selectId = uid('proj');
  const select = h('select', { id: selectId }, Object.keys(PROJECTIONS).map((p) => h('option', { value: p }, p)));
  const holder = h('div', { class: 'plot-holder' }, trajectorySvg(plan, 'ecliptic (X–Y)'));
  select.addEventListener('change', () => holder.replaceChildren(trajectorySvg(plan, select.value as Projection)));
  const legend = h('ul', { class: 'legend' },
    h('li', {}, h('span', { class: 'sw sw-start', 'aria-hidden': 'true' }), `Start ${epochText(plan.createdFrom.initialEpoch)}`),
    plan.burns.map((b) => h('li', {}, h('span', { class: 'sw sw-burn', 'aria-hidden': 'true' }), `${b.label} ${epochText(b.epoch)} (${fixed(b.magnitudeMS, 3)} m/s)`
      + (b.model === 'finite' && b.finite ? ` — finite burn from ignition, thrust arc of ${fixed(b.finite.durationS, 1)} s drawn thick` : ''))),
    plan.approaches.map((a) => h('li', {}, h('span', { class: 'sw sw-approach', 'aria-hidden': 'true' }), `Closest approach to ${a.body} ${epochText(a.epoch)}: ${fixed(a.altitudeKm, 1)} km altitude`)),
    h('li', {}, h('span', { class: 'sw sw-end', 'aria-hidden': 'true' }), `End ${epochText(plan.createdFrom.endEpoch)}`),
    bodyLegend(plan));
  return h('figure', { class: 'figure', 'data-testid': 'trajectory-plot' },
    h('figcaption', {}, h('strong', {}, 'Trajectory'), ` relative to ${plan.forceModel.centralBody}, J2000 ecliptic axes (X toward the vernal equinox), km.`),
    h('div', { class: 'field inline' }, h('label', { for: selectId }, 'Projection'), select),
    holder, legend);
}
