import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { problemWithOpmState } from '../../cli/commands/ccsds-cli.ts';
import { problemSchema } from '../../planner/index.ts';
import { reachableProblem } from '../queue/fixtures.ts';

const opmPath = fileURLToPath(new URL('../fixtures/ccsds/opm-sun-minimal.opm', import.meta.url));
const earthOpmPath = fileURLToPath(new URL('../fixtures/ccsds/opm-earth-maneuvers.opm', import.meta.url));

describe('veer plan --state FILE.opm', () => {
  describe('when the OPM is well formed', () => {
    it('should replace the problem initial state and keep everything else', async () => {
      const original = reachableProblem();
      const { problem, notes } = await problemWithOpmState(original, earthOpmPath);
      const p = problem as Record<string, any>;
      expect(p.initialState).toMatchObject({ epoch: '2025-03-02T00:00:00.000 UTC', centre: 'earth', positionKm: [-19864.2237, 37202.4036, 27.9016] });
      expect(p.targets).toEqual(original.targets);
      expect(notes[0]).toMatch(/initial state read from .*opm-earth-maneuvers.opm .*with covariance/);
      expect(notes.join(' ')).toMatch(/MASS \(2140.5 kg\) differs from spacecraft.massKg/);
      // The planner's own schema accepts the new initial state.
      expect(problemSchema.shape.initialState.safeParse(p.initialState).success).toBe(true);
    });
  });

  describe('when the file is missing or malformed', () => {
    it('should name --state for a missing file and the keyword and line for a bad one', async () => {
      await expect(problemWithOpmState(reachableProblem(), '/no/such/file.opm')).rejects.toThrow(/--state: cannot read/);
      const { problem } = await problemWithOpmState(reachableProblem(), opmPath);
      expect((problem as Record<string, any>).initialState.centre).toBe('sun');
    });
  });
});
