/**
 * Seeded Monte Carlo sampling of execution (and initial-state) errors. Sample i depends on (seed, i)
 * only: its random stream is sampleRandom(seed, i), drawn in a fixed layout — three normals per burn in
 * burn order (along-burn, transverse 1, transverse 2), then six for the initial state when a covariance
 * is given. The non-linear propagation of each sample is the caller's `evaluate` closure.
 */
import { CancelledError, InvalidInputError, type Vec3 } from '../../propagator/index.ts';
import { drawExecutedDeltaV, type GatesErrors } from './gates.ts';
import { choleskySemidefinite, multiplyVector, requireCovariance, type Matrix } from '../../propagator/index.ts';
import { sampleRandom } from './random.ts';

/** What the sampler disperses. */
export interface DispersionModel {
  /** Nominal Δv of each burn, km/s, J2000 equatorial (any inertial frame; the draws keep it). */
  burnDeltaVKmS: readonly Vec3[];
  /** Gates errors (one set for every burn), or null for exact execution. */
  executionErrors: GatesErrors | null;
  /** Optional 6×6 covariance of the initial (r, v): km², km²/s, km²/s². */
  initialCovariance?: Matrix | null;
}

/** One drawn sample: the executed burns and the initial-state offset to add to (r, v). */
export interface DrawnSample {
  index: number;
  /** Executed Δv of each burn, km/s, same frame as the model's. */
  burnDeltaVKmS: Vec3[];
  /** (δr km, δv km/s) to add to the initial state, or null when no covariance was given. */
  initialStateOffset: number[] | null;
}

export interface DispersionSampler {
  readonly model: DispersionModel;
  /** Draws sample `index` of the run seeded with `seed` (both integers in [0, 2^32)). */
  draw(seed: number, index: number): DrawnSample;
}

/** Validates the model once and precomputes the Cholesky factor of the initial covariance. */
export function createDispersionSampler(model: DispersionModel): DispersionSampler {
  model.burnDeltaVKmS.forEach((dv, k) => {
    if (!Array.isArray(dv) || dv.length !== 3 || !dv.every(Number.isFinite)) {
      throw new InvalidInputError(`burns[${k}].deltaVKmS`, 'must be three finite numbers');
    }
  });
  let factor: Matrix | null = null;
  if (model.initialCovariance) {
    requireCovariance('initialState.covarianceKmKmS', model.initialCovariance, 6);
    factor = choleskySemidefinite(model.initialCovariance, 'initialState.covarianceKmKmS');
  }
  return {
    model,
    draw(seed: number, index: number): DrawnSample {
      const random = sampleRandom(seed, index);
      const burnDeltaVKmS = model.burnDeltaVKmS.map((dv) => {
        if (model.executionErrors === null) {
          random.normal(); random.normal(); random.normal(); // keep the stream layout fixed
          return [dv[0], dv[1], dv[2]] as Vec3;
        }
        return drawExecutedDeltaV(dv, model.executionErrors, random);
      });
      let initialStateOffset: number[] | null = null;
      if (factor !== null) {
        const z = Array.from({ length: 6 }, () => random.normal());
        const l = factor;
        initialStateOffset = multiplyVector(l, z);
      }
      return { index, burnDeltaVKmS, initialStateOffset };
    },
  };
}

/** Options of a run over the sample range [firstIndex, firstIndex + count). */
export interface SampleRangeOptions {
  seed: number;
  firstIndex: number;
  count: number;
  signal?: AbortSignal;
  /** Called after each sample with the number done in this range. */
  onSample?: (done: number, count: number) => void;
}

/**
 * Draws samples [firstIndex, firstIndex + count) and evaluates each with the caller's closure, in index
 * order. Checks `signal` before each sample and yields to the event loop between samples.
 * @returns one entry per sample, in index order.
 * @throws CancelledError when the signal fires; InvalidInputError for a bad range.
 */
export async function runSampleRange<T>(
  sampler: DispersionSampler, evaluate: (sample: DrawnSample) => Promise<T>, options: SampleRangeOptions,
): Promise<{ sample: DrawnSample; result: T }[]> {
  const { seed, firstIndex, count, signal, onSample } = options;
  if (!Number.isInteger(firstIndex) || firstIndex < 0) throw new InvalidInputError('firstIndex', `must be an integer >= 0, got ${firstIndex}`);
  if (!Number.isInteger(count) || count < 0) throw new InvalidInputError('count', `must be an integer >= 0, got ${count}`);
  const out: { sample: DrawnSample; result: T }[] = [];
  for (let k = 0; k < count; k += 1) {
    if (signal?.aborted) throw new CancelledError(`dispersion cancelled after ${k} of ${count} samples`);
    const sample = sampler.draw(seed, firstIndex + k);
    out.push({ sample, result: await evaluate(sample) });
    onSample?.(k + 1, count);
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  return out;
}
