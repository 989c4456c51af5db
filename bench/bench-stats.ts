/**
 * Timing helpers shared by the benches, so all measure the
 * same way: CPU time of this process (process.cpuUsage, user + system — a shared, loaded machine
 * disturbs it less than wall time), peers timed in alternation within each round (both see the same
 * load), and the median with the spread over rounds reported, never the best run alone.
 */
import { execSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import os from 'node:os';
import { PerformanceObserver } from 'node:perf_hooks';
import v8 from 'node:v8';
import vm from 'node:vm';

/** CPU time of this process (user + system), ms. */
export function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

/** A full collection on demand, without --expose-gc on the command line (the flag is set at run time). */
function fullCollection(): () => void {
  v8.setFlagsFromString('--expose-gc');
  return vm.runInNewContext('gc') as () => void;
}

/**
 * Bytes allocated per call of `fn`: heap growth over `calls` calls right after a full collection, divided by
 * `calls`, one value per round. A round in which a collection ran (seen by a gc observer, whose entries arrive
 * after the round) is measured again, up to 3 × `rounds` tries, so fewer values may come back; `calls` must be
 * few enough for the young generation to hold their garbage.
 */
export async function heapBytesPerCall(fn: () => unknown, calls: number, rounds: number): Promise<number[]> {
  const gc = fullCollection();
  let collections = 0;
  const observer = new PerformanceObserver((list) => { collections += list.getEntries().length; });
  observer.observe({ entryTypes: ['gc'] });
  const settle = async (): Promise<void> => {
    for (let k = 0; k < 2; k++) await new Promise((resolve) => setTimeout(resolve, 0));
  };
  const out: number[] = [];
  try {
    for (let tries = 0; out.length < rounds && tries < rounds * 3; tries++) {
      gc();
      await settle();
      const seen = collections;
      const before = v8.getHeapStatistics().used_heap_size;
      for (let k = 0; k < calls; k++) fn();
      const grown = v8.getHeapStatistics().used_heap_size - before;
      await settle();
      if (collections === seen) out.push(grown / calls);
    }
  } finally {
    observer.disconnect();
  }
  return out;
}

/** Median and spread of a sample. */
export interface Spread {
  median: number;
  min: number;
  max: number;
  rounds: number;
}

export function spreadOf(values: readonly number[]): Spread {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  const median = s.length % 2 === 1 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
  return { median, min: s[0], max: s[s.length - 1], rounds: s.length };
}

/** "12.3 (10.1–15.0)": median with min–max over rounds. */
export function formatSpread(s: Spread, digits = 1): string {
  return `${s.median.toFixed(digits)} (${s.min.toFixed(digits)}–${s.max.toFixed(digits)})`;
}

/** CPU ms of one call of `fn`, averaged over `repeat` calls (short calls need repeats to rise above the
 * timer's resolution). */
export function cpuMsPerCall(fn: () => unknown, repeat = 1): number {
  const t = cpuMs();
  for (let k = 0; k < repeat; k++) fn();
  return (cpuMs() - t) / repeat;
}

/**
 * Times several contenders in alternation: each round runs every contender once (`repeat[i]` calls
 * each), after one warm-up round. Returns per-contender CPU ms per call for every round, so ratios can be
 * taken round by round (same load for both sides of a ratio).
 */
export function alternate(contenders: ReadonlyArray<{ fn: () => unknown; repeat: number }>, rounds: number): number[][] {
  for (const c of contenders) cpuMsPerCall(c.fn, c.repeat);
  const out: number[][] = contenders.map(() => []);
  for (let r = 0; r < rounds; r++) {
    contenders.forEach((c, i) => out[i].push(cpuMsPerCall(c.fn, c.repeat)));
  }
  return out;
}

/** Per-round ratios a[i] / b[i]. */
export function ratios(a: readonly number[], b: readonly number[]): number[] {
  return a.map((x, i) => x / b[i]);
}

/** CPU model, nproc, Node version, load average and date: the machine line of every results file. */
export function machineLine(): string {
  const cpu = readFileSync('/proc/cpuinfo', 'utf8').split('\n').find((l) => l.startsWith('model name'))?.split(':')[1]?.trim()
    ?? os.cpus()[0]?.model ?? 'unknown CPU';
  const cores = execSync('nproc').toString().trim();
  const load = os.loadavg().map((l) => l.toFixed(1)).join(', ');
  return `${cpu}; nproc ${cores}; node ${process.version}; load average at start ${load}; ${new Date().toISOString().slice(0, 16)}Z`;
}

/**
 * Keeps a run-history table across runs: returns the previous rows found under `heading` in `file`
 * (at most `keep - 1`) followed by `row`, so each results file shows how the figures move between runs.
 */
export function historyRows(file: URL, heading: string, row: string, keep = 10): string[] {
  let previous: string[] = [];
  try {
    const text = readFileSync(file, 'utf8');
    const at = text.indexOf(heading);
    if (at >= 0) {
      previous = text.slice(at + heading.length).split('\n')
        .filter((l) => /^\| \d{4}-\d\d-\d\d/.test(l));
    }
  } catch {
    previous = [];
  }
  return [...previous.slice(-(keep - 1)), row];
}

/** Short commit of the measured code, marked "+changes" when propagator/ or bench/ differ from it. */
export function codeVersion(): string {
  try {
    const head = execSync('git rev-parse --short HEAD', { stdio: ['ignore', 'pipe', 'ignore'] }).toString().trim();
    const dirty = execSync('git status --porcelain -- propagator bench', { stdio: ['ignore', 'pipe', 'ignore'] }).toString()
      .split('\n').some((l) => l.trim() !== '' && !l.includes('bench/results/'));
    return dirty ? `${head}+changes` : head;
  } catch {
    return 'unknown';
  }
}

/** Samples of `count` from index `first`, computed in a child process, with its sampling time (ms). */
export type SampleChild<T> = (first: number, count: number) => Promise<{ samples: T[]; ms: number }>;

/** One child process against two splitting the same samples, alternated (order swapped every round). */
export interface OneVersusTwo<T> {
  /** Samples/s of sampling time, one process, per round. */
  oneRates: number[];
  /** Sampling time of the one-process run, ms, per round. */
  oneMs: number[];
  /** Samples/s of the slower of the two processes' sampling time, per round. */
  twoRates: number[];
  /** Wall time of the two-process run incl. start-up, ms, per round. */
  twoWalls: number[];
  /** Whether both contenders produced the same samples in every round. */
  sameSamples: boolean;
  /** The samples (one process's, last round). */
  samples: T[];
}

/** Runs `rounds` of one process vs two processes over `n` samples; `beforeRound` runs first in each round
 * (a peer measured under the same load). */
export async function oneVersusTwoProcesses<T>(runChild: SampleChild<T>, n: number, rounds: number,
  beforeRound: (round: number) => Promise<void> = async () => {}): Promise<OneVersusTwo<T>> {
  const out: OneVersusTwo<T> = { oneRates: [], oneMs: [], twoRates: [], twoWalls: [], sameSamples: true, samples: [] };
  const one = async (): Promise<T[]> => {
    const x = await runChild(0, n);
    out.oneRates.push(n / (x.ms / 1000));
    out.oneMs.push(x.ms);
    return x.samples;
  };
  const two = async (): Promise<T[]> => {
    const t = performance.now();
    const [a, b] = await Promise.all([runChild(0, n / 2), runChild(n / 2, n / 2)]);
    out.twoWalls.push(performance.now() - t);
    out.twoRates.push(n / (Math.max(a.ms, b.ms) / 1000));
    return [...a.samples, ...b.samples];
  };
  for (let r = 0; r < rounds; r++) {
    await beforeRound(r);
    const [first, second] = r % 2 === 0 ? [await one(), await two()] : [await two(), await one()];
    out.sameSamples &&= JSON.stringify(first) === JSON.stringify(second);
    out.samples = r % 2 === 0 ? first : second;
  }
  return out;
}
