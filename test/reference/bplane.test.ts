/**
 * B-plane geometry against analytic constructions and textbook flyby relations:
 *  - a hyperbola built analytically from a chosen asymptote Ŝ, B vector and v∞ (periapsis from
 *    r_p = (μ/v∞²)(√(1 + (|B|v∞²/μ)²) − 1), e = 1 + r_p v∞²/μ; the hyperbola relations of Vallado (2013)
 *    §2.2/§12 and Curtis, Orbital Mechanics for Engineering Students, §8.9 "planetary flyby"), moved back in
 *    time by the Kepler solver, must give back Ŝ, B·T, B·R to round-off;
 *  - the aiming radius relation |B| = r_p √(1 + 2μ/(r_p v∞²)) (Curtis §8.9, from memory);
 *  - time to periapsis against the construction's own epoch offset.
 */
import { describe, expect, it } from 'vitest';
import { computeBPlane, referencePole } from '../../propagator/bplane/index.ts';
import { GM_KM3_S2 } from '../../propagator/constants.ts';
import { keplerPropagate } from '../../propagator/kepler/index.ts';

type V = number[];
const cross = (a: V, b: V) => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: V, b: V) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const unit = (a: V) => a.map((x) => x / Math.hypot(a[0], a[1], a[2]));

/** Periapsis state of the hyperbola with asymptote sHat, impact vector b (⟂ Ŝ) and v∞. */
function hyperbolaFromB(sHat: V, b: V, vInf: number, mu: number) {
  const bMag = Math.hypot(b[0], b[1], b[2]);
  const rp = (mu / vInf ** 2) * (Math.sqrt(1 + ((bMag * vInf ** 2) / mu) ** 2) - 1);
  const e = 1 + (rp * vInf ** 2) / mu;
  const hHat = cross(unit(b), sHat); // B̂ = Ŝ × ĥ  ⇒  ĥ = B̂ × Ŝ
  const cb = 1 / e;
  const sb = Math.sqrt(1 - cb * cb);
  const hxs = cross(hHat, sHat);
  const eHat = [0, 1, 2].map((i) => cb * sHat[i] - sb * hxs[i]); // Ŝ rotated by −β about ĥ, cos β = 1/e
  const pHat = cross(hHat, eHat);
  const vp = Math.sqrt(vInf ** 2 + (2 * mu) / rp);
  return { rp, e, r: eHat.map((x) => x * rp), v: pHat.map((x) => x * vp) };
}

describe('B-plane geometry', () => {
  const mu = GM_KM3_S2.mars;
  const sHat = unit([0.3, -0.8, 0.25]);
  const pole = referencePole('ecliptic');
  const tHat = unit(cross(sHat, pole));
  const rHat = cross(sHat, tHat);
  const bT = 8500;
  const bR = -4200;
  const b = [0, 1, 2].map((i) => bT * tHat[i] + bR * rHat[i]);
  const vInf = 3.1;
  const peri = hyperbolaFromB(sHat, b, vInf, mu);

  describe('when the hyperbola is built analytically from a chosen B vector and asymptote', () => {
    for (const dt of [-3 * 86400, -6 * 3600, -60]) {
      it(`should recover Ŝ, B·T and B·R to round-off from a state ${-dt} s before periapsis`, () => {
        const s = keplerPropagate(peri.r, peri.v, dt, mu);
        const bp = computeBPlane([...s.positionKm, ...s.velocityKmS], mu, 'ecliptic');
        for (let i = 0; i < 3; i++) expect(Math.abs(bp.sHat[i] - sHat[i])).toBeLessThan(1e-12);
        expect(Math.abs(bp.bDotTKm - bT)).toBeLessThan(1e-8 * 1e4);
        expect(Math.abs(bp.bDotRKm - bR)).toBeLessThan(1e-8 * 1e4);
        expect(bp.thetaRad).toBeCloseTo(Math.atan2(bR, bT), 11);
        expect(Math.abs(bp.vInfinityKmS - vInf)).toBeLessThan(1e-12);
        // Time to periapsis equals the construction's offset (Kepler solver round trip).
        expect(Math.abs(bp.timeToPeriapsisS + dt)).toBeLessThan(1e-6 * Math.max(1, Math.abs(dt)));
        expect(bp.periapsisRadiusKm).toBeCloseTo(peri.rp, 6);
      });
    }
  });

  describe('when checking the aiming-radius relation of a planetary flyby', () => {
    it('should give |B| = r_p √(1 + 2μ/(r_p v∞²)) (Curtis §8.9)', () => {
      for (const [rp, vi] of [[3396 + 300, 2.5], [3396 + 5000, 6], [3396 + 100, 0.5]]) {
        const e = 1 + (rp * vi ** 2) / mu;
        const r = [rp, 0, 0];
        const v = [0, Math.sqrt(vi ** 2 + (2 * mu) / rp), 0];
        const s = keplerPropagate(r, v, -2 * 86400, mu);
        const bp = computeBPlane([...s.positionKm, ...s.velocityKmS], mu, 'ecliptic');
        const expected = rp * Math.sqrt(1 + (2 * mu) / (rp * vi ** 2));
        expect(Math.abs(bp.bMagnitudeKm - expected) / expected).toBeLessThan(1e-12);
        expect(Math.abs(Math.hypot(bp.bDotTKm, bp.bDotRKm) - expected) / expected).toBeLessThan(1e-12);
        expect(bp.eccentricity).toBeCloseTo(e, 12);
      }
    });
  });

  describe('when the state is not on a hyperbola', () => {
    it('should throw an error giving the eccentricity found', () => {
      expect(() => computeBPlane([8000, 0, 0, 0, 2, 0], mu, 'ecliptic', 'mars')).toThrow(/not on a hyperbola about mars: e = /);
    });
  });
});
