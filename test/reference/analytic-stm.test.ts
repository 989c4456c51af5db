/**
 * Analytic two-body state transition matrix (Battin 1999, §4.5 universal functions and §9.7 two-body STM
 * from the Lagrange coefficients) checked against sources outside its own derivation:
 *  - central finite differences of the Kepler solution (relative agreement ~1e-6 as the issue asks);
 *  - the symplectic identity Φᵀ J Φ = J of any Hamiltonian flow (Battin §9.6 / any text on canonical
 *    transformations), and det Φ = 1 (Liouville);
 *  - the group property Φ(t2, t0) = Φ(t2, t1) Φ(t1, t0).
 */
import { describe, expect, it } from 'vitest';
import { createBuiltinEphemeris, propagate, type Vec3 } from '../../propagator/index.ts';
import { keplerPropagate, keplerStm } from '../../propagator/kepler/index.ts';

const MU = 398600.4418;
const mul = (a: number[], b: number[]) => {
  const c = new Array(36).fill(0);
  for (let i = 0; i < 6; i++) for (let k = 0; k < 6; k++) for (let j = 0; j < 6; j++) c[i * 6 + j] += a[i * 6 + k] * b[k * 6 + j];
  return c;
};
const transpose = (a: number[]) => a.map((_, idx) => a[(idx % 6) * 6 + Math.floor(idx / 6)]);
const J = (() => {
  const j = new Array(36).fill(0);
  for (let i = 0; i < 3; i++) { j[i * 6 + i + 3] = 1; j[(i + 3) * 6 + i] = -1; }
  return j;
})();

const cases = [
  { name: 'Vallado Example 2-4 ellipse, 40 min', x0: [1131.340, -2282.343, 6672.423, -5.64305, 4.30333, 2.42879], dt: 2400 },
  { name: 'hyperbola, one day', x0: [7000, 0, 100, 0, 12, 0.5], dt: 86400 },
  { name: 'hyperbola, one day backwards', x0: [7000, 0, 100, 0, 12, 0.5], dt: -86400 },
  { name: 'parabola, 5 h', x0: [7000, 0, 0, 0, Math.sqrt((2 * MU) / 7000), 0.3], dt: 18000 },
  { name: 'eccentric ellipse, 3 revolutions', x0: [7000, 0, 0, 0, 9.5, 0.4], dt: 3 * 2 * Math.PI * Math.sqrt(((1 / (2 / 7000 - (9.5 ** 2 + 0.16) / MU)) ** 3) / MU) },
];

describe('analytic two-body STM', () => {
  describe('when compared with central finite differences of the Kepler solution', () => {
    for (const c of cases) {
      it(`should agree to ~1e-6 relative for ${c.name}`, () => {
        const { stm } = keplerStm(c.x0.slice(0, 3), c.x0.slice(3), c.dt, MU);
        const colNorm = (j: number) => Math.hypot(...[0, 1, 2, 3, 4, 5].map((i) => stm[i * 6 + j]));
        let worst = 0;
        for (let j = 0; j < 6; j++) {
          const h = j < 3 ? 1e-4 : 1e-7; // km, km/s: central-difference truncation ~h², round-off ~ε/h
          const p = [...c.x0]; p[j] += h;
          const m = [...c.x0]; m[j] -= h;
          const a = keplerPropagate(p.slice(0, 3), p.slice(3), c.dt, MU);
          const b = keplerPropagate(m.slice(0, 3), m.slice(3), c.dt, MU);
          const ya = [...a.positionKm, ...a.velocityKmS];
          const yb = [...b.positionKm, ...b.velocityKmS];
          for (let i = 0; i < 6; i++) {
            const fd = (ya[i] - yb[i]) / (2 * h);
            worst = Math.max(worst, Math.abs(fd - stm[i * 6 + j]) / colNorm(j));
          }
        }
        expect(worst, c.name).toBeLessThan(1e-6);
      });
    }
  });

  describe('when checking the symplectic structure', () => {
    for (const c of cases) {
      it(`should satisfy Φᵀ J Φ = J to round-off for ${c.name}`, () => {
        const { stm } = keplerStm(c.x0.slice(0, 3), c.x0.slice(3), c.dt, MU);
        const m = mul(mul(transpose(stm), J), stm);
        const scale = Math.max(...stm.map(Math.abs)) ** 2;
        for (let k = 0; k < 36; k++) expect(Math.abs(m[k] - J[k]) / scale, `entry ${k}`).toBeLessThan(1e-13);
      });
    }
  });

  describe('when composing two steps', () => {
    it('should equal the single-step matrix (group property)', () => {
      const x0 = cases[0].x0;
      const first = keplerStm(x0.slice(0, 3), x0.slice(3), 1000, MU);
      const second = keplerStm(first.positionKm, first.velocityKmS, 1400, MU);
      const whole = keplerStm(x0.slice(0, 3), x0.slice(3), 2400, MU);
      const composed = mul(second.stm, first.stm);
      for (let k = 0; k < 36; k++) expect(Math.abs(composed[k] - whole.stm[k])).toBeLessThan(1e-11 * Math.max(1, Math.abs(whole.stm[k])));
    });
  });
});

// The issue asks for ~1e-6 relative; measured worst entries at rtol 1e-13: Cowell ≤ 1.1e-10, Encke ≤ 1.1e-8
// (three revolutions of the e ≈ 0.6 ellipse, where Φ grows secularly).
describe('integrated STM against the analytic two-body STM', () => {
  const ephemeris = createBuiltinEphemeris();
  for (const c of [cases[0], cases[1], cases[4]]) {
    for (const method of ['cowell', 'encke'] as const) {
      it(`should agree to 1e-7 of the largest entry for ${c.name} (${method})`, () => {
        const r = propagate({
          initial: { epochTdbS: 1e8, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: c.x0.slice(0, 3) as Vec3,
            velocityKmS: c.x0.slice(3) as Vec3 },
          endEpochTdbS: 1e8 + c.dt, forces: { centralBody: 'earth', perturbingBodies: [], gmOverridesKm3S2: { earth: MU } },
          ephemeris, method, withStm: true, relativeTolerance: 1e-13, absoluteTolerance: 1e-12,
        });
        const { stm } = keplerStm(c.x0.slice(0, 3), c.x0.slice(3), c.dt, MU);
        const scale = Math.max(...stm.map(Math.abs));
        for (let k = 0; k < 36; k++) expect(Math.abs(r.stm![k] - stm[k]) / scale, `Φ[${k}]`).toBeLessThan(1e-7);
      });
    }
  }
});
