/** `veer status <jobId>`: a job's state, progress and, once finished, its outcome and plan id. */
import { parseArgs } from 'node:util';
import type { CliCommand } from '../command.ts';
import { describeOutcome, isFinal, jobPath, statusLines, type JobStatusAnswer } from './job-outcome.ts';
import { callApi, reportApiError, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';

const USAGE = `usage: veer status <jobId> [--url URL] [--token TOKEN] [--json]

Prints the job's state (waiting, delayed, active, waiting-children, completed, failed, cancelled), priority,
submitter, reason and latest progress; for a finished job also its outcome: the plan id and whether the plan
converged and passed its cross-check (confirmed from the plan itself), or the error.
${REMOTE_USAGE}

Exit codes: 0 shown (whatever the job's state; \`veer watch\` exits by outcome); 2 refused (unknown job, token,
role); 1 other failures.`;

export const statusCommand: CliCommand = {
  name: 'status',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { ...REMOTE_OPTIONS } });
    const jobId = positionals[0];
    if (!jobId) throw new UsageError('jobId', 'veer status needs a job id\n\n' + USAGE);
    const remote = remoteFrom(values);
    try {
      const status = await callApi<JobStatusAnswer>(remote, 'GET', jobPath(jobId));
      if (values.json) { process.stdout.write(JSON.stringify(status, null, 2) + '\n'); return 0; }
      const lines = statusLines(status);
      if (isFinal(status)) lines.push(...(await describeOutcome(remote, status)).lines);
      process.stdout.write(lines.join('\n') + '\n');
      return 0;
    } catch (error) {
      return reportApiError('status', error);
    }
  },
};
