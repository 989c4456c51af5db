/** Live jobs: recent jobs (refreshed) and the selected job's state and progress from its event stream; cancel. */
import { ApiError, api } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { h, replaceChildren, scrollingTable } from '../dom.ts';
import { isoShort } from '../format.ts';
import { FINAL_JOB_STATES, type AnyJobStatus, type JobProgress, type JobStatus } from '../plan-types.ts';
import { hasRole } from '../session.ts';
import { followEvents } from '../sse.ts';
import { jobOutcomeText } from '../job-outcome.ts';

const STATE_TEXT: Record<string, string> = {
  waiting: 'queued', prioritized: 'queued', delayed: 'delayed', active: 'running', 'waiting-children': 'running (sample batches)',
  completed: 'finished', failed: 'failed', cancelled: 'cancelled', unknown: 'unknown',
};

export function stateBadge(state: string): HTMLElement {
  return h('span', { class: `badge state-${state}` }, STATE_TEXT[state] ?? state);
}

function progressBar(): { node: HTMLElement; set(fraction: number, failed?: boolean): void } {
  const fill = h('div', { class: 'progress-fill' });
  const bar = h('div', { class: 'progress', role: 'progressbar', 'aria-label': 'Job progress', 'aria-valuemin': 0, 'aria-valuemax': 100, 'aria-valuenow': 0, 'data-testid': 'job-progress' }, fill);
  const label = h('span', { class: 'progress-text', 'data-testid': 'job-progress-text' }, '0 %');
  return {
    node: h('div', { class: 'progress-row' }, bar, label),
    set(fraction, failed = false) {
      const pct = Math.round(Math.min(1, Math.max(0, fraction)) * 100);
      fill.style.width = `${pct}%`;
      bar.setAttribute('aria-valuenow', String(pct));
      bar.classList.toggle('failed', failed);
      label.textContent = `${pct} %`;
    },
  };
}

export const jobsScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const selected = ctx.params.jobId ?? null;
  const stop = new AbortController();
  const listBody = h('tbody');
  const listNote = h('p', { class: 'help', 'aria-live': 'polite' });
  const detail = h('div', { class: 'job-detail card', 'aria-live': 'off' });

  const refreshList = async (): Promise<void> => {
    try {
      const { jobs } = await api<{ jobs: AnyJobStatus[] }>(session, 'GET', '/v1/jobs?limit=30');
      replaceChildren(listBody, jobs.length === 0 ? h('tr', {}, h('td', { colspan: 5 }, 'No jobs yet.')) : jobs.map((j) => {
        const pct = j.state === 'completed' ? 100 : Math.round((j.progress?.fraction ?? 0) * 100);
        return h('tr', { ...(j.id === selected ? { class: 'selected', 'aria-current': 'true' } : {}) },
          // A Δv budget job opens on the budget screen (a study, never a plan).
          h('td', {}, h('a', { href: `${j.kind === 'delta-v-budget' ? '#/budgets/' : '#/jobs/'}${encodeURIComponent(j.id)}` }, j.spacecraftName),
            h('div', { class: 'mono small' }, j.kind === 'delta-v-budget' ? `${j.id} · Δv budget study` : j.id)),
          h('td', {}, stateBadge(j.state)),
          h('td', { class: 'num' }, `${pct} %`),
          h('td', {}, j.submittedBy),
          h('td', { class: 'small' }, isoShort(j.submittedAt)));
      }));
      listNote.textContent = `Updated ${new Date().toISOString().slice(11, 19)} UTC`;
    } catch (error) {
      listNote.textContent = `Could not list jobs: ${(error as Error).message}`;
    }
  };
  void refreshList();
  const timer = setInterval(() => { void refreshList(); }, 5000);

  if (selected) showJob(selected); else replaceChildren(detail, h('p', {}, 'Choose a job in the list to follow it.'));

  function showJob(jobId: string): void {
    const bar = progressBar();
    const stateEl = h('span', { 'data-testid': 'job-state' });
    const stage = h('p', { class: 'stage', 'data-testid': 'job-stage' }, 'Connecting to the progress stream…');
    const meta = h('dl', { class: 'meta' });
    const outcome = h('div', { class: 'outcome', 'aria-live': 'polite' });
    const cancel = h('button', { type: 'button', class: 'danger', hidden: true }, 'Cancel this job');
    let status: JobStatus | null = null;
    let shown = 0;
    let outcomeFor: string | null = null;

    const apply = (s: JobStatus): void => {
      status = s;
      replaceChildren(stateEl, stateBadge(s.state));
      replaceChildren(meta,
        h('dt', {}, 'Spacecraft'), h('dd', {}, s.spacecraftName),
        h('dt', {}, 'Submitted by'), h('dd', {}, s.submittedBy, s.submittedBy === session.name ? ' (you)' : ''),
        h('dt', {}, 'Submitted'), h('dd', {}, isoShort(s.submittedAt)),
        h('dt', {}, 'Priority'), h('dd', {}, s.priority),
        h('dt', {}, 'Reason'), h('dd', {}, s.reason));
      const final = FINAL_JOB_STATES.has(s.state);
      const mayCancel = (hasRole(session, 'submitter') && s.submittedBy === session.name) || hasRole(session, 'admin');
      cancel.hidden = final || !mayCancel;
      cancel.disabled = s.cancelRequested;
      if (s.cancelRequested && !final) cancel.textContent = 'Cancellation requested…';
      // A status snapshot may carry older progress than the last progress event: never step the bar back for it.
      if (s.progress && s.progress.fraction >= shown) applyProgress(s.progress);
      if (s.state === 'completed') {
        bar.set(1);
        stage.textContent = 'Finished.';
        if (s.result && outcomeFor !== s.result.planId) showOutcome(s.result);
      } else if (s.state === 'failed') {
        bar.set(s.progress?.fraction ?? 0, true);
        stage.textContent = 'The job failed.';
        replaceChildren(outcome, h('p', { class: 'error' }, `${s.error?.name ?? 'Error'}${s.error?.field ? ` in ${s.error.field}` : ''}: ${s.error?.message ?? 'no detail'}`));
      } else if (s.state === 'cancelled') {
        bar.set(s.progress?.fraction ?? 0, true);
        stage.textContent = 'The job was cancelled.';
        replaceChildren(outcome);
      }
    };
    /** Words the result by what it is; the job status lacks the cross-check, so it is read from the plan record. */
    const showOutcome = (result: NonNullable<JobStatus['result']>): void => {
      outcomeFor = result.planId;
      const render = (crossCheckPassed: boolean | null): void => {
        const text = jobOutcomeText(result.planStatus, crossCheckPassed);
        stage.textContent = text.stage;
        replaceChildren(outcome,
          h('p', { class: text.warning ? 'warn' : '', 'data-testid': 'job-outcome' }, text.message),
          h('a', { class: text.warning ? 'button' : 'button primary', href: `#/plans/${encodeURIComponent(result.planId)}`, 'data-testid': 'open-plan' }, text.linkText));
      };
      render(result.planStatus === 'converged' ? null : false);
      if (result.planStatus !== 'converged') return;
      void api<{ summary: { crossCheckPassed: boolean } }>(session, 'GET', `/v1/plans/${encodeURIComponent(result.planId)}`)
        .then((r) => { if (status?.result?.planId === result.planId) render(r.summary.crossCheckPassed === true); })
        .catch(() => undefined); // stays at "cross-check result not known yet": never claims a plan ready for review
    };
    const applyProgress = (p: JobProgress): void => {
      if (status && FINAL_JOB_STATES.has(status.state)) return;
      shown = p.fraction;
      bar.set(p.fraction);
      const extra = p.samplesTotal ? ` — samples ${p.samplesDone ?? 0} of ${p.samplesTotal}` : p.iteration !== undefined ? ` — iteration ${p.iteration}` : '';
      stage.textContent = `${p.stage}: ${p.message}${extra}`;
    };

    cancel.addEventListener('click', () => {
      if (!window.confirm('Cancel this job? A running computation stops; no plan is produced.')) return;
      cancel.disabled = true;
      void api<JobStatus>(session, 'POST', `/v1/jobs/${encodeURIComponent(jobId)}/cancel`, { reason: `cancelled from the console by ${session.name}` })
        .then(apply)
        .catch((e: unknown) => { replaceChildren(outcome, h('p', { class: 'error' }, e instanceof ApiError ? e.message : String(e))); cancel.disabled = false; });
    });

    replaceChildren(detail,
      h('h2', {}, 'Job ', h('span', { class: 'mono' }, jobId), ' ', stateEl),
      bar.node, stage, cancel, outcome, meta);

    followEvents(`/v1/jobs/${encodeURIComponent(jobId)}/events`, session.token, {
      onEvent(event, data) {
        if (event === 'status' || event === 'end') apply(data as JobStatus);
        else if (event === 'progress') applyProgress(data as JobProgress);
        if (event === 'end') void refreshList();
      },
      onDrop() { stage.textContent = 'Progress stream interrupted; reconnecting…'; },
    }, stop.signal);
  }

  return {
    title: 'Jobs',
    node: h('section', {},
      h('h1', { tabindex: '-1' }, 'Jobs'),
      h('div', { class: 'split' },
        h('div', { class: 'card' },
          h('h2', {}, 'Recent jobs'),
          scrollingTable('Recent jobs', h('table', { class: 'data' },
            h('caption', { class: 'sr-only' }, 'Recent retargeting jobs, newest first'),
            h('thead', {}, h('tr', {}, ['Spacecraft', 'State', 'Progress', 'By', 'Submitted'].map((c) => h('th', { scope: 'col' }, c)))),
            listBody)),
          listNote),
        detail)),
    dispose() { stop.abort(); clearInterval(timer); },
  };
};
