/**
 * Plan review: what the planner proposes and how far to trust it — burns, targets requested vs achieved,
 * the B-plane and trajectory plots, dispersion, the independent cross-check — and the decision panel.
 */
import { ephemerisSourceLines } from '../../../contract/ephemeris-sets.ts';
import { api } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { h, replaceChildren, scrollingTable } from '../dom.ts';
import { duration, epochText, fixed, isoShort, kmsToMs, sig } from '../format.ts';
import type { ManeuverPlan, PlannedFiniteBurn, PlanSummary, TargetResult } from '../plan-types.ts';
import { bPlaneFigure } from '../plots/b-plane-plot.ts';
import { trajectoryFigure } from '../plots/trajectory-plot.ts';
import { planStateBadge } from './plans.ts';
import { reviewPanel } from './review-panel.ts';

const LOCAL_AXES = { RTN: ['R', 'T', 'N'], VNB: ['V', 'N', 'B'] } as const;

function burnTable(plan: ManeuverPlan): HTMLElement {
  const frameSelect = h('select', { id: 'burn-frame' }, h('option', { value: 'RTN' }, 'RTN'), h('option', { value: 'VNB' }, 'VNB'));
  const preferred = plan.burns.find((b) => b.frame !== 'inertial')?.frame;
  if (preferred === 'VNB') frameSelect.value = 'VNB';
  const table = h('table', { class: 'data burns', 'data-testid': 'burn-table' });
  const draw = (): void => {
    const local = frameSelect.value as 'RTN' | 'VNB';
    const axes = LOCAL_AXES[local];
    replaceChildren(table,
      h('caption', {}, `Burns — Δv in m/s; ${local} axes at the burn state relative to ${plan.forceModel.centralBody}; inertial = J2000 equatorial`),
      h('thead', {},
        h('tr', {}, h('th', { scope: 'col', rowspan: 2 }, 'Burn'), h('th', { scope: 'col', rowspan: 2 }, 'Epoch'),
          h('th', { scope: 'colgroup', colspan: 3 }, `Δv ${local} (m/s)`), h('th', { scope: 'colgroup', colspan: 3 }, 'Δv inertial (m/s)'),
          h('th', { scope: 'col', rowspan: 2 }, '|Δv| (m/s)'), h('th', { scope: 'col', rowspan: 2 }, 'Propellant (kg)'), h('th', { scope: 'col', rowspan: 2 }, 'Duration')),
        h('tr', {}, [...axes, 'x', 'y', 'z'].map((a) => h('th', { scope: 'col', class: 'num' }, a)))),
      h('tbody', {}, plan.burns.map((b) => {
        const dv = local === 'RTN' ? b.deltaVRtnKmS : b.deltaVVnbKmS;
        return h('tr', {},
          h('th', { scope: 'row' }, b.label, b.epochWasFree ? h('div', { class: 'small' }, 'epoch moved by the corrector') : null),
          h('td', { class: 'small' }, h('div', {}, 'UTC ', b.epoch.utc ? isoShort(b.epoch.utc) : '— (before 1972)'), h('div', {}, 'TDB ', b.epoch.tdb.replace(' TDB', ''))),
          dv.map((c) => h('td', { class: 'num' }, kmsToMs(c))),
          b.deltaVInertialKmS.map((c) => h('td', { class: 'num' }, kmsToMs(c))),
          h('td', { class: 'num strong' }, fixed(b.magnitudeMS, 3)),
          h('td', { class: 'num' }, fixed(b.propellantKg, 3)),
          h('td', { class: 'num' }, duration(b.durationS)));
      }), plan.burns.flatMap((b) => (b.model === 'finite' && b.finite ? [finiteBurnRow(b.label, b.finite)] : []))),
      h('tfoot', {}, h('tr', {}, h('th', { scope: 'row', colspan: 8 }, 'Total'), h('td', { class: 'num strong' }, fixed(plan.totalDeltaVMS, 3)),
        h('td', { class: 'num' }, fixed(plan.totalPropellantKg, 3)), h('td', {}))));
  };
  frameSelect.addEventListener('change', draw);
  draw();
  return h('div', {}, h('div', { class: 'field inline' }, h('label', { for: 'burn-frame' }, 'Local axes'), frameSelect), scrollingTable('Burns', table));
}

/** A finite burn's command line under the burn table: ignition, cut-off, thrust, direction, masses, loss. */
function finiteBurnRow(label: string, f: PlannedFiniteBurn): HTMLTableRowElement {
  const dir = (v: readonly number[]): string => `[${v.map((c) => c.toFixed(6)).join(', ')}]`;
  return h('tr', { class: 'finite-burn', 'data-testid': 'finite-burn-row' },
    h('th', { scope: 'row' }, `${label} (finite)`),
    h('td', { colspan: 10, class: 'small' },
      h('div', {}, `Ignition UTC ${f.start.utc ? isoShort(f.start.utc) : '—'} (TDB ${f.start.tdb.replace(' TDB', '')}), cut-off UTC ${f.end.utc ? isoShort(f.end.utc) : '—'}, duration ${fixed(f.durationS, 3)} s`),
      h('div', {}, `Thrust ${f.thrustN} N, mass flow ${f.massFlowKgS.toPrecision(6)} kg/s, mass ${fixed(f.massBeforeKg, 3)} → ${fixed(f.massAfterKg, 3)} kg`),
      h('div', {}, `Direction held in ${f.axes} axes ${dir(f.directionLocal)}; J2000 at ignition ${dir(f.directionInertial)}`),
      h('div', {}, `Ideal Δv ${fixed(f.idealDeltaVMS, 4)} m/s vs impulsive ${fixed(f.impulsiveDeltaVMS, 4)} m/s: finite-burn loss ${fixed(f.finiteBurnLossMS, 4)} m/s`),
      ...f.insideArc.map((note) => h('div', { class: 'strong' }, `Inside the arc: ${note}`))));
}

/** The leap-second table the plan's UTC epochs use (older plans do not record it). */
/** Which source served each body (file, SHA-256 and span, or the built-in series); plans made before sources
 * were recorded used the built-in series throughout. */
function ephemerisList(plan: ManeuverPlan): HTMLElement | string {
  const lines = ephemerisSourceLines(plan.ephemerisSources ?? []);
  if (lines.length === 0) return `built-in series throughout (${plan.forceModel.ephemeris})`;
  return h('ul', { class: 'plain small' }, lines.map((l) => h('li', { class: 'mono' }, l.replace(/^ephemeris /, ''))));
}

function leapSecondsText(plan: ManeuverPlan): string {
  const l = plan.leapSeconds;
  if (!l) return 'built-in table (not recorded in this plan)';
  const where = l.source === 'built-in' ? 'built-in table' : `${l.path} (SHA-256 ${l.sha256?.slice(0, 16) ?? '—'}…)`;
  return `${where}, expires ${l.expiresUtc}`;
}

function targetValue(t: TargetResult, which: 'requested' | 'achieved'): string {
  if (t.unit === 's' && t.requestedEpoch) {
    const e = which === 'requested' ? t.requestedEpoch : t.achievedEpoch;
    return e ? epochText(e) : '—';
  }
  const v = which === 'requested' ? t.requested : t.achieved;
  return v === null ? '—' : `${fixed(v, 3)} ${t.unit}`;
}

function targetTable(plan: ManeuverPlan): HTMLTableElement {
  return h('table', { class: 'data', 'data-testid': 'target-table' },
    h('caption', {}, 'Targets — requested versus achieved on the planned trajectory'),
    h('thead', {}, h('tr', {}, ['Target', 'Body', 'Requested', 'Achieved', 'Residual', 'Tolerance', 'Met'].map((c) => h('th', { scope: 'col' }, c)))),
    h('tbody', {}, plan.targets.map((t) => h('tr', {},
      h('th', { scope: 'row' }, t.component),
      h('td', {}, t.body ?? '—'),
      h('td', { class: 'num' }, targetValue(t, 'requested')),
      h('td', { class: 'num' }, targetValue(t, 'achieved')),
      h('td', { class: 'num' }, t.residual === null ? '—' : `${sig(t.residual, 3)} ${t.unit}`),
      h('td', { class: 'num' }, `${sig(t.tolerance, 3)} ${t.unit}`),
      h('td', { class: 'nowrap' }, t.met ? h('span', { class: 'ok' }, '✓ met') : h('span', { class: 'bad' }, '✗ not met'))))));
}

/** " with/without central-body switching" when the plan records it (older plans do not). */
function switchingText(on: boolean | undefined): string {
  return on === undefined ? '' : on ? ' with central-body switching' : ' without central-body switching';
}

function crossCheckSection(plan: ManeuverPlan): HTMLElement {
  const cc = plan.crossCheck;
  return h('section', { class: 'card', 'aria-labelledby': 'cc-heading', 'data-testid': 'cross-check' },
    h('h2', { id: 'cc-heading' }, 'Independent cross-check ', cc.passed ? h('span', { class: 'badge ok-badge' }, 'passed') : h('span', { class: 'badge bad-badge' }, 'failed')),
    h('p', {}, `Planned with ${cc.primaryMethod}${switchingText(cc.primarySwitching)}; re-propagated with ${cc.method}`
      + `${switchingText(cc.switching)} at relative tolerance ${sig(cc.relativeTolerance, 2)}. ${cc.message}`),
    cc.differences.length ? scrollingTable('Cross-check differences', h('table', { class: 'data' },
      h('caption', { class: 'sr-only' }, 'Cross-check differences per target component'),
      h('thead', {}, h('tr', {}, ['Component', 'Plan', 'Check', 'Difference', 'Allowed', 'Within'].map((c) => h('th', { scope: 'col' }, c)))),
      h('tbody', {}, cc.differences.map((d) => h('tr', {},
        h('th', { scope: 'row' }, d.component),
        h('td', { class: 'num' }, sig(d.primary, 9)), h('td', { class: 'num' }, sig(d.check, 9)),
        h('td', { class: 'num' }, sig(d.difference, 3)), h('td', { class: 'num' }, sig(d.allowed, 3)),
        h('td', {}, d.withinTolerance && d.metByCheck ? h('span', { class: 'ok' }, '✓') : h('span', { class: 'bad' }, '✗ no'))))))) : null);
}

function dispersionSection(plan: ManeuverPlan): HTMLElement {
  const lin = plan.dispersion.linear;
  const mc = plan.dispersion.monteCarlo;
  const rows: [string, string][] = [];
  if (lin?.total.bPlane) rows.push(['B-plane 1σ (linear)', `${fixed(lin.total.bPlane.semiMajorKm, 1)} × ${fixed(lin.total.bPlane.semiMinorKm, 1)} km`]);
  if (lin?.threeSigma) rows.push(['B-plane 3σ (linear)', `${fixed(lin.threeSigma.semiMajorKm, 1)} × ${fixed(lin.threeSigma.semiMinorKm, 1)} km`]);
  if (lin?.total.closestApproachSigmaS !== null && lin?.total.closestApproachSigmaS !== undefined) rows.push(['Closest-approach time 1σ', `${fixed(lin.total.closestApproachSigmaS, 1)} s`]);
  if (lin && lin.impactProbability !== null) rows.push(['Impact probability (linear)', sig(lin.impactProbability, 2)]);
  if (mc) {
    rows.push(['Monte Carlo', `${mc.samples} samples (seed ${mc.seed}), ${mc.impacts} impacts, ${mc.failedSamples} failed`]);
    rows.push(['Impact probability (Monte Carlo, 95 %)', `${sig(mc.impactProbability, 2)} [${sig(mc.impactProbabilityInterval.lower95, 2)}, ${sig(mc.impactProbabilityInterval.upper95, 2)}]`]);
    if (mc.linearAgreement) rows.push(['Linear vs Monte Carlo', `${mc.linearAgreement.passed ? 'agree' : 'DISAGREE'} — ${mc.linearAgreement.message}`]);
  }
  return h('section', { class: 'card', 'aria-labelledby': 'disp-heading' },
    h('h2', { id: 'disp-heading' }, 'Dispersion'),
    rows.length ? h('dl', { class: 'meta' }, rows.map(([k, v]) => [h('dt', {}, k), h('dd', {}, v)])) : null,
    plan.dispersion.notes.map((n) => h('p', { class: 'help' }, n)));
}

export const planReviewScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const planId = ctx.params.planId;
  const body = h('div', { class: 'review-body' }, h('p', {}, 'Loading the plan…'));
  const heading = h('h1', { tabindex: '-1' }, 'Plan review');
  const load = async (): Promise<void> => {
    try {
      const { summary, plan } = await api<{ summary: PlanSummary; plan: ManeuverPlan; notice: string }>(session, 'GET', `/v1/plans/${encodeURIComponent(planId)}`);
      replaceChildren(heading, `Plan review: ${plan.spacecraftName} `, planStateBadge(summary.state));
      const converged = plan.status === 'converged';
      replaceChildren(body,
        h('div', { class: 'review-main' },
          h('section', { class: 'card plan-head' },
            plan.title ? h('p', { class: 'lede' }, plan.title) : null,
            h('dl', { class: 'meta cols' },
              h('dt', {}, 'Plan'), h('dd', { class: 'mono' }, summary.planId),
              h('dt', {}, 'Job'), h('dd', { class: 'mono' }, h('a', { href: `#/jobs/${encodeURIComponent(summary.jobId)}` }, summary.jobId)),
              h('dt', {}, 'Submitted by'), h('dd', {}, summary.submittedBy, summary.submittedBy === session.name ? ' (you)' : ''),
              h('dt', {}, 'Proposed'), h('dd', {}, isoShort(summary.proposedAt)),
              h('dt', {}, 'Corrector'), h('dd', {}, converged ? `converged in ${plan.iterations.length} iterations` : h('span', { class: 'bad' }, `not converged — ${plan.convergence.message}`)),
              h('dt', {}, 'Initial state'), h('dd', {}, epochText(plan.createdFrom.initialEpoch)),
              h('dt', {}, 'Leap seconds'), h('dd', {}, leapSecondsText(plan)),
              h('dt', {}, 'Force model'), h('dd', {}, plan.forceModel.summary),
              h('dt', {}, 'Ephemeris'), h('dd', { 'data-testid': 'ephemeris-sources' }, ephemerisList(plan)),
              h('dt', {}, 'Software'), h('dd', {}, plan.softwareVersion),
              h('dt', {}, 'Problem hash'), h('dd', { class: 'mono small' }, plan.problemHash.slice(0, 16), '…')),
            h('p', {}, h('a', { href: `#/plans/${encodeURIComponent(planId)}/history` }, 'History and export of this plan'))),
          converged ? null : h('p', { class: 'card bad-card', role: 'alert' }, 'This plan did not converge. It is shown for diagnosis only and can never be approved.'),
          h('section', { class: 'card', 'aria-labelledby': 'burns-heading' }, h('h2', { id: 'burns-heading' }, 'Burns'), burnTable(plan)),
          h('section', { class: 'card', 'aria-labelledby': 'targets-heading' }, h('h2', { id: 'targets-heading' }, 'Targets'), scrollingTable('Targets', targetTable(plan))),
          plan.bPlane ? h('section', { class: 'card', 'aria-labelledby': 'bp-heading' }, h('h2', { id: 'bp-heading' }, 'B-plane'), bPlaneFigure(plan.bPlane)) : null,
          plan.trajectory.length ? h('section', { class: 'card', 'aria-labelledby': 'traj-heading' }, h('h2', { id: 'traj-heading' }, 'Trajectory'), trajectoryFigure(plan)) : null,
          crossCheckSection(plan),
          dispersionSection(plan)),
        h('aside', { class: 'review-side', 'aria-label': 'Decision' },
          summary.state !== 'proposed' ? h('p', { class: `card decided plan-${summary.state}`, role: 'status', 'data-testid': 'decided' },
            `This plan is ${summary.state}. `, h('a', { href: `#/plans/${encodeURIComponent(planId)}/history` }, 'See its history')) : null,
          reviewPanel({ session, summary, caveats: plan.caveats, onDecided: () => ctx.navigate(`#/plans/${encodeURIComponent(planId)}/history`) })));
    } catch (error) {
      replaceChildren(body, h('p', { class: 'error', role: 'alert' }, `Could not load plan ${planId}: ${(error as Error).message}`));
    }
  };
  void load();
  return { title: 'Plan review', node: h('section', {}, heading, body) };
};
