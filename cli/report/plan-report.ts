/**
 * The readable plan report: caveats first and last, status and cross-check, burn table, targets,
 * closest approaches, dispersion, iterations. A plan that did not converge shows NO burn table — only
 * the last iterate, marked as diagnostics.
 */
import { ephemerisSourceLines } from '../../contract/ephemeris-sets.ts';
import type { BPlaneEllipse, ManeuverPlan, PlanEpoch } from '../../planner/index.ts';
import { table } from './text-table.ts';

const RULE = '='.repeat(100);

/** m/s with 4 decimals, without a '-0.0000'. */
function ms(kmS: number): string {
  const text = (kmS * 1000).toFixed(4);
  return /^-0\.0+$/.test(text) ? text.slice(1) : text;
}

/** A number for a report: fixed digits, exponential when very large or small, 'n/a' when absent. */
export function num(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return 'n/a';
  const a = Math.abs(x);
  if (a !== 0 && (a >= 1e7 || a < 1e-3)) return x.toExponential(digits);
  return x.toFixed(digits);
}

/** An epoch as a person reads it: UTC beside TDB (UTC is absent only before 1972). */
export function epochText(e: PlanEpoch): string {
  return e.utc === null ? `${e.tdb} (no UTC before 1972)` : `${e.utc} = ${e.tdb}`;
}

/** Which leap-second table the plan's UTC epochs use (plans made before it was recorded say so). */
function leapSecondsLine(plan: ManeuverPlan): string {
  const l = plan.leapSeconds;
  if (!l) return 'Leap seconds: not recorded (plan made before the table was recorded)';
  const where = l.source === 'built-in' ? 'built-in table' : `${l.path} (SHA-256 ${l.sha256 ?? 'not computed'})`;
  return `Leap seconds: ${where}, expires ${l.expiresUtc}; TAI − UTC ${l.taiMinusUtcAfterExpiryS} s from ${l.steps[l.steps.length - 1][0]}`;
}

/** The caveat block that opens and closes every report (plans and budget studies). */
export function caveatBlock(plan: Pick<ManeuverPlan, 'caveats'>, heading: string): string[] {
  return [RULE, heading, ...plan.caveats.map((c) => `  [${c.severity.toUpperCase()}] ${c.code}: ${c.text}`), RULE];
}

function statusLines(plan: ManeuverPlan): string[] {
  const lines: string[] = [];
  if (plan.status !== 'converged') {
    lines.push('*'.repeat(100),
      `***  NOT CONVERGED (${plan.convergence.outcome}) — THIS IS NOT A PLAN. THERE ARE NO BURNS TO EXECUTE.`,
      `***  ${plan.convergence.message}`, '*'.repeat(100));
  } else {
    lines.push(`Status: converged — ${plan.convergence.message}${plan.convergence.leastSquares ? ' (least squares)' : ''}`);
  }
  if (plan.status === 'converged') {
    const cc = plan.crossCheck;
    lines.push(cc.passed
      ? `Cross-check: PASSED — ${cc.message}`
      : `${'!'.repeat(100)}\n!!!  CROSS-CHECK FAILED — ${cc.message}\n${'!'.repeat(100)}`);
  }
  return lines;
}

function burnTable(plan: ManeuverPlan): string[] {
  if (plan.status !== 'converged') {
    const li = plan.convergence.lastIterate;
    if (!li) return [];
    return ['Last iterate (diagnostics only — NOT a burn to execute):',
      ...li.burnsInertialKmS.map((dv, i) => `  burn ${i + 1}: Δv J2000 [${dv.map((v) => (v * 1000).toFixed(4)).join(', ')}] m/s`)];
  }
  const rows = plan.burns.map((b) => [
    b.label, b.epoch.utc ?? 'n/a (before 1972)', b.epoch.tdb, b.magnitudeMS.toFixed(4),
    b.deltaVRtnKmS.map(ms).join(' '), b.deltaVVnbKmS.map(ms).join(' '),
    b.propellantKg.toFixed(3), b.durationS.toFixed(1),
  ]);
  const finite = plan.burns.some((b) => b.model === 'finite');
  const heading = plan.crossCheck.passed
    ? `Proposed burns (${finite ? 'finite burns: epoch = ignition, |Δv| ideal along the ignition direction' : 'impulsive'}; Δv in m/s):`
    : 'Burns that FAILED the cross-check (diagnostics only — NOT burns to execute; Δv in m/s):';
  return [heading,
    ...table(['burn', 'epoch UTC', 'epoch TDB', '|Δv|', 'Δv R T N', 'Δv V N B', 'propellant kg', 'duration s'], rows),
    `  Δv J2000 equatorial (km/s): ${plan.burns.map((b) => `[${b.deltaVInertialKmS.map((v) => v.toExponential(9)).join(', ')}]`).join('; ')}`,
    `  total |Δv| ${plan.totalDeltaVMS.toFixed(4)} m/s, propellant ${plan.totalPropellantKg.toFixed(3)} kg`,
    ...finiteBurnLines(plan)];
}

/** Per finite burn: what to command and what it costs against the impulsive answer. */
function finiteBurnLines(plan: ManeuverPlan): string[] {
  return plan.burns.flatMap((b) => {
    const f = b.finite;
    if (b.model !== 'finite' || f === undefined) return [];
    return [
      `  ${b.label} finite burn: ignition ${f.start.utc ?? 'n/a'} (${f.start.tdb}), cut-off ${f.end.utc ?? 'n/a'} (${f.end.tdb}), duration ${f.durationS.toFixed(3)} s`,
      `    thrust ${f.thrustN} N, mass flow ${f.massFlowKgS.toPrecision(6)} kg/s, mass ${f.massBeforeKg.toFixed(3)} → ${f.massAfterKg.toFixed(3)} kg (propellant ${f.propellantKg.toFixed(3)} kg)`,
      `    direction held in ${f.axes} axes: [${f.directionLocal.map((v) => v.toFixed(9)).join(', ')}]; at ignition J2000 [${f.directionInertial.map((v) => v.toFixed(9)).join(', ')}]`,
      `    ideal Δv ${f.idealDeltaVMS.toFixed(4)} m/s vs impulsive ${f.impulsiveDeltaVMS.toFixed(4)} m/s: finite-burn loss ${f.finiteBurnLossMS.toFixed(4)} m/s`,
      ...f.insideArc.map((note) => `    !!! ${note}`),
    ];
  });
}

function targetTable(plan: ManeuverPlan): string[] {
  const rows = plan.targets.map((t) => [
    `${t.targetIndex}:${t.kind}`, `${t.component}${t.body ? ` @${t.body}` : ''}`,
    t.requestedEpoch ? epochText(t.requestedEpoch) : num(t.requested),
    t.achievedEpoch ? epochText(t.achievedEpoch) : num(t.achieved), num(t.residual),
    `${num(t.tolerance)} ${t.unit}`, t.met ? 'yes' : 'NO',
  ]);
  return ['Targets (requested vs achieved):', ...table(['target', 'component', 'requested', 'achieved', 'residual', 'tolerance', 'met'], rows)];
}

/** ", switching on/off" when the plan says (plans made before the check varied switching do not). */
function switchingText(on: boolean | undefined): string {
  return on === undefined ? '' : on ? ' with switching' : ' without switching';
}

function crossCheckTable(plan: ManeuverPlan): string[] {
  const cc = plan.crossCheck;
  if (cc.differences.length === 0) return [];
  return [`Cross-check (${cc.primaryMethod}${switchingText(cc.primarySwitching)} vs ${cc.method}${switchingText(cc.switching)} at relative tolerance ${cc.relativeTolerance}):`,
    ...table(['component', 'plan', 'check', 'difference', 'allowed', 'ok'], cc.differences.map((d) => [
      d.component, num(d.primary, 6), num(d.check, 6), num(d.difference), num(d.allowed), d.withinTolerance && d.metByCheck ? 'yes' : 'NO',
    ]))];
}

/** Below this major/minor axis ratio the ellipse is nearly round and its orientation means little. */
const ROUND_AXIS_RATIO = 1.2;

/** "B-plane 1σ a x b km at θ°", with a note when the axes are nearly equal. */
function ellipseText(e: BPlaneEllipse, orientationStandardErrorDeg?: number | null): string {
  const se = orientationStandardErrorDeg !== undefined && orientationStandardErrorDeg !== null && Number.isFinite(orientationStandardErrorDeg)
    ? ` ± ${num(orientationStandardErrorDeg, 1)}° (standard error of a sample orientation)` : '';
  const round = e.semiMinorKm === 0 || e.semiMajorKm / e.semiMinorKm >= ROUND_AXIS_RATIO ? ''
    : ` (axes within ${Math.round((ROUND_AXIS_RATIO - 1) * 100)} %: orientation poorly determined)`;
  return `B-plane 1σ ${num(e.semiMajorKm)} x ${num(e.semiMinorKm)} km at ${num(e.orientationDeg, 2)}°${se}${round}`;
}

/** Per-target σ with each component's name and unit. */
function sigmaList(plan: ManeuverPlan, sigmas: readonly (number | null)[]): string {
  return sigmas.map((s, i) => {
    const t = plan.targets[i];
    return t ? `${t.component} ${num(s)} ${t.unit}` : num(s);
  }).join(', ');
}

function dispersionLines(plan: ManeuverPlan): string[] {
  const d = plan.dispersion;
  const out = ['Dispersion:'];
  if (d.executionModel) {
    const e = d.executionModel;
    out.push(`  Gates execution errors (1σ): magnitude ${e.fixedMagnitudeMS} m/s + ${(e.proportionalMagnitudeFraction * 100).toFixed(3)} %, pointing ${e.fixedPointingMS} m/s + ${e.proportionalPointingDeg}°`);
  }
  const l = d.linear;
  if (l) {
    const part = (name: string, p: typeof l.total | null): void => {
      if (!p) return;
      const e = p.bPlane;
      const parts = [
        ...(e ? [ellipseText(e)] : []),
        ...(p.closestApproachSigmaS !== null ? [`TCA σ ${num(p.closestApproachSigmaS)} s`] : []),
        `target σ ${sigmaList(plan, p.targetSigmas)}`,
      ];
      out.push(`  linear ${name}: ${parts.join('; ')}`);
    };
    part('execution', l.execution);
    part('initial state', l.initialState);
    part('total', l.total);
    if (l.threeSigma) out.push(`  linear 3σ ellipse: ${num(l.threeSigma.semiMajorKm)} x ${num(l.threeSigma.semiMinorKm)} km`);
    if (l.impactProbability !== null) out.push(`  impact probability (linear): ${l.impactProbability.toExponential(3)}`);
  }
  const mc = d.monteCarlo;
  if (mc) {
    out.push(`  Monte Carlo: ${mc.samples} samples (seed ${mc.seed}), ${mc.impacts} impacts → P = ${mc.impactProbability.toExponential(3)} (95 % ${mc.impactProbabilityInterval.lower95.toExponential(2)}–${mc.impactProbabilityInterval.upper95.toExponential(2)})${mc.failedSamples ? `, ${mc.failedSamples} failed` : ''}`);
    if (mc.bPlane) out.push(`  Monte Carlo ${ellipseText(mc.bPlane, mc.linearAgreement?.orientationStandardErrorDeg)}${mc.closestApproachSigmaS !== null ? `, TCA σ ${num(mc.closestApproachSigmaS)} s` : ''}`);
    out.push(`  Monte Carlo target σ ${sigmaList(plan, mc.targetSigmas)}`);
    if (mc.linearAgreement) out.push(`  linear vs Monte Carlo: ${mc.linearAgreement.passed ? 'agree' : 'DISAGREE'} — ${mc.linearAgreement.message}`);
  }
  for (const n of d.notes) out.push(`  note: ${n}`);
  return out;
}

/** First line of the report: only a converged, cross-checked result is called a proposed plan. */
function openingHeadline(plan: ManeuverPlan): string {
  if (plan.status !== 'converged') {
    return 'NOT CONVERGED — NO PLAN: the corrector did not meet the targets; what follows is diagnostics only. Caveats:';
  }
  if (!plan.crossCheck.passed) {
    return 'UNCHECKED RESULT — NOT A PLAN: the independent cross-check failed; do not use these burns. Caveats:';
  }
  return 'PROPOSED MANEUVER PLAN — requires review and approval by qualified flight-dynamics staff and independent verification before any commanding. Caveats:';
}

/** Last line of the report, repeating the verdict and the review requirement. */
function closingHeadline(plan: ManeuverPlan): string {
  if (plan.status !== 'converged') return 'NOT CONVERGED — no plan. Caveats:';
  if (!plan.crossCheck.passed) return 'CROSS-CHECK FAILED — not a plan; re-plan or investigate before any use. Caveats:';
  return 'REMINDER — this is a PROPOSAL. Review, approval and independent verification come first; follow the mission\'s own procedures. Caveats:';
}

/** The full readable report of a plan. */
export function formatPlanReport(plan: ManeuverPlan): string {
  const lines: string[] = [
    ...caveatBlock(plan, openingHeadline(plan)),
    `Spacecraft: ${plan.spacecraftName}${plan.title ? ` — ${plan.title}` : ''}`,
    `Problem hash (SHA-256): ${plan.problemHash}   software: ${plan.softwareVersion}`,
    `Initial state: ${epochText(plan.createdFrom.initialEpoch)}, centre ${plan.createdFrom.centre}, ${plan.createdFrom.frame}; span to ${epochText(plan.createdFrom.endEpoch)}`,
    leapSecondsLine(plan),
    `Force model: ${plan.forceModel.summary}; ephemeris ${plan.forceModel.ephemeris}`,
    ...ephemerisSourceLines(plan.ephemerisSources ?? []).map((line) => `  ${line}`),
    '',
    ...statusLines(plan),
    '',
    ...burnTable(plan),
    '',
    ...targetTable(plan),
    '',
    ...(plan.approaches.length ? ['Closest approaches:', ...plan.approaches.map((a) => `  ${a.body}: ${epochText(a.epoch)}, distance ${num(a.distanceKm)} km, altitude ${num(a.altitudeKm)} km`), ''] : []),
    ...crossCheckTable(plan),
    '',
    ...dispersionLines(plan),
    '',
    `Iterations (${plan.iterations.length}):`,
    ...plan.iterations.map((it) => `  ${it.iteration}: max |residual|/tol ${num(it.maxScaledResidual)}, cond ${num(it.conditionNumber)}, step ${num(it.stepNorm)}, Jacobian ${it.jacobianSource}${it.note ? ` — ${it.note}` : ''}`),
    `Effort: ${plan.effort.propagations} propagations, ${plan.effort.evaluations} force evaluations`,
    '',
    ...caveatBlock(plan, closingHeadline(plan)),
  ];
  return lines.join('\n');
}
