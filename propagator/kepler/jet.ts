/**
 * First-order forward-mode derivatives ("jets"): a value with its gradient with respect to N inputs
 * (here the 6 components of a Cartesian state). Each operation applies the chain rule exactly, so
 * partials built from closed-form expressions are analytic (no finite differences, no truncation error).
 */

/** The gradient of a jet without derivatives (dimension 0): one shared empty array, nothing to allocate. */
const NO_GRADIENT = new Float64Array(0);

/** A value `v` (in whatever unit the expression has) with its gradient `d` with respect to the inputs
 * (∂v/∂input_i, in the unit of v per unit of input i; for states km and km/s). */
export class Jet {
  readonly v: number;
  readonly d: Float64Array;
  constructor(v: number, d: Float64Array) {
    this.v = v;
    this.d = d;
  }
  /** A constant (zero gradient) of dimension n. */
  static constant(v: number, n: number): Jet {
    return new Jet(v, n === 0 ? NO_GRADIENT : new Float64Array(n));
  }
  private gradientCopy(): Float64Array {
    return this.d.length === 0 ? NO_GRADIENT : this.d.slice();
  }
  /** The i-th independent variable of dimension n. */
  static variable(v: number, i: number, n: number): Jet {
    const d = new Float64Array(n);
    d[i] = 1;
    return new Jet(v, d);
  }
  private map(v: number, a: number, other?: Jet, b = 0): Jet {
    const n = this.d.length;
    if (n === 0) return new Jet(v, NO_GRADIENT);
    const d = new Float64Array(n);
    for (let i = 0; i < n; i++) d[i] = a * this.d[i] + (other ? b * other.d[i] : 0);
    return new Jet(v, d);
  }
  add(o: Jet | number): Jet {
    return typeof o === 'number' ? new Jet(this.v + o, this.gradientCopy()) : this.map(this.v + o.v, 1, o, 1);
  }
  sub(o: Jet | number): Jet {
    return typeof o === 'number' ? new Jet(this.v - o, this.gradientCopy()) : this.map(this.v - o.v, 1, o, -1);
  }
  mul(o: Jet | number): Jet {
    return typeof o === 'number' ? this.map(this.v * o, o) : this.map(this.v * o.v, o.v, o, this.v);
  }
  div(o: Jet | number): Jet {
    if (typeof o === 'number') return this.map(this.v / o, 1 / o);
    const q = this.v / o.v;
    return this.map(q, 1 / o.v, o, -q / o.v);
  }
  neg(): Jet {
    return this.map(-this.v, -1);
  }
  sqrt(): Jet {
    const s = Math.sqrt(this.v);
    return this.map(s, 0.5 / s);
  }
  /** Applies a scalar function given its value and derivative at this.v. */
  apply(value: number, derivative: number): Jet {
    return this.map(value, derivative);
  }
}

/** A 3-vector of jets (e.g. a position in km or a velocity in km/s, in the axes of the input state). */
export type Jet3 = [Jet, Jet, Jet];

/** Dot product a·b with its gradient; unit = unit(a)·unit(b); a and b in the same axes. */
export function dot3(a: Jet3, b: Jet3): Jet {
  return a[0].mul(b[0]).add(a[1].mul(b[1])).add(a[2].mul(b[2]));
}
/** Cross product a × b with its gradient (right-handed; unit = unit(a)·unit(b); a and b in the same axes). */
export function cross3(a: Jet3, b: Jet3): Jet3 {
  return [
    a[1].mul(b[2]).sub(a[2].mul(b[1])),
    a[2].mul(b[0]).sub(a[0].mul(b[2])),
    a[0].mul(b[1]).sub(a[1].mul(b[0])),
  ];
}
/** a·s, component by component, with its gradient (s a jet or a constant; unit = unit(a)·unit(s)). */
export function scale3(a: Jet3, s: Jet | number): Jet3 {
  return [a[0].mul(s), a[1].mul(s), a[2].mul(s)];
}
/** a + b with its gradient (same unit and axes for both). */
export function add3(a: Jet3, b: Jet3): Jet3 {
  return [a[0].add(b[0]), a[1].add(b[1]), a[2].add(b[2])];
}
/** a − b with its gradient (same unit and axes for both). */
export function sub3(a: Jet3, b: Jet3): Jet3 {
  return [a[0].sub(b[0]), a[1].sub(b[1]), a[2].sub(b[2])];
}
/** Euclidean norm |a| with its gradient (unit of a; the gradient is undefined at a = 0). */
export function norm3(a: Jet3): Jet {
  return dot3(a, a).sqrt();
}
/** Unit vector a/|a| (dimensionless, same axes) with the gradient of the normalisation; a ≠ 0. */
export function unit3(a: Jet3): Jet3 {
  const n = norm3(a);
  return [a[0].div(n), a[1].div(n), a[2].div(n)];
}
/** Lifts a Cartesian 6-state [x, y, z (km), vx, vy, vz (km/s)], any inertial axes, into jets: components
 * 0..5 are the independent variables, so later gradients are ∂/∂(r, v) of that state. With `gradients`
 * 'none' the jets carry no gradient: the same operations give the same values, without the derivative work. */
export function stateJets(state: readonly number[], gradients: 'state' | 'none' = 'state'): { r: Jet3; v: Jet3 } {
  const j = (i: number) => (gradients === 'none' ? Jet.constant(state[i], 0) : Jet.variable(state[i], i, 6));
  return { r: [j(0), j(1), j(2)], v: [j(3), j(4), j(5)] };
}
