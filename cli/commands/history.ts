/** `veer history <planId>`: a plan's archive entries, oldest first, each with its hash re-checked. */
import { parseArgs } from 'node:util';
import type { CliCommand } from '../command.ts';
import { callApi, reportApiError, PROPOSAL_NOTICE, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';

const USAGE = `usage: veer history <planId> [--url URL] [--token TOKEN] [--json]

Prints every archive entry about the plan and its job: sequence, time (UTC), actor, kind, what happened, and
whether the entry's content still hashes to its stored hash. The whole chain is checked by \`veer verify\`.
${REMOTE_USAGE}`;

interface HistoryAnswer {
  plan: { planId: string; state: string; spacecraftName: string; converged: boolean };
  entries: Array<{ sequence: number; at: string; actor: string; kind: string; payload: Record<string, unknown>; hash: string; hashMatches: boolean }>;
}

function what(e: HistoryAnswer['entries'][number]): string {
  const p = e.payload;
  switch (e.kind) {
    case 'review': return `${String(p.decision)}${p.comment ? ` — "${String(p.comment)}"` : ''}; acknowledged ${(p.acknowledgedCaveatCodes as string[] | undefined)?.join(', ') || 'none'}`;
    case 'plan-superseded': return `superseded by ${String(p.supersededBy)}`;
    case 'plan-proposed': {
      const plan = p.plan as { status?: string; crossCheck?: { passed?: boolean } } | undefined;
      return `${plan?.status ?? '?'}, cross-check ${plan?.crossCheck?.passed ? 'passed' : 'FAILED'}; submitted by ${String(p.submittedBy)}`;
    }
    case 'job-submitted': return `problem ${String(p.problemHash).slice(0, 16)}…`;
    case 'job-failed': return `${String(p.errorName)}: ${String(p.message)}`;
    case 'job-cancelled': return String(p.reason);
    default: return '';
  }
}

export const historyCommand: CliCommand = {
  name: 'history',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { ...REMOTE_OPTIONS } });
    const planId = positionals[0];
    if (!planId) throw new UsageError('planId', 'veer history needs a plan id');
    try {
      const answer = await callApi<HistoryAnswer>(remoteFrom(values), 'GET', `/v1/plans/${encodeURIComponent(planId)}/history`);
      if (values.json) { process.stdout.write(JSON.stringify(answer, null, 2) + '\n'); return 0; }
      const p = answer.plan;
      const lines = [`plan ${p.planId} (${p.spacecraftName}) — ${p.state}${p.converged ? '' : ', not converged'}`,
        ...answer.entries.map((e) => `${String(e.sequence).padStart(6)}  ${e.at}  ${e.actor.padEnd(16)} ${e.kind.padEnd(16)} ${e.hashMatches ? 'hash ok' : 'HASH BAD'}  ${what(e)}`),
        '', PROPOSAL_NOTICE];
      process.stdout.write(lines.join('\n') + '\n');
      return answer.entries.every((e) => e.hashMatches) ? 0 : 1;
    } catch (error) {
      return reportApiError('history', error);
    }
  },
};
