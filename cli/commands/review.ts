/** `veer review <planId>`: show a plan's caveats, or approve / reject it through the API. */
import { parseArgs } from 'node:util';
import type { CliCommand } from '../command.ts';
import { ApiCallError, callApi, exitCodeFor, PROPOSAL_NOTICE, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';

const USAGE = `usage: veer review <planId>                                   show the plan's state and caveats
       veer review <planId> --approve --ack CODE[,CODE...] [--comment TEXT]
       veer review <planId> --reject --comment TEXT

Approving needs the reviewer role, must acknowledge every caveat of the plan by its code (--ack, repeatable or
comma-separated), and is refused to whoever submitted the job (two-person rule). A plan that did not converge or
failed its cross-check can never be approved. A rejection needs a comment. A decision is final.
${REMOTE_USAGE}

Exit codes: 0 recorded (or shown); 2 refused (rule, conflict, validation, bad usage); 1 other failures.
${PROPOSAL_NOTICE}`;

interface PlanAnswer {
  summary: { planId: string; state: string; spacecraftName: string; submittedBy: string; converged: boolean; crossCheckPassed: boolean; proposedAt: string };
  plan: { caveats?: Array<{ code: string; severity: string; text: string }> };
}

export const reviewCommand: CliCommand = {
  name: 'review',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({
      args, allowPositionals: true,
      options: { ...REMOTE_OPTIONS, approve: { type: 'boolean', default: false }, reject: { type: 'boolean', default: false },
        ack: { type: 'string', multiple: true }, comment: { type: 'string' } },
    });
    const planId = positionals[0];
    if (!planId) throw new UsageError('planId', 'veer review needs a plan id\n\n' + USAGE);
    if (values.approve && values.reject) throw new UsageError('--approve/--reject', 'choose one');
    const remote = remoteFrom(values);
    try {
      if (!values.approve && !values.reject) {
        const answer = await callApi<PlanAnswer>(remote, 'GET', `/v1/plans/${encodeURIComponent(planId)}`);
        if (values.json) { process.stdout.write(JSON.stringify(answer, null, 2) + '\n'); return 0; }
        const s = answer.summary;
        const lines = [
          `plan ${s.planId} — ${s.state}${s.converged ? '' : ' (NOT CONVERGED: can never be approved)'}${s.crossCheckPassed ? '' : ' (CROSS-CHECK FAILED: can never be approved)'}`,
          `spacecraft ${s.spacecraftName}; submitted by ${s.submittedBy}; proposed ${s.proposedAt}`,
          'caveats to acknowledge (by code) before approving:',
          ...(answer.plan.caveats ?? []).map((c) => `  [${c.severity}] ${c.code}: ${c.text}`),
          '', PROPOSAL_NOTICE,
        ];
        process.stdout.write(lines.join('\n') + '\n');
        return 0;
      }
      const ack = (values.ack ?? []).flatMap((a) => a.split(',')).map((a) => a.trim()).filter(Boolean);
      const body = { decision: values.approve ? 'approve' : 'reject', comment: values.comment ?? '', acknowledgedCaveatCodes: ack };
      const answer = await callApi<{ plan: { state: string; decidedBy: string }; entry: { sequence: number; hash: string } }>(
        remote, 'POST', `/v1/plans/${encodeURIComponent(planId)}/reviews`, body);
      process.stdout.write(values.json ? JSON.stringify(answer, null, 2) + '\n'
        : `plan ${planId} ${answer.plan.state} by ${answer.plan.decidedBy}; archive entry ${answer.entry.sequence} ${answer.entry.hash}\n${PROPOSAL_NOTICE}\n`);
      return 0;
    } catch (error) {
      if (!(error instanceof ApiCallError)) throw error;
      const e = error.body.error;
      const extra = [e?.missing?.length ? `missing caveat codes: ${e.missing.join(', ')}` : '', e?.unknown?.length ? `unknown caveat codes: ${e.unknown.join(', ')}` : '']
        .filter(Boolean).map((l) => `\n  ${l}`).join('');
      process.stderr.write(`veer review: ${error.message}${extra}\n`);
      return exitCodeFor(error);
    }
  },
};
