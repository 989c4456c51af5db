/**
 * A small two-body problem for planner tests: an Earth orbit, one VNB burn 10 min after the start, a
 * position target 50 min later. The target is where a known Δv takes the spacecraft (found with the real
 * propagator), so a solution exists and its Δv is known.
 */
import { createBuiltinEphemeris, formatEpoch, GM_KM3_S2, parseEpoch, propagate } from '../../propagator/index.ts';
import type { Vec3 } from '../../propagator/index.ts';
import type { PlanningProblemInput } from '../../planner/index.ts';

export const T0_TEXT = '2026-01-01T00:00:00 TDB';
const R_KM = 7000;
const V_KMS = Math.sqrt(GM_KM3_S2.earth / R_KM) * 1.01;
/** The Δv (J2000 equatorial, km/s) that the fixture's target is built from. */
export const TRUE_DELTA_V_KMS: Vec3 = [-0.004, 0.012, 0.006];

export function twoBodyProblem(overrides: Partial<PlanningProblemInput> = {}): PlanningProblemInput {
  const t0 = parseEpoch(T0_TEXT);
  const initial = { epochTdbS: t0, centre: 'earth' as const, frame: 'J2000_EQUATORIAL' as const, positionKm: [R_KM, 0, 0] as Vec3, velocityKmS: [0, V_KMS * 0.99, V_KMS * 0.14] as Vec3 };
  const truth = propagate({
    initial, endEpochTdbS: t0 + 3600, forces: { centralBody: 'earth', perturbingBodies: [] }, ephemeris: createBuiltinEphemeris(),
    burns: [{ epochTdbS: t0 + 600, deltaVKmS: TRUE_DELTA_V_KMS }], relativeTolerance: 1e-12,
  });
  return {
    title: 'two-body test problem',
    spacecraft: { name: 'Test craft', massKg: 500, engine: { ispS: 220, thrustN: 22 } },
    initialState: { epoch: T0_TEXT, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: initial.positionKm, velocityKmS: initial.velocityKmS },
    endEpoch: formatEpoch(t0 + 7200, 'TDB', 3),
    forceModel: { centralBody: 'earth', relativeTolerance: 1e-12 },
    burns: [{ label: 'TCM-1', epoch: formatEpoch(t0 + 600, 'TDB', 3), frame: 'VNB', deltaVGuessKmS: [0, 0, 0] }],
    targets: [{ kind: 'position', epoch: formatEpoch(t0 + 3600, 'TDB', 3), centre: 'earth', positionKm: truth.final.positionKm, toleranceKm: 1e-4 }],
    executionErrors: { fixedMagnitudeMS: 0.002, proportionalMagnitudeFraction: 0.002, fixedPointingMS: 0.002, proportionalPointingDeg: 0.05 },
    dispersion: { samples: 8, seed: 7 },
    ...overrides,
  };
}

/** The same problem moved to start at `startUtc`, every epoch written in UTC to the microsecond (two-body
 * about the Earth alone: the answer does not depend on the date). For leap-second tests. */
export function twoBodyProblemInUtc(startUtc: string): PlanningProblemInput {
  const p = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
  const shift = parseEpoch(startUtc) - parseEpoch(T0_TEXT);
  const utc = (text: string): string => formatEpoch(parseEpoch(text) + shift, 'UTC', 6).replace(' UTC', 'Z');
  return {
    ...p,
    initialState: { ...p.initialState, epoch: utc(p.initialState.epoch) },
    endEpoch: utc(p.endEpoch),
    burns: p.burns.map((b) => ({ ...b, epoch: utc(b.epoch) })),
    targets: p.targets.map((t) => ('epoch' in t ? { ...t, epoch: utc(t.epoch) } : t)),
  } as PlanningProblemInput;
}
