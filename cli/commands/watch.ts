/**
 * `veer watch <jobId>`: follows a job over the API's server-sent event stream (progress bar on stderr) and ends
 * with the outcome and the plan id on stdout. The exit code says what happened (JOB_EXIT).
 */
import { parseArgs } from 'node:util';
import { readEventStream } from '../../contract/event-stream.ts';
import { printableJson } from '../../contract/free-text.ts';
import type { CliCommand } from '../command.ts';
import {
  describeOutcome, isFinal, JOB_EXIT, JOB_EXIT_USAGE, jobPath, progressText, type JobStatusAnswer, type ProgressAnswer,
} from './job-outcome.ts';
import { ApiCallError, reportApiError, parseAnswer, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, sendToApi, UsageError, type Remote } from './remote-api.ts';

const MAX_RECONNECTS = 5;
const RECONNECT_DELAY_MS = 2000;

const USAGE = `usage: veer watch <jobId> [--url URL] [--token TOKEN] [--json]

Follows a job until it finishes: state changes and a progress bar on stderr (one line per stage when stderr is
not a terminal), then the outcome and the plan id on stdout. Stopping veer watch (Ctrl-C) does not cancel the
job; \`veer cancel <jobId>\` does. A lost stream is reopened up to ${MAX_RECONNECTS} times, ${RECONNECT_DELAY_MS / 1000} s apart.
${REMOTE_USAGE} (with --json: the final job status and plan summary as JSON)

${JOB_EXIT_USAGE}`;

interface SseEvent { event: string; data: unknown }

/** Reads a text/event-stream (WHATWG HTML §9.2 format) until it closes; rejects with ApiCallError on an error answer. */
async function* readEvents(remote: Remote, path: string): AsyncGenerator<SseEvent> {
  const res = await sendToApi(remote, path, { headers: { accept: 'text/event-stream' } });
  if (!res.ok || !res.body) throw new ApiCallError(res.status, parseAnswer(await res.text()) as ApiCallError['body']);
  for await (const block of readEventStream(res.body)) {
    if (block.data !== null) yield { event: block.event, data: printableJson(JSON.parse(block.data) as unknown) };
  }
}

/** Progress on stderr: a redrawn bar on a terminal, else one line per stage. */
function progressDisplay(jobId: string): { state(s: JobStatusAnswer): void; update(p: ProgressAnswer): void; end(): void } {
  const tty = process.stderr.isTTY === true;
  let lastStage = '';
  let lastLen = 0;
  const clear = (): void => { if (tty && lastLen > 0) { process.stderr.write(`\r${' '.repeat(lastLen)}\r`); lastLen = 0; } };
  return {
    state(s) {
      clear();
      process.stderr.write(`veer watch: job ${jobId} ${s.state}${s.cancelRequested && !isFinal(s) ? ' (cancellation requested)' : ''}\n`);
    },
    update(p) {
      const fraction = Math.min(1, Math.max(0, p.fraction));
      if (tty) {
        const width = 30;
        const filled = Math.round(fraction * width);
        const text = `[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${progressText(p)}`.slice(0, 110);
        process.stderr.write(`\r${text.padEnd(lastLen)}`);
        lastLen = text.length;
      } else if (p.stage !== lastStage) {
        process.stderr.write(`veer watch: ${progressText(p)}\n`);
      }
      lastStage = p.stage;
    },
    end: clear,
  };
}

const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/**
 * Contact lost: the job's state is unknown, which is not a failure — it may still run and complete. Says so
 * with the job id and how to resume, so a script does not resubmit a running job (exit JOB_EXIT.lostContact).
 */
function lostContact(jobId: string, lastError: string, json: boolean): number {
  const lines = [
    `veer watch: lost contact with the server while following job ${jobId} (${lastError}).`,
    `The job's state is UNKNOWN: it may still be running or have finished. Do not resubmit it.`,
    `Resume with: veer watch ${jobId}   (or check once: veer status ${jobId})`,
  ];
  process.stderr.write(`${lines.join('\n')}\n`);
  if (json) {
    process.stdout.write(JSON.stringify({ jobId, status: null, exitCode: JOB_EXIT.lostContact, outcome: lines }, null, 2) + '\n');
  }
  return JOB_EXIT.lostContact;
}

/**
 * Follows `jobId` to its end and prints the outcome; resolves to the exit code (JOB_EXIT). API refusals
 * (401/403/404…) reject with ApiCallError.
 */
export async function watchJob(remote: Remote, jobId: string, json: boolean): Promise<number> {
  const display = progressDisplay(jobId);
  let final: JobStatusAnswer | undefined;
  let failures = 0;
  let lastError = '';
  try {
    while (!final) {
      try {
        for await (const e of readEvents(remote, `${jobPath(jobId)}/events`)) {
          failures = 0;
          if (e.event === 'status') display.state(e.data as JobStatusAnswer);
          else if (e.event === 'progress') display.update(e.data as ProgressAnswer);
          else if (e.event === 'end') { final = e.data as JobStatusAnswer; break; }
        }
        lastError = 'the stream closed before the job ended';
      } catch (error) {
        if (error instanceof ApiCallError && error.status < 500) throw error;
        lastError = (error as Error).message;
      }
      if (final) break;
      failures += 1;
      if (failures > MAX_RECONNECTS) {
        display.end();
        return lostContact(jobId, lastError, json);
      }
      display.end();
      process.stderr.write(`veer watch: ${lastError}; reopening in ${RECONNECT_DELAY_MS / 1000} s (${failures}/${MAX_RECONNECTS})\n`);
      await sleep(RECONNECT_DELAY_MS);
    }
  } finally {
    display.end();
  }
  const outcome = await describeOutcome(remote, final);
  const code = outcome.code ?? JOB_EXIT.failed;
  if (json) process.stdout.write(JSON.stringify({ status: final, plan: outcome.plan ?? null, exitCode: code, outcome: outcome.lines }, null, 2) + '\n');
  else process.stdout.write(outcome.lines.join('\n') + '\n');
  return code;
}

export const watchCommand: CliCommand = {
  name: 'watch',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { ...REMOTE_OPTIONS } });
    const jobId = positionals[0];
    if (!jobId) throw new UsageError('jobId', 'veer watch needs a job id\n\n' + USAGE);
    try {
      return await watchJob(remoteFrom(values), jobId, values.json);
    } catch (error) {
      return reportApiError('watch', error);
    }
  },
};
