/**
 * npm run bench:planner — the planner's cost on the demo flyby (examples/flyby-demo.json), as ratios against
 * a peer measured in the same run on the same machine. Writes bench/results/planner.md.
 *
 * 1. Retargeting: corrector iterations (target ≤ 6), CPU time of the correction stage and of the whole
 *    plan without Monte Carlo, each as a multiple of ONE state-only propagation over the same span with the
 *    same force model and ephemeris cache, alternated in rounds after warm-up rounds; the ≤ 10× target
 *    applies to the correction stage (retargeting).
 * 2. Monte Carlo: samples per second over the demo's 62-day span, in one process and in two processes
 *    (one per core; target ≥ 50/s on 2 cores), alternated in rounds, and the linear-versus-Monte-Carlo
 *    agreement of the B-plane dispersion.
 * `tsx bench/planner.bench.ts --samples <first> <count>` is the child-process mode used for the 2-core run.
 */
import { spawn } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseProblem, planManeuvers, runDispersionSamples, summariseDispersion, attachMonteCarlo } from '../planner/index.ts';
import type { CheckedProblem, DispersionSample, ManeuverPlan } from '../planner/index.ts';
import {
  createBuiltinEphemeris, EphemerisCache, parseEpoch, propagateAsync,
} from '../propagator/index.ts';
import type { BodyName } from '../propagator/index.ts';
import { codeVersion, cpuMs, formatSpread, historyRows, machineLine, oneVersusTwoProcesses, ratios, spreadOf } from './bench-stats.ts';
import { finiteRetargeting } from './finite-retargeting.ts';

const here = fileURLToPath(import.meta.url);
const demo = JSON.parse(readFileSync(new URL('../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const problem: CheckedProblem = parseProblem({ ...demo, dispersion: { samples: 0, seed: 20310 } });
const MC_SEED = 20310;

async function basePlan(): Promise<ManeuverPlan> {
  return planManeuvers(problem, { monteCarlo: 'skip' });
}

// Child mode: run a sample range of the converged plan, print the samples as JSON.
if (process.argv[2] === '--samples') {
  const first = Number(process.argv[3]);
  const count = Number(process.argv[4]);
  const plan = await basePlan();
  const t = performance.now();
  const samples = await runDispersionSamples(problem, plan, { seed: MC_SEED, firstIndex: first, count });
  process.stdout.write(JSON.stringify({ samples, ms: performance.now() - t }));
  process.exit(0);
}

const RESULTS = new URL('./results/planner.md', import.meta.url);
const lines: string[] = [];
const log = (line = ''): void => {
  lines.push(line);
  console.log(line);
};

// One ephemeris cache for the peer propagation and every plan (as a worker thread holds one): neither side
// pays for fitting after the warm-up round.
const ephemerisCache = new EphemerisCache();

/** One state-only propagation over the problem's span with its force model (the peer), CPU ms. */
async function stateOnlyPropagationMs(): Promise<number> {
  const fm = problem.forceModel;
  const t0 = parseEpoch(problem.initialState.epoch);
  const t1 = parseEpoch(problem.endEpoch);
  const bodies: BodyName[] = [...new Set<BodyName>(['sun', fm.centralBody, ...fm.perturbingBodies, 'mars'])];
  const eph = ephemerisCache.ephemerisFor(createBuiltinEphemeris(), bodies, { startTdbS: t0 - 2 * 86400, endTdbS: t1 + 2 * 86400 });
  const sp = problem.spacecraft.solarPressure;
  const t = cpuMs();
  await propagateAsync({
    initial: { epochTdbS: t0, centre: problem.initialState.centre, frame: problem.initialState.frame, positionKm: problem.initialState.positionKm, velocityKmS: problem.initialState.velocityKmS },
    endEpochTdbS: t1, ephemeris: eph, method: fm.method, relativeTolerance: fm.relativeTolerance,
    forces: {
      centralBody: fm.centralBody, perturbingBodies: fm.perturbingBodies, centralJ2: fm.centralJ2,
      solarPressure: fm.solarPressure && sp ? { ...sp, massKg: problem.spacecraft.massKg } : undefined,
    },
  });
  return cpuMs() - t;
}

/** Warm-up rounds before timing: the planner's hot paths reach their steady speed only after several plans
 * (JIT), and the first round also fits the shared ephemeris cache. */
const RETARGET_WARMUP = 8;
const RETARGET_ROUNDS = 9;

/** Returns this run's row of the run-by-run table (RUN_BY_RUN), or null when the demo did not plan. */
async function retargeting(): Promise<string | null> {
  const walls: number[] = [];
  const correction: number[] = [];
  const props: number[] = [];
  let plan: ManeuverPlan | null = null;
  for (let i = 0; i < RETARGET_WARMUP + RETARGET_ROUNDS; i++) {
    const propMs = await stateOnlyPropagationMs();
    let tCorrect = 0;
    let tCross = 0;
    const t = cpuMs();
    plan = await planManeuvers(problem, {
      monteCarlo: 'skip', ephemerisCache,
      onProgress: (p) => {
        if (p.stage === 'correcting' && tCorrect === 0) tCorrect = cpuMs();
        if (p.stage === 'cross-checking' && tCross === 0) tCross = cpuMs();
      },
    });
    if (i < RETARGET_WARMUP) continue;
    props.push(propMs);
    walls.push(cpuMs() - t);
    correction.push(tCross - tCorrect);
  }
  if (!plan) return null;
  const iterations = plan.iterations.filter((it) => it.jacobianSource !== 'none').length;
  const ratio = spreadOf(ratios(correction, props));
  const wholeRatio = spreadOf(ratios(walls, props));
  const verdict = (r: number): string => (r <= 10 ? 'meets' : 'does not meet');
  log('## Demo flyby retargeting');
  log();
  log(`CPU time of this process, ms: median (min–max) over ${RETARGET_ROUNDS} rounds after ${RETARGET_WARMUP} warm-up rounds; each round runs `
    + 'the peer propagation and then the plan, and each ratio is taken round by round.');
  log();
  log('| quantity | value | target |');
  log('|---|---|---|');
  log(`| status | ${plan.status}, cross-check ${plan.crossCheck.passed ? 'passed' : 'FAILED'} | converged, passed |`);
  log(`| corrector iterations (Newton steps) | ${iterations} | ≤ 6 |`);
  log(`| one state-only propagation, 62 d (peer) | ${formatSpread(spreadOf(props), 2)} ms | peer |`);
  log(`| correction stage incl. final STM evaluation | ${formatSpread(spreadOf(correction))} ms | |`);
  log(`| correction cost / one state-only propagation | ${formatSpread(ratio)}× | ≤ 10× |`);
  log(`| whole plan without Monte Carlo (setup, correction, cross-check, linear dispersion) | ${formatSpread(spreadOf(walls))} ms | |`);
  log(`| whole plan without Monte Carlo / one state-only propagation | ${formatSpread(wholeRatio)}× | (none: the ≤ 10× target is for retargeting) |`);
  log(`| propagations in the plan (incl. cross-check) | ${plan.effort.propagations} | |`);
  log(`| total Δv | ${plan.totalDeltaVMS.toFixed(4)} m/s | |`);
  log();
  log(`The issue's ≤ 10× target is for retargeting, measured here as the correction stage (from the first corrector `
    + `step to the solution evaluated with its STM): ${ratio.median.toFixed(1)}× (median of the round ratios), which ${verdict(ratio.median)} it. `
    + `The whole plan without Monte Carlo costs ${wholeRatio.median.toFixed(1)}× one propagation (${verdict(wholeRatio.median)} 10×): on top `
    + 'of the correction it validates the problem, re-propagates the solution with the other method at a tighter '
    + 'tolerance (the independent cross-check) and maps the linear dispersion. Peer and plans share one ephemeris cache '
    + '(fitted in the first warm-up round), so neither side pays for fitting in the timed rounds.');
  log();
  return `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${os.loadavg()[0]!.toFixed(1)} | ${formatSpread(ratio)}× | `
    + `${formatSpread(wholeRatio)}× | ${plan.effort.propagations} | ${ratio.median <= 10 ? 'met' : 'NOT met'} |`;
}

/** The run-by-run table of the correction cost (the last 10 runs; a row is written only by a run). */
const RUN_BY_RUN = '## Correction cost, run by run';
function runByRun(row: string | null): string[] {
  if (row === null) return [];
  return ['', RUN_BY_RUN, '',
    'One row per run of this bench: its median moves with the machine\'s load from run to run, so one verdict is read against the others.',
    '', '| run | code | load at end of retargeting rounds | correction / one propagation | whole plan / one propagation | propagations | ≤ 10× |',
    '|---|---|---|---|---|---|---|', ...historyRows(RESULTS, RUN_BY_RUN, row)];
}

function runChild(first: number, count: number): Promise<{ samples: DispersionSample[]; ms: number }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', here, '--samples', String(first), String(count)], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    child.stdout.on('data', (d: Buffer) => { out += d.toString(); });
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve(JSON.parse(out) as { samples: DispersionSample[]; ms: number }) : reject(new Error(`child exited ${code}`))));
  });
}

/** Monte Carlo rounds: each runs the one-process and the two-process contender (order swapped every round). */
const MC_ROUNDS = 3;
const MC_SAMPLES = 200;

async function monteCarlo(): Promise<void> {
  const plan = await basePlan();
  const n = MC_SAMPLES;
  // Sampling rate inside the children (excludes their start-up and the plan each one recomputes).
  const { oneRates, twoRates, twoWalls, sameSamples, samples } = await oneVersusTwoProcesses(runChild, n, MC_ROUNDS);
  const summary = summariseDispersion(problem, plan, samples);
  const withMc = attachMonteCarlo(plan, summary);
  const lin = plan.dispersion.linear?.total;
  const twoRate = spreadOf(twoRates);
  log('## Monte Carlo dispersion (62-day span, full non-linear propagation per sample)');
  log();
  log(`${MC_ROUNDS} rounds; each runs ${n} samples in one child process and the same ${n} samples split over two child processes `
    + '(one per core), the order swapped every round. Rates are samples per second of sampling time inside the children; '
    + 'median (min–max) over rounds, the speed-up round by round.');
  log();
  log('| quantity | value | target |');
  log('|---|---|---|');
  log(`| samples/s, one process | ${formatSpread(spreadOf(oneRates))} | |`);
  log(`| samples/s, two processes | ${formatSpread(twoRate)} | ≥ 50 on 2 cores |`);
  log(`| two processes / one process | ${formatSpread(spreadOf(ratios(twoRates, oneRates)), 2)} | |`);
  log(`| wall time of the two-process run incl. start-up and re-planning, s | ${formatSpread(spreadOf(twoWalls.map((w) => w / 1000)))} | |`);
  log(`| same samples from one and from two processes (seed ${MC_SEED}) | ${sameSamples ? 'yes' : 'NO'} | yes |`);
  log();
  log(`Two processes: ${twoRate.median.toFixed(1)} samples/s (median), target ≥ 50 on 2 cores: ${twoRate.median >= 50 ? 'met' : 'NOT met'}.`);
  log();
  log(`Linear vs Monte Carlo (${n} samples, seed ${MC_SEED}):`);
  log();
  log('| | linear (STM) | Monte Carlo |');
  log('|---|---|---|');
  log(`| B-plane 1σ semi-major, km | ${lin?.bPlane?.semiMajorKm.toFixed(2)} | ${summary.bPlane?.semiMajorKm.toFixed(2)} |`);
  log(`| B-plane 1σ semi-minor, km | ${lin?.bPlane?.semiMinorKm.toFixed(2)} | ${summary.bPlane?.semiMinorKm.toFixed(2)} |`);
  log(`| closest-approach time σ, s | ${lin?.closestApproachSigmaS?.toFixed(2)} | ${summary.closestApproachSigmaS?.toFixed(2)} |`);
  log(`| impact probability | ${plan.dispersion.linear?.impactProbability?.toExponential(2)} | ${summary.impactProbability} (${summary.impacts}/${summary.samples}) |`);
  log();
  log(`Agreement: ${summary.linearAgreement?.passed ? 'passed' : 'FAILED'} — ${summary.linearAgreement?.message}; largest axis ratio error ${summary.linearAgreement?.axisRatioError?.toFixed(3)}.`);
  log(`Caveats after attaching: ${withMc.caveats.map((c) => c.code).join(', ')}.`);
  log();
}

const machine = `Machine: ${machineLine()}; ${Math.round(os.totalmem() / 2 ** 30)} GiB. Shared with other work, so treat absolute times as indicative; ratios are measured in the same run.`;
if (process.argv[2] === '--finite-only') {
  log('# bench:planner results — finite-burn section only');
  log();
  log(machine);
  log();
  await finiteRetargeting(demo, log);
  writeFileSync(new URL('./results/planner-finite.md', import.meta.url), `${lines.join('\n')}\n`);
  process.exit(0);
}

log('# bench:planner results');
log();
log(machine);
log();
const retargetingRow = await retargeting();
await finiteRetargeting(demo, log);
await monteCarlo();
writeFileSync(RESULTS, `${[...lines, ...runByRun(retargetingRow)].join('\n')}\n`);
