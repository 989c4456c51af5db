/**
 * zod validation of params, query and body. Failures answer 400 with every failing field's path
 * (`body.problem.burns[0].epoch`). Parsed values are put on `res.locals.valid`.
 */
import type { RequestHandler, Response } from 'express';
import type * as z from 'zod';
import { issuePath } from '../contract/errors.ts';
import { sendError, type FieldIssue } from './errors.ts';

export interface RequestSchemas {
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
}

export interface Valid<P = unknown, Q = unknown, B = unknown> { params: P; query: Q; body: B }

/** Every issue of a zod error, flattened (unions report their branches' issues). */
export function zodIssues(root: string, error: z.ZodError): FieldIssue[] {
  return error.issues.map((i) => ({ path: issuePath(i.path, root), message: i.message, code: i.code }));
}

export function validate(schemas: RequestSchemas): RequestHandler {
  return (req, res, next) => {
    const issues: FieldIssue[] = [];
    const valid: Valid = { params: req.params, query: req.query, body: req.body };
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const input = part === 'body' ? (req.body ?? {}) : (part === 'query' ? req.query : req.params);
      const result = schema.safeParse(input);
      if (result.success) valid[part] = result.data;
      else issues.push(...zodIssues(part, result.error));
    }
    if (issues.length > 0) {
      sendError(res, 400, 'INVALID_REQUEST', `${issues.length} invalid field(s): ${issues.slice(0, 5).map((i) => i.path).join(', ')}`, issues);
      return;
    }
    res.locals.valid = valid;
    next();
  };
}

/** The validated request parts set by `validate`. */
export function validOf<P, Q, B>(res: Response): Valid<P, Q, B> {
  return res.locals.valid as Valid<P, Q, B>;
}
