/**
 * Problem validation in the browser with the contract's own zod problemSchema: every shape issue is listed
 * by field before anything is sent. The checks that relate fields to each other (epochs in the span and in
 * order, bodies modelled, periapsis above the surface) need the epoch arithmetic and body constants of the
 * numerics, which the console does not bundle: the service runs them at submission and answers 400 with the
 * field, and the submit screen lists those issues beside the same fields.
 */
import { issuePath, problemSchema, type PlanningProblem } from '../../contract/index.ts';
import type { FieldIssue } from './api-client.ts';

export interface ValidationResult {
  problem: PlanningProblem | null;
  /** Every shape issue; paths like `burns[0].epoch`. */
  issues: FieldIssue[];
}

export function validateProblem(input: unknown): ValidationResult {
  const parsed = problemSchema.safeParse(input);
  if (!parsed.success) {
    return { problem: null, issues: parsed.error.issues.map((i) => ({ path: issuePath(i.path), message: i.message })) };
  }
  return { problem: parsed.data, issues: [] };
}

/** Turns a server issue path (`body.problem.burns[0].epoch`) into a problem path (`burns[0].epoch`). */
export function problemPathOf(serverPath: string): string {
  return serverPath.replace(/^body\.problem\.?/, '') || '(problem)';
}
