/**
 * Canonical JSON and the SHA-256 problem hash: keys sorted at every level, no whitespace, numbers as
 * JavaScript writes them (shortest round-trip form). Hashing the validated problem (defaults filled in)
 * makes a problem written with and without its defaults hash alike.
 */
import { createHash } from 'node:crypto';
import { InvalidInputError } from '../propagator/index.ts';
import { leapSecondsIdentity } from './leap-seconds.ts';
import type { PlanLeapSeconds } from '../contract/plan-types.ts';
import type { PlanningProblem } from '../contract/problem-schema.ts';

/** Canonical JSON text of plain data (objects, arrays, strings, finite numbers, booleans, null).
 * Undefined object members are dropped, as JSON.stringify does. `path` names the value in errors. */
export function canonicalJson(value: unknown, path = '(value)'): string {
  const parts: (string | number)[] = [];
  const out: string[] = [];
  write(value, parts, out, path);
  return out.join('');
}

/** Field path of the value at `parts` below `root`, built only for an error message. */
function pathOf(root: string, parts: readonly (string | number)[]): string {
  return parts.reduce<string>((p, k) => (typeof k === 'number' ? `${p}[${k}]` : `${p}.${k}`), root);
}

/** Appends the canonical JSON of `value` to `out`; `parts` is the path from the root (pushed and popped, so
 * no path text is made unless an error needs it — hashing sits on the submission path). */
function write(value: unknown, parts: (string | number)[], out: string[], root: string): void {
  if (value === null) {
    out.push('null');
  } else if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InvalidInputError(pathOf(root, parts), `non-finite number ${value} has no JSON form`);
    out.push(JSON.stringify(value));
  } else if (typeof value === 'string' || typeof value === 'boolean') {
    out.push(JSON.stringify(value));
  } else if (Array.isArray(value)) {
    out.push('[');
    for (let i = 0; i < value.length; i++) {
      if (i > 0) out.push(',');
      parts.push(i);
      write(value[i] ?? null, parts, out, root);
      parts.pop();
    }
    out.push(']');
  } else if (typeof value === 'object') {
    const record = value as Record<string, unknown>;
    const keys = Object.keys(record).filter((k) => record[k] !== undefined).sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    out.push('{');
    keys.forEach((k, i) => {
      out.push(i > 0 ? ',' : '', JSON.stringify(k), ':');
      parts.push(k);
      write(record[k], parts, out, root);
      parts.pop();
    });
    out.push('}');
  } else {
    throw new InvalidInputError(pathOf(root, parts), `value of type ${typeof value} has no JSON form`);
  }
}

/**
 * SHA-256 (hex, 64 characters) of the canonical JSON of a validated problem together with the identity of
 * the leap-second table its UTC epochs are read with (source, file SHA-256, expiry — not the path): the
 * same problem re-planned with a newer table hashes differently, because its UTC epochs may mean other
 * instants. `leapSeconds` is a plan's record (planLeapSeconds of the table the door loaded).
 */
export function problemHash(problem: PlanningProblem, leapSeconds: Pick<PlanLeapSeconds, 'source' | 'sha256' | 'expiresUtc'>): string {
  const hashed = { leapSeconds: leapSecondsIdentity(leapSeconds), problem };
  return createHash('sha256').update(canonicalJson(hashed), 'utf8').digest('hex');
}

/** Stable key naming the spacecraft and its target set (not the burns or the state): a newer plan with the
 * same key supersedes an older proposed one. */
export function targetSetKey(problem: PlanningProblem): string {
  const digest = createHash('sha256').update(canonicalJson(problem.targets), 'utf8').digest('hex').slice(0, 16);
  return `${problem.spacecraft.name}/${digest}`;
}
