/**
 * Layering: a tabulated trajectory of one body stands in for that body in a fuller source.
 *
 * Any state involving the override's target is chained through the override's centre:
 * target/X = (target/overrideCentre from the override) + (overrideCentre/X from the fallback).
 * Everything else comes from the fallback. The span is the intersection of both spans, applied to every
 * request so one object has one span.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { ComponentEphemeris } from './component-ephemeris.ts';
import type { TabulatedEphemeris } from './tabulated-ephemeris.ts';

class LayeredEphemeris extends ComponentEphemeris {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  private readonly work = new Float64Array(6);
  private readonly override: TabulatedEphemeris;
  private readonly fallback: Ephemeris;

  constructor(override: TabulatedEphemeris, fallback: Ephemeris) {
    super();
    this.override = override;
    this.fallback = fallback;
    this.name = `${override.name} over ${fallback.name}`;
    const start = Math.max(override.span.startTdbS, fallback.span.startTdbS);
    const end = Math.min(override.span.endTdbS, fallback.span.endTdbS);
    if (!(end > start)) {
      throw new InvalidInputError('override', `spans of ${override.name} and ${fallback.name} do not overlap`);
    }
    if (!fallback.bodies.includes(override.centre)) {
      throw new InvalidInputError('override.centre', `${fallback.name} does not give '${override.centre}', `
        + `the centre ${override.name} is relative to`);
    }
    this.span = Object.freeze({ startTdbS: start, endTdbS: end });
    this.bodies = Object.freeze([...new Set<BodyName>([...fallback.bodies, override.target])]);
  }

  protected fillRelative(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset: number,
    components: 3 | 6): void {
    const t = this.override.target;
    if (target !== t && centre !== t) {
      this.get(this.fallback, target, centre, epochTdbS, out, offset, components);
    } else {
      // One side is the tabulated body: chain through the override's centre.
      const other = target === t ? centre : target;
      const sign = target === t ? 1 : -1;
      const w = this.work;
      this.get(this.override, t, this.override.centre, epochTdbS, w, 0, components);
      for (let c = 0; c < components; c++) out[offset + c] = sign * w[c];
      if (other !== this.override.centre) {
        this.get(this.fallback, this.override.centre, other, epochTdbS, w, 0, components);
        for (let c = 0; c < components; c++) out[offset + c] += sign * w[c];
      }
    }
  }

  private get(source: Ephemeris, target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array,
    offset: number, components: number): void {
    if (components === 6) source.stateInto(target, centre, epochTdbS, out, offset);
    else source.positionInto(target, centre, epochTdbS, out, offset);
  }
}

/**
 * An Ephemeris where `override` (a tabulated trajectory of one body) replaces that body in `fallback`.
 * Frame J2000 equatorial, km, km/s, TDB s from J2000; span = intersection of the two spans.
 */
export function layerEphemerides(override: TabulatedEphemeris, fallback: Ephemeris): Ephemeris {
  return new LayeredEphemeris(override, fallback);
}
