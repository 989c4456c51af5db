/**
 * Value of one target component from the state where it is read, and its partial derivatives with respect
 * to that state (row of 6: ∂/∂(x, y, z km, vx, vy, vz km/s), J2000 equatorial). Chained with the STM by
 * the evaluator: d(component)/d(controls) = (∂component/∂state) · d(state)/d(controls).
 *
 * Quantities read at the closest approach are invariants of the osculating conic about the body (B·T, B·R,
 * |r| at periapsis, inclination of h), so the shift of the approach epoch with the controls does not enter
 * to first order. The closest-approach epoch itself uses the implicit-function rule on g = r·v = 0:
 * dt = −(∂g/∂state · δstate)/ġ, ġ = v·v + r·a, with a the body's point-mass pull (dominant near approach).
 */
import { bPlanePartials, computeBPlane, referencePole } from '../../propagator/index.ts';
import type { Vec3 } from '../../propagator/index.ts';
import type { ComponentQuantity, TargetComponent } from './target-components.ts';
import { gmOf, radiusOf } from './target-components.ts';

export interface ComponentEvaluation {
  value: number;
  /** ∂value/∂state (6), or null when the value has no useful derivative. */
  partial: number[] | null;
}

function centralPartial(f: (s: number[]) => number, s: readonly number[]): number[] {
  return s.map((v, k) => {
    const h = k < 3 ? Math.max(1e-7 * Math.abs(v), 1e-6) : Math.max(1e-7 * Math.abs(v), 1e-9);
    const p = s.slice();
    const m = s.slice();
    p[k] = v + h;
    m[k] = v - h;
    return (f(p) - f(m)) / (2 * h);
  });
}

/** Inclination (deg, [0, 180]) of the orbit plane of a state about a reference pole. */
export function inclinationDeg(s: readonly number[], pole: Vec3): number {
  const h: Vec3 = [s[1] * s[5] - s[2] * s[4], s[2] * s[3] - s[0] * s[5], s[0] * s[4] - s[1] * s[3]];
  const c = (h[0] * pole[0] + h[1] * pole[1] + h[2] * pole[2]) / Math.hypot(...h);
  return (Math.acos(Math.max(-1, Math.min(1, c))) * 180) / Math.PI;
}

/** Periapsis radius (km) of the osculating conic of a state about a body of GM μ. */
export function conicPeriapsisRadiusKm(s: readonly number[], mu: number): number {
  const r = Math.hypot(s[0], s[1], s[2]);
  const v2 = s[3] * s[3] + s[4] * s[4] + s[5] * s[5];
  const h2 = (s[1] * s[5] - s[2] * s[4]) ** 2 + (s[2] * s[3] - s[0] * s[5]) ** 2 + (s[0] * s[4] - s[1] * s[3]) ** 2;
  const energy = v2 / 2 - mu / r;
  const e = Math.sqrt(Math.max(0, 1 + (2 * energy * h2) / (mu * mu)));
  return h2 / mu / (1 + e);
}

/**
 * Evaluates a component from the state relative to its body or centre (J2000 equatorial) at `epochTdbS`.
 * With `options.partial` false (no STM to chain it with: a Monte Carlo sample) the partial is left out and
 * null; the value is the same number either way.
 * Throws InvalidInputError (from the B-plane geometry) when the approach is not hyperbolic.
 */
export function evaluateComponent(c: TargetComponent, state: readonly number[], epochTdbS: number,
  options: { partial?: boolean } = {}): ComponentEvaluation {
  const q = c.quantity;
  const withPartial = options.partial !== false;
  if (!isOther(q)) {
    // One pass on jets gives value and partial; without the partial the same operations run derivative-free.
    if (!withPartial) {
      const b = computeBPlane(state, gmOf(q.body), q.plane, q.body);
      return { value: q.q === 'bdott' ? b.bDotTKm : b.bDotRKm, partial: null };
    }
    const bp = bPlanePartials(state, gmOf(q.body), q.plane, q.body);
    return q.q === 'bdott'
      ? { value: bp.value.bDotTKm, partial: [...bp.rows.bDotTKm] }
      : { value: bp.value.bDotRKm, partial: [...bp.rows.bDotRKm] };
  }
  return { value: componentValue(q, state, epochTdbS), partial: withPartial ? componentPartial(q, state) : null };
}

/** A component other than B·T, B·R. */
type OtherQuantity = Exclude<ComponentQuantity, { q: 'bdott' | 'bdotr' }>;
const isOther = (q: ComponentQuantity): q is OtherQuantity => q.q !== 'bdott' && q.q !== 'bdotr';

/** The value of a component other than B·T, B·R. */
function componentValue(q: OtherQuantity, state: readonly number[], epochTdbS: number): number {
  switch (q.q) {
    case 'ca-epoch': return epochTdbS;
    // At closest approach the distance is the osculating periapsis radius; the conic form (its partial
    // below) is the same number there and stays stationary when the approach epoch shifts.
    case 'periapsis-radius': return Math.hypot(state[0], state[1], state[2]);
    case 'periapsis-altitude': return Math.hypot(state[0], state[1], state[2]) - radiusOf(q.body);
    case 'inclination': return inclinationDeg(state, referencePole(q.plane, q.body));
    case 'state': return state[q.axis];
  }
}

/** ∂value/∂state (6) of a component other than B·T, B·R. */
function componentPartial(q: OtherQuantity, state: readonly number[]): number[] {
  switch (q.q) {
    case 'ca-epoch': {
      const mu = gmOf(q.body);
      const r = Math.hypot(state[0], state[1], state[2]);
      const v2 = state[3] ** 2 + state[4] ** 2 + state[5] ** 2;
      const gDot = v2 - mu / r; // v·v + r·a with a = −μ r / r³
      return [-state[3], -state[4], -state[5], -state[0], -state[1], -state[2]].map((v) => v / gDot);
    }
    case 'periapsis-radius':
    case 'periapsis-altitude': {
      const mu = gmOf(q.body);
      return centralPartial((s) => conicPeriapsisRadiusKm(s, mu), state);
    }
    case 'inclination': {
      const pole = referencePole(q.plane, q.body);
      return centralPartial((s) => inclinationDeg(s, pole), state);
    }
    case 'state': {
      const partial = [0, 0, 0, 0, 0, 0];
      partial[q.axis] = 1;
      return partial;
    }
  }
}
