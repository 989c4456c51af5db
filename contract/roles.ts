/** Roles and the identity a bearer token stands for. */
import * as z from 'zod';

/**
 * - submitter: submits retargeting jobs, reads their status and plans;
 * - reviewer: approves or rejects proposed plans (never their own jobs' plans);
 * - auditor: reads history, exports bundles, verifies the archive;
 * - admin: manages tokens.
 * A role grants only what routes list it for; admin does not imply the others.
 */
export const ROLES = ['submitter', 'reviewer', 'auditor', 'admin'] as const;
export type Role = (typeof ROLES)[number];
export const roleSchema = z.enum(ROLES);

/** Who is calling: the token's name (a person or a service) and its roles. */
export interface Identity {
  name: string;
  roles: Role[];
  /** Id of the token used (never the token itself). */
  tokenId: string;
}

/**
 * Token names: 1–64 characters of letters, digits, `.`, `_`, `-`, `@`, stored in lowercase so `Ann` and `ann`
 * are one person to the two-person rule.
 */
export const tokenNameSchema = z.string().regex(/^[A-Za-z0-9._@-]{1,64}$/, {
  error: 'must be 1–64 characters of letters, digits, . _ - @',
}).toLowerCase();

/** Whether two identity names are the same person (names are ASCII; compared case-insensitively). */
export function sameIdentityName(a: string, b: string): boolean {
  return a.toLowerCase() === b.toLowerCase();
}
