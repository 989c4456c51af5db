/** The readable report of a Δv budget study: caveats first and last, per-burn Δv, totals, delivery, limits,
 * the linear/non-linear agreement. A study, never a plan: the headings say so. */
import type { BudgetResult, BudgetSummary, Distribution, LimitCrossing } from '../../planner/index.ts';
import { caveatBlock, num } from './plan-report.ts';
import { table } from './text-table.ts';
import { ephemerisSourceLines } from '../../contract/ephemeris-sets.ts';

const HEAD = 'Δv BUDGET STUDY — not a plan and never to be approved or commanded; its numbers inform plans that require review and approval by qualified flight-dynamics staff and independent verification. Caveats:';
const TAIL = 'REMINDER — a budget STUDY. Any burn it informs is a proposal for review, approval and independent verification under the mission\'s own procedures. Caveats:';

const dist = (d: Distribution, digits = 3): string[] => [num(d.mean, digits), num(d.sigma, digits), num(d.p95, digits), num(d.p99, digits),
  d.p99Interval ? `[${num(d.p99Interval.lower, digits)}, ${num(d.p99Interval.upper, digits)}]` : 'n/a'];

const crossing = (c: LimitCrossing | null): string => (c === null ? 'not evaluated'
  : `${c.count}/${c.evaluated} = ${num(c.probability, 4)} (95 % ${num(c.lower95, 4)}–${num(c.upper95, 4)})`);

function summaryLines(s: BudgetSummary): string[] {
  const title = s.path === 'linear' ? 'Linear path (STM gains)' : 'Non-linear path (every re-plan a corrector run)';
  return [
    `${title}: ${s.samples} samples, seed ${s.seed}; ${s.used} in the Δv statistics; re-plan not converged: ${s.notConverged.count}${s.notConverged.count ? ` (indices ${s.notConverged.indices.slice(0, 10).join(', ')}${s.notConverged.count > 10 ? ', ...' : ''})` : ''}; stopped early: ${s.stopped.count}`,
    ...table(['burn', 'nominal m/s', 'mean m/s', 'σ m/s', 'Δv95 m/s', 'Δv99 m/s', 'Δv99 95 % interval', 'propellant99 kg'], [
      ...s.burns.map((b) => [b.label, num(b.nominalMagnitudeMS), ...dist(b.deltaVMS), num(b.propellantKg.p99)]),
      ['total (per-sample sums)', '', ...dist(s.total.deltaVMS), num(s.total.propellantKg.p99)],
    ]),
    'Delivery:',
    ...(s.delivery.bPlane ? [`  B-plane 1σ ellipse ${num(s.delivery.bPlane.semiMajorKm)} × ${num(s.delivery.bPlane.semiMinorKm)} km at ${num(s.delivery.bPlane.orientationDeg, 1)}° from T; mean B·T ${num(s.delivery.meanBDotTKm)} km, B·R ${num(s.delivery.meanBDotRKm)} km; closest-approach time σ ${num(s.delivery.closestApproachSigmaS)} s`] : []),
    ...s.delivery.components.map((c) => `  ${c.name}: mean ${num(c.mean)} ${c.unit}, σ ${num(c.sigma)} ${c.unit}`),
    `Limits: impact ${crossing(s.limits.impact)}; closest approach below ${s.limits.safeAltitudeKm} km ${crossing(s.limits.belowSafeAltitude)}`,
  ];
}

/** The full report; see the file comment. */
export function formatBudgetReport(r: BudgetResult): string {
  const lines = [
    ...caveatBlock(r, HEAD),
    `Spacecraft: ${r.spacecraftName}${r.title ? ` — ${r.title}` : ''}`,
    `Problem hash (SHA-256): ${r.problemHash}   request hash: ${r.requestHash}   software: ${r.softwareVersion}`,
    ...(r.ephemerisSources ? ['Ephemeris sources:', ...ephemerisSourceLines(r.ephemerisSources).map((line) => `  ${line}`)] : []),
    `Nominal plan: ${r.nominal.status}, cross-check ${r.nominal.crossCheckPassed ? 'passed' : 'FAILED'}; ${r.nominal.burns.map((b) => `${b.label} ${b.epochUtc ? `${b.epochUtc} = ` : ''}${b.epochTdb} ${num(b.magnitudeMS)} m/s`).join('; ')}`,
    '',
  ];
  for (const s of [r.linear, r.nonlinear]) if (s) lines.push(...summaryLines(s), '');
  if (r.agreement) {
    const a = r.agreement;
    lines.push(`Linear vs non-linear: ${a.passed ? 'AGREE' : 'DISAGREE'} — ${a.message} (per burn, the plan's linear/Monte Carlo check: mean χ² and covariance likelihood-ratio p-values, significance ${a.significance})`,
      ...table(['burn', 'checked', 'samples', 'p-value mean', 'p-value covariance', 'σ non-linear/linear', 'verdict'], a.burns.map((b) => [
        b.label, b.components.join(', '), String(b.samples), b.meanPValue === null ? 'n/a' : b.meanPValue.toPrecision(3),
        b.covariancePValue === null ? 'n/a' : b.covariancePValue.toPrecision(3), b.sigmaRatios.map((x) => num(x, 3)).join(', ') || 'n/a',
        b.passed ? 'agree' : b.checked ? 'DISAGREE' : 'NOT CHECKED',
      ])), '');
  }
  lines.push(...r.notes.map((n) => `Note: ${n}`), '', ...caveatBlock(r, TAIL));
  return lines.join('\n');
}
