/** Validation of token requests (name, roles), shared by the CLI, the API route and the stores. */
import { z } from 'zod';
import { roleSchema, tokenNameSchema, type Role } from '../../contract/roles.ts';

/** Bad token input; `name` matches the project's InvalidInputError so callers classify it the same way. */
export class TokenInputError extends Error {
  override readonly name = 'InvalidInputError';
  readonly code = 'INVALID_INPUT';
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.field = field;
  }
}

export const newTokenSchema = z.object({
  name: tokenNameSchema,
  roles: z.array(roleSchema).min(1, { error: 'at least one role' }),
}).strict();

/** Parses {name, roles}; throws TokenInputError naming the first bad field. Roles are de-duplicated. */
export function parseNewToken(input: unknown): { name: string; roles: Role[] } {
  const result = newTokenSchema.safeParse(input);
  if (!result.success) {
    const issue = result.error.issues[0];
    throw new TokenInputError(issue.path.join('.') || '(root)', issue.message);
  }
  return { name: result.data.name, roles: [...new Set(result.data.roles)] };
}
