/**
 * `veer propagate` with finite burns (the problem's burn model: `model: "finite"`, ignition, duration,
 * thrust, Isp or mass flow, direction held in inertial / RTN / VNB axes), the mass carried. Checked
 * against the planner's own arc: a finite plan of the two-body fixture, re-flown by the command from the
 * plan JSON's finite block, must land where the plan says it lands with the plan's final mass; and the
 * mass against the constant-flow law of the rocket equation, ṁ = F/(Isp·g0), g0 = 9.80665 m/s² exactly
 * (3rd CGPM, 1901). Bad finite burns are refused naming the request file's field.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { propagateCommand } from '../../cli/commands/propagate.ts';
import { parsePropagateRequest, toPropagationRequest } from '../../cli/propagate-request-schema.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import { parseProblem, planManeuvers, type ManeuverPlan } from '../../planner/index.ts';
import { createBuiltinEphemeris } from '../../propagator/index.ts';
import { twoBodyProblem } from '../planner/two-body-fixture.ts';

const dir = mkdtempSync(join(tmpdir(), 'veer-propagate-finite-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
afterEach(() => vi.restoreAllMocks());

const ENGINE = { ispS: 220, thrustN: 8 };
const problem = (() => {
  const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
  return { ...base, spacecraft: { ...base.spacecraft, engine: ENGINE }, burns: [{ ...base.burns[0], model: 'finite' as const }] };
})();
const target = problem.targets[0] as { epoch: string };

/** Runs the command on `request` with --json (or the report) and returns stdout. */
async function run(request: unknown, json = true): Promise<{ code: number; out: string }> {
  const path = join(dir, `request-${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(path, JSON.stringify(request));
  const chunks: string[] = [];
  vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => { chunks.push(String(chunk)); return true; });
  vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  const code = await propagateCommand.run(json ? [path, '--json'] : [path]);
  vi.restoreAllMocks();
  return { code, out: chunks.join('') };
}

interface ResultJson {
  outcome: string; final: { positionKm: number[] }; finalMassKg: number | null;
  finiteBurns: { startTdbS: number; endTdbS: number; massBeforeKg: number; massAfterKg: number; idealDeltaVKmS: number }[] | null;
}

describe('veer propagate with finite burns', () => {
  let plan: ManeuverPlan;
  let request: Record<string, unknown>;
  beforeAll(async () => {
    plan = await planManeuvers(parseProblem(problem), { monteCarlo: 'skip' });
    const f = plan.burns[0].finite!;
    request = {
      initial: {
        epoch: problem.initialState.epoch, centre: 'earth', positionKm: problem.initialState.positionKm, velocityKmS: problem.initialState.velocityKmS,
      },
      endEpoch: target.epoch, forces: { centralBody: 'earth' }, relativeTolerance: 1e-12, massKg: problem.spacecraft.massKg,
      burns: [{ model: 'finite', epoch: f.startTdbS, durationS: f.durationS, thrustN: f.thrustN, massFlowKgS: f.massFlowKgS, frame: f.axes, direction: f.directionLocal }],
    };
  }, 120_000);

  describe('when a plan\'s finite burn is re-flown from its finite block', () => {
    it('should land where the plan says, with the plan\'s final mass', async () => {
      expect(plan.status).toBe('converged');
      expect(plan.burns[0].finite!.axes).toBe('VNB');
      const r = await run(request);
      expect(r.code).toBe(0);
      const json = JSON.parse(r.out) as ResultJson;
      const achieved = plan.targets.map((t) => t.achieved as number);
      const difference = Math.hypot(...json.final.positionKm.map((x, i) => x - achieved[i]));
      // Same propagator and tolerance as the planner's final evaluation: measured 0 km (identical steps); limit 1e-9 km.
      expect(difference).toBeLessThan(1e-9);
      const f = plan.burns[0].finite!;
      expect(json.finalMassKg).toBeCloseTo(f.massAfterKg, 9);
      expect(json.finiteBurns![0].massBeforeKg).toBe(problem.spacecraft.massKg);
      expect(json.finiteBurns![0].endTdbS - json.finiteBurns![0].startTdbS).toBeCloseTo(f.durationS, 6);
    });

    it('should give the same flight from ispS as from the mass flow, the mass falling at F/(Isp·g0)', async () => {
      const burn = (request.burns as Record<string, unknown>[])[0];
      const { massFlowKgS: _dropped, ...rest } = burn;
      const r = await run({ ...request, burns: [{ ...rest, ispS: ENGINE.ispS }] });
      const json = JSON.parse(r.out) as ResultJson;
      const durationS = burn.durationS as number;
      // Hand formula: m1 = m0 − F/(Isp·g0)·D, g0 = 9.80665 m/s² (3rd CGPM, 1901). Measured 2.0e-10 kg: the
      // cut-off epoch, ~8.2e8 TDB s, carries ~1e-7 s of round-off, times ṁ = 3.7e-3 kg/s; limit 5e-10 kg.
      expect(json.finalMassKg).toBeCloseTo(problem.spacecraft.massKg - (ENGINE.thrustN / (ENGINE.ispS * 9.80665)) * durationS, 9);
      // Tsiolkovsky: Δv = Isp·g0·ln(m0/m1), km/s.
      const b = json.finiteBurns![0];
      expect(b.idealDeltaVKmS).toBeCloseTo((ENGINE.ispS * 9.80665 / 1000) * Math.log(b.massBeforeKg / b.massAfterKg), 14);
      const achieved = plan.targets.map((t) => t.achieved as number);
      expect(Math.hypot(...json.final.positionKm.map((x, i) => x - achieved[i]))).toBeLessThan(1e-9);
    });

    it('should show the burn and the final mass in the readable report', async () => {
      const r = await run(request, false);
      expect(r.out).toMatch(/finite burn 1: ignition .* cut-off .* mass 500\.000000 -> \d+\.\d+ kg, ideal Δv \d+\.\d+ m\/s/);
      expect(r.out).toMatch(/final mass \d+\.\d{6} kg/);
    });
  });

  describe('when the example request examples/propagate-finite-burn.json is run', () => {
    it('should finish with the mass of the constant-flow law', async () => {
      const example = JSON.parse(readFileSync(new URL('../../examples/propagate-finite-burn.json', import.meta.url), 'utf8')) as {
        massKg: number; burns: { durationS: number; thrustN: number; ispS: number }[];
      };
      const r = await run(example);
      expect(r.code).toBe(0);
      const json = JSON.parse(r.out) as ResultJson;
      const b = example.burns[0];
      // m1 = m0 − F/(Isp·g0)·D = 480 − 10/(225 × 9.80665) × 900 = 475.921 kg (hand arithmetic: ṁ = 4.532e-3 kg/s).
      expect(json.finalMassKg).toBeCloseTo(example.massKg - (b.thrustN / (b.ispS * 9.80665)) * b.durationS, 9);
      expect(json.finalMassKg).toBeCloseTo(475.921, 3);
    });
  });

  describe('when a finite burn is malformed', () => {
    const finiteBurn = { model: 'finite', epoch: '2026-01-01T00:10:00 TDB', durationS: 600, thrustN: 8, ispS: 220, frame: 'VNB', direction: [1, 0, 0] };
    const base = () => ({ ...request, burns: [{ epoch: '2026-01-01T00:05:00 TDB', deltaVKmS: [0, 0, 0] }, finiteBurn] });
    const cases: [string, () => unknown, string][] = [
      ['neither ispS nor massFlowKgS', () => ({ ...base(), burns: [base().burns[0], { ...finiteBurn, ispS: undefined }] }), 'burns[1].ispS'],
      ['a direction that is not a unit vector', () => ({ ...base(), burns: [base().burns[0], { ...finiteBurn, direction: [1, 1, 0] }] }), 'burns[1].direction'],
      ['a burn past the end of the span', () => ({ ...base(), burns: [base().burns[0], { ...finiteBurn, durationS: 86400 }] }), 'burns[1].epoch'],
      ['no mass', () => ({ ...base(), massKg: undefined }), 'massKg'],
      ['an unknown frame', () => ({ ...base(), burns: [base().burns[0], { ...finiteBurn, frame: 'LVLH' }] }), 'burns[1].frame'],
      ['an impulsive burn inside the arc', () => ({ ...base(), burns: [{ epoch: '2026-01-01T00:12:00 TDB', deltaVKmS: [0, 0, 0] }, finiteBurn] }), 'burns[0].epoch'],
    ];
    for (const [name, json, field] of cases) {
      it(`should refuse ${name}, naming ${field}`, () => {
        let caught: unknown;
        try {
          toPropagationRequest(parsePropagateRequest(json()), createBuiltinEphemeris());
        } catch (error) {
          caught = error;
        }
        expect(caught).toBeInstanceOf(InvalidInputError);
        expect((caught as InvalidInputError).field).toBe(field);
      });
    }
  });
});
