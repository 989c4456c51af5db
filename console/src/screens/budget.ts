/**
 * Δv budget studies: a form to submit a budget request (JSON, checked in the browser with the contract's own
 * budget job schema, the field named), and a study screen — status and progress while it runs, then the
 * study with its caveats first: per-burn table, a |Δv| histogram per burn, the delivery ellipse, limit
 * crossings, and the linear/non-linear agreement. A study is never a plan: nothing here can be approved.
 */
import { budgetJobRequestSchema, issuePath } from '../../../contract/index.ts';
import type { BudgetJobStatus, BudgetResult, BudgetSummary } from '../../../contract/index.ts';
import { api, ApiError } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { h, replaceChildren, scrollingTable } from '../dom.ts';
import { fixed } from '../format.ts';
import { deliveryFigure, deltaVHistogram } from '../plots/budget-plots.ts';

const STUDY_NOTICE = 'A Δv budget is a STUDY, never a plan: it cannot be approved or commanded. Any burn it informs is a proposal '
  + 'that requires review and approval by qualified flight-dynamics staff and independent verification, following the mission\'s own procedures.';

export const budgetSubmitScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const text = h('textarea', { id: 'budget-json', rows: 18, class: 'mono', spellcheck: 'false' });
  const reason = h('input', { id: 'budget-reason', type: 'text', value: '' });
  const issues = h('ul', { class: 'issues', 'aria-live': 'polite', 'data-testid': 'budget-issues' });
  const submit = async (): Promise<void> => {
    let request: unknown;
    try { request = JSON.parse(text.value); } catch (error) {
      replaceChildren(issues, h('li', {}, `request: not JSON (${(error as Error).message})`));
      return;
    }
    const parsed = budgetJobRequestSchema.safeParse({ request, reason: reason.value });
    if (!parsed.success) {
      replaceChildren(issues, parsed.error.issues.map((i) => h('li', {}, h('code', {}, issuePath(i.path)), ` ${i.message}`)));
      return;
    }
    try {
      const res = await api<{ jobId: string }>(session, 'POST', '/v1/budgets', parsed.data);
      ctx.navigate(`#/budgets/${encodeURIComponent(res.jobId)}`);
    } catch (error) {
      const e = error as ApiError;
      replaceChildren(issues, e.issues?.length ? e.issues.map((i) => h('li', {}, h('code', {}, i.path), ` ${i.message}`)) : h('li', {}, e.message));
    }
  };
  return {
    title: 'New Δv budget',
    node: h('section', {},
      h('h1', { tabindex: '-1' }, 'New Δv budget study'),
      h('p', { class: 'notice', role: 'note', 'data-testid': 'study-notice' }, STUDY_NOTICE),
      h('div', { class: 'card' },
        h('div', { class: 'field' }, h('label', { for: 'budget-json' }, 'Budget request (JSON: problem, knowledge per burn, samples, seed)'), text),
        h('div', { class: 'field' }, h('label', { for: 'budget-reason' }, 'Why this budget is needed'), reason),
        h('button', { type: 'button', onclick: () => { void submit(); } }, 'Submit budget'),
        issues)),
  };
};

function summaryTable(s: BudgetSummary): HTMLElement {
  const row = (label: string, d: BudgetSummary['total']['deltaVMS'], p99Kg: number) => h('tr', {},
    h('th', { scope: 'row' }, label), h('td', {}, fixed(d.mean, 4)), h('td', {}, fixed(d.sigma, 4)), h('td', {}, fixed(d.p95, 4)),
    h('td', {}, fixed(d.p99, 4)), h('td', {}, d.p99Interval ? `${fixed(d.p99Interval.lower, 4)}–${fixed(d.p99Interval.upper, 4)}` : 'n/a'), h('td', {}, fixed(p99Kg, 3)));
  return scrollingTable(`Δv budget, ${s.path} path`, h('table', { class: 'data' },
    h('caption', {}, `${s.path === 'linear' ? 'Linear path (STM gains)' : 'Non-linear path (a corrector run per re-plan)'}: ${s.samples} samples, seed ${s.seed}; re-plan not converged ${s.notConverged.count}; stopped early ${s.stopped.count}`),
    h('thead', {}, h('tr', {}, ['Burn', 'mean m/s', 'σ m/s', 'Δv95 m/s', 'Δv99 m/s', 'Δv99 95 % interval', 'propellant99 kg'].map((c) => h('th', { scope: 'col' }, c)))),
    h('tbody', {}, ...s.burns.map((b) => row(b.label, b.deltaVMS, b.propellantKg.p99)), row('total (per-sample sums)', s.total.deltaVMS, s.total.propellantKg.p99))));
}

function limitsText(s: BudgetSummary): string {
  const c = (x: BudgetSummary['limits']['impact'] | null): string => (x ? `${x.count}/${x.evaluated} (95 % ${x.lower95.toExponential(1)}–${x.upper95.toExponential(1)})` : 'not evaluated');
  return `Impact ${c(s.limits.impact)}; closest approach below ${s.limits.safeAltitudeKm} km ${c(s.limits.belowSafeAltitude)}.`;
}

/** Per burn: the p-values of the plan's linear/Monte Carlo check on the non-linear samples, and the verdict. */
function agreementView(a: NonNullable<BudgetResult['agreement']>): HTMLElement {
  const p = (v: number | null): string => (v === null ? 'n/a' : v.toPrecision(3));
  return h('section', { class: 'card' }, h('h2', {}, 'Linear vs non-linear'),
    h('p', { class: a.passed ? '' : 'warn' }, a.message),
    h('table', { 'data-testid': 'budget-agreement' },
      h('caption', {}, `Per burn: mean χ² and covariance likelihood-ratio tests of the non-linear samples against the linear prediction (significance ${a.significance})`),
      h('thead', {}, h('tr', {}, ['Burn', 'components', 'samples', 'p-value mean', 'p-value covariance', 'σ non-linear/linear', 'verdict'].map((c) => h('th', { scope: 'col' }, c)))),
      h('tbody', {}, ...a.burns.map((b) => h('tr', {},
        h('td', {}, b.label), h('td', {}, b.components.join(', ')), h('td', { class: 'num' }, String(b.samples)),
        h('td', { class: 'num' }, p(b.meanPValue)), h('td', { class: 'num' }, p(b.covariancePValue)),
        h('td', { class: 'num' }, b.sigmaRatios.map((x) => fixed(x, 3)).join(', ') || 'n/a'),
        h('td', { class: b.passed ? '' : 'warn' }, b.passed ? 'agree' : b.checked ? 'DISAGREE' : 'not checked'))))));
}

function studyView(r: BudgetResult): HTMLElement {
  const paths = [r.linear, r.nonlinear].filter((s): s is BudgetSummary => s !== null);
  return h('div', { 'data-testid': 'budget-study' },
    h('section', { class: 'card', 'aria-labelledby': 'bcav' }, h('h2', { id: 'bcav' }, 'Caveats'),
      h('ul', { class: 'caveats-read' }, r.caveats.map((c) => h('li', { class: `caveat-read sev-${c.severity}` },
        h('span', { class: `badge sev-${c.severity}` }, c.severity), ' ', h('code', {}, c.code), h('span', { class: 'caveat-text' }, c.text))))),
    h('section', { class: 'card' }, h('h2', {}, 'Nominal sequence'),
      h('p', {}, `${r.spacecraftName}: nominal plan ${r.nominal.status}, cross-check ${r.nominal.crossCheckPassed ? 'passed' : 'FAILED'}; `,
        r.nominal.burns.map((b) => `${b.label} ${b.epochTdb} ${fixed(b.magnitudeMS, 3)} m/s`).join('; '))),
    ...paths.map((s) => h('section', { class: 'card' }, h('h2', {}, s.path === 'linear' ? 'Linear path' : 'Non-linear path'),
      summaryTable(s), h('p', {}, limitsText(s)), ...s.burns.map((b) => deltaVHistogram(b, s.path)), deliveryFigure(s))),
    r.agreement ? agreementView(r.agreement) : null,
    h('section', { class: 'card' }, h('h2', {}, 'Notes'), h('ul', {}, r.notes.map((n) => h('li', {}, n)))));
}

export const budgetScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const jobId = ctx.params.jobId;
  const status = h('p', { 'aria-live': 'polite', 'data-testid': 'budget-status' }, 'Loading…');
  const body = h('div');
  let timer: ReturnType<typeof setTimeout> | undefined;
  const poll = async (): Promise<void> => {
    try {
      const s = await api<BudgetJobStatus>(session, 'GET', `/v1/budgets/${encodeURIComponent(jobId)}`);
      status.textContent = `State: ${s.state}${s.progress ? ` — ${Math.round(s.progress.fraction * 100)} % ${s.progress.message}` : ''}`;
      if (s.state === 'completed') {
        const { study } = await api<{ study: BudgetResult }>(session, 'GET', `/v1/budgets/${encodeURIComponent(jobId)}/study`);
        replaceChildren(body, studyView(study));
        return;
      }
      if (s.state === 'failed' || s.state === 'cancelled') {
        replaceChildren(body, h('p', { class: 'error', role: 'alert' }, `${s.error?.name ?? 'Error'}: ${s.error?.message ?? ''}`));
        return;
      }
      timer = setTimeout(() => { void poll(); }, 1000);
    } catch (error) {
      status.textContent = `Could not read budget job ${jobId}: ${(error as Error).message}`;
    }
  };
  void poll();
  return {
    title: 'Δv budget study',
    node: h('section', {}, h('h1', { tabindex: '-1' }, 'Δv budget study'), h('p', { class: 'notice', role: 'note', 'data-testid': 'study-notice' }, STUDY_NOTICE), status, body),
    dispose: () => { if (timer) clearTimeout(timer); },
  };
};
