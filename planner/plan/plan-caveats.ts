/**
 * Which caveats apply to a plan, judged from the plan's own data against its stated limits, so that they
 * can be recomputed when Monte Carlo results are attached later (queue fan-out).
 */
import { caveat, orderCaveats, reviewCaveat } from '../caveats.ts';
import type { Caveat, ManeuverPlan, PlanEpoch } from '../../contract/plan-types.ts';

/** Codes that depend on the dispersion results (recomputed by attachMonteCarlo). */
export const DISPERSION_CAVEAT_CODES = new Set([
  'IMPACT_PROBABILITY_ABOVE_LIMIT', 'DISPERSION_LINEARITY_CHECK_FAILED', 'MONTE_CARLO_NOT_RUN', 'NO_EXECUTION_ERROR_MODEL',
]);

const pct = (x: number): string => `${(x * 100).toPrecision(3)} %`;

/** Caveats that depend on the dispersion part of the plan. */
export function dispersionCaveats(plan: ManeuverPlan): Caveat[] {
  const out: Caveat[] = [];
  if (plan.status !== 'converged') return out;
  const d = plan.dispersion;
  const limit = plan.limits.impactProbabilityLimit;
  if (!d.executionModel) {
    out.push(caveat('NO_EXECUTION_ERROR_MODEL', 'The problem gives no execution-error model (executionErrors): no Δv execution dispersion was computed.'));
  }
  const pLinear = d.linear?.impactProbability ?? null;
  const pMc = d.monteCarlo ? d.monteCarlo.impactProbability : null;
  const worst = Math.max(pLinear ?? 0, pMc ?? 0, d.monteCarlo ? d.monteCarlo.impactProbabilityInterval.lower95 : 0);
  if (worst > limit) {
    out.push(caveat('IMPACT_PROBABILITY_ABOVE_LIMIT', `Probability of impact ${pct(worst)} exceeds the limit ${pct(limit)} `
      + `(linear ${pLinear === null ? 'n/a' : pct(pLinear)}, Monte Carlo ${pMc === null ? 'not run' : `${pct(pMc)} of ${d.monteCarlo?.samples}`}).`));
  }
  if (d.monteCarlo?.linearAgreement && !d.monteCarlo.linearAgreement.passed) {
    out.push(caveat('DISPERSION_LINEARITY_CHECK_FAILED', `The linear (STM) dispersion does not match the Monte Carlo samples: ${d.monteCarlo.linearAgreement.message}. Trust the Monte Carlo figures, not the linear ellipse.`));
  }
  if (d.executionModel && !d.monteCarlo) {
    out.push(caveat('MONTE_CARLO_NOT_RUN', 'No Monte Carlo run is attached yet: the dispersion and impact probability are linear estimates only.'));
  }
  return out;
}

/** Every epoch of a plan a person reads. */
function planEpochs(plan: ManeuverPlan): PlanEpoch[] {
  return [plan.createdFrom.initialEpoch, plan.createdFrom.endEpoch, ...plan.burns.map((b) => b.epoch),
    ...plan.approaches.map((a) => a.epoch),
    ...plan.targets.flatMap((t) => [t.requestedEpoch, t.achievedEpoch].filter((e): e is PlanEpoch => e !== undefined && e !== null))];
}

/** Caveats on the UTC readings: past the leap-second table's expiry (assumed offset) or before 1972 (none). */
function utcCaveats(plan: ManeuverPlan): Caveat[] {
  const out: Caveat[] = [];
  const epochs = planEpochs(plan);
  const leap = plan.leapSeconds;
  // ISO dates compare as text; a UTC reading on or after the expiry date uses an assumed TAI − UTC.
  const past = leap ? epochs.filter((e) => e.utc !== null && e.utc.slice(0, 10) >= leap.expiresUtc) : [];
  if (leap && past.length > 0) {
    const lastStep = leap.steps[leap.steps.length - 1][0];
    const source = leap.source === 'built-in' ? 'the built-in table' : `${leap.path} (SHA-256 ${leap.sha256 ?? 'not computed'})`;
    out.push(caveat('UTC_LEAP_SECONDS_ASSUMED', `${past.length} epoch(s) of this plan, from ${past.map((e) => e.utc).sort()[0]} on, `
      + `lie past the expiry ${leap.expiresUtc} of the leap-second table (${source}); TAI − UTC = ${leap.taiMinusUtcAfterExpiryS} s `
      + `is assumed there (no leap second after ${lastStep}). A leap second announced after that table would shift every UTC `
      + 'time from its date on by 1 s (a UTC-written input epoch would move by 1 s in TDB). Give a current leap-seconds.list '
      + 'through VEER_LEAP_SECONDS (or --leap-seconds on the CLI) and re-plan.'));
  }
  if (epochs.some((e) => e.utc === null)) {
    out.push(caveat('UTC_BEYOND_LEAP_SECOND_TABLE', 'Some epochs lie before 1972, where UTC had no whole-second offset from TAI: they are given in TDB only.'));
  }
  return out;
}

/** Every caveat of a plan (review first, critical before warning before info). */
export function planCaveats(plan: ManeuverPlan): Caveat[] {
  const out: Caveat[] = [reviewCaveat()];
  const lim = plan.limits;
  if (plan.status !== 'converged') {
    out.push(caveat('NOT_CONVERGED', `NOT CONVERGED (${plan.convergence.outcome}): ${plan.convergence.message}. There is no plan to execute; the last iterate is kept as diagnostics only.`));
  }
  if (plan.status === 'converged' && !plan.crossCheck.passed) {
    out.push(caveat('CROSS_CHECK_FAILED', `Independent cross-check failed: ${plan.crossCheck.message}`));
  }
  for (const b of plan.burns) {
    for (const note of b.finite?.insideArc ?? []) {
      out.push(caveat('FINITE_BURN_OVERLAPS_EVENT', `${b.label}: ${note}. The burn arc must not straddle a closest approach or a sphere-of-influence crossing; move or split the burn.`));
    }
    // A finite burn is modelled as flown: the impulsive approximation does not apply to it.
    if (b.model !== 'finite' && b.timeToTargetS !== null && b.durationS > lim.impulsiveDurationFraction * b.timeToTargetS) {
      out.push(caveat('IMPULSIVE_APPROXIMATION_QUESTIONABLE', `${b.label}: burn duration ${b.durationS.toFixed(1)} s is ${pct(b.durationS / b.timeToTargetS)} of the ${(b.timeToTargetS / 86400).toFixed(2)} d to its target (limit ${pct(lim.impulsiveDurationFraction)}); model it as a finite burn before use.`));
    }
  }
  for (const a of plan.approaches) {
    if (a.altitudeKm < lim.safeAltitudeKm) {
      out.push(caveat('CLOSEST_APPROACH_BELOW_SAFE_ALTITUDE', `Closest approach to ${a.body} at ${a.altitudeKm.toFixed(1)} km altitude is below the safe altitude ${lim.safeAltitudeKm} km.`));
    }
  }
  const load = plan.propellantLoadKg;
  if (load !== undefined && load !== null && plan.totalPropellantKg > load) {
    out.push(caveat('PROPELLANT_EXCEEDS_LOAD', `The burns need ${plan.totalPropellantKg.toFixed(2)} kg of propellant but the spacecraft carries ${load.toFixed(2)} kg (spacecraft.propellantKg): the plan cannot be flown as proposed.`));
  }
  const cond = plan.convergence.maxConditionNumber;
  if (cond !== null && cond > lim.conditionNumberLimit) {
    out.push(caveat('JACOBIAN_ILL_CONDITIONED', `The targeting Jacobian was ill-conditioned (condition number ${cond.toExponential(2)} > ${lim.conditionNumberLimit.toExponential(0)}): the solution is sensitive to small changes and may not be unique.`));
  }
  if (plan.convergence.leastSquares) {
    out.push(caveat('TARGETS_MET_IN_LEAST_SQUARES_ONLY', 'The targets outnumber the free variables: the burns were solved in least squares, and the targets are met only as far as the table shows.'));
  }
  const builtin = builtinBodiesThatMatter(plan);
  if (builtin.length > 0) out.push(caveat('BUILTIN_EPHEMERIS_ACCURACY', `Positions of ${builtin.join(', ')} come from the built-in ${builtinVersion(plan)} series (truncated VSOP87-class theory, about one arcminute: thousands to tens of thousands of km at planetary distances). Targets relative to a planet inherit that error; re-plan against the mission's reference ephemeris (veer plan --ephemeris FILE.oem) before use.`));
  if (!plan.createdFrom.hasCovariance) {
    out.push(caveat('NO_INITIAL_STATE_COVARIANCE', 'The initial state has no covariance: the dispersion covers burn execution errors only, not orbit-determination uncertainty.'));
  }
  out.push(...utcCaveats(plan));
  out.push(...dispersionCaveats(plan));
  return orderCaveats(out);
}

/**
 * Bodies whose built-in positions the plan depends on: every body it uses (central, initial centre,
 * perturbing, target bodies) once more than one is involved, except the Sun, the origin of every source
 * (the Sun relative to a planet is that planet's position). Plans without source records (made before they
 * were kept) used the built-in series for all of them.
 */
function builtinBodiesThatMatter(plan: ManeuverPlan): string[] {
  const fm = plan.forceModel;
  const used = new Set<string>([fm.centralBody, plan.createdFrom.centre, ...fm.perturbingBodies,
    ...plan.targets.flatMap((t) => (t.body !== null ? [t.body] : []))]);
  if (used.size < 2) return [];
  used.delete('sun');
  const fromFile = new Set<string>((plan.ephemerisSources ?? []).filter((s) => s.source === 'oem').map((s) => s.body));
  return [...used].filter((b) => !fromFile.has(b)).sort();
}

function builtinVersion(plan: ManeuverPlan): string {
  const record = (plan.ephemerisSources ?? []).find((s) => s.source === 'built-in');
  return record !== undefined && record.source === 'built-in' ? record.version : plan.forceModel.ephemeris;
}
