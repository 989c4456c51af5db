/** Validation of token requests (name, roles), shared by the CLI, the API route and the stores. */
import * as z from 'zod';
import { InvalidInputError } from '../../contract/errors.ts';
import { roleSchema, tokenNameSchema, type Role } from '../../contract/roles.ts';

export const newTokenSchema = z.object({
  name: tokenNameSchema,
  roles: z.array(roleSchema).min(1, { error: 'at least one role' }),
}).strict();

/** Parses {name, roles}; throws InvalidInputError naming the first bad field. Roles are de-duplicated. */
export function parseNewToken(input: unknown): { name: string; roles: Role[] } {
  const result = newTokenSchema.safeParse(input);
  if (!result.success) {
    const issue = result.error.issues[0];
    throw new InvalidInputError(issue.path.join('.') || '(root)', issue.message);
  }
  return { name: result.data.name, roles: [...new Set(result.data.roles)] };
}
