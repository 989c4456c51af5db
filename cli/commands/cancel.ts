/** `veer cancel <jobId> [--reason TEXT]`: removes a waiting job, or tells a running one to stop. */
import { parseArgs } from 'node:util';
import type { CliCommand } from '../command.ts';
import { jobPath, type JobStatusAnswer } from './job-outcome.ts';
import { callApi, reportApiError, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';

const USAGE = `usage: veer cancel <jobId> [--reason TEXT] [--url URL] [--token TOKEN] [--json]

A waiting job is removed at once (state cancelled). A running job is told to stop; it ends cancelled shortly
(follow it with \`veer watch <jobId>\`, which then exits 4). Submitters may cancel only their own jobs; admins any.
  --reason TEXT  why (kept in the archive; default "cancelled on request")
${REMOTE_USAGE}

Exit codes: 0 cancelled or cancellation requested; 2 refused (job already finished, unknown job, not yours,
token, role); 1 other failures.`;

export const cancelCommand: CliCommand = {
  name: 'cancel',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({
      args, allowPositionals: true, options: { ...REMOTE_OPTIONS, reason: { type: 'string' } },
    });
    const jobId = positionals[0];
    if (!jobId) throw new UsageError('jobId', 'veer cancel needs a job id\n\n' + USAGE);
    try {
      const status = await callApi<JobStatusAnswer>(remoteFrom(values), 'POST', `${jobPath(jobId)}/cancel`,
        values.reason === undefined ? {} : { reason: values.reason });
      if (values.json) { process.stdout.write(JSON.stringify(status, null, 2) + '\n'); return 0; }
      process.stdout.write(status.state === 'cancelled'
        ? `job ${jobId} cancelled (it had not started; no plan was produced)\n`
        : `job ${jobId}: cancellation requested while ${status.state}; it stops shortly (veer watch ${jobId})\n`);
      return 0;
    } catch (error) {
      return reportApiError('cancel', error);
    }
  },
};
