/**
 * Invented plan documents for archive and review tests (spacecraft "Kestrel-7" and "Heron-2" are made up).
 * They carry the fields the archive reads plus a few of the planner's others, to show the whole plan is kept.
 */
import type { ArchivablePlan } from '../../archive/index.ts';

export interface PlanOptions {
  spacecraftName?: string;
  targetSetKey?: string;
  status?: 'converged' | 'not-converged';
  crossCheckPassed?: boolean;
  caveatCodes?: string[];
  problemHash?: string;
}

export function makePlan(options: PlanOptions = {}): ArchivablePlan & Record<string, unknown> {
  const caveatCodes = options.caveatCodes ?? ['PROPOSAL_REQUIRES_REVIEW', 'DISPERSION_LINEAR_ONLY'];
  const plan = {
    planFormatVersion: 1,
    status: options.status ?? ('converged' as const),
    problemHash: options.problemHash ?? 'a'.repeat(64),
    softwareVersion: '0.1.0-test',
    spacecraftName: options.spacecraftName ?? 'Kestrel-7',
    targetSetKey: options.targetSetKey ?? 'Kestrel-7|mars-flyby-bplane',
    burns: [{ epochUtc: '2031-03-04T05:06:07.000Z', deltaVKmS: [0.0012, -0.0004, 0.0001], magnitudeMS: 1.27, propellantKg: 0.43, durationS: 21.5 }],
    crossCheck: { passed: options.crossCheckPassed ?? true, method: 'independent-propagation', positionDifferenceKm: 0.003 },
    caveats: caveatCodes.map((code) => ({ code, severity: code === 'PROPOSAL_REQUIRES_REVIEW' ? 'info' : 'warning', text: `caveat ${code}` })),
  };
  return plan;
}

export const PROBLEM = { spacecraft: { name: 'Kestrel-7', massKg: 512.5 }, note: 'invented test problem' };
