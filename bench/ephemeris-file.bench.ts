/**
 * npm run bench:ephemeris-file — what planning on an ephemeris file costs against the built-in Chebyshev
 * cache, on the demo flyby (examples/flyby-demo.json, Monte Carlo skipped). The file is a CCSDS OEM of Mars
 * relative to the Sun, every 6 h over the problem's span ± 4 days, sampled from the built-in series
 * (Lagrange degree 7), read with the same loader as `veer plan --ephemeris`. Each side uses its own
 * EphemerisCache created in the round (a plan's first use fits the blocks it reaches, as a fresh process
 * does); the two alternate in 5 rounds after a warm-up round, and the ratio is taken round by round.
 * Target (issue 11): a tabulated source makes a plan at most 2× slower than the built-in cache.
 * Writes bench/results/ephemeris-file.md.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadEphemerisFiles } from '../cli/ephemeris-option.ts';
import { parseProblem, planManeuvers, type EphemerisFileTable } from '../planner/index.ts';
import { createBuiltinEphemeris, EphemerisCache, formatEpoch, parseEpoch } from '../propagator/index.ts';
import { formatSpread, machineLine, ratios, spreadOf } from './bench-stats.ts';

const demo = JSON.parse(readFileSync(new URL('../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const problem = parseProblem({ ...demo, dispersion: { samples: 0, seed: 1 } });
const DAY_S = 86400;

/** The OEM text of Mars from the built-in series over [start, end] TDB s, every 6 h. */
function marsOem(startTdbS: number, endTdbS: number): string {
  const source = createBuiltinEphemeris();
  const out = new Float64Array(6);
  const epoch = (t: number): string => formatEpoch(t, 'TDB', 3).replace(' TDB', '');
  const lines = ['CCSDS_OEM_VERS = 2.0', 'CREATION_DATE = 2031-08-01T00:00:00', 'ORIGINATOR = VEER-BENCH', '', 'META_START',
    'OBJECT_NAME = MARS', 'OBJECT_ID = 499', 'CENTER_NAME = SUN', 'REF_FRAME = EME2000', 'TIME_SYSTEM = TDB',
    `START_TIME = ${epoch(startTdbS)}`, `STOP_TIME = ${epoch(endTdbS)}`, 'INTERPOLATION = LAGRANGE', 'INTERPOLATION_DEGREE = 7',
    'META_STOP', ''];
  for (let t = startTdbS; t <= endTdbS; t += 6 * 3600) {
    source.stateInto('mars', 'sun', t, out);
    lines.push(`${epoch(t)} ${[...out.subarray(0, 3)].map((x) => x.toFixed(6)).join(' ')} ${[...out.subarray(3)].map((v) => v.toFixed(9)).join(' ')}`);
  }
  return `${lines.join('\n')}\n`;
}

async function planMs(files: readonly EphemerisFileTable[]): Promise<number> {
  const t = performance.now();
  const plan = await planManeuvers(problem, { monteCarlo: 'skip', ephemerisCache: new EphemerisCache(), ephemerisFiles: files });
  if (plan.status !== 'converged' || !plan.crossCheck.passed) throw new Error('the demo did not converge');
  return performance.now() - t;
}

const t0 = parseEpoch(problem.initialState.epoch);
const t1 = parseEpoch(problem.endEpoch);
const path = join(mkdtempSync(join(tmpdir(), 'veer-bench-')), 'mars.oem');
writeFileSync(path, marsOem(t0 - 4 * DAY_S, t1 + 4 * DAY_S));
const files = await loadEphemerisFiles([path]);
const builtin: number[] = [];
const tabulated: number[] = [];
for (let round = 0; round < 6; round++) {
  const b = await planMs([]);
  const f = await planMs(files);
  if (round === 0) continue;
  builtin.push(b);
  tabulated.push(f);
}
const ratio = spreadOf(ratios(tabulated, builtin));
const lines = [
  '# Planning on an ephemeris file (npm run bench:ephemeris-file)',
  '',
  machineLine(),
  '',
  'Demo flyby plan (Monte Carlo skipped), each plan with a fresh ephemeris cache (its blocks fitted as the plan',
  'reaches them); built-in cache and OEM Mars (6-hourly, Lagrange 7, layered over the built-in series and fitted',
  'into the same cache) alternate in 5 rounds after a warm-up round. Median (min–max) wall time.',
  '',
  '| source | plan wall time, ms |',
  '|---|---:|',
  `| built-in series, Chebyshev cache | ${formatSpread(spreadOf(builtin), 0)} |`,
  `| Mars from the OEM file, rest built-in | ${formatSpread(spreadOf(tabulated), 0)} |`,
  `| ratio file / built-in (per round) | ${formatSpread(ratio, 2)}× (target ≤ 2×) |`,
  '',
];
console.log(lines.join('\n'));
writeFileSync(new URL('./results/ephemeris-file.md', import.meta.url), lines.join('\n'));
