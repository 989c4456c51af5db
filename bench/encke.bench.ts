/**
 * npm run bench:encke — Encke's method against Cowell's (evaluations, CPU time, accuracy), measured in the
 * same run on the same machine. Writes bench/results/encke.md.
 *
 * Timing (bench/bench-stats.ts, as bench:propagator): CPU time of this process; the contenders of a row are
 * alternated inside every round, and the tables give the median with the min–max over rounds; ratios are
 * taken round by round. Every figure in the file, prose included, is computed in this run.
 *
 * Cases (invented spacecraft):
 *  1. one year heliocentric at 2.3 au (10 % above circular speed, 23° out of the equator), Sun central with
 *     (a) every planet and the Moon perturbing, (b) only the giant planets (a quiet cruise);
 *  2. a Mars flyby (300 km altitude, v∞ = 3 km/s) in the dynamically consistent Sun–Mars fixture of the
 *     tests, 2.5 d before to 3 d after periapsis, with and without central-body switching;
 *  3. the STM's cost: the cruise, and examples/propagate-mars-flyby.json as `veer propagate` runs it.
 * Accuracy: position error at the end against a Cowell run at rtol 1e-14 (about Mars for the flyby).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { parsePropagateRequest, toPropagationRequest } from '../cli/propagate-request-schema.ts';
import { ephemerisFor } from '../cli/commands/propagate.ts';
import {
  changeCentre, propagate, type PropagationRequest, type PropagationResult, type StateVector,
} from '../propagator/index.ts';
import { flybyEphemeris, flybyStart, forcesAbout, PERIAPSIS_EPOCH } from '../test/propagator/flyby-fixture.ts';
import { ALL, cruise, GIANTS } from '../test/reference/heliocentric-cruise.ts';
import { alternate, codeVersion, formatSpread, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';

const ROUNDS = 9;
const lines: string[] = [];
const log = (line = ''): void => {
  lines.push(line);
  console.log(line);
};
const miss = (a: readonly number[], b: readonly number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
/** Runs each request once for its result, then times them in alternation (repeat chosen so one timed call of
 * the fastest lasts a few ms). */
function race(requests: PropagationRequest[], repeat = 5): { values: PropagationResult[]; ms: Spread[]; raw: number[][] } {
  const values = requests.map((r) => propagate(r));
  const raw = alternate(requests.map((r) => ({ fn: () => propagate(r), repeat })), ROUNDS);
  return { values, ms: raw.map((m) => spreadOf(m)), raw };
}

log('# Encke vs Cowell benchmark (npm run bench:encke)');
log();
log(`Machine: ${machineLine()}. Shared with other work.`);
log();
log('Times are CPU time of this process per run (user + system). The contenders of each table row group run in');
log(`alternation inside each of ${ROUNDS} rounds after a warm-up round; tables give the median with the min–max over rounds`);
log('in brackets, and ratios are taken round by round. Timing code: bench/bench-stats.ts (shared with bench:propagator).');
log();

// 1. One-year heliocentric cruise (scenario shared with test/reference/encke-vs-cowell.test.ts).
const quietEvaluationRatios: number[] = [];
for (const [label, bodies] of [['every planet and the Moon', ALL], ['giant planets only (quiet cruise)', GIANTS]] as const) {
  log(`## One year heliocentric, ${label}`);
  log();
  const reference = propagate(cruise(bodies, { relativeTolerance: 1e-14, absoluteTolerance: 1e-12 }));
  log('| method | rtol | atol | evaluations | steps | rectifications | CPU ms per run | error vs Cowell 1e-14, km |');
  log('|---|---|---|---|---|---|---|---|');
  for (const [rtol, atol] of [[1e-10, 1e-9], [1e-12, 1e-9], [1e-13, 1e-12]]) {
    const methods = ['cowell', 'encke'] as const;
    const { values, ms, raw } = race(methods.map((method) => cruise(bodies, { method, relativeTolerance: rtol, absoluteTolerance: atol })));
    methods.forEach((method, i) => {
      const r = values[i];
      log(`| ${method} | ${rtol} | ${atol} | ${r.stats.evaluations} | ${r.stats.steps} | ${r.stats.rectifications} | `
        + `${formatSpread(ms[i], 2)} | ${miss(r.final.positionKm, reference.final.positionKm).toExponential(2)} |`);
    });
    const evalRatio = values[1].stats.evaluations / values[0].stats.evaluations;
    if (bodies === GIANTS) quietEvaluationRatios.push(evalRatio);
    log(`| *Encke / Cowell* | | | ${evalRatio.toFixed(2)} | | | ${formatSpread(spreadOf(ratios(raw[1], raw[0])), 2)} | |`);
  }
  log();
}
log('Encke integrates only the deviation from a Kepler conic that the universal-variable solver advances');
log('exactly; its step is set by the perturbation, and each evaluation also solves Kepler\'s equation. In this run, on');
log(`the quiet cruise Encke needed ${quietEvaluationRatios.map((r) => r.toFixed(2)).join(', ')} of Cowell's evaluations at the three`);
log('tolerances (first table: every planet, where Mercury\'s fast indirect term limits both methods alike).');
log();

// 2. Mars flyby.
log('## Mars flyby (consistent Sun–Mars fixture), 2.5 d before to 3 d after periapsis');
log();
const END = PERIAPSIS_EPOCH + 3 * 86400;
const { relMars, helio } = flybyStart(2.5);
const toMars = (s: StateVector) => (s.centre === 'mars' ? s : changeCentre(s, 'mars', flybyEphemeris));
const flyby = (extra: Partial<PropagationRequest>): PropagationRequest => ({
  initial: helio, endEpochTdbS: END, forces: forcesAbout('sun'), ephemeris: flybyEphemeris,
  relativeTolerance: 1e-12, absoluteTolerance: 1e-12, ...extra,
});
const ref = propagate(flyby({ initial: relMars, forces: forcesAbout('mars'), relativeTolerance: 1e-14, absoluteTolerance: 1e-14 }));
const flybyRuns: [string, Partial<PropagationRequest>][] = [
  ['Cowell about Mars from the same state', { initial: relMars, forces: forcesAbout('mars') }],
  ['Cowell heliocentric, no switching', {}],
  ['Encke heliocentric, no switching', { method: 'encke' }],
  ['Cowell with switching', { switching: { enabled: true } }],
  ['Encke with switching', { method: 'encke', switching: { enabled: true } }],
];
const fly = race(flybyRuns.map(([, extra]) => flyby(extra)), 3);
log('| run (rtol = atol = 1e-12; all five alternated) | evaluations | switches | rectifications | CPU ms per run | error vs Mars-centred 1e-14, km |');
log('|---|---|---|---|---|---|');
flybyRuns.forEach(([name], i) => {
  const r = fly.values[i];
  log(`| ${name} | ${r.stats.evaluations} | ${r.stats.switches.length} | ${r.stats.rectifications} | ${formatSpread(fly.ms[i], 2)} | `
    + `${miss(toMars(r.final).positionKm, ref.final.positionKm).toExponential(2)} |`);
});
log();

// 3. STM cost.
log('## State + STM versus state only');
log();
log('Encke\'s STM is the reference conic\'s analytic two-body STM times an integrated part driven by the deviation');
log('(propagator/encke/encke-stm.ts), so it rides on the deviation\'s step control; Cowell integrates Φ\' = AΦ on the');
log('state\'s step control. Same rounds alternate the state-only and the with-STM run of each method.');
log();
log('| case | method | steps (state / with STM) | evaluations (state / with STM) | state only CPU ms | with STM CPU ms | CPU ratio |');
log('|---|---|---|---|---|---|---|');
const stmCases: [string, (extra: Partial<PropagationRequest>) => PropagationRequest][] = [
  ['one year, every planet, rtol 1e-12', (extra) => cruise(ALL, { relativeTolerance: 1e-12, absoluteTolerance: 1e-9, ...extra })],
  ['Mars flyby fixture with switching', (extra) => flyby({ switching: { enabled: true }, ...extra })],
];
const exampleFile = parsePropagateRequest(JSON.parse(readFileSync(new URL('../examples/propagate-mars-flyby.json', import.meta.url), 'utf8')));
const exampleRequest = toPropagationRequest(exampleFile, ephemerisFor(exampleFile));
stmCases.push(['examples/propagate-mars-flyby.json (switching, events, built-in ephemeris via the shared cache)',
  (extra) => ({ ...exampleRequest, withStm: false, ...extra })]);
let exampleStepRatio = Number.NaN;
for (const [label, make] of stmCases) {
  for (const method of ['cowell', 'encke'] as const) {
    const { values, raw } = race([make({ method }), make({ method, withStm: true })], 2);
    const [s, w] = values;
    if (label.startsWith('examples/') && method === 'encke') exampleStepRatio = w.stats.steps / s.stats.steps;
    log(`| ${label} | ${method} | ${s.stats.steps} / ${w.stats.steps} | ${s.stats.evaluations} / ${w.stats.evaluations} | `
      + `${formatSpread(spreadOf(raw[0]), 2)} | ${formatSpread(spreadOf(raw[1]), 2)} | ${formatSpread(spreadOf(ratios(raw[1], raw[0])), 2)} |`);
  }
}
log();
log(`Example file, Encke: steps with the STM / without = ${exampleStepRatio.toFixed(2)} (target ≤ 1.5: `
  + `${exampleStepRatio <= 1.5 ? 'met' : '**NOT met**'}). The STM itself is checked against finite differences in`);
log('test/propagator/encke-stm.test.ts.');
log();

const resultsFile = new URL('./results/encke.md', import.meta.url);
const HISTORY = '## Run history';
const history = historyRows(resultsFile, HISTORY,
  `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${machineLine().split('; ').find((l) => l.startsWith('load')) ?? ''} | `
  + `${quietEvaluationRatios.map((r) => r.toFixed(2)).join(' / ')} | ${exampleStepRatio.toFixed(2)} |`);
log(HISTORY);
log();
log('Headline figures of this run and the previous ones (read from this file before it is rewritten).');
log();
log('| run (UTC) | code | load | quiet cruise: Encke / Cowell evaluations (1e-10 / 1e-12 / 1e-13) | example flyby, Encke: steps with / without STM |');
log('|---|---|---|---|---|');
for (const row of history) log(row);
writeFileSync(resultsFile, `${lines.join('\n')}\n`);
