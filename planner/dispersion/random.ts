/**
 * Seeded per-sample random numbers for Monte Carlo dispersion. Sample i of a run draws from its own
 * generator seeded from (seed, i) only, so any split of [0, N) into batches — in one process or across
 * workers — gives bit-identical samples.
 * Generators: SplitMix64 (Steele, Lea & Flood 2014) turns (seed, i) into 128 bits of state for
 * xoshiro128** 1.1 (Blackman & Vigna 2018, "Scrambled linear pseudorandom number generators");
 * normal deviates by the Box–Muller transform (Box & Muller 1958).
 */
import { InvalidInputError } from '../../propagator/index.ts';

const MASK_64 = (1n << 64n) - 1n;

/** SplitMix64 step: returns [next state, output], both unsigned 64-bit BigInts. */
export function splitMix64(state: bigint): [bigint, bigint] {
  const next = (state + 0x9e3779b97f4a7c15n) & MASK_64;
  let z = next;
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK_64;
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK_64;
  return [next, z ^ (z >> 31n)];
}

const rotl32 = (x: number, k: number): number => ((x << k) | (x >>> (32 - k))) >>> 0;

/** Random stream of one Monte Carlo sample. */
export interface SampleRandom {
  /** Uniform in [0, 1) with 53 random bits. */
  uniform(): number;
  /** Standard normal deviate N(0, 1). */
  normal(): number;
}

/** xoshiro128** over four 32-bit words, with Box–Muller normals (the second of each pair is kept). */
class Xoshiro128StarStar implements SampleRandom {
  private readonly s: Uint32Array;
  private spare: number | null = null;

  constructor(words: Uint32Array) {
    this.s = words;
  }

  nextUint32(): number {
    const s = this.s;
    const result = Math.imul(rotl32(Math.imul(s[1], 5) >>> 0, 7), 9) >>> 0;
    const t = (s[1] << 9) >>> 0;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl32(s[3], 11);
    return result;
  }

  uniform(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  normal(): number {
    if (this.spare !== null) {
      const z = this.spare;
      this.spare = null;
      return z;
    }
    const u1 = 1 - this.uniform(); // (0, 1]: log is finite
    const u2 = this.uniform();
    const radius = Math.sqrt(-2 * Math.log(u1));
    const angle = 2 * Math.PI * u2;
    this.spare = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  }
}

/**
 * The random stream of sample `index` in a run seeded with `seed`.
 * @param seed integer in [0, 2^32).
 * @param index sample number, integer in [0, 2^32).
 */
export function sampleRandom(seed: number, index: number): SampleRandom {
  if (!Number.isInteger(seed) || seed < 0 || seed >= 2 ** 32) {
    throw new InvalidInputError('seed', `must be an integer in [0, 2^32), got ${seed}`);
  }
  if (!Number.isInteger(index) || index < 0 || index >= 2 ** 32) {
    throw new InvalidInputError('index', `must be an integer in [0, 2^32), got ${index}`);
  }
  // (seed, index) → one distinct 64-bit SplitMix64 state; two outputs fill xoshiro's 128-bit state.
  let state = (BigInt(seed) << 32n) | BigInt(index);
  let a: bigint;
  let b: bigint;
  [state, a] = splitMix64(state);
  [state, b] = splitMix64(state);
  const words = new Uint32Array([
    Number(a & 0xffffffffn), Number(a >> 32n), Number(b & 0xffffffffn), Number(b >> 32n)]);
  if (words.every((w) => w === 0)) words[0] = 1; // all-zero state is xoshiro's fixed point
  return new Xoshiro128StarStar(words);
}
