/** `veer plan <problem.json> [--json] [--out FILE] [--state FILE.opm] [--leap-seconds FILE] [--ephemeris FILE.oem ...] [--threads N]`: the whole planning job in-process, no server. */
import { constants } from 'node:fs';
import { access, stat, writeFile } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';
import { InvalidInputError, type LeapSecondTable } from '../../propagator/index.ts';
import { parseProblem, planLeapSeconds, planManeuvers, type CheckedProblem } from '../../planner/index.ts';
import type { ManeuverPlan } from '../../planner/index.ts';
import { cliEphemerisCache } from '../cli-ephemeris-cache.ts';
import { progressBar } from '../progress-bar.ts';
import type { CliCommand } from '../command.ts';
import { formatPlanReport } from '../report/plan-report.ts';
import { readJsonFile } from './read-json-file.ts';
import { LEAP_SECONDS_USAGE, loadCliLeapSeconds } from '../leap-seconds-option.ts';
import { parseFileCommandArgs } from './file-command-args.ts';
import { EPHEMERIS_USAGE, loadEphemerisFiles } from '../ephemeris-option.ts';
import { planThreadCount, SampleThread } from '../sample-threads.ts';

const USAGE = `usage: veer plan <problem.json> [--json] [--out FILE] [--state FILE.opm] [--leap-seconds FILE]
                 [--ephemeris FILE.oem ...] [--threads N]

Plans the correction burns of a retargeting problem in this process: differential correction, an
independent cross-check (the other propagation method and central-body treatment at a tighter tolerance), linear and Monte Carlo
dispersion, caveats. Progress goes to stderr; the readable report to stdout.

  --json       print the plan as JSON on stdout instead of the report
  --out FILE   also write the plan as JSON to FILE (checked for writability before planning)
  --state FILE.opm  take the initial state (and covariance) from a CCSDS OPM, KVN or XML, instead of the
               problem's initialState (the file is read strictly; errors name the keyword and line)
${LEAP_SECONDS_USAGE}
${EPHEMERIS_USAGE}
  --threads N  run the Monte Carlo samples on N threads (1 to 16; default 1); the plan is the same for every
               N. Each extra thread loads its own copy of the planner first: it pays only with free cores
               and many samples

Exit codes: 0 converged and cross-check passed; 3 not converged or cross-check failed;
2 bad usage or invalid problem (the field is named); 1 other failures.
Every plan is a PROPOSAL: it requires review and approval by qualified flight-dynamics staff and
independent verification before any commanding; follow the mission's own procedures.`;

/** Reads and validates a problem file; InvalidInputError names the file or the field. */
export async function readProblemFile(path: string, leapSeconds: LeapSecondTable): Promise<CheckedProblem> {
  return parseProblem(await readJsonFile(path, 'problem', (field, message) => new InvalidInputError(field, message)), leapSeconds);
}

/**
 * Refuses an --out path that cannot be written, before any computation (the job may take minutes): the
 * folder must exist and be writable, and an existing entry must be a writable file. Leaves no file behind.
 */
export async function checkOutputPath(path: string): Promise<void> {
  const full = resolve(path);
  const existing = await stat(full).catch(() => null);
  if (existing?.isDirectory()) throw new InvalidInputError('--out', `'${path}' is a directory, not a file`);
  try {
    if (existing) await access(full, constants.W_OK);
    else await access(dirname(full), constants.W_OK | constants.X_OK);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    const why = code === 'ENOENT' ? `folder '${dirname(full)}' does not exist` : `not writable (${code})`;
    throw new InvalidInputError('--out', `cannot write the plan to '${path}': ${why}`);
  }
}

/** Exit code of a finished plan: 0 only when converged and cross-checked. */
export function planExitCode(plan: ManeuverPlan): number {
  return plan.status === 'converged' && plan.crossCheck.passed ? 0 : 3;
}

/** The helper threads of `--threads` (none when the plan runs no Monte Carlo here), each handed the problem at
 * once so it gets ready while the plan is made. */
function startSampleThreads(problem: CheckedProblem, leapSeconds: LeapSecondTable, ephemerisFiles: string[],
  option: string | undefined): SampleThread[] {
  const count = planThreadCount(option);
  const disperses = problem.executionErrors !== undefined || problem.initialState.covarianceKmKmS !== undefined;
  if (count === 1 || problem.dispersion.samples === 0 || !disperses) return [];
  const threads = Array.from({ length: count - 1 }, () => new SampleThread());
  for (const t of threads) t.prepare({ problem, leapSeconds: planLeapSeconds(leapSeconds), ephemerisFiles });
  return threads;
}

export const planCommand: CliCommand = {
  name: 'plan',
  usage: USAGE,
  async run(args: string[]): Promise<number> {
    const parsed = parseFileCommandArgs(args, 'plan', USAGE, { '--out': 'a file name', '--state': 'an OPM file name', '--leap-seconds': 'a file name',
      '--ephemeris': 'an OEM file name', '--threads': 'a number of threads' });
    if (!parsed) return 2;
    const { json, file } = parsed;
    const out = parsed.values['--out'];
    const state = parsed.values['--state'];
    const leapSeconds = await loadCliLeapSeconds(parsed.values['--leap-seconds']);
    // The CCSDS readers load only for --state (they are not needed to plan from a problem file).
    const problem = state ? await (await import('./ccsds-cli.ts')).readProblemFileWithOpmState(file, state, leapSeconds)
      : await readProblemFile(file, leapSeconds);
    const ephemerisPaths = parsed.all['--ephemeris'] ?? [];
    const ephemerisFiles = await loadEphemerisFiles(ephemerisPaths, leapSeconds);
    if (out) await checkOutputPath(out);
    const threads = startSampleThreads(problem, leapSeconds, ephemerisPaths, parsed.values['--threads']);
    const bar = progressBar('veer plan');
    const controller = new AbortController();
    const onSigint = (): void => controller.abort();
    process.once('SIGINT', onSigint);
    let plan: ManeuverPlan;
    try {
      plan = await planManeuvers(problem, {
        onProgress: bar.update, signal: controller.signal, ephemerisCache: cliEphemerisCache, ephemerisFiles, sampleRunners: threads,
      });
    } finally {
      bar.end();
      process.removeListener('SIGINT', onSigint);
      await Promise.all(threads.map((t) => t.close()));
    }
    const text = `${JSON.stringify(plan, null, 2)}\n`;
    let writeFailure: string | null = null;
    if (out) {
      try {
        await writeFile(out, text, 'utf8');
      } catch (error) {
        writeFailure = (error as Error).message;
      }
    }
    process.stdout.write(json ? text : `${formatPlanReport(plan)}\n`);
    if (writeFailure !== null) {
      process.stderr.write(`veer plan: --out: could not write the plan to '${out}' after planning: ${writeFailure}\n`);
      return 1;
    }
    const code = planExitCode(plan);
    if (code !== 0) {
      process.stderr.write(plan.status !== 'converged'
        ? `veer plan: NOT CONVERGED (${plan.convergence.outcome}) — no plan to execute\n`
        : `veer plan: CROSS-CHECK FAILED — ${plan.crossCheck.message}\n`);
    }
    return code;
  },
};
