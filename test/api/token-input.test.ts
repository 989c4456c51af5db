/**
 * Bad token requests fail as the project's one field error (contract InvalidInputError: name, code, field), so
 * every door classifies them alike (the project's rule: bad input gets a clear error naming the field).
 */
import { describe, expect, it } from 'vitest';
import { parseNewToken } from '../../api/auth/token-input.ts';
import { InvalidInputError } from '../../contract/errors.ts';

describe('parseNewToken', () => {
  it('should refuse a token with no role, naming the field roles', () => {
    let caught: unknown;
    try { parseNewToken({ name: 'dee', roles: [] }); } catch (error) { caught = error; }
    expect(caught).toBeInstanceOf(InvalidInputError);
    expect(caught).toMatchObject({ name: 'InvalidInputError', code: 'INVALID_INPUT', field: 'roles' });
  });

  it('should de-duplicate roles of a valid request', () => {
    expect(parseNewToken({ name: 'dee', roles: ['reviewer', 'reviewer'] })).toEqual({ name: 'dee', roles: ['reviewer'] });
  });
});
