/**
 * The random draws of one budget sample. Sample i depends on (seed, i) only: its stream is
 * sampleRandom(seed, i), drawn in a fixed layout that starts like the plan-level Monte Carlo sampler's
 * (planner/dispersion/monte-carlo.ts) — three normals per burn in burn order (along-burn, transverse 1,
 * transverse 2: the execution errors), then six for the initial state when a covariance is given — and
 * then six per burn for the navigation knowledge error. So a one-burn sequence with no navigation error
 * draws exactly the execution and initial-state errors of the plan-level Monte Carlo for the same seed.
 * Both budget paths use the same draws for the same i (paired comparison).
 */
import { choleskySemidefinite, multiplyVector } from '../../propagator/index.ts';
import { sampleRandom } from '../dispersion/random.ts';

/** The draws of one sample; offsets J2000 equatorial [δr km, δv km/s]. */
export interface BudgetDraw {
  index: number;
  /** Three standard normals per burn for executedDeltaV. */
  executionNormals: [number, number, number][];
  /** Offset of the true initial state from the nominal one, or null without an initial covariance. */
  initialOffset: number[] | null;
  /** Per burn: navigation estimate − true state at the burn epoch. */
  knowledgeOffsets: number[][];
}

export interface BudgetSampler {
  draw(seed: number, index: number): BudgetDraw;
}


/**
 * A sampler for `burnCount` burns. Covariances 6x6, J2000 equatorial (km², km²/s, km²/s²), already checked.
 */
export function createBudgetSampler(burnCount: number, initialCovariance: number[][] | null, knowledgeCovariances: number[][][]): BudgetSampler {
  const initialFactor = initialCovariance ? choleskySemidefinite(initialCovariance, 'problem.initialState.covarianceKmKmS') : null;
  const knowledgeFactors = knowledgeCovariances.map((c, i) => choleskySemidefinite(c, `knowledge[${i}].covarianceKmKmS`));
  return {
    draw(seed: number, index: number): BudgetDraw {
      const random = sampleRandom(seed, index);
      const six = (): number[] => Array.from({ length: 6 }, () => random.normal());
      const executionNormals = Array.from({ length: burnCount }, (): [number, number, number] => {
        const n0 = random.normal();
        const n1 = random.normal();
        const n2 = random.normal();
        return [n0, n1, n2];
      });
      const initialOffset = initialFactor ? multiplyVector(initialFactor, six()) : null;
      const knowledgeOffsets = knowledgeFactors.map((l) => multiplyVector(l, six()));
      return { index, executionNormals, initialOffset, knowledgeOffsets };
    },
  };
}
