/**
 * npm run bench:ephemeris — cost of ephemeris look-ups: the built-in astronomy-engine source against the
 * Chebyshev cache built from it, per kind of look-up. Writes bench/results/ephemeris.md.
 *
 * Measured the same way as bench/propagator.bench.ts (bench/bench-stats.ts): CPU time of this process,
 * the two sources alternated within each round, the ratio taken round by round, median and min–max over
 * rounds. The span and cache are the propagator benchmark's (one year from 2031-03-01 TDB, ±1 day).
 *
 * What differs from the propagator benchmark's look-up target: here epochs are spread over the whole year
 * in a scattered order (every segment visited, no reuse between neighbouring epochs), and several kinds of
 * look-up are timed; there, the exact epochs one propagation asks for are replayed. The row "9 perturbers
 * from the Sun, batch" is the same call and bodies as the propagator target.
 */
import { writeFileSync } from 'node:fs';
import v8 from 'node:v8';
import vm from 'node:vm';
import {
  buildChebyshevEphemeris, CHEBYSHEV_DEFAULTS, createBuiltinEphemeris, parseEpoch, planBodyPositions, type BodyName, type Ephemeris,
} from '../propagator/index.ts';
import { alternate, codeVersion, cpuMs, formatSpread, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';
import { sharedCacheSection } from './shared-cache-bench.ts';

const ROUNDS = 15;
const T0 = parseEpoch('2031-03-01T00:00:00 TDB');
const T1 = T0 + 365.25 * 86400;
const source = createBuiltinEphemeris();
const buildStarted = cpuMs();
const cache = buildChebyshevEphemeris(source, {
  bodies: ['sun', 'mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'],
  startTdbS: T0 - 86400, endTdbS: T1 + 86400,
});
const buildMs = cpuMs() - buildStarted;

/** `count` epochs over the year in a scattered order (stride 7919, prime to count). */
function scatteredEpochs(count: number): Float64Array {
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = T0 + (((i * 7919) % count) + 0.5) * ((T1 - T0) / count);
  return out;
}

const out = new Float64Array(30);
let sink = 0;

/** One kind of look-up: a function doing all of it at the given epochs; `perEpoch` look-ups per epoch. */
interface Pattern {
  label: string;
  perEpoch: number;
  make: (eph: Ephemeris, epochs: Float64Array) => () => void;
}

const single = (kind: 'state' | 'position', target: BodyName, centre: BodyName): Pattern => ({
  label: `${kind} ${target} from ${centre}, one call`,
  perEpoch: 1,
  make: (eph, epochs) => () => {
    for (let i = 0; i < epochs.length; i++) {
      if (kind === 'state') eph.stateInto(target, centre, epochs[i], out, 0);
      else eph.positionInto(target, centre, epochs[i], out, 0);
      sink += out[0];
    }
  },
});

const batch = (label: string, targets: BodyName[], centre: BodyName): Pattern => ({
  label, perEpoch: targets.length,
  make: (eph, epochs) => {
    const plan = planBodyPositions(eph, targets, centre);
    return () => {
      for (let i = 0; i < epochs.length; i++) plan.positionsInto(epochs[i], out, 0);
      sink += out[0];
    };
  },
});

const perBody = (label: string, targets: BodyName[], centre: BodyName): Pattern => ({
  label, perEpoch: targets.length,
  make: (eph, epochs) => () => {
    for (let i = 0; i < epochs.length; i++) {
      for (let p = 0; p < targets.length; p++) eph.positionInto(targets[p], centre, epochs[i], out, 3 * p);
    }
    sink += out[0];
  },
});

const FROM_SUN: BodyName[] = ['mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
const FROM_EARTH: BodyName[] = ['sun', 'mercury', 'venus', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
const patterns: Pattern[] = [
  single('state', 'moon', 'earth'), single('state', 'mars', 'sun'), single('state', 'jupiter', 'earth'),
  single('position', 'sun', 'earth'),
  batch('9 perturbers from the Sun, batch (`planBodyPositions`; the propagator target\'s call)', FROM_SUN, 'sun'),
  perBody('9 perturbers from the Sun, one `positionInto` per body', FROM_SUN, 'sun'),
  batch('9 perturbers from the Earth, batch', FROM_EARTH, 'earth'),
  perBody('9 perturbers from the Earth, one `positionInto` per body', FROM_EARTH, 'earth'),
];

// Epoch counts sized so one call of each side takes a few ms of CPU.
const sourceEpochs = scatteredEpochs(400);
const cacheEpochs = scatteredEpochs(20000);
interface Row { label: string; sourceNs: Spread; cacheNs: Spread; ratio: Spread }
const rows: Row[] = patterns.map((p) => {
  const [s, c] = alternate([
    { fn: p.make(source, sourceEpochs), repeat: 1 }, { fn: p.make(cache, cacheEpochs), repeat: 1 },
  ], ROUNDS);
  const sNs = s.map((ms) => (ms * 1e6) / (sourceEpochs.length * p.perEpoch));
  const cNs = c.map((ms) => (ms * 1e6) / (cacheEpochs.length * p.perEpoch));
  return { label: p.label, sourceNs: spreadOf(sNs), cacheNs: spreadOf(cNs), ratio: spreadOf(ratios(sNs, cNs)) };
});

/** Heap growth per look-up of the batch call on the cache (should be ~0: no allocation on that path). */
function heapBytesPerLookUp(): number {
  const plan = planBodyPositions(cache, FROM_SUN, 'sun');
  const epochs = scatteredEpochs(200000);
  plan.positionsInto(epochs[0], out, 0);
  // A full collection first, so earlier garbage does not show up as a negative growth.
  v8.setFlagsFromString('--expose-gc');
  (vm.runInNewContext('gc') as () => void)();
  const before = process.memoryUsage().heapUsed;
  for (let i = 0; i < epochs.length; i++) plan.positionsInto(epochs[i], out, 0);
  return (process.memoryUsage().heapUsed - before) / (epochs.length * FROM_SUN.length);
}
const bytes = heapBytesPerLookUp();
if (sink === 42) console.log('');

const fromSun = rows[4];

/** The propagator benchmark's latest headline look-up figures, read from its stored results file (never
 * restated here): the last row of its run history. */
function propagatorFileFigure(): string {
  const rows = historyRows(new URL('./results/propagator.md', import.meta.url), '## Run history', '');
  const last = rows.length >= 2 ? rows[rows.length - 2] : null;
  if (last === null) return 'no stored run found';
  const cells = last.split('|').map((c) => c.trim());
  return `run ${cells[1]} (code ${cells[2]}): look-up ratio ${cells[4]}×, ${cells[5]} ns per cached look-up`;
}

const shared = await sharedCacheSection();
const resultsFile = new URL('./results/ephemeris.md', import.meta.url);
const HISTORY = '## Run history';
const history = historyRows(resultsFile, HISTORY,
  `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${machineLine().split('; ').find((l) => l.startsWith('load')) ?? ''} | `
  + `${formatSpread(fromSun.ratio, 0)} | ${formatSpread(fromSun.cacheNs, 0)} | ${formatSpread(rows[6].ratio, 0)} | `
  + `${formatSpread(shared.coldRatio, 2)} | ${(100 * shared.secondShare).toPrecision(2)} % (replayed) |`);
const lines = [
  '# Ephemeris look-up benchmark (npm run bench:ephemeris)',
  '',
  `Machine: ${machineLine()}. Shared with other work.`,
  '',
  'Times are CPU time of this process (user + system) per look-up (one body\'s position or state); the two sources',
  `alternate inside each of ${ROUNDS} rounds after a warm-up round, ratios are taken round by round, and tables give the`,
  'median with the min–max over rounds in brackets. Timing code: bench/bench-stats.ts, shared with bench:propagator.',
  '',
  `Span and cache: the propagator benchmark's (one year from 2031-03-01 TDB, ±1 day; all ten bodies; default fit).`,
  `Cache build: ${buildMs.toFixed(0)} ms CPU (first build in the process, JIT warm-up included). Epochs: ${sourceEpochs.length} (built-in) and`,
  `${cacheEpochs.length} (cache) spread over the year in a scattered order, so every segment is visited.`,
  '',
  '| look-up | astronomy-engine ns per look-up | Chebyshev cache ns per look-up | ratio |',
  '|---|---:|---:|---:|',
  ...rows.map((r) => `| ${r.label} | ${formatSpread(r.sourceNs, 0)} | ${formatSpread(r.cacheNs, 0)} | ${formatSpread(r.ratio, 0)}× |`),
  '',
  'How to read the rows:',
  '- "9 perturbers from the Sun, batch" is the call and body list of the propagator benchmark\'s look-up target',
  '  (≥ 50× less time in look-ups with the cache). That target is judged in bench/results/propagator.md, on the epochs',
  '  one propagation actually asks for; this row checks it on epochs spread over the year. The built-in source has no',
  '  batch call, so its side is one `positionInto` per body there too.',
  `- The same row in the latest stored bench/results/propagator.md: ${propagatorFileFigure()}.`,
  '- Single calls include per-call argument checks; the batch call checks bodies once, when the plan is made, and',
  '  only the epoch per call.',
  '',
  `Heap growth per cached batch look-up: ${bytes.toFixed(3)} bytes (heap used after minus before, 200,000 epochs, after a full collection).`,
  '',
  '## Fit of the cache',
  '',
  'Measured against the source at six check points per segment (ends and between nodes), after dropping trailing',
  'position terms whose summed magnitude stays within a quarter of the tolerance (5 cm default).',
  '',
  `| body | parent | segment (days) | segments | position terms kept (of ${CHEBYSHEV_DEFAULTS.coefficients}) | max fit error at check points (m) | (mm/s) |`,
  '|---|---|---:|---:|---:|---:|---:|',
  ...cache.fitReport().map((f) => `| ${f.body} | ${f.parent} | ${(f.segmentS / 86400).toFixed(2)} | ${f.segments} | ${f.positionTerms} | `
    + `${(f.maxErrorKm * 1000).toFixed(4)} | ${(f.maxErrorKmS * 1e6).toFixed(6)} |`),
  '',
  ...shared.lines,
  '',
  HISTORY,
  '',
  'Headline figures of this run and the previous ones (medians, min–max over rounds in brackets).',
  '',
  '| run (UTC) | code | load | 9 from the Sun, batch: ratio | 9 from the Sun, batch: cache ns per look-up | 9 from the Earth, batch: ratio | cold one-year run: veer / peer CPU | second plan\'s ephemeris time / first\'s |',
  '|---|---|---|---|---|---|---|---|',
  ...history,
  '',
];
const report = lines.join('\n');
console.log(report);
writeFileSync(resultsFile, report);
