/**
 * npm run bench:propagator — speed and accuracy of the propagator core, as ratios against peers measured
 * in the same run on the same machine. Writes bench/results/propagator.md.
 *
 * How times are taken (bench/bench-stats.ts, shared with bench/ephemeris.bench.ts): CPU time of this
 * process, contenders alternated within each round, median and min–max over rounds; ratios are taken
 * round by round. The look-up target compares the two sources on the exact look-ups one propagation makes,
 * through the same call the force model makes (planBodyPositions(...).positionsInto once per epoch).
 *
 * Case: one year heliocentric (an invented spacecraft, a = 1.3 au, e = 0.2, i = 3°, from 2031-03-01 TDB),
 * Sun central, Mercury..Neptune and the Moon perturbing, DOP853 at rtol = atol = 1e-12.
 */
import { writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import * as Astronomy from 'astronomy-engine';
import {
  buildChebyshevEphemeris, createBuiltinEphemeris, createCowellRhs, ForceModel, GM_KM3_S2, integrateDop853, parseEpoch,
  planBodyPositions, propagate, ttFromTdb, type BodyName, type BodyPositionsPlan, type Ephemeris, type PropagationRequest,
  type PropagationResult,
} from '../propagator/index.ts';
import { conicToState } from '../propagator/kepler/index.ts';
import { alternate, codeVersion, cpuMs, formatSpread, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';

interface OdexSolver {
  absoluteTolerance: number;
  relativeTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; nStep: number; nEval: number; outcome: number };
}
const { Solver } = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const T0 = parseEpoch('2031-03-01T00:00:00 TDB');
const YEAR_S = 365.25 * 86400;
const T1 = T0 + YEAR_S;
const TOL = 1e-12;
const PERTURBERS: BodyName[] = ['mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
const AU = 149597870.7;
const start = conicToState({
  semiLatusRectumKm: 1.3 * AU * (1 - 0.04), semiMajorAxisKm: 1.3 * AU, eccentricity: 0.2, inclinationRad: 0.0524,
  raanRad: 0.7, argPeriapsisRad: 2.0, trueAnomalyRad: 0.4,
}, GM_KM3_S2.sun);
const x0 = [...start.positionKm, ...start.velocityKmS];

const lines: string[] = [];
const log = (line = ''): void => {
  lines.push(line);
  console.log(line);
};
const distance = (a: ArrayLike<number>, b: ArrayLike<number>): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const ROUNDS = 15;
let speedRatio: Spread | null = null;

function request(ephemeris: Ephemeris, extra: Partial<PropagationRequest> = {}): PropagationRequest {
  return {
    initial: { epochTdbS: T0, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: start.positionKm, velocityKmS: start.velocityKmS },
    endEpochTdbS: T1, forces: { centralBody: 'sun', perturbingBodies: PERTURBERS }, ephemeris,
    relativeTolerance: TOL, absoluteTolerance: TOL, ...extra,
  };
}

/** Wraps a source to record what a propagation asks of it: the epochs of its batch look-ups (one per
 * force-model epoch) and any other single look-ups (bench only; allocates). */
function recording(source: Ephemeris): { ephemeris: Ephemeris; epochs: number[]; singles: { count: number } } {
  const epochs: number[] = [];
  const singles = { count: 0 };
  return {
    epochs, singles,
    ephemeris: {
      name: source.name, span: source.span, bodies: source.bodies,
      stateInto: (t, c, e, o, off) => {
        singles.count += 1;
        source.stateInto(t, c, e, o, off);
      },
      positionInto: (t, c, e, o, off) => {
        singles.count += 1;
        source.positionInto(t, c, e, o, off);
      },
      planPositions: (targets, centre): BodyPositionsPlan => {
        const plan = planBodyPositions(source, targets, centre);
        return { targets, centre, positionsInto: (e, o, off) => {
          epochs.push(e);
          plan.positionsInto(e, o, off);
        } };
      },
    },
  };
}

const out27 = new Float64Array(3 * PERTURBERS.length);
/** The force model's look-ups replayed: one batch call per recorded epoch. */
const replayBatch = (plan: BodyPositionsPlan, epochs: readonly number[]) => (): void => {
  for (let i = 0; i < epochs.length; i++) plan.positionsInto(epochs[i], out27, 0);
};
/** The same look-ups one body at a time (the call pattern before the batch plan existed). */
const replayPerBody = (source: Ephemeris, epochs: readonly number[]) => (): void => {
  for (let i = 0; i < epochs.length; i++) {
    for (let p = 0; p < PERTURBERS.length; p++) source.positionInto(PERTURBERS[p], 'sun', epochs[i], out27, 3 * p);
  }
};

log('# Propagator benchmark (npm run bench:propagator)');
log();
log(`Machine: ${machineLine()}. Shared with other work.`);
log();
log('Times are CPU time of this process (user + system), not wall time. Contenders run in alternation inside each');
log(`round (${ROUNDS} rounds after a warm-up round, unless a table says otherwise), so both sides of a ratio see the same load;`);
log('tables give the median with the min–max over rounds in brackets, and ratios are taken round by round. Timing');
log('code: bench/bench-stats.ts (shared with bench/ephemeris.bench.ts).');
log();
log('Case: one year heliocentric, invented spacecraft (a = 1.3 au, e = 0.2, i = 3°) from 2031-03-01 TDB; Sun');
log('central; Mercury..Neptune and the Moon as third bodies in f(q) form; Cowell, DOP853, rtol = atol = 1e-12.');
log();

// 1. Built-in ephemeris versus the Chebyshev cache.
const builtin = createBuiltinEphemeris();
const buildStarted = cpuMs();
const cache = buildChebyshevEphemeris(builtin, { bodies: ['sun', ...PERTURBERS], startTdbS: T0 - 86400, endTdbS: T1 + 86400 });
const buildMs = cpuMs() - buildStarted;
const rec = recording(builtin);
const builtinResult = propagate(request(rec.ephemeris));
const epochs = [...rec.epochs];
const singleLookUps = rec.singles.count;
const cacheResult = propagate(request(cache));
const [builtinRunMs, cacheRunMs] = alternate([
  { fn: () => propagate(request(builtin)), repeat: 1 }, { fn: () => propagate(request(cache)), repeat: 10 },
], 7);
const builtinPlan = planBodyPositions(builtin, PERTURBERS, 'sun');
const cachePlan = planBodyPositions(cache, PERTURBERS, 'sun');
const [builtinLookUpMs, cacheLookUpMs, builtinPerBodyMs, cachePerBodyMs] = alternate([
  { fn: replayBatch(builtinPlan, epochs), repeat: 1 }, { fn: replayBatch(cachePlan, epochs), repeat: 20 },
  { fn: replayPerBody(builtin, epochs), repeat: 1 }, { fn: replayPerBody(cache, epochs), repeat: 20 },
], ROUNDS);
const lookUpRatio = spreadOf(ratios(builtinLookUpMs, cacheLookUpMs));
const perBodyRatio = spreadOf(ratios(builtinPerBodyMs, cachePerBodyMs));
const lookUps = epochs.length * PERTURBERS.length;
const nsPerLookUp = (ms: readonly number[]): Spread => spreadOf(ms.map((m) => (m * 1e6) / lookUps));
const cacheNs = nsPerLookUp(cacheLookUpMs);
// Share of a run spent in look-ups: ratio of medians (the two were timed in different rounds).
const cacheShare = (100 * spreadOf(cacheLookUpMs).median) / spreadOf(cacheRunMs).median;
const builtinShare = (100 * spreadOf(builtinLookUpMs).median) / spreadOf(builtinRunMs).median;
const cacheError = distance(cacheResult.final.positionKm, builtinResult.final.positionKm);
const stat = (r: PropagationResult): string => `${r.stats.steps} (${r.stats.rejectedSteps}) | ${r.stats.evaluations}`;
log('## Ephemeris: built-in astronomy-engine series versus Chebyshev cache');
log();
log(`What is measured: the look-ups of one propagation of the case — ${epochs.length} force-model epochs × ${PERTURBERS.length}`);
log(`perturbers = ${lookUps} positions relative to the Sun, recorded from a run on the built-in source (plus ${singleLookUps}`);
log('single look-ups outside the force model, not counted) — replayed in the recorded order through the call the force');
log('model makes, `planBodyPositions(source, perturbers, \'sun\').positionsInto(epoch)`, once per epoch, for each source.');
log('The built-in source has no batch call, so its plan makes one `positionInto` per body (planBodyPositions\' fallback);');
log('the cache evaluates each series once per epoch with a shared Chebyshev basis per segment grid.');
log();
log('| run | CPU time per propagation ms | steps (rejected) | evaluations | look-up CPU time ms | ns per look-up | look-ups as share of run (ratio of medians) |');
log('|---|---|---|---|---|---|---|');
log(`| built-in | ${formatSpread(spreadOf(builtinRunMs))} | ${stat(builtinResult)} | ${formatSpread(spreadOf(builtinLookUpMs))} | `
  + `${formatSpread(nsPerLookUp(builtinLookUpMs), 0)} | ${builtinShare.toFixed(0)} % |`);
log(`| Chebyshev cache | ${formatSpread(spreadOf(cacheRunMs), 2)} | ${stat(cacheResult)} | ${formatSpread(spreadOf(cacheLookUpMs), 3)} | `
  + `${formatSpread(cacheNs, 0)} | ${cacheShare.toFixed(0)} % |`);
log();
log(`**Look-up time ratio built-in / cache: ${formatSpread(lookUpRatio, 0)}×** (median over ${lookUpRatio.rounds} rounds, min–max in`);
log(`brackets; target ≥ 50×: ${lookUpRatio.median >= 50 ? 'met' : '**NOT met**'}${lookUpRatio.median >= 50 && lookUpRatio.min < 50 ? ' at the median, not in every round' : ''}).`);
log(`Same look-ups made one body at a time (\`positionInto\` per perturber, the pattern before the batch call): ratio`);
log(`${formatSpread(perBodyRatio, 0)}×, ${formatSpread(nsPerLookUp(cachePerBodyMs), 0)} ns per cached look-up.`);
log(`Building the cache took ${buildMs.toFixed(0)} ms CPU (first build in the process, JIT warm-up included). Final positions`);
log(`with the cache and with the built-in source differ by ${(cacheError * 1000).toFixed(3)} m.`);
log();

// 2. odex (Hairer & Wanner's GBS extrapolation code, npm port) on the same equations at equal accuracy.
const model = new ForceModel({ centralBody: 'sun', perturbingBodies: PERTURBERS }, cache);
const rhs = createCowellRhs(model, false);
const yIn = new Float64Array(6);
const yOut = new Float64Array(6);
const odexRhs = (x: number, y: number[]): number[] => {
  for (let i = 0; i < 6; i++) yIn[i] = y[i];
  rhs(x, yIn, yOut);
  return Array.from(yOut);
};
const runOdex = (tol: number) => {
  const solver = new Solver(6);
  solver.relativeTolerance = tol;
  solver.absoluteTolerance = tol;
  solver.maxSteps = 1e6;
  return solver.solve(odexRhs, T0, x0, T1);
};
const runVeer = (tol: number) => integrateDop853(rhs, T0, x0, T1, { relativeTolerance: tol, absoluteTolerance: tol });
const reference = runVeer(1e-14).y;
const referenceOdex = runOdex(1e-14).y;
const veerValue = runVeer(TOL);
const veerError = distance(veerValue.y, reference);
const ODEX_TOLS = [1e-10, 3e-11, 1e-11, 3e-12, 1e-12, 3e-13, 1e-13, 3e-14];
const odexValues = ODEX_TOLS.map((tol) => runOdex(tol));
const odexErrors = odexValues.map((v) => distance(v.y, reference));
const odexTimes = alternate(ODEX_TOLS.map((tol) => ({ fn: () => runOdex(tol), repeat: 5 })), 5);
const matchedIndex = odexErrors.findIndex((e) => e <= veerError);
const odexMonotonic = odexErrors.every((e, i) => i === 0 || e <= odexErrors[i - 1]);
log('## DOP853 (veer) versus odex on the same equations');
log();
log(`Reference: veer at 1e-14 (odex at 1e-14 agrees with it to ${(distance(reference, referenceOdex) * 1000).toFixed(3)} m). `
  + 'Both integrate the same right-hand side (Chebyshev cache, batch look-up); odex gets a wrapper that returns a new array, as its API requires.');
log();
log('| integrator | tolerance | final position error m | steps | evaluations | CPU time ms (5 rounds × 5 runs) |');
log('|---|---|---|---|---|---|');
ODEX_TOLS.forEach((tol, i) => {
  log(`| odex | ${tol} | ${(odexErrors[i] * 1000).toFixed(3)} | ${odexValues[i].nStep} | ${odexValues[i].nEval} | ${formatSpread(spreadOf(odexTimes[i]), 2)} |`);
});
if (matchedIndex < 0) {
  log();
  log('odex did not reach veer\'s accuracy at any tolerance tried: no speed ratio at equal accuracy.');
} else {
  const matchedTol = ODEX_TOLS[matchedIndex];
  const [veerMs, odexMs] = alternate([{ fn: () => runVeer(TOL), repeat: 10 }, { fn: () => runOdex(matchedTol), repeat: 10 }], ROUNDS);
  const speed = spreadOf(ratios(odexMs, veerMs));
  speedRatio = speed;
  log(`| veer DOP853 | 1e-12 | ${(veerError * 1000).toFixed(3)} | ${veerValue.counts.steps} | ${veerValue.counts.evaluations} | ${formatSpread(spreadOf(veerMs), 2)} |`);
  log(`| odex (matched, timed in alternation with veer) | ${matchedTol} | ${(odexErrors[matchedIndex] * 1000).toFixed(3)} | `
    + `${odexValues[matchedIndex].nStep} | ${odexValues[matchedIndex].nEval} | ${formatSpread(spreadOf(odexMs), 2)} |`);
  log();
  log(`Equal accuracy: the loosest odex tolerance whose final error is at most veer's (odex at ${matchedTol}: `
    + `${(odexErrors[matchedIndex] * 1000).toFixed(3)} m vs veer ${(veerError * 1000).toFixed(3)} m; in this run odex's error ${odexMonotonic ? 'shrinks' : 'does not shrink'}`);
  log(`monotonically as its tolerance tightens). **veer is ${formatSpread(speed, 2)}× faster** (median over ${speed.rounds} alternated rounds of 10 runs each;`);
  log(`target ≥ 2×: ${speed.median >= 2 ? 'met' : '**NOT met**'}${speed.median >= 2 && speed.min < 2 ? ' at the median, not in every round' : ''}).`);
}
log();

// 3. astronomy-engine GravitySimulator on the same case with its own physics (no separate Moon).
const toKm3S2 = (gm: number): number => (gm * Astronomy.KM_PER_AU ** 3) / 86400 ** 2;
const source: Record<string, Astronomy.Body> = { sun: Astronomy.Body.Sun, mercury: Astronomy.Body.Mercury,
  venus: Astronomy.Body.Venus, earth: Astronomy.Body.Earth, mars: Astronomy.Body.Mars, jupiter: Astronomy.Body.Jupiter,
  saturn: Astronomy.Body.Saturn, uranus: Astronomy.Body.Uranus, neptune: Astronomy.Body.Neptune };
const simBodies = PERTURBERS.filter((b) => b !== 'moon');
const gm: Partial<Record<BodyName, number>> = {};
for (const b of ['sun', ...simBodies]) gm[b as BodyName] = toKm3S2(Astronomy.MassProduct(source[b]));
gm.earth = toKm3S2(Astronomy.MassProduct(Astronomy.Body.Earth) + Astronomy.MassProduct(Astronomy.Body.Moon));
const simRequest = request(cache, { forces: { centralBody: 'sun', perturbingBodies: simBodies, gmOverridesKm3S2: gm } });
const simPhysicsValue = propagate(simRequest);
const simulate = (steps: number): number[] => {
  const tt0 = ttFromTdb(T0) / 86400;
  const time0 = Astronomy.AstroTime.FromTerrestrialTime(tt0);
  const k = Astronomy.KM_PER_AU;
  const sv = new Astronomy.StateVector(x0[0] / k, x0[1] / k, x0[2] / k, (x0[3] * 86400) / k, (x0[4] * 86400) / k, (x0[5] * 86400) / k, time0);
  const sim = new Astronomy.GravitySimulator(Astronomy.Body.Sun, time0, [sv]);
  let out: Astronomy.StateVector[] = [];
  for (let i = 1; i <= steps; i++) out = sim.Update(Astronomy.AstroTime.FromTerrestrialTime(tt0 + (i * 365.25) / steps));
  return [out[0].x * k, out[0].y * k, out[0].z * k];
};
log('## astronomy-engine GravitySimulator on the same case');
log();
log('The simulator has no separate Moon (the Earth carries the Earth+Moon mass), so veer runs the same physics for');
log('this comparison (its GM values, no Moon, Chebyshev cache). The simulator is second order with a fixed step.');
log();
log('| run | distance to veer after one year km | CPU time ms |');
log('|---|---|---|');
const SIM_STEPS = [365, 1461, 5844];
const SIM_ROUNDS = 3;
// veer and the three simulator runs alternate inside each round.
const simTimes = alternate([
  { fn: () => propagate(simRequest), repeat: 10 }, ...SIM_STEPS.map((steps) => ({ fn: () => simulate(steps), repeat: 1 })),
], SIM_ROUNDS).map((ms) => spreadOf(ms));
log(`| veer (same physics; ${SIM_ROUNDS} rounds alternated with the simulator runs) | 0 | ${formatSpread(simTimes[0], 2)} |`);
const simRuns = SIM_STEPS.map((steps) => simulate(steps));
SIM_STEPS.forEach((steps, i) => {
  log(`| GravitySimulator, step ${(365.25 / steps).toFixed(4)} d | ${distance(simRuns[i], simPhysicsValue.final.positionKm).toFixed(1)} | ${formatSpread(simTimes[i + 1], 1)} |`);
});
// Second order, step ratio 4: Richardson p + (p - p_coarse)/15 removes the simulator's leading step error.
const richardson = simRuns[2].map((v, i) => v + (v - simRuns[1][i]) / 15);
log(`| GravitySimulator, Richardson of the two finest | ${distance(richardson, simPhysicsValue.final.positionKm).toFixed(1)} | — |`);
log();
const simErrors = simRuns.map((v) => distance(v, simPhysicsValue.final.positionKm));
log(`In this run the simulator's distance to veer shrank by ${(simErrors[0] / simErrors[1]).toFixed(1)}× and ${(simErrors[1] / simErrors[2]).toFixed(1)}× per`);
log('4× smaller step (a second-order method\'s step error alone would give 16×); the extrapolated value shows what is');
log('left once its leading step error is removed: the simulator moves the Sun along astronomy-engine\'s barycentre');
log('series rather than by the point-mass pulls (see');
log('test/reference/gravity-simulator-peer.test.ts, where this is measured for a 2.5 au orbit).');
log();

// 4. State + STM versus state only.
const stateOnlyValue = propagate(request(cache));
const withStmValue = propagate(request(cache, { withStm: true }));
const [stateOnlyMs, withStmMs] = alternate([
  { fn: () => propagate(request(cache)), repeat: 10 }, { fn: () => propagate(request(cache, { withStm: true })), repeat: 10 },
], ROUNDS);
const stmRatio = spreadOf(ratios(withStmMs, stateOnlyMs));
log('## State + STM versus state only (Chebyshev cache)');
log();
log(`| run | CPU time ms | steps | evaluations |`);
log('|---|---|---|---|');
log(`| state only | ${formatSpread(spreadOf(stateOnlyMs), 2)} | ${stateOnlyValue.stats.steps} | ${stateOnlyValue.stats.evaluations} |`);
log(`| state + STM | ${formatSpread(spreadOf(withStmMs), 2)} | ${withStmValue.stats.steps} | ${withStmValue.stats.evaluations} |`);
log();
log(`Ratio: **${formatSpread(stmRatio, 2)}×** (target ≤ 3×: ${stmRatio.median <= 3 ? 'met' : '**NOT met**'}). The STM rides on the state's step control (error norm on the 6 state components).`);
log();

// 5. Energy drift of 100 revolutions, two-body.
log('## Energy drift, 100 revolutions two-body (Earth, a = 12000 km), tolerance 1e-12');
log();
log('| eccentricity | relative energy drift | steps | CPU time ms (median of 5) | target < 1e-10 |');
log('|---|---|---|---|---|');
const mu = GM_KM3_S2.earth;
for (const e of [0.1, 0.4]) {
  const a = 12000;
  const rp = a * (1 - e);
  const vp = Math.sqrt((mu * (1 + e)) / rp);
  const period = 2 * Math.PI * Math.sqrt(a ** 3 / mu);
  const y0 = [rp, 0, 0, 0, vp * 0.8, vp * 0.6];
  const twoBody = createCowellRhs(new ForceModel({ centralBody: 'earth', perturbingBodies: [] }, builtin), false);
  const run = () => integrateDop853(twoBody, 0, y0, 100 * period, { relativeTolerance: TOL, absoluteTolerance: TOL });
  const value = run();
  const ms = spreadOf(alternate([{ fn: run, repeat: 1 }], 5)[0]);
  const energy = (y: ArrayLike<number>): number => Math.hypot(y[3], y[4], y[5]) ** 2 / 2 - mu / Math.hypot(y[0], y[1], y[2]);
  const drift = Math.abs((energy(value.y) - energy(y0)) / energy(y0));
  log(`| ${e} | ${drift.toExponential(2)} | ${value.counts.steps} | ${ms.median.toFixed(1)} | ${drift < 1e-10 ? 'met' : '**NOT met**'} |`);
}
log();
log();

// Run history: the headline ratios of this and earlier runs (kept from the previous results file).
const resultsFile = new URL('./results/propagator.md', import.meta.url);
const HISTORY = '## Run history';
const speedText = speedRatio === null ? 'n/a' : formatSpread(speedRatio, 2);
const history = historyRows(resultsFile, HISTORY,
  `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${machineLine().split('; ').find((p) => p.startsWith('load')) ?? ''} | `
  + `${formatSpread(lookUpRatio, 0)} | ${formatSpread(cacheNs, 0)} | ${speedText} |`);
log(HISTORY);
log();
log('Headline figures of this run and the previous ones (medians, min–max over rounds in brackets), to show how much');
log('they move between runs on this shared machine.');
log();
log('| run (UTC) | code | load | look-up ratio built-in / cache (target ≥ 50×) | ns per cached look-up | veer / odex speed (target ≥ 2×) |');
log('|---|---|---|---|---|---|');
for (const row of history) log(row);

writeFileSync(resultsFile, `${lines.join('\n')}\n`);
