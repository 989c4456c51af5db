/**
 * `veer submit <problem.json>`: checks the problem locally with the planner's own parser (nothing is sent when it
 * fails), submits it as a retargeting job, and optionally follows it to the end (--watch).
 */
import { parseArgs } from 'node:util';
import { parseProblem } from '../../planner/index.ts';
import { failureOf } from '../../contract/errors.ts';
import { loadCliLeapSeconds } from '../leap-seconds-option.ts';
import type { CliCommand } from '../command.ts';
import { JOB_EXIT, JOB_EXIT_USAGE } from './job-outcome.ts';
import { readJsonFile } from './read-json-file.ts';
import { ApiCallError, callApi, exitCodeFor, PROPOSAL_NOTICE, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';
import { watchJob } from './watch.ts';

const USAGE = `usage: veer submit <problem.json> --reason TEXT [--urgent] [--idempotency-key KEY] [--watch]
                  [--url URL] [--token TOKEN] [--json]

Submits a retargeting problem (the same JSON as \`veer plan\`) to the service as a job and prints its id. The
problem is checked here first with the planner's own parser; an invalid one is not sent and the failing field
is named. When the server refuses the request, every failing field is listed by its path.
  --reason TEXT           why the retargeting is needed (required, 3–2000 characters; kept for reviewers)
  --urgent                serve before routine jobs (priority urgent)
  --idempotency-key KEY   8–128 of A-Z a-z 0-9 . _ ~ -: resubmitting with the same key and request returns the
                          existing job instead of a new one (keys are per submitter)
  --watch                 then follow the job like \`veer watch\` and exit with its outcome code
${REMOTE_USAGE}

Exit codes without --watch: 0 submitted (or the existing job returned); 2 invalid problem, bad usage or a
request the server refused; 1 other failures. With --watch:
${JOB_EXIT_USAGE}
${PROPOSAL_NOTICE}`;

interface SubmitAnswer { jobId: string; outcome: 'created' | 'existing'; statusUrl: string; eventsUrl: string }

/** Reads the problem file as JSON and checks it with parseProblem; returns the JSON exactly as written. */
async function readCheckedProblem(path: string): Promise<unknown> {
  const json = await readJsonFile(path, 'problem', (field, message) => new UsageError(field, message));
  // The same table the local planner would use (VEER_LEAP_SECONDS or built-in); the service checks again with its own.
  const leapSeconds = await loadCliLeapSeconds(undefined);
  try {
    parseProblem(json, leapSeconds);
  } catch (error) {
    const failure = failureOf(error);
    if (failure.name !== 'InvalidInputError' && failure.name !== 'OutOfSpanError') throw error;
    throw new UsageError(`problem.${failure.field ?? '(problem)'}`, `${failure.message} — in '${path}'; nothing was sent`);
  }
  return json;
}

export const submitCommand: CliCommand = {
  name: 'submit',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({
      args, allowPositionals: true,
      options: {
        ...REMOTE_OPTIONS, reason: { type: 'string' }, urgent: { type: 'boolean', default: false },
        'idempotency-key': { type: 'string' }, watch: { type: 'boolean', default: false },
      },
    });
    const file = positionals[0];
    if (!file) throw new UsageError('problem', 'veer submit needs a problem file\n\n' + USAGE);
    if (values.reason === undefined) throw new UsageError('--reason', 'say why the retargeting is needed (kept for reviewers)');
    const remote = remoteFrom(values);
    const problem = await readCheckedProblem(file);
    const body = {
      problem, reason: values.reason, priority: values.urgent ? 'urgent' : 'routine',
      ...(values['idempotency-key'] !== undefined ? { idempotencyKey: values['idempotency-key'] } : {}),
    };
    let answer: SubmitAnswer;
    try {
      answer = await callApi<SubmitAnswer>(remote, 'POST', '/v1/jobs', body);
    } catch (error) {
      if (!(error instanceof ApiCallError)) throw error;
      const refused = error.status === 400 ? 'the server refused the job' : 'submission failed';
      process.stderr.write(`veer submit: ${refused}: ${error.message}\n`);
      return exitCodeFor(error);
    }
    if (values.json && !values.watch) process.stdout.write(JSON.stringify(answer, null, 2) + '\n');
    else {
      const what = answer.outcome === 'created' ? `job ${answer.jobId} submitted (${body.priority})`
        : `job ${answer.jobId} already exists for this idempotency key and request; nothing new was submitted`;
      (values.json ? process.stderr : process.stdout).write(`${what}\n`);
    }
    if (!values.watch) return 0;
    try {
      return await watchJob(remote, answer.jobId, values.json);
    } catch (error) {
      if (!(error instanceof ApiCallError)) throw error;
      process.stderr.write(`veer submit: following job ${answer.jobId}: ${error.message}\n`);
      return error.status < 500 ? exitCodeFor(error) : JOB_EXIT.lostContact;
    }
  },
};
