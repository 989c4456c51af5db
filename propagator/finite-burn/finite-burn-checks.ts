/**
 * Checks the finite burns of a PropagationRequest before any work (InvalidInputError naming the field,
 * with the numbers): forward runs only, each burn inside the span, no two finite burns overlapping, no
 * impulsive burn strictly inside one, a known spacecraft mass that stays positive.
 * Epochs TDB s from J2000; durations s; thrust N; mass kg; mass flow kg/s.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { FiniteBurnSpec, PropagationRequest, ThrustAxes } from '../run/propagation-types.ts';

/** A checked finite burn with its index in the request, in time order. */
export interface OrderedFiniteBurn extends FiniteBurnSpec {
  requestIndex: number;
  endTdbS: number;
}

/** Largest accepted | |u| − 1 | of a thrust direction (dimensionless). */
export const DIRECTION_UNIT_TOLERANCE = 1e-9;
const AXES: readonly ThrustAxes[] = ['inertial', 'RTN', 'VNB'];

function finite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new InvalidInputError(field, `must be a finite number, got ${String(value)}`);
  return value;
}

function positive(value: unknown, field: string): number {
  const v = finite(value, field);
  if (v <= 0) throw new InvalidInputError(field, `must be > 0, got ${v}`);
  return v;
}

function checkOne(burn: FiniteBurnSpec, i: number, start: number, end: number): OrderedFiniteBurn {
  const f = `finiteBurns[${i}]`;
  if (burn === null || typeof burn !== 'object') throw new InvalidInputError(f, 'must be a finite-burn specification');
  const startTdbS = finite(burn.startTdbS, `${f}.startTdbS`);
  const durationS = positive(burn.durationS, `${f}.durationS`);
  const thrustN = positive(burn.thrustN, `${f}.thrustN`);
  const massFlowKgS = finite(burn.massFlowKgS, `${f}.massFlowKgS`);
  if (massFlowKgS < 0) throw new InvalidInputError(`${f}.massFlowKgS`, `must be >= 0, got ${massFlowKgS}`);
  if (!AXES.includes(burn.axes)) throw new InvalidInputError(`${f}.axes`, `unknown axes ${JSON.stringify(burn.axes)}; use ${AXES.join(', ')}`);
  const u = burn.direction;
  if (!Array.isArray(u) || u.length !== 3) throw new InvalidInputError(`${f}.direction`, 'must be an array of 3 numbers');
  u.forEach((c, k) => finite(c, `${f}.direction[${k}]`));
  const norm = Math.hypot(u[0], u[1], u[2]);
  if (Math.abs(norm - 1) > DIRECTION_UNIT_TOLERANCE) {
    throw new InvalidInputError(`${f}.direction`, `must be a unit vector (| |u| - 1 | <= ${DIRECTION_UNIT_TOLERANCE}), got |u| = ${norm}`);
  }
  const endTdbS = startTdbS + durationS;
  if (startTdbS < start || endTdbS > end) {
    throw new InvalidInputError(`${f}.startTdbS`, `burn [${startTdbS}, ${endTdbS}] TDB s lies outside the propagation span [${start}, ${end}]`);
  }
  return { startTdbS, durationS, thrustN, massFlowKgS, axes: burn.axes, direction: [u[0], u[1], u[2]], requestIndex: i, endTdbS };
}

/** The spacecraft mass at the initial epoch, kg: initialMassKg, else the SRP mass; both must agree. */
function initialMass(request: PropagationRequest): number {
  const given = request.initialMassKg;
  const srp = request.forces?.solarPressure?.massKg;
  if (given === undefined && srp === undefined) {
    throw new InvalidInputError('initialMassKg', 'finite burns need the spacecraft mass at the initial epoch (kg)');
  }
  const mass = positive(given ?? srp, given !== undefined ? 'initialMassKg' : 'forces.solarPressure.massKg');
  if (given !== undefined && srp !== undefined && srp !== given) {
    throw new InvalidInputError('initialMassKg', `${given} kg differs from forces.solarPressure.massKg ${srp} kg (one mass, please)`);
  }
  return mass;
}

/** Validates the request's finite burns; returns them in time order with the initial mass, kg. */
export function checkFiniteBurns(request: PropagationRequest): { burns: OrderedFiniteBurn[]; initialMassKg: number } {
  const list = request.finiteBurns ?? [];
  if (!Array.isArray(list)) throw new InvalidInputError('finiteBurns', 'must be an array');
  const start = finite(request.initial?.epochTdbS, 'initial.epochTdbS');
  const end = finite(request.endEpochTdbS, 'endEpochTdbS');
  if (end <= start) {
    throw new InvalidInputError('finiteBurns', `finite burns need a forward propagation (end ${end} TDB s is not after the start ${start})`);
  }
  const burns = list.map((b, i) => checkOne(b, i, start, end)).sort((a, b) => a.startTdbS - b.startTdbS || a.requestIndex - b.requestIndex);
  for (let k = 1; k < burns.length; k++) {
    const [a, b] = [burns[k - 1], burns[k]];
    if (b.startTdbS < a.endTdbS) {
      throw new InvalidInputError(`finiteBurns[${b.requestIndex}].startTdbS`, `ignition ${b.startTdbS} TDB s falls inside finite burn `
        + `${a.requestIndex} [${a.startTdbS}, ${a.endTdbS}] (overlap ${(a.endTdbS - b.startTdbS).toPrecision(6)} s)`);
    }
  }
  (request.burns ?? []).forEach((impulse, j) => {
    const e = impulse?.epochTdbS;
    const inside = burns.find((b) => e > b.startTdbS && e < b.endTdbS);
    if (inside !== undefined) {
      throw new InvalidInputError(`burns[${j}].epochTdbS`, `impulsive burn at ${e} TDB s falls inside finite burn `
        + `${inside.requestIndex} [${inside.startTdbS}, ${inside.endTdbS}]`);
    }
  });
  const initialMassKg = initialMass(request);
  let mass = initialMassKg;
  for (const b of burns) {
    const used = b.massFlowKgS * b.durationS;
    if (used >= mass) {
      throw new InvalidInputError(`finiteBurns[${b.requestIndex}].durationS`, `burns ${used.toPrecision(6)} kg `
        + `(${b.massFlowKgS} kg/s for ${b.durationS} s) but the spacecraft weighs ${mass.toPrecision(6)} kg at ignition`);
    }
    mass -= used;
  }
  return { burns, initialMassKg };
}
