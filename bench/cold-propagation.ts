/**
 * Child process of bench:ephemeris (`tsx bench/cold-propagation.ts <veer|peer> <tolerance>`): one one-year,
 * nine-perturber propagation in a fresh process, so nothing is fitted, compiled or cached beforehand.
 *  veer: the propagator with a new EphemerisCache over the built-in source (fitted as the run reaches it);
 *  peer: odex (npm port of Hairer's extrapolation code) on the same force model evaluated directly on the
 *        built-in astronomy-engine source.
 * Prints JSON {cpuMs, evaluations, positionKm}: CPU time of this process from after the imports to the end.
 */
import { createRequire } from 'node:module';
import {
  createBuiltinEphemeris, createCowellRhs, EphemerisCache, ForceModel, propagate,
} from '../propagator/index.ts';
import { cpuMs } from './bench-stats.ts';
import { COLD_CASE } from './cold-case.ts';

interface OdexSolver {
  absoluteTolerance: number;
  relativeTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; nEval: number };
}
const { Solver } = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const [who, tolText] = process.argv.slice(2);
const tol = Number(tolText);
const started = cpuMs();
const builtin = createBuiltinEphemeris();
const { t0, t1, x0, perturbers } = COLD_CASE;
let out: { evaluations: number; positionKm: number[] };
if (who === 'veer') {
  const ephemeris = new EphemerisCache().ephemerisFor(builtin, ['sun', ...perturbers], { startTdbS: t0 - 86400, endTdbS: t1 + 86400 });
  const r = propagate({
    initial: { epochTdbS: t0, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: [x0[0], x0[1], x0[2]], velocityKmS: [x0[3], x0[4], x0[5]] },
    endEpochTdbS: t1, forces: { centralBody: 'sun', perturbingBodies: perturbers }, ephemeris, relativeTolerance: tol, absoluteTolerance: tol,
  });
  out = { evaluations: r.stats.evaluations, positionKm: [...r.final.positionKm] };
} else {
  const rhs = createCowellRhs(new ForceModel({ centralBody: 'sun', perturbingBodies: perturbers }, builtin), false);
  const yIn = new Float64Array(6);
  const yOut = new Float64Array(6);
  const solver = new Solver(6);
  solver.relativeTolerance = tol;
  solver.absoluteTolerance = tol;
  solver.maxSteps = 1e6;
  const r = solver.solve((x, y) => {
    for (let i = 0; i < 6; i++) yIn[i] = y[i];
    rhs(x, yIn, yOut);
    return Array.from(yOut);
  }, t0, [...x0], t1);
  out = { evaluations: r.nEval, positionKm: r.y.slice(0, 3) };
}
process.stdout.write(JSON.stringify({ cpuMs: cpuMs() - started, ...out }));
