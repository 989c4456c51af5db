/** One call for the CLI and the API: a plan (with its problem) as OPM or OEM text. */
import type { ManeuverPlan } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { InvalidInputError } from '../../propagator/index.ts';
import { writeOem } from '../messages/oem-writer.ts';
import { writeOpm } from '../messages/opm-writer.ts';
import { planToOem, type PlanOemOptions } from './plan-oem.ts';
import { type PlanExportOptions, planToOpm } from './plan-opm.ts';
import type { OdmWriteOptions } from '../messages/write-options.ts';

export type CcsdsExportKind = 'opm' | 'oem';

export type CcsdsExportOptions = PlanExportOptions & Partial<Omit<PlanOemOptions, keyof PlanExportOptions>> & {
  kind: CcsdsExportKind;
  /** KVN or XML. @defaultValue 'kvn' */
  encoding?: OdmWriteOptions['encoding'];
};

/** Writes a converged, cross-checked plan as an OPM (initial state + maneuvers) or an OEM (predicted
 * trajectory at `stepS`, required for 'oem'). Throws InvalidInputError for a plan that did not converge
 * or failed its cross-check, or for bad options. */
export async function exportPlanAsCcsds(problem: PlanningProblem, plan: ManeuverPlan, options: CcsdsExportOptions): Promise<string> {
  const writing: OdmWriteOptions = { encoding: options.encoding ?? 'kvn' };
  if (options.kind === 'opm') return writeOpm(planToOpm(problem, plan, options), writing);
  if (options.kind === 'oem') {
    if (options.stepS === undefined) throw new InvalidInputError('stepS', 'an OEM export needs the step between lines, s');
    return writeOem(await planToOem(problem, plan, { ...options, stepS: options.stepS }), writing);
  }
  throw new InvalidInputError('kind', `'${String(options.kind)}' is not 'opm' or 'oem'`);
}
