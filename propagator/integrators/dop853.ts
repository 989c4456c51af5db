/**
 * Dormand–Prince 8(5,3) explicit Runge–Kutta stepper with 7th-order dense output (Hairer, Nørsett &
 * Wanner, Solving ODE I, 2nd ed., §II.5 (Table 5.3 ff.) and §II.6; Hairer's DOP853 step control:
 * combined 5th/3rd-order error estimate, safety 0.9, step ratio in [1/6, 3], no growth right after a
 * rejection). All buffers are allocated once; `step()` and `denseOutput()` do not allocate.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { validateOptions } from './dop853-checks.ts';
import * as K from './dop853-coefficients.ts';
import { trialStages, type StageCall } from './dop853-stages.ts';
import type { Dop853Options, IntegratorCounts, LinearTail, RhsFunction, StepStatus } from './integrator-types.ts';

const SAFETY = 0.9;
const MIN_FACTOR = 0.333;
const MAX_FACTOR = 6.0;
const EXPONENT = 1 / 8;
const UNIT_ROUNDOFF = 2.220446049250313e-16;

/** Adaptive DOP853 stepper. Construct at (t0, y0) with a direction (+1 forward, -1 backward); each
 * `step(tStop)` advances one accepted step that never passes `tStop` and lands on it exactly when it
 * reaches it. Units of t are those of the caller (seconds in the propagator). */
export class Dop853Stepper {
  readonly dimension: number;
  readonly direction: 1 | -1;
  /** Counters since construction. */
  readonly counts: IntegratorCounts = { steps: 0, acceptedSteps: 0, rejectedSteps: 0, evaluations: 0 };
  /** Why the last `step()` failed, with the numbers needed to diagnose it. */
  diagnostic = '';

  private readonly rhs: RhsFunction;
  private readonly rtol: number;
  private readonly atol: number;
  private readonly maxStep: number;
  private readonly errorComponents: number;
  private tNow: number;
  private tPrev: number;
  private hNext: number;
  private hLast = 0;
  private rejectedLast = false;
  private facOld = 1e-4;
  /** Components [0, denseReady) of the last step's interpolant are ready. */
  private denseReady = 0;
  private denseValid = false;
  private yNow: Float64Array;
  private yPrev: Float64Array;
  private yNew: Float64Array;
  private fNow: Float64Array;
  private fPrev: Float64Array;
  private fNew: Float64Array;
  private readonly yTmp: Float64Array;
  private readonly k: Float64Array[];
  private readonly cont: Float64Array;
  private readonly tail: LinearTail | null;
  private readonly fullStage: StageCall;
  private readonly headStage: StageCall;
  private readonly tailStage: StageCall;

  constructor(rhs: RhsFunction, t0: number, y0: ArrayLike<number>, direction: 1 | -1, options: Dop853Options) {
    validateOptions(t0, y0, options);
    const n = y0.length;
    this.dimension = n;
    this.direction = direction;
    this.rhs = rhs;
    this.rtol = options.relativeTolerance;
    this.atol = options.absoluteTolerance;
    this.maxStep = options.maxStepS ?? Infinity;
    this.errorComponents = Math.min(n, options.errorComponents ?? n);
    const tail = options.linearTail ?? null;
    this.tail = tail;
    this.fullStage = (_stage, t, y, dydt) => rhs(t, y, dydt);
    this.headStage = tail === null ? this.fullStage : (stage, t, y, dydt) => tail.head(t, y, dydt, stage);
    this.tailStage = tail === null ? this.fullStage : (stage, _t, y, dydt) => tail.tail(y, dydt, stage);
    this.tNow = t0;
    this.tPrev = t0;
    // All working vectors are views of one allocation: a run starts many steppers (one per leg and segment),
    // and each typed array of more than a few numbers is a separate backing store to allocate and collect.
    const block = new Float64Array(32 * n);
    let used = 0;
    const buf = (): Float64Array => {
      used += n;
      return block.subarray(used - n, used);
    };
    this.yNow = buf();
    for (let i = 0; i < n; i++) this.yNow[i] = y0[i];
    this.yPrev = buf();
    this.yNew = buf();
    this.fNow = buf();
    this.fPrev = buf();
    this.fNew = buf();
    this.yTmp = buf();
    // k[i] holds stage i (2..12 of the step, 14..16 of the dense output); k[0], k[1], k[13] unused.
    this.k = Array.from({ length: 17 }, buf);
    this.cont = block.subarray(used, used + 8 * n);
    this.rhs(t0, this.yNow, this.fNow);
    this.counts.evaluations += 1;
    this.hNext = options.initialStepS !== undefined
      ? direction * Math.min(Math.abs(options.initialStepS), this.maxStep)
      : this.initialStep(options.endTime === undefined ? Infinity : Math.abs(options.endTime - t0));
  }

  /** Current time (end of the last accepted step). */
  get t(): number { return this.tNow; }
  /** Start of the last accepted step. */
  get tPrevious(): number { return this.tPrev; }
  /** Current state; the buffer is reused, copy it to keep it past the next `step()` or `reset()`. */
  get y(): Float64Array { return this.yNow; }
  /** y' at the current state. */
  get dydt(): Float64Array { return this.fNow; }
  /** Step size the controller proposes next (signed). */
  get nextStep(): number { return this.hNext; }
  /** True when `denseOutput()` may be called (an accepted step since construction or `reset()`). */
  get hasDenseOutput(): boolean { return this.denseValid; }
  /** Size of the last accepted step (signed); 0 before the first. */
  get lastStep(): number { return this.hLast; }

  /**
   * Advances one accepted step towards `tStop` (must lie ahead in the stepper's direction or equal the
   * current time). Rejected attempts are retried internally with a smaller step. Returns
   * 'step-size-underflow' (with `diagnostic` set) when the step falls below round-off of t.
   */
  step(tStop: number): StepStatus {
    const dir = this.direction;
    const remaining = (tStop - this.tNow) * dir;
    if (remaining <= 0) return 'accepted';
    let h = dir * Math.min(Math.abs(this.hNext), this.maxStep);
    for (;;) {
      let landing = false;
      const hUnclipped = h;
      if ((this.tNow + 1.01 * h - tStop) * dir >= 0) {
        h = tStop - this.tNow;
        landing = true;
      }
      const roundOff = 10 * UNIT_ROUNDOFF * Math.abs(this.tNow);
      if (landing && Math.abs(h) <= roundOff) {
        // tStop is within round-off of t: snap to it rather than take a meaningless step.
        this.tNow = tStop;
        this.tPrev = tStop;
        this.denseValid = false;
        return 'accepted';
      }
      // Make the step exactly representable at this epoch, so t + h is the interval actually integrated
      // (at t ~ 1e9 s an unrounded h drifts from the stepped time by up to an ulp of t per step).
      if (!landing) h = (this.tNow + h) - this.tNow;
      if (Math.abs(h) <= roundOff || h === 0 || !Number.isFinite(h)) {
        this.diagnostic = `step size ${h} s fell below round-off at t = ${this.tNow} s after `
          + `${this.counts.rejectedSteps} rejections (rtol ${this.rtol}, atol ${this.atol})`;
        return 'step-size-underflow';
      }
      this.counts.steps += 1;
      const err = this.attempt(h);
      const fac11 = err ** EXPONENT;
      if (err <= 1) {
        this.facOld = Math.max(err, 1e-4);
        this.rhs(this.tNow + h, this.yNew, this.fNew);
        this.counts.evaluations += 1;
        this.counts.acceptedSteps += 1;
        let fac = Math.max(1 / MAX_FACTOR, Math.min(1 / MIN_FACTOR, fac11 / SAFETY));
        if (!Number.isFinite(fac)) fac = 1 / MAX_FACTOR;
        let hNew = h / fac;
        if (landing) hNew = dir * Math.max(Math.abs(hNew), Math.abs(hUnclipped));
        if (Math.abs(hNew) > this.maxStep) hNew = dir * this.maxStep;
        if (this.rejectedLast) hNew = dir * Math.min(Math.abs(hNew), Math.abs(h));
        this.rejectedLast = false;
        this.hNext = hNew;
        this.acceptStep(landing ? tStop : this.tNow + h, h);
        return 'accepted';
      }
      this.counts.rejectedSteps += 1;
      this.rejectedLast = true;
      const shrink = Number.isFinite(fac11) ? Math.min(1 / MIN_FACTOR, fac11 / SAFETY) : 1 / MIN_FACTOR;
      h = h / shrink;
    }
  }

  /**
   * Writes the 7th-order dense-output interpolant at `t` (within the last accepted step) into out[0..count)
   * (the leading `count` components; all by default). Costs three extra evaluations the first time it is
   * used within a step; with a linear tail, the tail's share only when a tail component is asked for.
   */
  denseOutput(t: number, out: Float64Array, count = this.dimension): void {
    if (!this.denseValid) {
      throw new InvalidInputError('t', 'no accepted step to interpolate in (dense output is reset by reset())');
    }
    if (this.denseReady < count) this.prepareDenseFor(count);
    const n = this.dimension;
    const c = this.cont;
    const s = (t - this.tPrev) / this.hLast;
    const s1 = 1 - s;
    for (let i = 0; i < count; i++) {
      out[i] = c[i] + s * (c[n + i] + s1 * (c[2 * n + i] + s * (c[3 * n + i] + s1 * (c[4 * n + i]
        + s * (c[5 * n + i] + s1 * (c[6 * n + i] + s * c[7 * n + i]))))));
    }
  }

  /** Replaces the current state (a discontinuity such as an impulsive burn) at the current time; keeps
   * the proposed step size; dense output is unavailable until the next step. */
  reset(y: ArrayLike<number>): void {
    for (let i = 0; i < this.dimension; i++) this.yNow[i] = y[i];
    this.rhs(this.tNow, this.yNow, this.fNow);
    this.counts.evaluations += 1;
    this.denseValid = false;
    this.denseReady = 0;
  }

  /** One trial step of size h from (tNow, yNow): fills yNew and returns the scaled error norm. With a
   * linear tail the head goes first and the tail only when the step is accepted: the same arithmetic per
   * component, so the same numbers, without the tail's work in rejected attempts. */
  private attempt(h: number): number {
    const n = this.dimension;
    const tail = this.tail;
    const split = tail === null ? n : tail.offset;
    trialStages(h, 0, split, this.tNow, this.yNow, this.fNow, this.k, this.yTmp, tail === null ? this.fullStage : this.headStage);
    this.counts.evaluations += 11;
    const err = this.combine(h, 0, split);
    if (tail !== null && err <= 1) {
      trialStages(h, split, n, this.tNow, this.yNow, this.fNow, this.k, this.yTmp, this.tailStage);
      this.combine(h, split, n);
    }
    return err;
  }

  /** yNew over [lo, hi) from the stages, and the scaled error norm over the error components among them. */
  private combine(h: number, lo: number, hi: number): number {
    const y = this.yNow;
    const k1 = this.fNow;
    const [, , , , , , k6, k7, k8, k9, k10, k11, k12] = this.k;
    const yNew = this.yNew;
    let err5 = 0;
    let err3 = 0;
    const m = this.errorComponents;
    for (let i = lo; i < hi; i++) {
      const slope = K.b1 * k1[i] + K.b6 * k6[i] + K.b7 * k7[i] + K.b8 * k8[i] + K.b9 * k9[i] + K.b10 * k10[i]
        + K.b11 * k11[i] + K.b12 * k12[i];
      yNew[i] = y[i] + h * slope;
      if (i >= m) continue;
      const sk = this.atol + this.rtol * Math.max(Math.abs(y[i]), Math.abs(yNew[i]));
      const e3 = (slope - K.bhh1 * k1[i] - K.bhh2 * k9[i] - K.bhh3 * k12[i]) / sk;
      const e5 = (K.er1 * k1[i] + K.er6 * k6[i] + K.er7 * k7[i] + K.er8 * k8[i] + K.er9 * k9[i]
        + K.er10 * k10[i] + K.er11 * k11[i] + K.er12 * k12[i]) / sk;
      err3 += e3 * e3;
      err5 += e5 * e5;
    }
    let deno = err5 + 0.01 * err3;
    if (deno <= 0) deno = 1;
    const err = Math.abs(h) * err5 * Math.sqrt(1 / (m * deno));
    return Number.isNaN(err) ? Infinity : err;
  }

  private acceptStep(tNew: number, h: number): void {
    let swap = this.yPrev;
    this.yPrev = this.yNow;
    this.yNow = this.yNew;
    this.yNew = swap;
    swap = this.fPrev;
    this.fPrev = this.fNow;
    this.fNow = this.fNew;
    this.fNew = swap;
    this.tPrev = this.tNow;
    this.tNow = tNew;
    this.hLast = h;
    this.denseReady = 0;
    this.denseValid = true;
  }

  /** Readies the interpolant for components [0, count): the head alone when they lie within it. */
  private prepareDenseFor(count: number): void {
    const n = this.dimension;
    const tail = this.tail;
    if (tail === null) {
      this.prepareDense(0, n, this.fullStage);
      this.counts.evaluations += 3;
      return;
    }
    if (this.denseReady === 0) {
      this.prepareDense(0, tail.offset, this.headStage);
      this.counts.evaluations += 3;
    }
    if (count > tail.offset) this.prepareDense(tail.offset, n, this.tailStage);
  }

  /** The three extra stages and the interpolant coefficients of the last accepted step for components
   * [lo, hi), each stage finished by `call`. */
  private prepareDense(lo: number, hi: number, call: StageCall): void {
    const n = this.dimension;
    const h = this.hLast;
    const t = this.tPrev;
    const y0 = this.yPrev;
    const y1 = this.yNow;
    const k1 = this.fPrev;
    const f1 = this.fNow;
    const [, , , , , , k6, k7, k8, k9, k10, k11, k12, , k14, k15, k16] = this.k;
    const yt = this.yTmp;
    for (let i = lo; i < hi; i++) {
      yt[i] = y0[i] + h * (K.a141 * k1[i] + K.a147 * k7[i] + K.a148 * k8[i] + K.a149 * k9[i] + K.a1410 * k10[i]
        + K.a1411 * k11[i] + K.a1412 * k12[i] + K.a1413 * f1[i]);
    }
    call(14, t + K.c14 * h, yt, k14);
    for (let i = lo; i < hi; i++) {
      yt[i] = y0[i] + h * (K.a151 * k1[i] + K.a156 * k6[i] + K.a157 * k7[i] + K.a158 * k8[i] + K.a1511 * k11[i]
        + K.a1512 * k12[i] + K.a1513 * f1[i] + K.a1514 * k14[i]);
    }
    call(15, t + K.c15 * h, yt, k15);
    for (let i = lo; i < hi; i++) {
      yt[i] = y0[i] + h * (K.a161 * k1[i] + K.a166 * k6[i] + K.a167 * k7[i] + K.a168 * k8[i] + K.a169 * k9[i]
        + K.a1613 * f1[i] + K.a1614 * k14[i] + K.a1615 * k15[i]);
    }
    call(16, t + K.c16 * h, yt, k16);
    const c = this.cont;
    for (let i = lo; i < hi; i++) {
      const dy = y1[i] - y0[i];
      const bspl = h * k1[i] - dy;
      c[i] = y0[i];
      c[n + i] = dy;
      c[2 * n + i] = bspl;
      c[3 * n + i] = dy - h * f1[i] - bspl;
      c[4 * n + i] = h * (K.d41 * k1[i] + K.d46 * k6[i] + K.d47 * k7[i] + K.d48 * k8[i] + K.d49 * k9[i]
        + K.d410 * k10[i] + K.d411 * k11[i] + K.d412 * k12[i] + K.d413 * f1[i] + K.d414 * k14[i]
        + K.d415 * k15[i] + K.d416 * k16[i]);
      c[5 * n + i] = h * (K.d51 * k1[i] + K.d56 * k6[i] + K.d57 * k7[i] + K.d58 * k8[i] + K.d59 * k9[i]
        + K.d510 * k10[i] + K.d511 * k11[i] + K.d512 * k12[i] + K.d513 * f1[i] + K.d514 * k14[i]
        + K.d515 * k15[i] + K.d516 * k16[i]);
      c[6 * n + i] = h * (K.d61 * k1[i] + K.d66 * k6[i] + K.d67 * k7[i] + K.d68 * k8[i] + K.d69 * k9[i]
        + K.d610 * k10[i] + K.d611 * k11[i] + K.d612 * k12[i] + K.d613 * f1[i] + K.d614 * k14[i]
        + K.d615 * k15[i] + K.d616 * k16[i]);
      c[7 * n + i] = h * (K.d71 * k1[i] + K.d76 * k6[i] + K.d77 * k7[i] + K.d78 * k8[i] + K.d79 * k9[i]
        + K.d710 * k10[i] + K.d711 * k11[i] + K.d712 * k12[i] + K.d713 * f1[i] + K.d714 * k14[i]
        + K.d715 * k15[i] + K.d716 * k16[i]);
    }
    this.denseReady = hi;
  }

  /** Hairer's starting-step estimate (HINIT in DOP853), order 8. */
  private initialStep(spanLimit: number): number {
    const limit = Math.min(this.maxStep, spanLimit);
    if (!(limit > 0)) return this.direction * 1e-6;
    const n = this.dimension;
    const m = this.errorComponents;
    const y = this.yNow;
    const f = this.fNow;
    let dnf = 0;
    let dny = 0;
    for (let i = 0; i < m; i++) {
      const sk = this.atol + this.rtol * Math.abs(y[i]);
      dnf += (f[i] / sk) ** 2;
      dny += (y[i] / sk) ** 2;
    }
    // Hairer's 1e-6 fallback is below the round-off of t far from J2000; keep it above 100 ulp of t.
    const smallest = Math.max(1e-6, 100 * UNIT_ROUNDOFF * Math.abs(this.tNow));
    let h = dnf <= 1e-10 || dny <= 1e-10 ? smallest : Math.sqrt(dny / dnf) * 0.01;
    h = Math.min(h, limit);
    const yt = this.yTmp;
    const f1 = this.k[2];
    for (let i = 0; i < n; i++) yt[i] = y[i] + this.direction * h * f[i];
    this.rhs(this.tNow + this.direction * h, yt, f1);
    this.counts.evaluations += 1;
    let der2 = 0;
    for (let i = 0; i < m; i++) {
      const sk = this.atol + this.rtol * Math.abs(y[i]);
      der2 += ((f1[i] - f[i]) / sk) ** 2;
    }
    der2 = Math.sqrt(der2) / h;
    const der12 = Math.max(Math.abs(der2), Math.sqrt(dnf));
    const h1 = der12 <= 1e-15 ? Math.max(smallest, h * 1e-3) : (0.01 / der12) ** (1 / 8);
    return this.direction * Math.min(100 * h, h1, limit);
  }
}
