/**
 * A Chebyshev cache shared by every plan a process makes: an explicit object (no module state) that the
 * process-level owner (CLI, planner thread, export thread) creates once and passes in.
 *
 * Fits are kept in blocks of a fixed grid anchored at J2000 (block k covers [k·B, (k+1)·B] TDB s, B =
 * `blockS`), one Chebyshev cache (buildChebyshevEphemeris) per block, keyed by source name, body set,
 * origin, tolerance and coefficients. A view over a span (`ephemerisFor`) fits a block only when a look-up
 * first reaches it, so an integration extends the cache block by block as it goes, and a later plan over the
 * same epochs and bodies finds the blocks already fitted. A block's fit depends only on its key and index,
 * never on the span or the order of requests: the same problem gives the same numbers whether the cache
 * was cold or warm. Memory is bounded: past `maxBlocks` fitted blocks the least recently used one is
 * dropped (a view holding it keeps using it until it moves to another block).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';
import { buildChebyshevEphemeris, CHEBYSHEV_DEFAULTS, type ChebyshevEphemerisCache } from './chebyshev-ephemeris.ts';
import { planBodyPositions } from './body-positions-plan.ts';
import type { BodyPositionsPlan, Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertBody, assertInSpan, assertValidSpan } from './ephemeris-checks.ts';

/** Options of {@link EphemerisCache}. */
export interface EphemerisCacheOptions {
  /** Block length, s (a multiple of the Chebyshev segment guesses 4, 16 and 128 days divides it evenly).
   * @defaultValue 32 days (2 764 800 s) */
  blockS?: number;
  /** Fitted blocks kept before the least recently used is dropped. @defaultValue 512 (about 16 MB with
   * all ten bodies) */
  maxBlocks?: number;
}

export const EPHEMERIS_CACHE_DEFAULTS = Object.freeze({ blockS: 32 * 86400, maxBlocks: 512 });

/** Counters of a cache (no clocks in the propagator: callers time the work themselves). */
export interface EphemerisCacheStats {
  /** Blocks fitted from the source so far. */
  blocksFitted: number;
  /** Look-ups of a block that found it already fitted (once per view and block entered). */
  blocksReused: number;
  /** Blocks dropped to stay within maxBlocks. */
  blocksEvicted: number;
  /** Blocks held now. */
  blocksHeld: number;
}

/** The fit settings a view asks for; together with source and bodies they form the key. */
interface FitKey {
  source: Ephemeris;
  bodies: readonly BodyName[];
  key: string;
  /** Short stand-in for `key` in block ids ("<n>#"), so a look-up builds and hashes a short string. */
  prefix: string;
}

/** Process-wide store of fitted ephemeris blocks; see the file comment. */
export class EphemerisCache {
  readonly blockS: number;
  readonly maxBlocks: number;
  /** Insertion order = recency order (a hit moves the entry to the end). */
  private readonly blocks = new Map<string, ChebyshevEphemerisCache>();
  private readonly counters = { blocksFitted: 0, blocksReused: 0, blocksEvicted: 0 };
  /** Fit key → its short prefix (one per distinct key for the cache's life; a handful in practice). */
  private readonly prefixes = new Map<string, string>();

  constructor(options: EphemerisCacheOptions = {}) {
    this.blockS = options.blockS ?? EPHEMERIS_CACHE_DEFAULTS.blockS;
    this.maxBlocks = options.maxBlocks ?? EPHEMERIS_CACHE_DEFAULTS.maxBlocks;
    if (!(this.blockS >= 86400) || !Number.isFinite(this.blockS)) {
      throw new InvalidInputError('blockS', `${this.blockS} must be a finite number of s >= 86400`);
    }
    if (!Number.isInteger(this.maxBlocks) || this.maxBlocks < 1) {
      throw new InvalidInputError('maxBlocks', `${this.maxBlocks} must be an integer >= 1`);
    }
  }

  /**
   * An Ephemeris over `span` (TDB s from J2000, inside the source's span) for `bodies` (the origin, the
   * Sun, is added), answering from this cache's blocks (fitted from `source` on first use, default fit
   * settings of buildChebyshevEphemeris). Look-ups outside `span` throw OutOfSpanError.
   */
  ephemerisFor(source: Ephemeris, bodies: readonly BodyName[], span: TdbSpan): Ephemeris {
    assertValidSpan(span, 'startTdbS/endTdbS');
    assertInSpan(source.name, source.span, span.startTdbS, 'startTdbS');
    assertInSpan(source.name, source.span, span.endTdbS, 'endTdbS');
    const all = [...new Set<BodyName>([CHEBYSHEV_DEFAULTS.origin, ...bodies])].sort();
    all.forEach((b, i) => assertBody(source.name, source.bodies, b, `bodies[${i}]`));
    const key = `${source.name}|${all.join(',')}|${CHEBYSHEV_DEFAULTS.origin}|${CHEBYSHEV_DEFAULTS.toleranceKm}|${CHEBYSHEV_DEFAULTS.coefficients}`;
    let prefix = this.prefixes.get(key);
    if (prefix === undefined) {
      prefix = `${this.prefixes.size}#`;
      this.prefixes.set(key, prefix);
    }
    return new CachedEphemeris(this, { source, bodies: all, key, prefix }, Object.freeze({ ...span }));
  }

  /** The fitted block `index` for `fit` (fits it now when missing). */
  block(fit: FitKey, index: number): ChebyshevEphemerisCache {
    const id = fit.prefix + index;
    const held = this.blocks.get(id);
    if (held !== undefined) {
      this.blocks.delete(id);
      this.blocks.set(id, held);
      this.counters.blocksReused += 1;
      return held;
    }
    const startTdbS = Math.max(fit.source.span.startTdbS, index * this.blockS);
    const endTdbS = Math.min(fit.source.span.endTdbS, (index + 1) * this.blockS);
    let built: ChebyshevEphemerisCache;
    try {
      built = buildChebyshevEphemeris(fit.source, { bodies: fit.bodies, startTdbS, endTdbS, velocity: 'from-positions' });
    } catch (error) {
      // The fit's own fields mean nothing to the author of a request: name the ephemeris.
      if (!(error instanceof InvalidInputError)) throw error;
      throw new InvalidInputError('ephemeris', `the Chebyshev cache of ${fit.source.name} could not be fitted over `
        + `[${startTdbS}, ${endTdbS}] TDB s (${error.message}); evaluate the source directly instead`);
    }
    this.counters.blocksFitted += 1;
    this.blocks.set(id, built);
    while (this.blocks.size > this.maxBlocks) {
      const oldest = this.blocks.keys().next().value as string;
      this.blocks.delete(oldest);
      this.counters.blocksEvicted += 1;
    }
    return built;
  }

  stats(): EphemerisCacheStats {
    return { ...this.counters, blocksHeld: this.blocks.size };
  }
}

/** A view of the shared blocks over one span (what a plan or a propagation is given). */
class CachedEphemeris implements Ephemeris {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  private readonly owner: EphemerisCache;
  private readonly fit: FitKey;
  private readonly blockS: number;
  private currentIndex = Number.NaN;
  private current: ChebyshevEphemerisCache | null = null;

  constructor(owner: EphemerisCache, fit: FitKey, span: TdbSpan) {
    this.owner = owner;
    this.fit = fit;
    this.span = span;
    this.bodies = Object.freeze([...fit.bodies]);
    this.blockS = owner.blockS;
    this.name = `chebyshev cache of ${fit.source.name} in ${owner.blockS / 86400}-day blocks over [${span.startTdbS}, ${span.endTdbS}] TDB s`;
  }

  /** The block answering at `epochTdbS` (checked against the view's span). A block's end epoch belongs to
   * the next block, except at the end of the source's span. */
  blockAt(epochTdbS: number): Ephemeris {
    if (!(epochTdbS >= this.span.startTdbS && epochTdbS <= this.span.endTdbS)) assertInSpan(this.name, this.span, epochTdbS);
    let index = Math.floor(epochTdbS / this.blockS);
    if (index * this.blockS >= this.fit.source.span.endTdbS) index -= 1;
    if (index !== this.currentIndex || this.current === null) {
      this.current = this.owner.block(this.fit, index);
      this.currentIndex = index;
    }
    return this.current;
  }

  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.blockAt(epochTdbS).stateInto(target, centre, epochTdbS, out, offset);
  }

  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.blockAt(epochTdbS).positionInto(target, centre, epochTdbS, out, offset);
  }

  planPositions(targets: readonly BodyName[], centre: BodyName): BodyPositionsPlan {
    return new CachedPositionsPlan(this, targets, centre);
  }
}

/** Batch look-up over the blocks: the current block's own batch plan, remade when the epoch moves to
 * another block. */
class CachedPositionsPlan implements BodyPositionsPlan {
  readonly targets: readonly BodyName[];
  readonly centre: BodyName;
  private readonly view: CachedEphemeris;
  private block: Ephemeris | null = null;
  private plan: BodyPositionsPlan | null = null;

  constructor(view: CachedEphemeris, targets: readonly BodyName[], centre: BodyName) {
    this.view = view;
    this.targets = targets;
    this.centre = centre;
  }

  positionsInto(epochTdbS: number, out: Float64Array, offset = 0): void {
    const block = this.view.blockAt(epochTdbS);
    if (block !== this.block || this.plan === null) {
      this.plan = planBodyPositions(block, this.targets, this.centre);
      this.block = block;
    }
    this.plan.positionsInto(epochTdbS, out, offset);
  }
}
