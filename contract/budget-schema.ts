/**
 * The Δv budget request: a retargeting problem (the one problem schema) whose burns are a sequence of
 * correction burns, plus what the budget adds — the navigation knowledge covariance at each burn, the
 * sample count and seed, and which paths to run. The initial-state covariance (the true state's spread) is
 * the problem's `initialState.covarianceKmKmS`; the execution errors are its Gates `executionErrors`.
 * Shape checks only; parseBudgetRequest (planner/budget/budget-checks.ts) relates fields to each other.
 */
import * as z from 'zod';
import { problemSchema } from './problem-schema.ts';

const covariance6Schema = z.array(z.array(z.number()).length(6)).length(6);

/** Navigation knowledge at one burn epoch. */
const knowledgeSchema = z.object({
  /** 6x6 covariance of the navigation estimate's error in [r, v] at the burn epoch, in the axes of
   * `problem.initialState.frame`: km², km²/s, km²/s² (same units as the initial covariance). */
  covarianceKmKmS: covariance6Schema,
}).strict();

/** Frozen defaults of a budget request (the schema's defaults point here). */
export const BUDGET_DEFAULTS = Object.freeze({
  linearSamples: 10_000,
  nonlinearSamples: 200,
  seed: 1,
  replanToleranceFraction: 0.01,
});

export const budgetRequestSchema = z.object({
  /** The retargeting problem: burns (the correction sequence; impulsive only — parseBudgetRequest refuses a
   * finite burn, naming problem.burns[i].model), targets, initial covariance,
   * execution errors, limits. Burn epochs are taken from its nominal plan (epoch windows are not re-solved
   * per sample). */
  problem: problemSchema,
  /** One entry per burn, in burn order. */
  knowledge: z.array(knowledgeSchema).min(1).max(6),
  /** Samples of the linear path (STM gains; fast). 0 skips it. */
  linearSamples: z.number().int().min(0).max(1_000_000).default(BUDGET_DEFAULTS.linearSamples),
  /** Samples of the non-linear path (every re-plan a corrector run). 0 skips it. */
  nonlinearSamples: z.number().int().min(0).max(100_000).default(BUDGET_DEFAULTS.nonlinearSamples),
  /** Sample i of either path depends on (seed, i) only; both paths draw the same errors for the same i. */
  seed: z.number().int().min(0).max(2 ** 32 - 1).default(BUDGET_DEFAULTS.seed),
  /** Re-plans are solved to this fraction of each target's tolerance, so the re-planned Δv is not
   * quantised by the tolerance (a re-plan stopping anywhere inside it). */
  replanToleranceFraction: z.number().positive().max(1).default(BUDGET_DEFAULTS.replanToleranceFraction),
  /** Significance of the per-burn linear/non-linear check (the plan's linear/Monte Carlo check: a burn fails
   * when a p-value is below it). Absent: that check's own default (planner LINEARITY_CHECK_DEFAULTS, 1e-3). */
  agreementSignificance: z.number().gt(0).lt(1).optional(),
}).strict();

/** A validated budget request (defaults filled in). */
export type BudgetRequest = z.infer<typeof budgetRequestSchema>;
/** A budget request as written by a user (defaults optional). */
export type BudgetRequestInput = z.input<typeof budgetRequestSchema>;
