/** `veer budget <request.json> [--json] [--out FILE] [--leap-seconds FILE] [--ephemeris FILE.oem ...]`: the statistical Δv budget of a correction sequence, in-process. */
import { writeFile } from 'node:fs/promises';
import { InvalidInputError } from '../../propagator/index.ts';
import { parseBudgetRequest, runBudget } from '../../planner/index.ts';
import type { BudgetResult } from '../../planner/index.ts';
import type { CliCommand } from '../command.ts';
import { progressBar } from '../progress-bar.ts';
import { formatBudgetReport } from '../report/budget-report.ts';
import { checkOutputPath } from './plan.ts';
import { readJsonFile } from './read-json-file.ts';
import { parseFileCommandArgs } from './file-command-args.ts';
import { LEAP_SECONDS_USAGE, loadCliLeapSeconds } from '../leap-seconds-option.ts';
import { EPHEMERIS_USAGE, loadEphemerisFiles } from '../ephemeris-option.ts';

const USAGE = `usage: veer budget <request.json> [--json] [--out FILE] [--leap-seconds FILE]
                   [--ephemeris FILE.oem ...]

The statistical Δv budget of a sequence of correction burns, in this process: plans the nominal sequence,
then simulates it many times — true initial state drawn from the initial covariance, each burn re-planned
on a navigation estimate drawn from that burn's knowledge covariance, executed with Gates errors — by a
linear path (STM gains) and a non-linear path (a corrector run per re-plan), and compares the two.
The request: { "problem": <retargeting problem>, "knowledge": [{ "covarianceKmKmS": 6x6 }, ... one per burn],
"linearSamples", "nonlinearSamples", "seed", "replanToleranceFraction", "agreementSignificance" }.
Progress goes to stderr (Ctrl-C stops it); the readable report to stdout.

  --json       print the result as JSON on stdout instead of the report
  --out FILE   also write the result as JSON to FILE (checked for writability first)
${LEAP_SECONDS_USAGE}
${EPHEMERIS_USAGE}

Exit codes: 0 budget done and the two paths agree (or only one ran); 3 no budget (nominal plan not
converged) or the paths disagree or re-plans did not converge; 2 bad usage or invalid request (the field
is named); 1 other failures.
A budget is a STUDY, never a plan: any burn it informs requires review and approval by qualified
flight-dynamics staff and independent verification; follow the mission's own procedures.`;

/** Exit code of a finished budget; see USAGE. */
export function budgetExitCode(r: BudgetResult): number {
  if (r.nominal.status !== 'converged' || (!r.linear && !r.nonlinear)) return 3;
  if (r.agreement && !r.agreement.passed) return 3;
  if ((r.nonlinear?.notConverged.count ?? 0) > 0) return 3;
  return 0;
}

export const budgetCommand: CliCommand = {
  name: 'budget',
  usage: USAGE,
  async run(args: string[]): Promise<number> {
    const parsed = parseFileCommandArgs(args, 'budget', USAGE, { '--out': 'a file name', '--leap-seconds': 'a file name',
      '--ephemeris': 'an OEM file name' });
    if (!parsed) return 2;
    const { json, file } = parsed;
    const out = parsed.values['--out'];
    const leapSeconds = await loadCliLeapSeconds(parsed.values['--leap-seconds']);
    const request = parseBudgetRequest(await readJsonFile(file, 'request', (field, message) => new InvalidInputError(field, message)), leapSeconds);
    const ephemerisFiles = await loadEphemerisFiles(parsed.all['--ephemeris'] ?? [], leapSeconds);
    if (out) await checkOutputPath(out);
    const bar = progressBar('veer budget');
    const controller = new AbortController();
    const onSigint = (): void => controller.abort();
    process.once('SIGINT', onSigint);
    let result: BudgetResult;
    try {
      result = await runBudget(request, { onProgress: bar.update, signal: controller.signal, ephemerisFiles });
    } finally {
      bar.end();
      process.removeListener('SIGINT', onSigint);
    }
    const text = `${JSON.stringify(result, null, 2)}\n`;
    if (out) {
      try {
        await writeFile(out, text, 'utf8');
      } catch (error) {
        process.stdout.write(json ? text : `${formatBudgetReport(result)}\n`);
        process.stderr.write(`veer budget: --out: could not write the result to '${out}': ${(error as Error).message}\n`);
        return 1;
      }
    }
    process.stdout.write(json ? text : `${formatBudgetReport(result)}\n`);
    const code = budgetExitCode(result);
    if (code !== 0) {
      process.stderr.write(result.nominal.status !== 'converged' ? 'veer budget: NO BUDGET — the nominal plan did not converge\n'
        : `veer budget: CHECK THE RESULT — ${result.agreement && !result.agreement.passed ? result.agreement.message : 'some re-plans did not converge'}\n`);
    }
    return code;
  },
};
