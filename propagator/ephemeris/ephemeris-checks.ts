/**
 * Argument checks shared by every ephemeris source: known body, finite epoch inside the span.
 * Kept free of allocation on the success path so hot look-ups can call them.
 */
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';
import type { TdbSpan } from './ephemeris.ts';

/** Throws OutOfSpanError unless `epochTdbS` is finite and inside the closed span (TDB s from J2000). */
export function assertInSpan(sourceName: string, span: TdbSpan, epochTdbS: number, field = 'epochTdbS'): void {
  if (epochTdbS >= span.startTdbS && epochTdbS <= span.endTdbS) return;
  if (!Number.isFinite(epochTdbS)) throw new InvalidInputError(field, `epoch ${epochTdbS} is not a finite number`);
  throw new OutOfSpanError(field, `epoch ${epochTdbS} TDB s from J2000 is outside the span of ${sourceName} `
    + `[${span.startTdbS}, ${span.endTdbS}] (no extrapolation)`);
}

/** Throws InvalidInputError unless `body` is one this source provides. */
export function assertBody(sourceName: string, bodies: readonly BodyName[], body: BodyName, field: string): void {
  if (bodies.includes(body)) return;
  throw new InvalidInputError(field, `body '${String(body)}' is not provided by ${sourceName} `
    + `(it gives: ${bodies.join(', ')})`);
}

/** Throws InvalidInputError unless a span is finite and ordered. */
export function assertValidSpan(span: TdbSpan, field = 'span'): void {
  if (!Number.isFinite(span.startTdbS) || !Number.isFinite(span.endTdbS) || !(span.endTdbS > span.startTdbS)) {
    throw new InvalidInputError(field, `span [${span.startTdbS}, ${span.endTdbS}] TDB s must be finite with end > start`);
  }
}

/**
 * Throws unless a source gives both bodies and the epoch (TDB s from J2000) lies in its span:
 * the checks every look-up makes before it reads anything.
 */
export function assertRequest(
  source: { readonly name: string; readonly bodies: readonly BodyName[]; readonly span: TdbSpan },
  target: BodyName, centre: BodyName, epochTdbS: number,
): void {
  assertBody(source.name, source.bodies, target, 'target');
  assertBody(source.name, source.bodies, centre, 'centre');
  assertInSpan(source.name, source.span, epochTdbS);
}
