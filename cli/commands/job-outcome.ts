/**
 * Shared by `veer submit|status|watch|cancel`: the job status the API answers, how it reads, and what a
 * finished job means (exit codes). A completed job counts as a proposed plan only when the plan converged and
 * its independent cross-check passed — the plan's own summary is fetched to confirm both.
 */
import { FINAL_JOB_STATES, type JobStatus, type PlanSummary } from '../../contract/index.ts';
import { callApi, PROPOSAL_NOTICE, type Remote } from './remote-api.ts';

/** Exit codes of `veer watch` (and `veer submit --watch`). */
export const JOB_EXIT = {
  /** Completed: a converged plan whose cross-check passed was proposed (it still needs review). */
  proposed: 0,
  /** The job failed (error named). */
  failed: 1,
  /** Bad usage, invalid problem, or a request the server refused (4xx). */
  refused: 2,
  /** Completed, but the plan did not converge, its cross-check failed, or neither could be confirmed. */
  notUsable: 3,
  /** The job was cancelled. */
  cancelled: 4,
  /** Contact with the server was lost while following the job: its state is unknown (it may still run). */
  lostContact: 5,
} as const;

export const JOB_EXIT_USAGE = `Exit codes: 0 a converged, cross-checked plan was proposed (still only a proposal); 3 completed but not
converged or cross-check failed (or not confirmed): no usable plan; 1 the job failed; 4 the job was cancelled;
5 contact with the server lost, job state unknown (it may still run: resume with veer watch <jobId>; do not
resubmit); 2 bad usage, invalid problem or a request the server refused.`;

/** The API's job status (GET /v1/jobs/{jobId}) and its progress reports, as the contract defines them. */
export type JobStatusAnswer = JobStatus;
export type ProgressAnswer = JobStatus['progress'] & object;
type PlanSummaryAnswer = { summary: PlanSummary };


export function isFinal(status: JobStatusAnswer): boolean {
  return FINAL_JOB_STATES.has(status.state);
}

export const jobPath = (jobId: string): string => `/v1/jobs/${encodeURIComponent(jobId)}`;

/** One line for a progress report: `55% cross-checking: … (iteration 3, samples 40/200)`. */
export function progressText(p: ProgressAnswer): string {
  const extra = [p.iteration !== undefined ? `iteration ${p.iteration}` : '',
    p.samplesDone !== undefined ? `samples ${p.samplesDone}/${p.samplesTotal ?? '?'}` : ''].filter(Boolean).join(', ');
  return `${String(Math.round(p.fraction * 100)).padStart(3)}% ${p.stage}: ${p.message}${extra ? ` (${extra})` : ''}`;
}

export interface JobOutcome {
  /** Exit code (JOB_EXIT); undefined while the job has not finished. */
  code: number | undefined;
  lines: string[];
  /** The plan's summary when one was fetched. */
  plan?: PlanSummaryAnswer['summary'];
}

/**
 * What a job's status means for the operator. For a completed job the plan is fetched to confirm convergence and
 * the cross-check; a plan that cannot be confirmed is never presented as usable.
 */
export async function describeOutcome(remote: Remote, status: JobStatusAnswer): Promise<JobOutcome> {
  const id = status.id;
  if (status.state === 'failed') {
    const e = status.error;
    return { code: JOB_EXIT.failed, lines: [`job ${id} FAILED: ${e ? `${e.name}: ${e.message}${e.field && !e.message.startsWith(e.field) ? ` (field ${e.field})` : ''}` : 'no reason given'}`, 'No plan was produced.'] };
  }
  if (status.state === 'cancelled') {
    return { code: JOB_EXIT.cancelled, lines: [`job ${id} CANCELLED: ${status.error?.message ?? 'cancelled'}`, 'No plan was produced.'] };
  }
  if (status.state !== 'completed') {
    return { code: undefined, lines: [`job ${id} has not finished (${status.state}${status.cancelRequested ? ', cancellation requested' : ''})`] };
  }
  const planId = status.result?.planId;
  if (!planId) return { code: JOB_EXIT.failed, lines: [`job ${id} completed without a plan id`] };
  let plan: PlanSummaryAnswer['summary'] | undefined;
  let fetchError = '';
  try {
    plan = (await callApi<PlanSummaryAnswer>(remote, 'GET', `/v1/plans/${encodeURIComponent(planId)}`)).summary;
  } catch (error) {
    fetchError = (error as Error).message;
  }
  if (!plan) {
    return { code: JOB_EXIT.notUsable, lines: [
      `job ${id} completed with plan ${planId} (${status.result?.planStatus ?? '?'}), but the plan could not be fetched to confirm its cross-check: ${fetchError}`,
      'Treat it as unconfirmed: do not use it before checking it with `veer review`.', PROPOSAL_NOTICE] };
  }
  if (plan.converged && plan.crossCheckPassed) {
    return { code: JOB_EXIT.proposed, plan, lines: [
      `job ${id} completed: plan ${planId} PROPOSED (converged, cross-check passed; state ${plan.state})`,
      `Next: \`veer review ${planId}\` shows its caveats for review.`, PROPOSAL_NOTICE] };
  }
  const why = [plan.converged ? '' : 'NOT CONVERGED', plan.crossCheckPassed ? '' : 'CROSS-CHECK FAILED'].filter(Boolean).join(', ');
  return { code: JOB_EXIT.notUsable, plan, lines: [
    `job ${id} completed, but plan ${planId} is not a usable plan: ${why}; it can never be approved.`,
    'Look at its caveats with `veer review` and revise the problem.', PROPOSAL_NOTICE] };
}

/** The readable status report (without the outcome lines). */
export function statusLines(s: JobStatusAnswer): string[] {
  const lines = [
    `job ${s.id} — ${s.state}${s.cancelRequested && !isFinal(s) ? ' (cancellation requested)' : ''}`,
    `spacecraft ${s.spacecraftName}; priority ${s.priority}; submitted by ${s.submittedBy} at ${s.submittedAt}`,
    `reason: ${s.reason}`,
  ];
  if (s.progress && !isFinal(s)) lines.push(`progress: ${progressText(s.progress).trim()}`);
  const times = [s.startedAt ? `started ${s.startedAt}` : '', s.finishedAt ? `finished ${s.finishedAt}` : ''].filter(Boolean);
  lines.push(`attempts ${s.attemptsMade}${times.length ? `; ${times.join('; ')}` : ''}`);
  return lines;
}
