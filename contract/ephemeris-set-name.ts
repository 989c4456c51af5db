/** The name of a service ephemeris set (its own file so the problem schema needs nothing else of the sets). */
import * as z from 'zod';

/** A set's name: its sub-folder's name, 1–64 of letters, digits, `.`, `_`, `-` (not starting with `.`). */
export const ephemerisSetNameSchema = z.string().regex(/^[A-Za-z0-9_-][A-Za-z0-9._-]{0,63}$/, {
  error: 'must be 1–64 of letters, digits, . _ - (not starting with .)',
});
