/**
 * Locates events on each accepted step of a run: evaluates every event function at the step's end,
 * and where one changed sign in its direction finds the epoch with Brent's method on the dense output
 * (EVENT_TIME_TOLERANCE_S). Records non-terminal events in time order; returns the earliest terminal
 * event (user stop, sphere-of-influence crossing) so the run can end or switch there.
 */
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import type { EventRecord, PropagationOutcome } from '../run/propagation-types.ts';
import { CARTESIAN_LENGTH } from '../run/propagation-dynamics.ts';
import type { BodyName, StateVector } from '../types.ts';
import { brentRoot } from './brent-root.ts';
import { type ActiveEvent, crossed } from './event-functions.ts';

/** Absolute tolerance on event epochs, s. Brent adds 2ε|t| for the float64 resolution of the epoch, so the
 * located epoch is within ~5e-7 s near t = 1e9 s (the requirement is 1e-6 s or better). */
export const EVENT_TIME_TOLERANCE_S = 1e-7;

/** What the watcher needs of a stepper (structurally the DOP853 stepper). */
export interface DenseStepper {
  readonly t: number;
  readonly tPrevious: number;
  readonly y: Float64Array;
  /** The interpolant's leading `count` components at t into out. */
  denseOutput(t: number, out: Float64Array, count?: number): void;
}
/** What it needs of the dynamics (structurally PropagationDynamics). */
export interface CartesianSource {
  readonly initialY: Float64Array;
  readonly forces: { readonly centralBody: BodyName };
  cartesianInto(epochTdbS: number, y: Float64Array, out: Float64Array): void;
}

export interface EventStop {
  epochTdbS: number;
  outcome: PropagationOutcome;
  message: string;
  event?: EventRecord;
}

/** Output samples on a grid that outlives the segment: origin + direction·k·stepS, before endTdbS. */
export interface SampleGrid {
  originTdbS: number;
  endTdbS: number;
  stepS: number;
}

/** Watches the accepted steps of one segment: brackets sign changes of the event functions between
 * steps and locates each root on the dense output (Brent, time tolerance EVENT_TIME_TOLERANCE_S, TDB s),
 * records EventRecords (states relative to the event's body) and the output samples on the grid. */
export class EventWatcher {
  /** Set when the run stopped for a sphere-of-influence crossing: the centre to switch to. */
  switchTo: { body: BodyName; epochTdbS: number } | null = null;
  /** States on the sample grid inside this segment (relative to the segment's centre). */
  readonly samples: StateVector[] = [];
  private nextSample = -1;
  private readonly previous: number[] = [];
  private started = false;
  private readonly buf: Float64Array;
  private readonly cart = new Float64Array(6);
  private readonly bodyBuf = new Float64Array(6);

  constructor(private readonly events: ActiveEvent[], private readonly dynamics: CartesianSource,
    private readonly ephemeris: Ephemeris, private readonly direction: 1 | -1,
    private readonly grid?: SampleGrid) {
    this.buf = new Float64Array(dynamics.initialY.length);
  }

  private stateAt(stepper: DenseStepper, t: number): Float64Array {
    if (t === stepper.t) this.buf.set(stepper.y);
    else stepper.denseOutput(t, this.buf, CARTESIAN_LENGTH);
    this.dynamics.cartesianInto(t, this.buf, this.cart);
    return this.cart;
  }

  /** Inspects the step just accepted; pushes located events into `out`. */
  afterStep(stepper: DenseStepper, out: EventRecord[]): EventStop | null {
    const t0 = stepper.tPrevious;
    const t1 = stepper.t;
    if (!this.started) {
      const x0 = this.stateAt(stepper, t0);
      this.events.forEach((e, i) => { this.previous[i] = e.g(t0, x0); });
      this.started = true;
    }
    const x1 = this.stateAt(stepper, t1);
    const after = this.events.map((e) => e.g(t1, x1));
    const hits: { epoch: number; index: number }[] = [];
    this.events.forEach((e, i) => {
      if (!crossed(e, this.previous[i], after[i])) return;
      const g = (t: number) => e.g(t, this.stateAt(stepper, t));
      const root = brentRoot(g, t0, t1, this.previous[i], after[i], EVENT_TIME_TOLERANCE_S);
      hits.push({ epoch: root.x, index: i });
    });
    hits.sort((a, b) => (a.epoch - b.epoch) * this.direction);
    const stop = this.firstStop(stepper, hits, out);
    this.sample(stepper, t0, stop?.epochTdbS ?? t1);
    if (stop === null) after.forEach((v, i) => { this.previous[i] = v; });
    return stop;
  }

  /** Records the located events in order up to the first that ends the segment, and returns that one. */
  private firstStop(stepper: DenseStepper, hits: { epoch: number; index: number }[], out: EventRecord[]): EventStop | null {
    for (const hit of hits) {
      const e = this.events[hit.index];
      const record = this.record(stepper, e, hit.epoch);
      if (e.kind === 'impact' && !e.terminal) continue;
      out.push(record);
      if (e.switchTo !== undefined) {
        this.switchTo = { body: e.switchTo, epochTdbS: hit.epoch };
        return { epochTdbS: hit.epoch, outcome: 'stopped-by-event', event: record,
          message: `${e.kind} ${e.body} at ${hit.epoch} TDB s: switching centre to ${e.switchTo}` };
      }
      if (e.terminal) {
        return { epochTdbS: hit.epoch, outcome: 'stopped-by-event', event: record,
          message: `stopped by ${e.kind}${e.body ? ` (${e.body})` : ''} at ${hit.epoch} TDB s` };
      }
    }
    return null;
  }

  /** Emits grid samples in (t0, limit] of this step. */
  private sample(stepper: DenseStepper, t0: number, limit: number): void {
    const g = this.grid;
    if (g === undefined) return;
    const dir = this.direction;
    if (this.nextSample < 0) this.nextSample = Math.floor(((t0 - g.originTdbS) * dir) / g.stepS) + 1;
    for (;;) {
      const epoch = g.originTdbS + dir * this.nextSample * g.stepS;
      if ((epoch - limit) * dir > 0 || (g.endTdbS - epoch) * dir <= 1e-6) return;
      // The state vector copies the buffer's numbers (Array.from on a typed array costs ~1 µs a sample).
      if ((epoch - t0) * dir > 0) this.samples.push(this.vector(epoch, this.dynamics.forces.centralBody, this.stateAt(stepper, epoch)));
      this.nextSample += 1;
    }
  }

  private record(stepper: DenseStepper, e: ActiveEvent, epoch: number): EventRecord {
    const centre = this.dynamics.forces.centralBody;
    const x = Array.from(this.stateAt(stepper, epoch));
    const body = e.body;
    if (body === undefined) {
      return { kind: e.kind, epochTdbS: epoch, state: this.vector(epoch, centre, x) };
    }
    if (body !== centre) {
      this.ephemeris.stateInto(body, centre, epoch, this.bodyBuf, 0);
      for (let i = 0; i < 6; i++) x[i] -= this.bodyBuf[i];
    }
    return { kind: e.kind, body, epochTdbS: epoch, state: this.vector(epoch, body, x),
      distanceKm: Math.hypot(x[0], x[1], x[2]) };
  }

  private vector(epoch: number, centre: BodyName, x: ArrayLike<number>) {
    return { epochTdbS: epoch, centre, frame: 'J2000_EQUATORIAL' as const,
      positionKm: [x[0], x[1], x[2]] as [number, number, number], velocityKmS: [x[3], x[4], x[5]] as [number, number, number] };
  }
}
