/**
 * Central-body switching is a numerical device: a switched run must reproduce the unswitched run about the
 * requested central body to integration accuracy, whatever the ephemeris source. Each case flies the same
 * Mars flyby with and without switching (Cowell and Encke) and compares the closest approach (distance and
 * epoch) and the final heliocentric position.
 *
 * Sources: the equivalence of the two formulations is exact algebra (forces/moving-centre.ts: the shifted
 * coordinate plus the centre's tabulated motion obeys the unswitched equations from the same state); the
 * 10 m agreement target on the closest approach is the (1 % of a 1 km B-plane tolerance).
 * Limits are set a few times above what was measured on this machine (in brackets below).
 *
 * Measured before the moving-centre formulation (planet-centred segments took the planet's acceleration
 * from Newtonian gravity), examples/propagate-mars-flyby.json: closest approach 4065.553 km switched
 * against 4063.064 km unswitched, final positions 465 km apart.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ephemerisFor } from '../../cli/commands/propagate.ts';
import { parsePropagateRequest, toPropagationRequest } from '../../cli/propagate-request-schema.ts';
import {
  createTabulatedEphemeris, GM_KM3_S2, layerEphemerides,
  MEAN_SEMI_MAJOR_AXIS_KM, propagate, type Ephemeris, type PropagationMethod, type PropagationRequest,
  type PropagationResult, type TabulatedStateRecord,
} from '../../propagator/index.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';
import { flybyStart, PERIAPSIS_EPOCH } from './flyby-fixture.ts';

interface Agreement { distanceKm: number; epochS: number; finalKm: number }

const closest = (r: PropagationResult) => {
  const e = r.events.find((x) => x.kind === 'closest-approach');
  if (e === undefined) throw new Error('no closest approach located');
  return e;
};

/** Runs `request` with and without switching; differences of the closest approach and the final state. */
function agreement(request: PropagationRequest): Agreement {
  const switched = propagate({ ...request, switching: { enabled: true } });
  const plain = propagate({ ...request, switching: undefined });
  expect(switched.outcome).toBe('finished');
  expect(plain.outcome).toBe('finished');
  expect(switched.stats.switches.length).toBeGreaterThanOrEqual(2);
  expect(switched.final.centre).toBe(plain.final.centre);
  const a = closest(switched);
  const b = closest(plain);
  return {
    distanceKm: Math.abs(a.distanceKm! - b.distanceKm!),
    epochS: Math.abs(a.epochTdbS - b.epochTdbS),
    finalKm: Math.hypot(...switched.final.positionKm.map((x, i) => x - plain.final.positionKm[i])),
  };

}

const methods: PropagationMethod[] = ['cowell', 'encke'];

describe('switched and unswitched runs agree', () => {
  describe('when Mars does not move as Newtonian gravity from the modelled bodies would move it', () => {
    // Mars on a circle whose period is 1 % short of the Sun–Mars two-body period: its tabulated
    // acceleration differs from the Newtonian one by 2 %, as a real ephemeris differs (less) from a model
    // that leaves bodies out. The old planet-centred equations would feel that 2 % as a force.
    const a = MEAN_SEMI_MAJOR_AXIS_KM.mars!;
    const periodS = 0.99 * 2 * Math.PI * Math.sqrt(a ** 3 / (GM_KM3_S2.sun + GM_KM3_S2.mars));
    const ephemeris = circularEphemeris([{ body: 'mars', radiusKm: a, periodS, phaseRad: 0.3, phaseEpochTdbS: PERIAPSIS_EPOCH }]);
    for (const method of methods) {
      it(`should agree on the closest approach within 1 cm and 1 µs with ${method}`, () => {
        const { helio } = flybyStart(3);
        const e = agreement({
          initial: helio,
          endEpochTdbS: PERIAPSIS_EPOCH + 3 * 86400, ephemeris, method,
          forces: { centralBody: 'sun', perturbingBodies: ['mars'] },
          relativeTolerance: 1e-12, absoluteTolerance: 1e-12,
          events: [{ kind: 'closest-approach', body: 'mars' }],
        });
        // [distance 1.5e-6 km Cowell, 4.5e-7 km Encke; epoch 1.2e-7 s both; final 9.5e-4 km, 5.1e-4 km]
        expect(e.distanceKm).toBeLessThan(1e-5);
        expect(e.epochS).toBeLessThan(1e-6);
        expect(e.finalKm).toBeLessThan(5e-3);
      });
    }
  });

  // The example's own limits: the 10 m is 1e-2 km; the limits below are a few times the measured.
  const example = parsePropagateRequest(JSON.parse(readFileSync('examples/propagate-mars-flyby.json', 'utf8')));
  const cache = ephemerisFor(example);
  const sources: [string, Ephemeris, string][] = [
    ['the built-in series (Chebyshev cache)', cache,
      'distance 5.5e-8 km Cowell, 5.5e-6 km Encke; epoch 7.9e-6 s, 2.5e-6 s; final 1.2e-3 km, 1.1e-3 km'],
    ['a tabulated (OEM-style) Mars layered over the cache',
      layerEphemerides(marsTable(cache, cache.span.startTdbS, cache.span.endTdbS, 4 * 3600), cache),
      'distance 6.7e-7 km Cowell, 4.4e-6 km Encke; epoch 7.4e-6 s, 2.5e-6 s; final 1.5e-3 km, 7.3e-4 km'],
  ];
  for (const [label, ephemeris, measured] of sources) {
    describe(`when examples/propagate-mars-flyby.json runs on ${label}`, () => {
      for (const method of methods) {
        it(`should agree on the closest approach well within 10 m with ${method} [${measured}]`, () => {
          const e = agreement(toPropagationRequest({ ...example, method, withStm: false }, ephemeris));
          expect(e.distanceKm).toBeLessThan(3e-5);
          expect(e.epochS).toBeLessThan(5e-5);
          expect(e.finalKm).toBeLessThan(5e-3);
        });
      }
    });
  }
});

/** Mars relative to the Sun sampled every `stepS` from `source`, as a Lagrange (degree 7) table. */
function marsTable(source: Ephemeris, startTdbS: number, endTdbS: number, stepS: number) {
  const records: TabulatedStateRecord[] = [];
  const out = new Float64Array(6);
  for (let t = startTdbS; t <= endTdbS; t += stepS) {
    source.stateInto('mars', 'sun', t, out);
    records.push({ epochTdbS: t, positionKm: [out[0], out[1], out[2]], velocityKmS: [out[3], out[4], out[5]] });
  }
  return createTabulatedEphemeris({ name: 'mars table', target: 'mars', centre: 'sun', records, interpolation: 'lagrange', degree: 7 });
}

