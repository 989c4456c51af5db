/** Validation of a ForceModelSpec against the constants and the ephemeris, with field-named errors. */
import { GM_KM3_S2, J2_EARTH, J2_REFERENCE_RADIUS_EARTH_KM, RADIUS_KM } from '../constants.ts';
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import type { ForceModelSpec } from '../run/propagation-types.ts';
import { BODY_NAMES, type BodyName } from '../types.ts';
import { solarPressureStrength } from './solar-pressure.ts';

/** Bodies with a J2 constant in constants.ts, with its reference radius (km). */
const J2_CONSTANTS: Partial<Record<BodyName, { j2: number; radiusKm: number }>> = {
  earth: { j2: J2_EARTH, radiusKm: J2_REFERENCE_RADIUS_EARTH_KM },
};

export interface CheckedForceModel {
  centralGm: number;
  centralRadiusKm: number;
  perturbingBodies: BodyName[];
  perturbingGm: number[];
  perturbingRadiiKm: number[];
  j2: { j2: number; radiusKm: number } | null;
  solarPressure: { strength: number; sunIndex: number; occulterRadiusKm: number } | null;
  /** Index of referenceBody among the perturbing bodies; -1 when it is the central body (or not given). */
  referenceIndex: number;
}

function checkBody(name: unknown, field: string, ephemeris: Ephemeris): BodyName {
  if (typeof name !== 'string' || !(BODY_NAMES as readonly string[]).includes(name)) {
    throw new InvalidInputError(field, `unknown body ${JSON.stringify(name)}; known: ${BODY_NAMES.join(', ')}`);
  }
  const body = name as BodyName;
  if (!ephemeris.bodies.includes(body)) {
    throw new InvalidInputError(field, `ephemeris "${ephemeris.name}" does not provide ${body}`);
  }
  return body;
}

function positiveFinite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new InvalidInputError(field, `must be a finite number > 0, got ${String(value)}`);
  }
  return value;
}

/** Checks the spec and resolves constants; throws InvalidInputError naming the field (`forces.*`). */
export function checkForceModel(spec: ForceModelSpec, ephemeris: Ephemeris): CheckedForceModel {
  if (spec === null || typeof spec !== 'object') throw new InvalidInputError('forces', 'must be a force model object');
  if (ephemeris === null || typeof ephemeris !== 'object' || !Array.isArray(ephemeris.bodies)) {
    throw new InvalidInputError('ephemeris', 'must be an Ephemeris (see propagator/ephemeris/ephemeris.ts)');
  }
  const overrides = spec.gmOverridesKm3S2 ?? {};
  for (const [name, gm] of Object.entries(overrides)) {
    checkBody(name, `forces.gmOverridesKm3S2.${name}`, ephemeris);
    positiveFinite(gm, `forces.gmOverridesKm3S2.${name}`);
  }
  const gmOf = (body: BodyName): number => overrides[body] ?? GM_KM3_S2[body];
  const central = checkBody(spec.centralBody, 'forces.centralBody', ephemeris);
  if (!Array.isArray(spec.perturbingBodies)) {
    throw new InvalidInputError('forces.perturbingBodies', 'must be an array of body names');
  }
  const perturbing = spec.perturbingBodies.map((b, i) => checkBody(b, `forces.perturbingBodies[${i}]`, ephemeris));
  perturbing.forEach((body, i) => {
    if (body === central) {
      throw new InvalidInputError(`forces.perturbingBodies[${i}]`, `${body} is the central body`);
    }
    if (perturbing.indexOf(body) !== i) {
      throw new InvalidInputError(`forces.perturbingBodies[${i}]`, `${body} is listed twice`);
    }
  });
  let j2: CheckedForceModel['j2'] = null;
  if (spec.centralJ2 === true) {
    const constant = J2_CONSTANTS[central];
    if (constant === undefined) {
      throw new InvalidInputError('forces.centralJ2', `no J2 constant is known for ${central} (only: `
        + `${Object.keys(J2_CONSTANTS).join(', ')})`);
    }
    j2 = constant;
  }
  let solarPressure: CheckedForceModel['solarPressure'] = null;
  if (spec.solarPressure !== undefined) {
    const srp = spec.solarPressure;
    const area = positiveFinite(srp.areaM2, 'forces.solarPressure.areaM2');
    const mass = positiveFinite(srp.massKg, 'forces.solarPressure.massKg');
    const cr = srp.reflectivityCoefficient;
    if (typeof cr !== 'number' || !(cr >= 1 && cr <= 2)) {
      throw new InvalidInputError('forces.solarPressure.reflectivityCoefficient', `must lie in [1, 2], got ${String(cr)}`);
    }
    const shadow = srp.shadow ?? 'cylindrical';
    if (shadow !== 'none' && shadow !== 'cylindrical') {
      throw new InvalidInputError('forces.solarPressure.shadow', `must be 'none' or 'cylindrical', got ${String(shadow)}`);
    }
    if (central !== 'sun' && !ephemeris.bodies.includes('sun')) {
      throw new InvalidInputError('forces.solarPressure', `ephemeris "${ephemeris.name}" does not provide the Sun`);
    }
    solarPressure = {
      strength: solarPressureStrength(area, cr, mass),
      sunIndex: perturbing.indexOf('sun'),
      occulterRadiusKm: shadow === 'cylindrical' && central !== 'sun' ? RADIUS_KM[central] : 0,
    };
  }
  let referenceIndex = -1;
  if (spec.referenceBody !== undefined && spec.referenceBody !== central) {
    referenceIndex = perturbing.indexOf(spec.referenceBody);
    if (referenceIndex < 0) {
      throw new InvalidInputError('forces.referenceBody', `${String(spec.referenceBody)} must be the central body `
        + 'or one of the perturbing bodies');
    }
  }
  return {
    referenceIndex,
    centralGm: positiveFinite(gmOf(central), `forces.gmOverridesKm3S2.${central}`),
    centralRadiusKm: RADIUS_KM[central],
    perturbingBodies: perturbing,
    perturbingGm: perturbing.map((b) => positiveFinite(gmOf(b), `forces.gmOverridesKm3S2.${b}`)),
    perturbingRadiiKm: perturbing.map((b) => RADIUS_KM[b]),
    j2,
    solarPressure,
  };
}
