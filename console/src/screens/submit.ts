/**
 * Submission: a problem file (upload or paste) or the form for the common case, checked in the browser
 * with the planner's own schema and checks before POST /v1/jobs; issues appear beside the field they name.
 */
import { ApiError, api, type FieldIssue } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { h, replaceChildren } from '../dom.ts';
import { hasRole } from '../session.ts';
import { problemPathOf, validateProblem } from '../validation.ts';
import { createProblemForm } from './problem-form.ts';
import type { EphemerisSetListing } from '../../../contract/ephemeris-sets.ts';

/** The problem with the chosen set as forceModel.ephemerisSet (unchanged when none is chosen). */
function withEphemerisSet(problem: unknown, set: string): unknown {
  if (set === '' || typeof problem !== 'object' || problem === null) return problem;
  const p = problem as { forceModel?: unknown };
  const forceModel = typeof p.forceModel === 'object' && p.forceModel !== null ? p.forceModel : {};
  return { ...p, forceModel: { ...forceModel, ephemerisSet: set } };
}

export const submitScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  if (!hasRole(session, 'submitter')) {
    return { title: 'New job', node: h('section', {}, h('h1', { tabindex: '-1' }, 'New job'),
      h('p', { class: 'card' }, 'Your token does not hold the submitter role, so it cannot submit jobs.')) };
  }
  const form = createProblemForm();
  const modeFile = h('input', { type: 'radio', name: 'mode', id: 'mode-file', value: 'file', checked: true });
  const modeForm = h('input', { type: 'radio', name: 'mode', id: 'mode-form', value: 'form' });
  const fileInput = h('input', { type: 'file', id: 'problem-file', accept: 'application/json,.json', 'aria-describedby': 'problem-file-help' });
  const text = h('textarea', {
    id: 'problem-text', rows: 16, spellcheck: 'false', 'aria-describedby': 'problem-text-help problem-text-error',
    placeholder: '{ "spacecraft": { … }, "initialState": { … }, "burns": [ … ], "targets": [ … ] }',
  });
  const textError = h('div', { id: 'problem-text-error', class: 'field-error', 'aria-live': 'polite' });
  const fillButton = h('button', { type: 'button', class: 'quiet' }, 'Open this file in the form');
  const reason = h('textarea', { id: 'reason', rows: 2, 'aria-describedby': 'reason-help reason-error', required: true });
  const reasonError = h('p', { id: 'reason-error', class: 'field-error', 'aria-live': 'polite' });
  const priority = h('select', { id: 'priority' }, h('option', { value: 'routine' }, 'routine'), h('option', { value: 'urgent' }, 'urgent'));
  // The service's named ephemeris sets (GET /v1/ephemerides); the built-in series unless one is chosen.
  const ephemeris = h('select', { id: 'ephemeris-set', 'aria-describedby': 'ephemeris-set-help' },
    h('option', { value: '' }, 'built-in series (or the set the problem names)'));
  const ephemerisHelp = h('p', { id: 'ephemeris-set-help', class: 'help' }, 'Loading the service\'s ephemeris sets…');
  void api<{ sets: EphemerisSetListing[] }>(session, 'GET', '/v1/ephemerides').then(({ sets }) => {
    for (const s of sets) {
      const bodies = s.files.flatMap((f) => f.bodies.map((b) => `${b.body} ${b.startUtc.slice(0, 10)} to ${b.endUtc.slice(0, 10)}`));
      ephemeris.append(h('option', { value: s.name }, `${s.name}: ${bodies.join(', ')}`));
    }
    ephemerisHelp.textContent = sets.length === 0 ? 'This service has no ephemeris sets: plans use the built-in series.'
      : 'A set\'s OEM files serve the bodies they tabulate; the built-in series the rest. The plan records each file\'s SHA-256.';
  }, (error: unknown) => { ephemerisHelp.textContent = `Could not list the ephemeris sets: ${(error as Error).message}`; });
  const summary = h('div', { class: 'summary', tabindex: '-1', 'aria-live': 'assertive' });
  const submit = h('button', { type: 'submit', class: 'primary' }, 'Check and submit');

  const filePanel = h('div', { class: 'panel', id: 'panel-file' },
    h('div', { class: 'field' },
      h('label', { for: 'problem-file' }, 'Problem file (JSON)'), fileInput,
      h('p', { id: 'problem-file-help', class: 'help' }, 'The file is read in this browser and shown below; nothing is sent until you submit.')),
    h('div', { class: 'field' },
      h('label', { for: 'problem-text' }, 'Problem (JSON text)'), text,
      h('p', { id: 'problem-text-help', class: 'help' }, 'Paste a problem here or edit the loaded file. Units are in the field names (km, s, km/s, kg).'),
      textError),
    h('div', { class: 'actions' }, fillButton));
  const formPanel = h('div', { class: 'panel', id: 'panel-form', hidden: true }, form.node);

  const showMode = (): void => {
    filePanel.hidden = !modeFile.checked;
    formPanel.hidden = !modeForm.checked;
  };
  modeFile.addEventListener('change', showMode);
  modeForm.addEventListener('change', showMode);

  fileInput.addEventListener('change', () => {
    const file = fileInput.files?.[0];
    if (!file) return;
    void file.text().then((t) => { text.value = t; textError.textContent = ''; text.removeAttribute('aria-invalid'); });
  });

  const parseText = (): unknown => {
    try {
      return JSON.parse(text.value);
    } catch (e) {
      showTextIssues([{ path: '(file)', message: `not valid JSON: ${(e as Error).message}` }]);
      return undefined;
    }
  };

  fillButton.addEventListener('click', () => {
    const parsed = parseText();
    if (parsed === undefined) return;
    form.fill(parsed as Record<string, unknown>);
    modeForm.checked = true;
    showMode();
    (formPanel.querySelector('input, select') as HTMLElement | null)?.focus();
  });

  function showTextIssues(issues: FieldIssue[]): void {
    if (issues.length === 0) { textError.textContent = ''; text.removeAttribute('aria-invalid'); return; }
    text.setAttribute('aria-invalid', 'true');
    replaceChildren(textError, h('p', {}, `${issues.length === 1 ? 'One problem' : `${issues.length} problems`} in the file:`),
      h('ul', {}, issues.map((i) => h('li', {}, h('code', {}, i.path), ` — ${i.message}`))));
  }

  function showIssues(issues: FieldIssue[]): void {
    const reasonIssues = issues.filter((i) => i.path === 'reason');
    const problemIssues = issues.filter((i) => i.path !== 'reason');
    reasonError.textContent = reasonIssues.map((i) => i.message).join(' ');
    if (reasonIssues.length) reason.setAttribute('aria-invalid', 'true'); else reason.removeAttribute('aria-invalid');
    let listed: { text: string; id: string }[] = [];
    if (modeFile.checked) {
      showTextIssues(problemIssues);
      listed = problemIssues.map((i) => ({ text: `${i.path}: ${i.message}`, id: 'problem-text' }));
    } else {
      const { placed, unplaced } = form.fields.show(problemIssues);
      listed = placed.map((p) => ({ text: `${p.label} (${p.issue.path}): ${p.issue.message}`, id: p.id }))
        .concat(unplaced.map((i) => ({ text: `${i.path}: ${i.message}`, id: '' })));
    }
    listed = listed.concat(reasonIssues.map((i) => ({ text: `Reason: ${i.message}`, id: 'reason' })));
    if (listed.length === 0) { replaceChildren(summary); summary.className = 'summary'; return; }
    summary.className = 'summary error-summary';
    replaceChildren(summary, h('h2', {}, 'Not submitted — please correct:'),
      h('ul', {}, listed.map((l) => h('li', {}, l.id ? h('a', { href: `#${l.id}`, onclick: (e: Event) => { e.preventDefault(); document.getElementById(l.id)?.focus(); } }, l.text) : l.text))));
    summary.focus();
  }

  const el = h('form', { class: 'submit-form', novalidate: true },
    h('fieldset', { class: 'mode' }, h('legend', {}, 'State the problem as'),
      h('label', { for: 'mode-file', class: 'check' }, modeFile, ' a problem file'),
      h('label', { for: 'mode-form', class: 'check' }, modeForm, ' the form (one or two burns, flyby targets)')),
    summary,
    filePanel, formPanel,
    h('div', { class: 'row' },
      h('div', { class: 'field wide' }, h('label', { for: 'reason' }, 'Reason for this job'), reason,
        h('p', { id: 'reason-help', class: 'help' }, 'Kept with the plan for the reviewers, e.g. "retarget after the latest orbit determination".'), reasonError),
      h('div', { class: 'field' }, h('label', { for: 'priority' }, 'Priority'), priority),
      h('div', { class: 'field' }, h('label', { for: 'ephemeris-set' }, 'Ephemeris'), ephemeris, ephemerisHelp)),
    h('div', { class: 'actions' }, submit));

  el.addEventListener('submit', (event) => {
    event.preventDefault();
    const written = modeFile.checked ? parseText() : form.collect();
    if (written === undefined) return;
    const problem = withEphemerisSet(written, ephemeris.value);
    const checked = validateProblem(problem);
    const issues = [...checked.issues];
    if (reason.value.trim().length < 3) issues.push({ path: 'reason', message: 'say in a few words why this retargeting is needed (at least 3 characters)' });
    showIssues(issues);
    if (issues.length > 0) return;
    submit.disabled = true;
    void (async () => {
      try {
        // The problem as written (defaults are the server's business); the browser check above used the same schema.
        const res = await api<{ jobId: string }>(session, 'POST', '/v1/jobs', { problem, reason: reason.value.trim(), priority: priority.value });
        ctx.navigate(`#/jobs/${encodeURIComponent(res.jobId)}`);
      } catch (error) {
        if (error instanceof ApiError && error.issues.length > 0) {
          showIssues(error.issues.map((i) => ({ path: i.path.startsWith('body.problem') ? problemPathOf(i.path) : i.path.replace(/^body\./, ''), message: i.message })));
        } else {
          showIssues([{ path: '(server)', message: error instanceof Error ? error.message : String(error) }]);
        }
      } finally {
        submit.disabled = false;
      }
    })();
  });

  return {
    title: 'New job',
    node: h('section', {}, h('h1', { tabindex: '-1' }, 'New retargeting job'),
      h('p', { class: 'lede' }, 'The shape of the problem is checked here with the same schema the service uses; the service then checks how its fields relate and lists any issue beside its field. Once accepted it is queued. The result is a proposed plan for review — never a command.'),
      el),
  };
};
