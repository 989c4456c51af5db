/**
 * Base for ephemeris sources that answer positions and states with one routine: the request checks (bodies,
 * span) and the same-body case live here; a subclass writes only target relative to centre.
 */
import type { BodyName } from '../types.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertRequest } from './ephemeris-checks.ts';

export abstract class ComponentEphemeris implements Ephemeris {
  abstract readonly name: string;
  abstract readonly span: TdbSpan;
  abstract readonly bodies: readonly BodyName[];

  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.fill(target, centre, epochTdbS, out, offset, 6);
  }

  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.fill(target, centre, epochTdbS, out, offset, 3);
  }

  private fill(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset: number,
    components: 3 | 6): void {
    assertRequest(this, target, centre, epochTdbS);
    if (target === centre) {
      out.fill(0, offset, offset + components);
      return;
    }
    this.fillRelative(target, centre, epochTdbS, out, offset, components);
  }

  /**
   * Writes target relative to centre at `epochTdbS` (TDB s from J2000), J2000 equatorial, into
   * out[offset .. offset + components): 3 = position km, 6 = position km then velocity km/s.
   * Called only for a checked request (both bodies given, epoch in span) with target ≠ centre.
   */
  protected abstract fillRelative(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset: number,
    components: 3 | 6): void;
}
