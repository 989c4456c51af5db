/**
 * The independent cross-check: the final burns re-propagated with the other method (Encke if the plan
 * used Cowell and vice versa) AND the other central-body treatment (switching on if the plan ran without
 * it, off if with it) at a tolerance 100 times tighter, every target compared. It passes when each
 * component differs by at most `crossCheckToleranceFraction` × its tolerance AND the re-propagation itself
 * meets every target. Same ephemeris and force model: it checks the numerics and the formulation (an error
 * in either method or in the switched equations disagrees), not the models.
 * Finite-burn arcs run about the central body without switching, and in Cowell form whenever the STM
 * rides along (their partials exist in that form only): the plan's arcs are Cowell. The check flies them
 * in Encke form whatever the plan's method (for an Encke plan: Cowell coasts, Encke arcs), so the arcs'
 * formulation is varied too; the message says so.
 */
import type { CrossCheck } from '../../contract/plan-types.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import { hasFiniteBurns } from './finite-stage.ts';
import type { PlanningContext } from './planning-context.ts';

/** Runs the cross-check of `settings` whose primary target values are `primary`. */
export async function runCrossCheck(ctx: PlanningContext, settings: BurnSetting[], primary: number[], signal?: AbortSignal): Promise<{ check: CrossCheck; propagations: number; evaluations: number }> {
  const fm = ctx.problem.forceModel;
  const method = fm.method === 'cowell' ? 'encke' : 'cowell';
  const relativeTolerance = Math.max(1e-13, fm.relativeTolerance / 100);
  const switching = !fm.switching;
  const fraction = ctx.problem.limits.crossCheckToleranceFraction;
  let ev: Awaited<ReturnType<typeof evaluateTrajectory>>;
  try {
    ev = await evaluateTrajectory(ctx.evaluation, settings, { withStm: false, method, arcMethod: 'encke', switching, relativeTolerance, signal });
  } catch (error) {
    if ((error as Error).name === 'CancelledError') throw error;
    ev = { ok: false, reason: `${(error as Error).name}: ${(error as Error).message}`, impact: null, burns: [] };
  }
  const base = {
    primaryMethod: fm.method, method, primarySwitching: fm.switching, switching, relativeTolerance, toleranceFraction: fraction,
  } as const;
  const how = `${method}${switching ? ' with' : ' without'} central-body switching`;
  const comps = ctx.components.slice(0, ctx.targetCount);
  if (!ev.ok) {
    return {
      check: {
        ...base, passed: false, message: `the ${how} re-propagation failed: ${ev.reason}`,
        differences: comps.map((c, i) => ({
          component: c.component, targetIndex: c.targetIndex, primary: primary[i], check: null, difference: null,
          allowed: fraction * c.tolerance, withinTolerance: false, metByCheck: false,
        })),
      },
      propagations: 0, evaluations: 0,
    };
  }
  const differences = comps.map((c, i) => {
    const difference = ev.values[i] - primary[i];
    const allowed = fraction * c.tolerance;
    return {
      component: c.component, targetIndex: c.targetIndex, primary: primary[i], check: ev.values[i], difference, allowed,
      withinTolerance: Math.abs(difference) <= allowed,
      metByCheck: Math.abs(ev.values[i] - c.requested) <= c.tolerance,
    };
  });
  const bad = differences.filter((d) => !d.withinTolerance || !d.metByCheck);
  const arcs = hasFiniteBurns(ctx.problem) ? '; finite-burn arcs: Encke form in the check, Cowell form in the plan (neither switched)' : '';
  // A check that silently ran the plan's own method would not be independent.
  const fallback = ev.warnings.filter((w) => /fell back/i.test(w));
  const passed = bad.length === 0 && fallback.length === 0;
  const message = fallback.length > 0
    ? `not independent: ${fallback.join('; ')}`
    : passed
    ? `${how} at relative tolerance ${relativeTolerance} agrees on every target within ${fraction} × its tolerance and meets every target${arcs}`
    : `${how} at relative tolerance ${relativeTolerance} disagrees: ${bad.map((d) => `${d.component} differs by ${d.difference?.toPrecision(3)} (allowed ${d.allowed.toPrecision(3)})${d.metByCheck ? '' : ', target not met'}`).join('; ')}${arcs}`;
  return { check: { ...base, passed, message, differences }, propagations: ev.propagations, evaluations: ev.evaluations };
}
