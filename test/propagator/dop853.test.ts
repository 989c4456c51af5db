import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { Dop853Stepper, integrateDop853, integrateRk4, type RhsFunction } from '../../propagator/integrators/index.ts';
import { InvalidInputError } from '../../contract/errors.ts';

// Harmonic oscillator y'' = -y, y(0) = 1, y'(0) = 0: exact solution cos t, -sin t (analytic).
const oscillator: RhsFunction = (_t, y, dydt) => {
  dydt[0] = y[1];
  dydt[1] = -y[0];
};

// Two-body problem in canonical units (mu = 1), circular-ish orbit e = 0.5 from periapsis; the exact
// solution after one period T = 2*pi returns to the start (Kepler's third law, analytic).
const twoBody: RhsFunction = (_t, y, dydt) => {
  const r2 = y[0] * y[0] + y[1] * y[1];
  const r3 = r2 * Math.sqrt(r2);
  dydt[0] = y[2];
  dydt[1] = y[3];
  dydt[2] = -y[0] / r3;
  dydt[3] = -y[1] / r3;
};
interface OdexSolver {
  relativeTolerance: number;
  absoluteTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; nEval: number };
}
const e = 0.5;
const twoBodyStart = [1 - e, 0, 0, Math.sqrt((1 + e) / (1 - e))];

describe('DOP853 stepper', () => {
  describe('when integrating the harmonic oscillator over 10 periods', () => {
    it('should reach the analytic solution within a small multiple of the tolerance', () => {
      for (const tol of [1e-6, 1e-9, 1e-12]) {
        const tEnd = 20 * Math.PI;
        const result = integrateDop853(oscillator, 0, [1, 0], tEnd, { relativeTolerance: tol, absoluteTolerance: tol });
        expect(result.outcome).toBe('finished');
        expect(result.t).toBe(tEnd);
        const error = Math.hypot(result.y[0] - Math.cos(tEnd), result.y[1] + Math.sin(tEnd));
        // Global error of an 8th-order method grows roughly linearly over the span (common practice).
        expect(error).toBeLessThan(200 * tol);
      }
    });
  });

  describe('when integrating backward in time', () => {
    it('should reach the analytic solution at a negative end time', () => {
      const tEnd = -7.5;
      const result = integrateDop853(oscillator, 0, [1, 0], tEnd, { relativeTolerance: 1e-11, absoluteTolerance: 1e-11 });
      expect(result.outcome).toBe('finished');
      expect(Math.abs(result.y[0] - Math.cos(tEnd))).toBeLessThan(1e-9);
      expect(Math.abs(result.y[1] + Math.sin(tEnd))).toBeLessThan(1e-9);
    });
  });

  describe('when asked for dense output inside each accepted step', () => {
    it('should interpolate the analytic solution to the tolerance scale', () => {
      const stepper = new Dop853Stepper(oscillator, 0, [1, 0], 1, { relativeTolerance: 1e-10, absoluteTolerance: 1e-10 });
      const out = new Float64Array(2);
      let worst = 0;
      while (stepper.t < 10) {
        expect(stepper.step(10)).toBe('accepted');
        for (const s of [0.1, 0.37, 0.5, 0.81, 1]) {
          const t = stepper.tPrevious + s * (stepper.t - stepper.tPrevious);
          stepper.denseOutput(t, out);
          worst = Math.max(worst, Math.abs(out[0] - Math.cos(t)), Math.abs(out[1] + Math.sin(t)));
        }
      }
      expect(worst).toBeLessThan(1e-8);
      expect(worst).toBeGreaterThan(0);
    });
  });

  describe('when told to stop at an intermediate epoch', () => {
    it('should land exactly on it and continue from there', () => {
      const stepper = new Dop853Stepper(oscillator, 0, [1, 0], 1, { relativeTolerance: 1e-9, absoluteTolerance: 1e-9 });
      const stop = 1.2345678901234567;
      while (stepper.t !== stop) stepper.step(stop);
      expect(stepper.t).toBe(stop);
      expect(Math.abs(stepper.y[0] - Math.cos(stop))).toBeLessThan(1e-8);
      stepper.step(3);
      expect(stepper.t).toBeGreaterThan(stop);
      expect(stepper.t).toBeLessThanOrEqual(3);
    });
  });

  describe('when the solution blows up (y\' = y^2, y(0) = 1, singular at t = 1)', () => {
    it('should stop with step-size underflow and a diagnostic instead of looping', () => {
      const blowUp: RhsFunction = (_t, y, dydt) => {
        dydt[0] = y[0] * y[0];
      };
      const result = integrateDop853(blowUp, 0, [1], 2, { relativeTolerance: 1e-8, absoluteTolerance: 1e-8 });
      expect(['step-size-underflow', 'max-steps']).toContain(result.outcome);
      // The run stops within the tolerance's reach of the singularity, not beyond it.
      expect(Math.abs(result.t - 1)).toBeLessThan(1e-6);
      expect(result.message).toMatch(/s/);
    });
  });

  describe('when the step budget or an AbortSignal intervene', () => {
    it('should report max-steps', () => {
      const result = integrateDop853(oscillator, 0, [1, 0], 1000, { relativeTolerance: 1e-10, absoluteTolerance: 1e-10, maxSteps: 5 });
      expect(result.outcome).toBe('max-steps');
      expect(result.counts.steps).toBe(5);
    });
    it('should report cancelled', () => {
      const controller = new AbortController();
      controller.abort();
      const result = integrateDop853(oscillator, 0, [1, 0], 1000, { relativeTolerance: 1e-10, absoluteTolerance: 1e-10, signal: controller.signal });
      expect(result.outcome).toBe('cancelled');
    });
  });

  describe('when integrating a fixed two-body case (e = 0.5, one period, tolerance 1e-10)', () => {
    // CHANGE DETECTOR: these counts are what this code produced (not an outside value); paired below with a
    // check against an outside integrator's counts at equal accuracy.
    it('should keep the pinned step and evaluation counts (a change in step control shows here)', () => {
      const result = integrateDop853(twoBody, 0, twoBodyStart, 2 * Math.PI, { relativeTolerance: 1e-10, absoluteTolerance: 1e-10 });
      expect(result.outcome).toBe('finished');
      const error = Math.hypot(...twoBodyStart.map((v, i) => result.y[i] - v));
      expect(error).toBeLessThan(1e-8);
      expect(result.counts).toEqual(PINNED_TWO_BODY);
    });
  });

  describe('when its evaluations are compared with odex at equal accuracy (same two-body case)', () => {
    // odex (npm 2.0.4): Hairer's GBS extrapolation code ported, an outside integrator. For each DOP853
    // tolerance, odex runs at the loosest tolerance whose error after one period is at most DOP853's, and the
    // evaluation counts are compared. Measured 2026-12-03: 577 / 688 = 0.84 at 1e-10 (errors 5.1e-9 and
    // 1.6e-9), 821 / 1037 = 0.79 at 1e-12 (1.5e-10 and 7.0e-11). Expectation: an 8th-order Runge–Kutta code
    // is at least as economical as extrapolation at these tolerances (Hairer, Nørsett & Wanner, Solving ODE I,
    // §II.10 comparisons; from memory). Limit 1.0, ~1.2x the measured ratios.
    const { Solver } = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };
    const odexRun = (tol: number) => {
      const solver = new Solver(4);
      solver.relativeTolerance = tol;
      solver.absoluteTolerance = tol;
      solver.maxSteps = 1e6;
      const r = solver.solve((_x, y) => {
        const r3 = Math.hypot(y[0], y[1]) ** 3;
        return [y[2], y[3], -y[0] / r3, -y[1] / r3];
      }, 0, twoBodyStart, 2 * Math.PI);
      return { evaluations: r.nEval, error: Math.hypot(...twoBodyStart.map((v, i) => r.y[i] - v)) };
    };
    for (const tol of [1e-10, 1e-12]) {
      it(`should need no more evaluations than odex for the same error (DOP853 at ${tol})`, () => {
        const veer = integrateDop853(twoBody, 0, twoBodyStart, 2 * Math.PI, { relativeTolerance: tol, absoluteTolerance: tol });
        const veerError = Math.hypot(...twoBodyStart.map((v, i) => veer.y[i] - v));
        const matched = [1e-8, 1e-9, 1e-10, 1e-11, 1e-12, 1e-13, 1e-14].map(odexRun).find((r) => r.error <= veerError);
        expect(matched, 'odex reached DOP853\'s accuracy').toBeDefined();
        const ratio = veer.counts.evaluations / matched!.evaluations;
        console.info(`DOP853 ${tol}: ${veer.counts.evaluations} evaluations (error ${veerError.toExponential(2)}); odex ${matched!.evaluations} `
          + `(error ${matched!.error.toExponential(2)}); ratio ${ratio.toFixed(2)}`);
        expect(ratio).toBeLessThan(1.0);
      });
    }
  });

  describe('when given bad options', () => {
    it('should throw InvalidInputError naming the field', () => {
      expect(() => new Dop853Stepper(oscillator, 0, [1, Number.NaN], 1, { relativeTolerance: 1e-9, absoluteTolerance: 1e-9 }))
        .toThrow(InvalidInputError);
      expect(() => new Dop853Stepper(oscillator, 0, [1, 0], 1, { relativeTolerance: 0, absoluteTolerance: 1e-9 }))
        .toThrow(/relativeTolerance/);
      expect(() => new Dop853Stepper(oscillator, 0, [1, 0], 1, { relativeTolerance: 1e-9, absoluteTolerance: -1 }))
        .toThrow(/absoluteTolerance/);
    });
  });
});

describe('RK4', () => {
  describe('when the step is halved on the harmonic oscillator', () => {
    it('should show 4th-order convergence (error ratio near 16)', () => {
      const err = (steps: number): number => {
        const { y } = integrateRk4(oscillator, 0, [1, 0], 5, steps);
        return Math.hypot(y[0] - Math.cos(5), y[1] + Math.sin(5));
      };
      const ratio = err(100) / err(200);
      expect(ratio).toBeGreaterThan(14);
      expect(ratio).toBeLessThan(18);
    });
  });
});

// Change detector, pinned after the implementation was checked against the analytic cases above. evaluations =
// 1 initial + 1 starting-step estimate + 11 per attempt + 1 per accepted step (Hairer's counting).
const PINNED_TWO_BODY = { steps: 49, acceptedSteps: 36, rejectedSteps: 13, evaluations: 577 };
