/**
 * Problem validation in the browser with the planner's own definitions: the zod problemSchema (shape) and
 * checkProblem (relations between fields). Imported from their module files, not planner/index.ts, so the
 * bundle holds the schema and the epoch arithmetic only (no propagator numerics, no Node modules).
 */
import { problemSchema, type PlanningProblem } from '../../contract/problem-schema.ts';
import { checkProblem, issuePath } from '../../planner/problem-checks.ts';
import type { FieldIssue } from './api-client.ts';

export interface ValidationResult {
  problem: PlanningProblem | null;
  /** Every shape issue, or the first semantic issue; paths like `burns[0].epoch`. */
  issues: FieldIssue[];
}

export function validateProblem(input: unknown): ValidationResult {
  const parsed = problemSchema.safeParse(input);
  if (!parsed.success) {
    return { problem: null, issues: parsed.error.issues.map((i) => ({ path: issuePath(i.path), message: i.message })) };
  }
  try {
    checkProblem(parsed.data);
    return { problem: parsed.data, issues: [] };
  } catch (error) {
    const e = error as Error & { field?: string };
    const field = e.field ?? '(problem)';
    const message = e.message.startsWith(`${field}: `) ? e.message.slice(field.length + 2) : e.message;
    return { problem: null, issues: [{ path: field, message }] };
  }
}

/** Turns a server issue path (`body.problem.burns[0].epoch`) into a problem path (`burns[0].epoch`). */
export function problemPathOf(serverPath: string): string {
  return serverPath.replace(/^body\.problem\.?/, '') || '(problem)';
}
