/**
 * Sample statistics of Monte Carlo dispersion results. Sums run in sample-index order, so a run split
 * into batches and merged gives bit-identical statistics to a single-process run.
 */
import { InvalidInputError } from '../../propagator/index.ts';
import { zeros, type Matrix } from '../../propagator/index.ts';

/** Batches [firstIndex, firstIndex + count) of at most `batchSize` samples covering [0, total), in order
 * (the queue's child jobs, the CLI's threads). */
export function sampleBatches(total: number, batchSize: number): { firstIndex: number; count: number }[] {
  const out: { firstIndex: number; count: number }[] = [];
  for (let first = 0; first < total; first += batchSize) out.push({ firstIndex: first, count: Math.min(batchSize, total - first) });
  return out;
}

/**
 * Merges batches of samples (each carrying its `index`) into one list sorted by index.
 * @param expectedCount when given, the merged indices must be exactly [firstIndex, firstIndex + count).
 * @throws InvalidInputError on a duplicate index or a gap.
 */
export function mergeSampleBatches<T extends { index: number }>(
  batches: readonly (readonly T[])[], expected?: { firstIndex: number; count: number },
): T[] {
  const merged = batches.flat().slice().sort((p, q) => p.index - q.index);
  for (let i = 1; i < merged.length; i += 1) {
    if (merged[i].index === merged[i - 1].index) {
      throw new InvalidInputError('samples', `sample index ${merged[i].index} appears twice`);
    }
  }
  if (expected) {
    if (merged.length !== expected.count) {
      throw new InvalidInputError('samples', `expected ${expected.count} samples, got ${merged.length}`);
    }
    merged.forEach((s, k) => {
      if (s.index !== expected.firstIndex + k) {
        throw new InvalidInputError('samples', `missing sample index ${expected.firstIndex + k}`);
      }
    });
  }
  return merged;
}

function checkRows(rows: readonly (readonly number[])[]): number {
  if (rows.length === 0) throw new InvalidInputError('samples', 'need at least one sample');
  const p = rows[0].length;
  rows.forEach((row, i) => {
    if (row.length !== p || !row.every(Number.isFinite)) {
      throw new InvalidInputError(`samples[${i}]`, `must be ${p} finite numbers`);
    }
  });
  return p;
}

/** Component-wise mean of N samples of p quantities. */
export function sampleMean(rows: readonly (readonly number[])[]): number[] {
  const p = checkRows(rows);
  const mean = new Array<number>(p).fill(0);
  for (const row of rows) for (let j = 0; j < p; j += 1) mean[j] += row[j];
  return mean.map((v) => v / rows.length);
}

/** Unbiased sample covariance (divisor N − 1, N ≥ 2), two-pass about the sample mean. */
export function sampleCovariance(rows: readonly (readonly number[])[], mean = sampleMean(rows)): Matrix {
  const p = checkRows(rows);
  if (rows.length < 2) throw new InvalidInputError('samples', 'need at least two samples for a covariance');
  const c = zeros(p, p);
  for (const row of rows) {
    for (let i = 0; i < p; i += 1) {
      const di = row[i] - mean[i];
      for (let j = i; j < p; j += 1) c[i][j] += di * (row[j] - mean[j]);
    }
  }
  for (let i = 0; i < p; i += 1) {
    for (let j = i; j < p; j += 1) {
      c[i][j] /= rows.length - 1;
      c[j][i] = c[i][j];
    }
  }
  return c;
}
