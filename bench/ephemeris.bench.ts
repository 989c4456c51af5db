/**
 * Ephemeris look-up cost: the built-in astronomy-engine source against the Chebyshev cache built from it,
 * measured in the same run (ratios are what to compare across machines). Times are this process's CPU
 * time (process.cpuUsage), not wall time, so a machine shared with other work distorts them less. Also: cache build time, its
 * fit error, and heap growth per look-up (should be ~0: the look-up path does not allocate).
 *
 * Run: npm run bench:ephemeris   (writes bench/results/ephemeris.md)
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { BODY_NAMES, buildChebyshevEphemeris, createBuiltinEphemeris, parseEpoch } from '../propagator/index.ts';
import type { BodyName, Ephemeris } from '../propagator/index.ts';

const source = createBuiltinEphemeris();
const start = parseEpoch('2027-01-01T00:00:00 TDB');
const end = start + 365.25 * 86400;

/** CPU time of this process in ms (user + system). */
function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

const buildStarted = cpuMs();
const cache = buildChebyshevEphemeris(source, { bodies: BODY_NAMES, startTdbS: start, endTdbS: end });
const buildMs = cpuMs() - buildStarted;

/** Median over `rounds` of the mean ns per call of `calls` look-ups at epochs spread over the span. */
function timeLookUps(eph: Ephemeris, target: BodyName, centre: BodyName, calls: number, rounds: number, position = false): number {
  const out = new Float64Array(6);
  const step = (end - start) / (calls + 1);
  const results: number[] = [];
  let sink = 0;
  for (let r = 0; r < rounds; r++) {
    const t0 = cpuMs();
    for (let i = 0; i < calls; i++) {
      const t = start + ((i * 7919) % calls) * step; // scattered, not sequential, segment access
      if (position) eph.positionInto(target, centre, t, out); else eph.stateInto(target, centre, t, out);
      sink += out[0];
    }
    results.push(((cpuMs() - t0) * 1e6) / calls);
  }
  if (sink === 42) console.log('');
  results.sort((a, b) => a - b);
  return results[Math.floor(results.length / 2)];
}

function heapBytesPerCall(eph: Ephemeris, calls: number): number {
  const out = new Float64Array(6);
  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const before = process.memoryUsage().heapUsed;
  for (let i = 0; i < calls; i++) eph.stateInto('moon', 'earth', start + (i % 1000) * 3000, out);
  const after = process.memoryUsage().heapUsed;
  return (after - before) / calls;
}

const pairs: Array<[BodyName, BodyName, boolean]> = [
  ['moon', 'earth', false], ['mars', 'sun', false], ['jupiter', 'earth', false], ['sun', 'earth', true],
];
// Warm both paths so the JIT has compiled them before timing.
for (const [t, c, p] of pairs) {
  timeLookUps(source, t, c, 2000, 1, p);
  timeLookUps(cache, t, c, 200000, 1, p);
}

const rows = pairs.map(([target, centre, position]) => {
  const sourceNs = timeLookUps(source, target, centre, 20000, 5, position);
  const cacheNs = timeLookUps(cache, target, centre, 1000000, 5, position);
  return { lookUp: `${position ? 'position' : 'state'} ${target}/${centre}`, sourceNs, cacheNs, ratio: sourceNs / cacheNs };
});
/** A force model's pattern: every perturber's position relative to the central body at one epoch, then
 * the next epoch. ns per look-up. */
function timeForcePattern(eph: Ephemeris, epochs: number, rounds: number): number {
  const perturbers: BodyName[] = ['sun', 'mercury', 'venus', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
  const out = new Float64Array(3 * perturbers.length);
  const step = (end - start) / (epochs + 1);
  const results: number[] = [];
  for (let r = 0; r < rounds; r++) {
    const t0 = cpuMs();
    for (let i = 0; i < epochs; i++) {
      const t = start + ((i * 7919) % epochs) * step;
      for (let p = 0; p < perturbers.length; p++) eph.positionInto(perturbers[p], 'earth', t, out, 3 * p);
    }
    results.push(((cpuMs() - t0) * 1e6) / (epochs * perturbers.length));
  }
  results.sort((a, b) => a - b);
  return results[Math.floor(results.length / 2)];
}
timeForcePattern(cache, 20000, 1);
rows.push({
  lookUp: '9 perturbers/earth at one epoch (force-model pattern), per look-up',
  sourceNs: timeForcePattern(source, 300, 3),
  cacheNs: timeForcePattern(cache, 100000, 5),
  ratio: 0,
});
rows[rows.length - 1].ratio = rows[rows.length - 1].sourceNs / rows[rows.length - 1].cacheNs;
const bytesPerCall = heapBytesPerCall(cache, 1000000);

const machine = `${os.cpus()[0]?.model ?? 'unknown CPU'} × ${os.cpus().length}, ${os.platform()} ${os.release()}, Node ${process.version}`;
const lines = [
  '# Ephemeris look-up benchmark',
  '',
  `Machine: ${machine} (load average at start ${os.loadavg().map((l) => l.toFixed(2)).join(', ')}; shared with other work).`,
  `Span: one year from 2027-01-01 TDB, all ten bodies. Cache build: ${buildMs.toFixed(0)} ms CPU.`,
  '',
  '| look-up | astronomy-engine ns/call (CPU) | Chebyshev cache ns/call (CPU) | ratio |',
  '|---|---:|---:|---:|',
  ...rows.map((r) => `| ${r.lookUp} | ${r.sourceNs.toFixed(0)} | ${r.cacheNs.toFixed(0)} | ${r.ratio.toFixed(0)}× |`),
  '',
  `Heap growth per cached look-up: ${bytesPerCall.toFixed(3)} bytes (run with NODE_OPTIONS=--expose-gc for a clean baseline).`,
  '',
  '| body | parent | segment (days) | segments | max fit error at check points (m) | (mm/s) |',
  '|---|---|---:|---:|---:|---:|',
  ...cache.fitReport().map((f) => `| ${f.body} | ${f.parent} | ${(f.segmentS / 86400).toFixed(2)} | ${f.segments} | `
    + `${(f.maxErrorKm * 1000).toFixed(4)} | ${(f.maxErrorKmS * 1e6).toFixed(6)} |`),
  '',
];
const report = lines.join('\n');
console.log(report);
mkdirSync(new URL('./results/', import.meta.url), { recursive: true });
writeFileSync(new URL('./results/ephemeris.md', import.meta.url), report);
