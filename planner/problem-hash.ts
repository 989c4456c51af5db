/**
 * Canonical JSON and the SHA-256 problem hash: keys sorted at every level, no whitespace, numbers as
 * JavaScript writes them (shortest round-trip form). Hashing the validated problem (defaults filled in)
 * makes a problem written with and without its defaults hash alike.
 */
import { createHash } from 'node:crypto';
import { InvalidInputError } from '../propagator/index.ts';
import type { PlanningProblem } from '../contract/problem-schema.ts';

/** Canonical JSON text of plain data (objects, arrays, strings, finite numbers, booleans, null).
 * Undefined object members are dropped, as JSON.stringify does. */
export function canonicalJson(value: unknown, path = '(value)'): string {
  if (value === null) return 'null';
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InvalidInputError(path, `non-finite number ${value} has no JSON form`);
    return JSON.stringify(value);
  }
  if (typeof value === 'string' || typeof value === 'boolean') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map((v, i) => canonicalJson(v ?? null, `${path}[${i}]`)).join(',')}]`;
  if (typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v, `${path}.${k}`)}`).join(',')}}`;
  }
  throw new InvalidInputError(path, `value of type ${typeof value} has no JSON form`);
}

/** SHA-256 (hex, 64 characters) of the canonical JSON of a validated problem. */
export function problemHash(problem: PlanningProblem): string {
  return createHash('sha256').update(canonicalJson(problem), 'utf8').digest('hex');
}

/** Stable key naming the spacecraft and its target set (not the burns or the state): a newer plan with the
 * same key supersedes an older proposed one. */
export function targetSetKey(problem: PlanningProblem): string {
  const digest = createHash('sha256').update(canonicalJson(problem.targets), 'utf8').digest('hex').slice(0, 16);
  return `${problem.spacecraft.name}/${digest}`;
}
