/**
 * planBodyPositions: the one way callers get several bodies' positions per epoch from any Ephemeris. It
 * uses the source's own planPositions when it has one (the Chebyshev cache shares work between bodies)
 * and otherwise falls back to one positionInto per body, so every source works unchanged.
 */
import type { BodyName } from '../types.ts';
import type { BodyPositionsPlan, Ephemeris } from './ephemeris.ts';
import { assertBody } from './ephemeris-checks.ts';

/** Fallback plan: one positionInto call per target (the source checks span and bodies itself). */
class PerBodyPositionsPlan implements BodyPositionsPlan {
  readonly targets: readonly BodyName[];
  readonly centre: BodyName;
  private readonly source: Ephemeris;

  constructor(source: Ephemeris, targets: readonly BodyName[], centre: BodyName) {
    this.source = source;
    this.targets = targets;
    this.centre = centre;
  }

  positionsInto(epochTdbS: number, out: Float64Array, offset = 0): void {
    const targets = this.targets;
    for (let i = 0; i < targets.length; i++) this.source.positionInto(targets[i], this.centre, epochTdbS, out, offset + 3 * i);
  }
}

/**
 * A plan giving the positions (km, J2000 equatorial) of `targets` relative to `centre` at TDB epochs (s
 * from J2000) within `source.span`, written side by side (3 per target). Throws InvalidInputError now for
 * a body the source lacks; OutOfSpanError later for an epoch outside the span.
 */
export function planBodyPositions(source: Ephemeris, targets: readonly BodyName[], centre: BodyName): BodyPositionsPlan {
  assertBody(source.name, source.bodies, centre, 'centre');
  targets.forEach((t, i) => assertBody(source.name, source.bodies, t, `targets[${i}]`));
  const frozen = Object.freeze([...targets]);
  return source.planPositions ? source.planPositions(frozen, centre) : new PerBodyPositionsPlan(source, frozen, centre);
}
