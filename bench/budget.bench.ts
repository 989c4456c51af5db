/**
 * npm run bench:budget — the Δv budget's cost on the demo flyby (examples/flyby-budget-demo.json) with a
 * third correction burn added (TCM-3 five days before the flyby). Writes bench/results/budget.md.
 *
 * 1. Linear path: 10,000 samples of the three-burn sequence in this process (one core), CPU time.
 * 2. Non-linear path: samples/s in one process and in two processes (one per core), alternated in rounds (the
 *    same samples, order swapped every round), and the cost of one non-linear sample as a multiple of one plan's
 *    correction stage (first corrector step to the solution evaluated with its STM, from planManeuvers'
 *    progress) — the peer, measured in each round.
 * `tsx bench/budget.bench.ts --nonlinear <first> <count>` is the child-process mode of the two-process run.
 */
import { spawn } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { assembleBudget, parseBudgetRequest, planManeuvers, prepareBudget, runBudgetSamples } from '../planner/index.ts';
import type { BudgetSample, CheckedBudgetRequest } from '../planner/index.ts';
import { cpuMs, formatSpread, machineLine, oneVersusTwoProcesses, ratios, spreadOf } from './bench-stats.ts';

const here = fileURLToPath(import.meta.url);
const demo = JSON.parse(readFileSync(new URL('../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as {
  problem: { burns: unknown[] }; knowledge: { covarianceKmKmS: number[][] }[];
};
const diag = (pKm: number, vKmS: number): number[][] => Array.from({ length: 6 }, (_, i) => Array.from({ length: 6 }, (__, j) => (i !== j ? 0 : i < 3 ? pKm ** 2 : vKmS ** 2)));
const LINEAR_N = 10_000;
const request: CheckedBudgetRequest = parseBudgetRequest({
  ...demo,
  problem: { ...demo.problem, burns: [...demo.problem.burns, { label: 'TCM-3', epoch: '2031-10-06T12:00:00 TDB', frame: 'inertial', deltaVGuessKmS: [0, 0, 0] }] },
  knowledge: [...demo.knowledge, { covarianceKmKmS: diag(0.2, 2e-8) }],
  linearSamples: LINEAR_N, nonlinearSamples: 0,
});

// Child mode: prepare the nominal, time a range of non-linear samples, print them as JSON.
if (process.argv[2] === '--nonlinear') {
  const first = Number(process.argv[3]);
  const count = Number(process.argv[4]);
  const { nominal } = await prepareBudget(request);
  const t = performance.now();
  const samples = await runBudgetSamples(request, nominal!, { path: 'nonlinear', firstIndex: first, count });
  process.stdout.write(JSON.stringify({ samples, ms: performance.now() - t }));
  process.exit(0);
}

function runChild(first: number, count: number): Promise<{ samples: BudgetSample[]; ms: number }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', here, '--nonlinear', String(first), String(count)], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    child.stdout.on('data', (d: Buffer) => { out += d.toString(); });
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve(JSON.parse(out) as { samples: BudgetSample[]; ms: number }) : reject(new Error(`child exited ${code}`))));
  });
}

const lines: string[] = [];
const log = (line = ''): void => { lines.push(line); console.log(line); };

/** Correction stage of one plan of the same problem, ms wall (first corrector step to the solution with its STM). */
async function correctionStageMs(): Promise<number> {
  let tCorrect = 0;
  let tCross = 0;
  await planManeuvers(request.problem, {
    monteCarlo: 'skip',
    onProgress: (p) => {
      if (p.stage === 'correcting' && tCorrect === 0) tCorrect = performance.now();
      if (p.stage === 'cross-checking' && tCross === 0) tCross = performance.now();
    },
  });
  return tCross - tCorrect;
}

/** Rounds of the non-linear comparison; each runs the peer (one plan's correction stage, here), the one-process
 * run and the two-process run of the same samples, the last two in swapped order every round. */
const ROUNDS = 3;
const NONLINEAR_N = 60;

log('# bench:budget results');
log();
log(`Machine: ${machineLine()}. Other work shared the machine, so absolute times are indicative; ratios are measured in the same run.`);
log();
const { plan, nominal } = await prepareBudget(request);
if (!nominal) throw new Error(`the nominal plan did not converge: ${plan.convergence.message}`);
const c0 = cpuMs();
const linear = await runBudgetSamples(request, nominal, { path: 'linear', firstIndex: 0, count: LINEAR_N });
const linearCpuMs = cpuMs() - c0;
const linearSummary = assembleBudget(request, plan, nominal, linear, []).linear!;

await correctionStageMs(); // warm-up: the first plan in a process pays for compiling the planner's hot paths
const correction: number[] = [];
const { oneRates, oneMs, twoRates, twoWalls, sameSamples, samples: nonlinear } = await oneVersusTwoProcesses(runChild, NONLINEAR_N, ROUNDS,
  async () => { correction.push(await correctionStageMs()); });
const sampleOverCorrection = oneMs.map((ms, r) => ms / NONLINEAR_N / correction[r]!);
const both = assembleBudget(request, plan, nominal, linear, nonlinear);

log('## Three-burn sequence (TCM-1, TCM-2, TCM-3; demo flyby, 62-day span)');
log();
log('| quantity | value |');
log('|---|---|');
log(`| nominal plan | ${plan.status}, cross-check ${plan.crossCheck.passed ? 'passed' : 'FAILED'}; ${plan.burns.map((x) => `${x.label} ${x.magnitudeMS.toFixed(3)} m/s`).join(', ')} |`);
log(`| linear path: ${LINEAR_N} samples, CPU time (one core) | ${(linearCpuMs / 1000).toFixed(3)} s |`);
log(`| linear path: samples/s, one core | ${(LINEAR_N / (linearCpuMs / 1000)).toFixed(0)} |`);
log(`| non-linear path: samples/s, one process (${NONLINEAR_N} samples; median (min–max) of ${ROUNDS} rounds) | ${formatSpread(spreadOf(oneRates), 2)} |`);
log(`| non-linear path: samples/s, two processes (the same ${NONLINEAR_N} samples split, sampling time) | ${formatSpread(spreadOf(twoRates), 2)} |`);
log(`| two processes / one process, round by round | ${formatSpread(spreadOf(ratios(twoRates, oneRates)), 2)}× |`);
log(`| wall time of the two-process run incl. start-up and nominal planning, s | ${formatSpread(spreadOf(twoWalls.map((w) => w / 1000)))} |`);
log(`| same samples from one and from two processes | ${sameSamples ? 'yes' : 'NO'} |`);
log(`| one plan's correction stage (peer, wall ms, one per round after a warm-up plan) | ${formatSpread(spreadOf(correction), 0)} |`);
log(`| one non-linear sample (3 re-plans + propagation) / one correction stage, round by round | ${formatSpread(spreadOf(sampleOverCorrection), 2)}× |`);
log();
log(`Linear path, ${LINEAR_N} samples, seed ${request.seed}:`);
log();
log('| burn | mean m/s | σ m/s | Δv95 m/s | Δv99 m/s | propellant at 99 % kg |');
log('|---|---|---|---|---|---|');
for (const x of linearSummary.burns) log(`| ${x.label} | ${x.deltaVMS.mean.toFixed(4)} | ${x.deltaVMS.sigma.toFixed(4)} | ${x.deltaVMS.p95.toFixed(4)} | ${x.deltaVMS.p99.toFixed(4)} | ${x.propellantKg.p99.toFixed(3)} |`);
log(`| total (per-sample sums) | ${linearSummary.total.deltaVMS.mean.toFixed(4)} | ${linearSummary.total.deltaVMS.sigma.toFixed(4)} | ${linearSummary.total.deltaVMS.p95.toFixed(4)} | ${linearSummary.total.deltaVMS.p99.toFixed(4)} | ${linearSummary.total.propellantKg.p99.toFixed(3)} |`);
log();
log(`Linear vs non-linear on ${nonlinear.length} non-linear samples: ${both.agreement?.passed ? 'agree' : 'DISAGREE'} — ${both.agreement?.message}; `
  + `p-values (mean, covariance) per burn ${both.agreement?.burns.map((x) => `${x.label} ${x.meanPValue?.toPrecision(3)}, ${x.covariancePValue?.toPrecision(3)}`).join('; ')}; re-plans not converged ${both.nonlinear?.notConverged.count}.`);
log();
writeFileSync(new URL('./results/budget.md', import.meta.url), `${lines.join('\n')}\n`);
