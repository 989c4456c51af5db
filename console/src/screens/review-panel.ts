/**
 * The decision panel: caveats as a checklist (every one must be ticked before Approve is enabled), the
 * two-person rule stated plainly, a comment, and approve / reject (POST /v1/plans/:planId/reviews).
 * The server enforces the same rules; the panel only makes them visible before the click.
 */
import { ApiError, api } from '../api-client.ts';
import { h, replaceChildren } from '../dom.ts';
import type { Caveat, PlanSummary } from '../plan-types.ts';
import { hasRole, type Session } from '../session.ts';

export interface ReviewPanelInput {
  session: Session;
  summary: PlanSummary;
  caveats: Caveat[];
  onDecided(): void;
}

export function reviewPanel({ session, summary, caveats, onDecided }: ReviewPanelInput): HTMLElement {
  const isReviewer = hasRole(session, 'reviewer');
  const isSubmitter = summary.submittedBy.toLowerCase() === session.name.toLowerCase(); // as the server's two-person rule compares
  const proposed = summary.state === 'proposed';
  const approvable = summary.converged && summary.crossCheckPassed;
  if (!proposed) {
    // Decided (or superseded): the caveats stay readable; there is nothing left to tick or click.
    return h('section', { class: 'card review-panel', 'aria-labelledby': 'review-heading' },
      h('h2', { id: 'review-heading' }, 'Caveats of this plan'),
      h('ul', { class: 'caveats-read' }, caveats.map((c) => h('li', { class: `caveat-read sev-${c.severity}` },
        h('span', { class: `badge sev-${c.severity}` }, c.severity), ' ', h('code', {}, c.code), h('span', { class: 'caveat-text' }, c.text)))),
      h('p', { class: 'why' }, `This plan is ${summary.state}; decisions are final.`));
  }

  const boxes = caveats.map((c) => h('input', { type: 'checkbox', id: `caveat-${c.code}`, value: c.code, 'data-testid': 'caveat-check', }));
  const checklist = h('fieldset', { class: 'caveats' },
    h('legend', {}, `Caveats — tick each one you have read and accept (${caveats.length})`),
    h('ul', {}, caveats.map((c, i) => h('li', { class: `caveat sev-${c.severity}` },
      boxes[i],
      h('label', { for: `caveat-${c.code}` },
        h('span', { class: `badge sev-${c.severity}` }, c.severity), ' ', h('code', {}, c.code), h('span', { class: 'caveat-text' }, c.text))))));
  const progress = h('p', { class: 'help', 'aria-live': 'polite', 'data-testid': 'caveat-count' });
  const comment = h('textarea', { id: 'review-comment', rows: 3, 'aria-describedby': 'review-comment-help review-error' });
  const why = h('p', { id: 'approve-why', class: 'why', 'aria-live': 'polite', 'data-testid': 'approve-why' });
  const approve = h('button', { type: 'button', class: 'primary', disabled: true, 'aria-describedby': 'approve-why', 'data-testid': 'approve' }, 'Approve plan');
  const reject = h('button', { type: 'button', class: 'danger', disabled: true, 'data-testid': 'reject' }, 'Reject plan');
  const error = h('div', { id: 'review-error', class: 'field-error', role: 'alert' });

  const twoPerson = isSubmitter ? h('p', { class: 'two-person', role: 'status', 'data-testid': 'two-person' },
    h('strong', {}, 'Two-person rule: '), 'you submitted this job; another reviewer must approve.') : null;

  const update = (): void => {
    const ticked = boxes.filter((b) => b.checked).length;
    progress.textContent = `${ticked} of ${boxes.length} caveats ticked`;
    const blockers: string[] = [];
    if (!proposed) blockers.push(`this plan is ${summary.state}; decisions are final`);
    if (!isReviewer) blockers.push('your token does not hold the reviewer role');
    if (isSubmitter) blockers.push('you submitted this job; another reviewer must approve');
    if (!summary.converged) blockers.push('the corrector did not converge, so this plan can never be approved');
    else if (!summary.crossCheckPassed) blockers.push('the independent cross-check failed, so this plan can never be approved');
    if (ticked < boxes.length) blockers.push(`${boxes.length - ticked} caveat${boxes.length - ticked === 1 ? '' : 's'} not yet ticked`);
    approve.disabled = blockers.length > 0 || !approvable;
    why.textContent = blockers.length ? `Approve is not available: ${blockers.join('; ')}.` : 'Every caveat is ticked. Approving records your decision in the archive.';
    reject.disabled = !proposed || !isReviewer || comment.value.trim() === '';
  };
  for (const b of boxes) b.addEventListener('change', update);
  comment.addEventListener('input', update);

  const decide = async (decision: 'approve' | 'reject'): Promise<void> => {
    error.textContent = '';
    approve.disabled = true; reject.disabled = true;
    try {
      await api(session, 'POST', `/v1/plans/${encodeURIComponent(summary.planId)}/reviews`, {
        decision, comment: comment.value.trim(),
        acknowledgedCaveatCodes: decision === 'approve' ? boxes.filter((b) => b.checked).map((b) => b.value) : [],
      });
      onDecided();
    } catch (e) {
      const extra = e instanceof ApiError && e.issues.length ? ` (${e.issues.map((i) => i.message).join('; ')})` : '';
      replaceChildren(error, h('p', {}, `Not recorded: ${(e as Error).message}${extra}`));
      update();
    }
  };
  approve.addEventListener('click', () => { void decide('approve'); });
  reject.addEventListener('click', () => { void decide('reject'); });
  update();

  return h('section', { class: 'card review-panel', 'aria-labelledby': 'review-heading' },
    h('h2', { id: 'review-heading' }, 'Decision'),
    twoPerson,
    checklist, progress,
    h('div', { class: 'field' },
      h('label', { for: 'review-comment' }, 'Comment'), comment,
      h('p', { id: 'review-comment-help', class: 'help' }, 'Required to reject; optional to approve. Stored with the decision.')),
    why,
    h('div', { class: 'actions' }, approve, reject),
    error);
}
