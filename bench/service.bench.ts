/**
 * Service benchmarks (npm run bench:service; writes bench/results/service.md):
 *  1. submission latency over HTTP at 50 concurrent clients (autocannon, in its own process), target p99 < 50 ms;
 *     peers in the same rounds: GET /health of the same API, and a bare express 5 route (the framework's floor);
 *  2. queue overhead per job for a trivial problem: end-to-end time through API-less queue + worker + archive,
 *     minus the planner's own time for the same problem in-process, target < 20 ms;
 *  3. throughput (jobs/s) with 1, 2 and 4 worker processes draining the same batch of jobs.
 * Uses REDIS_URL when set, else a private redis-server in a temp folder. The API and the workers run the compiled
 * build (dist/, what `npm run api` and `npm run worker` start), so `npm run build` must have run (the bench refuses
 * a missing dist/); the in-process planner peer runs in this process.
 */
import { execFile, spawn, type ChildProcess } from 'node:child_process';
import { promisify } from 'node:util';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import { join, resolve } from 'node:path';
import { openTokenStore } from '../api/auth/index.ts';
import { parseProblem, planManeuvers } from '../planner/index.ts';
import { JobEventHub, RetargetQueue, jobRequestSchema, startLocalRedis, type LocalRedis, type SubmitOutcome } from '../queue/index.ts';
import { reachableProblem } from '../test/queue/fixtures.ts';
import { codeVersion, cpuMs, historyRows, spreadOf } from './bench-stats.ts';

/** Throughput runs measure the queue itself: admission limits out of the way. */
const NO_ADMISSION_LIMIT = { waitingPerPriority: { urgent: 1e9, routine: 1e9 }, unfinishedPerSubmitter: 1e9, retryAfterS: 1 };

/** The job id of an accepted submission (throws on a refusal, which the limits above rule out). */
function createdId(outcome: SubmitOutcome): string {
  if (!('jobId' in outcome)) throw new Error(`submission refused: ${JSON.stringify(outcome)}`);
  return outcome.jobId;
}

interface CannonResult { latency: { p50: number; p99: number; average: number; max: number }; requests: { average: number; total: number }; non2xx: number; errors: number; statusCodeStats?: Record<string, { count: number }> }
const execFileAsync = promisify(execFile);
/** autocannon's command line (its package's `bin`). */
const AUTOCANNON_CLI = createRequire(import.meta.url).resolve('autocannon/autocannon.js');

const ROOT = resolve(import.meta.dirname, '..');
/** The deployed entry points (package.json's `api` and `worker` scripts). */
const API_MAIN = join(ROOT, 'dist/api/main.js');
const WORKER_MAIN = join(ROOT, 'dist/queue/worker-main.js');
/** The framework floor peer (run through tsx: its start-up is not measured). */
const FLOOR_MAIN = join(ROOT, 'bench/express-floor-server.ts');
const RESULTS_URL = new URL('./results/service.md', import.meta.url);
const LATENCY_HISTORY = '## Submission latency, run by run';
if (!existsSync(API_MAIN) || !existsSync(WORKER_MAIN)) throw new Error('dist/ is missing: run `npm run build` first');

/** CPU time a process has used so far (user + system, all its threads), ms, from /proc (Linux); NaN elsewhere.
 * Unlike latency it does not grow with the machine's load, so it tells the request path's own cost apart. */
function processCpuMs(pid: number | undefined): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLOCK_TICKS_PER_S;
  } catch {
    return Number.NaN;
  }
}
/** USER_HZ of Linux's /proc times (100 on every common build). */
const CLOCK_TICKS_PER_S = 100;
const DURATION_S = Number(process.env.BENCH_DURATION_S ?? 10);
const SUBMIT_ROUNDS = 5;
/** Seconds each latency contender runs at full concurrency before the recorded rounds. */
const WARM_UP_S = 2;

let local: LocalRedis | null = null;

/** What every section shares: the temp folder, Redis, the queue prefix and the results lines. */
interface BenchContext { dir: string; redisUrl: string; prefix: string; say(line: string): void }

const trivial = reachableProblem({ samples: 0, name: 'BENCHSAT' });

/** What autocannon fires: a URL and, for a submission, its method, headers and body. */
interface Target { url: string; method?: 'POST'; headers?: Record<string, string>; body?: string }
/** One contender of the latency rounds: what autocannon fires and which process answers it. */
interface Contender { name: string; pid: number | undefined; target: Target }
interface RoundResult { result: CannonResult; cpuPerRequest: number }

/** autocannon at 50 clients for `seconds`, run as its command line in a process of its own (JSON result): the load
 * generator's heap and collections stay apart from this bench's, which holds the planner and the queue. */
async function cannon(t: Target, seconds: number): Promise<CannonResult> {
  const args = [AUTOCANNON_CLI, '-j', '-c', '50', '-d', String(seconds)];
  if (t.method) args.push('-m', t.method);
  for (const [k, v] of Object.entries(t.headers ?? {})) args.push('-H', `${k}=${v}`);
  if (t.body !== undefined) args.push('-b', t.body);
  const { stdout } = await execFileAsync(process.execPath, [...args, t.url], { maxBuffer: 16 * 2 ** 20 });
  return JSON.parse(stdout) as CannonResult;
}

/** Fires `c` for `seconds`; the answering process's CPU time per request answered, from /proc. */
async function fire(c: Contender, seconds: number): Promise<RoundResult> {
  const c0 = processCpuMs(c.pid);
  const result = await cannon(c.target, seconds);
  return { result, cpuPerRequest: (processCpuMs(c.pid) - c0) / result.requests.total };
}

const median = (xs: readonly number[]): number => spreadOf(xs).median;

/** 1. Submission latency (no worker running: measures the door and the enqueue only), with two peers in the
 *  same rounds: GET /health of the same API, and the framework's floor (express-floor-server.ts). */
async function submissionLatency({ dir, redisUrl, prefix, say }: BenchContext, token: string): Promise<string> {
  // The API runs in its own process (as deployed) so the load generator does not share its event loop.
  const api = await startServerProcess([API_MAIN], {
    REDIS_URL: redisUrl, QUEUE_PREFIX: prefix, HOST: '127.0.0.1', DATA_DIR: dir, PLAN_SINK: 'archive',
    RATE_LIMIT_MAX: '1000000', LOG_LEVEL: 'silent',
    // The latency rounds submit thousands of jobs with no worker: admission limits are measured in service-overload.
    QUEUE_LIMIT_ROUTINE: '10000000', QUEUE_LIMIT_PER_SUBMITTER: '10000000',
  }, '/health');
  const floor = await startServerProcess(['--import', 'tsx', FLOOR_MAIN], {}, '/floor');
  const headers = { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
  const body = JSON.stringify({ problem: trivial, reason: 'benchmark submission' });
  const contenders: Contender[] = [
    { name: 'GET /health (peer)', pid: api.pid, target: { url: `${api.url}/health`, headers } },
    { name: 'GET /floor: bare express 5 (peer)', pid: floor.pid, target: { url: `${floor.url}/floor` } },
    { name: 'POST /v1/jobs', pid: api.pid, target: { url: `${api.url}/v1/jobs`, method: 'POST', headers, body } },
  ];
  // Warm-up at full concurrency: JIT and heap sizes settle before anything is recorded.
  for (const c of contenders) await fire(c, WARM_UP_S);
  // The contenders alternate in rounds, so all see the same machine load.
  const roundS = Math.max(2, Math.round(DURATION_S / SUBMIT_ROUNDS));
  const rounds: RoundResult[][] = [];
  for (let r = 0; r < SUBMIT_ROUNDS; r++) {
    const row: RoundResult[] = [];
    for (const c of contenders) row.push(await fire(c, roundS));
    rounds.push(row);
  }
  await api.stop();
  await floor.stop();
  const historyRow = reportLatency(say, contenders, rounds, roundS);
  const submitted = new RetargetQueue({ redisUrl, prefix, admission: NO_ADMISSION_LIMIT });
  await submitted.queue.obliterate({ force: true });
  await submitted.close();
  return historyRow;
}

/** The latency table and what it says about the target, from this run's rounds alone; returns this run's row of
 * the history table (LATENCY_HISTORY). */
function reportLatency(say: (line: string) => void, contenders: Contender[], rounds: RoundResult[][], roundS: number): string {
  say('## Submission latency, 50 concurrent clients');
  say('');
  say(`${WARM_UP_S} s warm-up per contender, then ${SUBMIT_ROUNDS} rounds of ${roundS} s each, the three contenders alternated; latencies as autocannon (in its own process) reports them.`);
  say('');
  say('| round | request | p50 ms | p99 ms | mean ms | req/s | non-2xx | answering process CPU ms per request |');
  say('|---|---|---|---|---|---|---|---|');
  rounds.forEach((row, i) => row.forEach(({ result: r, cpuPerRequest }, k) => {
    say(`| ${i + 1} | ${contenders[k]!.name} | ${r.latency.p50} | ${r.latency.p99} | ${r.latency.average.toFixed(2)} | ${r.requests.average.toFixed(0)} | ${r.non2xx} | ${cpuPerRequest.toFixed(3)} |`);
  }));
  const of = (k: number, pick: (x: RoundResult) => number): number => median(rounds.map((row) => pick(row[k]!)));
  const [HEALTH, FLOOR, SUBMIT] = [0, 1, 2];
  const submitP99 = of(SUBMIT, (x) => x.result.latency.p99);
  const tail = of(SUBMIT, (x) => x.result.latency.p99 / x.result.latency.average);
  say('');
  say(`Submission p99, median over rounds: ${submitP99} ms (target < 50 ms): ${submitP99 < 50 ? 'met' : 'NOT met'}; `
    + `/health p99 ${of(HEALTH, (x) => x.result.latency.p99)} ms; bare express p99 ${of(FLOOR, (x) => x.result.latency.p99)} ms. `
    + `CPU per request of the answering process, median over rounds: submit ${of(SUBMIT, (x) => x.cpuPerRequest).toFixed(3)} ms, `
    + `/health ${of(HEALTH, (x) => x.cpuPerRequest).toFixed(3)} ms, bare express ${of(FLOOR, (x) => x.cpuPerRequest).toFixed(3)} ms `
    + '(from /proc over the round, divided by the requests answered; load does not inflate it as it does latency).');
  say('');
  // Closed loop: each client sends its next request when the answer comes, so mean latency = clients / throughput.
  say(`What the target asks, from this run: the clients wait for each answer, so mean latency = 50 / throughput (Little's law). `
    + `Submission p99 / mean, median over rounds: ${tail.toFixed(2)}; at that ratio p99 < 50 ms needs a mean below ${(50 / tail).toFixed(1)} ms, `
    + `i.e. at least ${Math.round(tail * 1000)} submissions/s — at most ${(1 / tail).toFixed(3)} ms of API CPU per submission if the API had a core `
    + `to itself (it shares ${os.cpus().length} cores with Redis and the load generator).`);
  const p99s = rounds.map((row) => row[SUBMIT]!.result.latency.p99);
  return `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${os.loadavg()[0]!.toFixed(1)} | ${submitP99} (${Math.min(...p99s)}–${Math.max(...p99s)}) | `
    + `${of(HEALTH, (x) => x.result.latency.p99)} | ${of(FLOOR, (x) => x.result.latency.p99)} | ${of(SUBMIT, (x) => x.cpuPerRequest).toFixed(3)} | ${submitP99 < 50 ? 'met' : 'NOT met'} |`;
}

/** 2. Queue overhead per trivial job: sequential jobs through queue + worker process (+ archive), interleaved
 *  with in-process planner runs so that all three paths see the same machine load. */
async function queueOverhead({ dir, redisUrl, prefix, say }: BenchContext, queue: RetargetQueue, events: JobEventHub): Promise<void> {
  const parsed = parseProblem(trivial);
  const request = jobRequestSchema.parse({ problem: trivial, reason: 'benchmark overhead' });
  const prefixNoArchive = `${prefix}n`;
  const queueNoArchive = new RetargetQueue({ redisUrl, prefix: prefixNoArchive, admission: NO_ADMISSION_LIMIT });
  const eventsNoArchive = new JobEventHub(redisUrl, prefixNoArchive);
  await eventsNoArchive.ready();
  const runOne = async (q: RetargetQueue, ev: JobEventHub): Promise<number> => {
    const t0 = performance.now();
    let jobId = '';
    const finished = new Promise<void>((res) => {
      const off = ev.subscribe('*', (e) => { if (e.jobId === jobId && (e.type === 'completed' || e.type === 'failed')) { off(); res(); } });
    });
    jobId = createdId(await q.submit(request, 'bench'));
    await finished;
    return performance.now() - t0;
  };
  const runLocal = async (): Promise<number> => {
    const t0 = performance.now();
    await planManeuvers(parsed, { monteCarlo: 'in-process' });
    return performance.now() - t0;
  };
  const workersA = await startWorkers(1, redisUrl, prefix, dir);
  const workersB = await startWorkers(1, redisUrl, prefixNoArchive, dir, { PLAN_SINK: 'job-result' });
  for (let i = 0; i < 3; i++) { await runLocal(); await runOne(queue, events); await runOne(queueNoArchive, eventsNoArchive); }
  const inProcess: number[] = [];
  const viaQueue: number[] = [];
  const viaQueueNoArchive: number[] = [];
  let localCpu = 0;
  let workerCpu = 0;
  let submitterCpu = 0;
  const JOBS = 30;
  for (let i = 0; i < JOBS; i++) {
    const c0 = cpuMs();
    inProcess.push(await runLocal());
    localCpu += cpuMs() - c0;
    const w0 = processCpuMs(workersA[0]?.pid);
    const s0 = cpuMs();
    viaQueue.push(await runOne(queue, events));
    submitterCpu += cpuMs() - s0;
    workerCpu += processCpuMs(workersA[0]?.pid) - w0;
    viaQueueNoArchive.push(await runOne(queueNoArchive, eventsNoArchive));
  }
  await stopWorkers([...workersA, ...workersB]);
  await eventsNoArchive.close();
  await queueNoArchive.close();
  const overhead = median(viaQueue) - median(inProcess);
  say('');
  say('## Queue overhead per trivial job (Monte Carlo off)');
  say('');
  say(`| path | median ms |`);
  say('|---|---|');
  say(`| planner in-process (peer) | ${median(inProcess).toFixed(1)} |`);
  say(`| submit → worker thread → archive → completed event | ${median(viaQueue).toFixed(1)} |`);
  say(`| overhead | ${overhead.toFixed(1)} |`);
  say(`| same with PLAN_SINK=job-result (no SQLite archive writes) | ${median(viaQueueNoArchive).toFixed(1)} |`);
  say(`| overhead without archive writes | ${(median(viaQueueNoArchive) - median(inProcess)).toFixed(1)} |`);
  say('');
  say('CPU time per job (load does not inflate it as it does the times above; worker from /proc, so all its threads):');
  say('');
  say('| where | CPU ms per job |');
  say('|---|---|');
  say(`| planner in-process (peer) | ${(localCpu / JOBS).toFixed(1)} |`);
  say(`| worker process (planner thread included) | ${(workerCpu / JOBS).toFixed(1)} |`);
  say(`| worker process beyond the peer's plan | ${((workerCpu - localCpu) / JOBS).toFixed(1)} |`);
  say(`| this process: submit and wait for the completed event | ${(submitterCpu / JOBS).toFixed(1)} |`);
  say('');
  say(`Overhead ${overhead.toFixed(1)} ms (target < 20 ms): ${overhead < 20 ? 'met' : 'NOT met'}.`);
}

/** 3. Throughput with 1, 2, 4 worker processes draining 40 jobs (200 Monte Carlo samples each). */
async function throughput({ dir, redisUrl, prefix, say }: BenchContext, queue: RetargetQueue, events: JobEventHub): Promise<void> {
  say('');
  say('## Throughput, 40 jobs of 200 Monte Carlo samples each');
  say('');
  say('| workers | seconds | jobs/s | speed-up vs 1 |');
  say('|---|---|---|---|');
  const work = jobRequestSchema.parse({ problem: reachableProblem({ samples: 200, name: 'THRUSAT' }), reason: 'benchmark throughput' });
  let base = 0;
  const drain = async (count: number): Promise<number> => {
    let done = 0;
    const all = new Set<string>();
    const finished = new Promise<void>((res) => {
      const off = events.subscribe('*', (e) => {
        if ((e.type === 'completed' || e.type === 'failed') && all.has(e.jobId) && ++done === count) { off(); res(); }
      });
    });
    const t0 = performance.now();
    for (let i = 0; i < count; i++) all.add(createdId(await queue.submit(work, 'bench')));
    await finished;
    return (performance.now() - t0) / 1000;
  };
  for (const n of [1, 2, 4]) {
    const ws = await startWorkers(n, redisUrl, prefix, dir);
    await drain(4 * n); // warm-up: each process's JIT compiles the planner's hot paths on its first jobs
    const s = await drain(40);
    if (n === 1) base = s;
    say(`| ${n} | ${s.toFixed(2)} | ${(40 / s).toFixed(2)} | ${(base / s).toFixed(2)} |`);
    await stopWorkers(ws);
  }
  say('');
  say(`Each run began with 4 warm-up jobs per worker (not timed). On ${os.cpus().length} cores, shared with the API, Redis and `
    + 'this bench, more worker processes than free cores cannot speed this up; the row shows what the queue costs when they compete.');
}

async function main(): Promise<void> {
  const loadAtStart = os.loadavg();
  const dir = mkdtempSync(join(os.tmpdir(), 'veer-bench-'));
  const redisUrl = process.env.REDIS_URL ?? (local = await startLocalRedis(join(dir, 'redis'))).url;
  const prefix = `bench${Date.now().toString(36)}`;
  const tokens = await openTokenStore({ dataDir: dir });
  const { token } = await tokens.add('bench', ['submitter']);
  const lines: string[] = [];
  const ctx: BenchContext = { dir, redisUrl, prefix, say: (s) => { lines.push(s); process.stdout.write(`${s}\n`); } };
  const latencyRow = await submissionLatency(ctx, token);
  const queue = new RetargetQueue({ redisUrl, prefix, admission: NO_ADMISSION_LIMIT });
  const events = new JobEventHub(redisUrl, prefix);
  await events.ready();
  await queueOverhead(ctx, queue, events);
  await throughput(ctx, queue, events);

  const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
  const header = [
    '# Service benchmark (npm run bench:service)',
    '',
    `Machine: ${cpu}, ${os.cpus().length} logical cores, ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB RAM, ${os.platform()} ${os.release()}, `
      + `Node ${process.version}, Redis ${process.env.REDIS_URL ? 'from REDIS_URL' : 'private redis-server (append-only file on)'}, `
      + 'archive SQLite in a temp folder; API and workers from the compiled build (dist/). Run at ' + new Date().toISOString() + '.',
    '',
    `Load average (1 min) at start ${loadAtStart[0]!.toFixed(1)}, at end ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores `
      + '(the load at start is other work on the machine; during the run the API, Redis, workers and load generator share the cores): '
      + 'absolute times grow with load; compare the ratios to the peers measured in the same run.',
    '',
  ];
  mkdirSync(join(ROOT, 'bench/results'), { recursive: true });
  const history = historyRows(RESULTS_URL, LATENCY_HISTORY, latencyRow);
  const historyLines = ['', LATENCY_HISTORY, '',
    'One row per run of this bench (the last 10; a row is written only by a run): the machine\'s speed varies from run to run, so one run\'s verdict near the target is read against the others.',
    '', '| run | code | load at end of latency rounds | submit p99 ms, median (rounds min–max) | /health p99 ms | bare express p99 ms | API CPU ms per submission | target < 50 ms |',
    '|---|---|---|---|---|---|---|---|', ...history];
  writeFileSync(RESULTS_URL, `${[...header, ...lines, ...historyLines].join('\n')}\n`);
  await events.close();
  await queue.close();
  await tokens.close();
  await local?.stop();
  rmSync(dir, { recursive: true, force: true });
}

/** Starts a server (node with `args`) on a free port and waits until `probePath` answers 200. */
async function startServerProcess(args: string[], env: Record<string, string>, probePath: string): Promise<{ url: string; pid: number | undefined; stop(): Promise<void> }> {
  const { createServer } = await import('node:net');
  const port = await new Promise<number>((res) => {
    const srv = createServer().listen(0, '127.0.0.1', () => {
      const a = srv.address();
      srv.close(() => res(typeof a === 'object' && a ? a.port : 0));
    });
  });
  const child = spawn(process.execPath, args, {
    cwd: ROOT, stdio: ['ignore', 'ignore', 'inherit'], env: { ...process.env, ...env, PORT: String(port) },
  });
  const url = `http://127.0.0.1:${port}`;
  for (let i = 0; ; i++) {
    try { if ((await fetch(`${url}${probePath}`)).ok) break; } catch { /* not yet */ }
    if (i > 300) throw new Error(`${args.join(' ')} did not start in 30 s`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url, pid: child.pid,
    stop: () => new Promise<void>((res) => { child.once('exit', () => res()); child.kill('SIGTERM'); }),
  };
}

async function startWorkers(n: number, redisUrl: string, prefix: string, dataDir: string, extraEnv: Record<string, string> = {}): Promise<ChildProcess[]> {
  const out: ChildProcess[] = [];
  await Promise.all(Array.from({ length: n }, () => new Promise<void>((res, rej) => {
    const child = spawn(process.execPath, [WORKER_MAIN], {
      cwd: ROOT, stdio: ['ignore', 'pipe', 'inherit'],
      env: { ...process.env, REDIS_URL: redisUrl, QUEUE_PREFIX: prefix, DATA_DIR: dataDir, WORKER_CONCURRENCY: '1', LOG_LEVEL: 'info', ...extraEnv },
    });
    out.push(child);
    child.stdout?.on('data', (d: Buffer) => { if (d.toString().includes('"worker ready"')) res(); });
    child.once('exit', (code) => rej(new Error(`worker exited ${code}`)));
  })));
  return out;
}

async function stopWorkers(children: ChildProcess[]): Promise<void> {
  await Promise.all(children.map((c) => new Promise<void>((res) => { c.removeAllListeners('exit'); c.once('exit', () => res()); c.kill('SIGTERM'); })));
}

main().catch(async (e: unknown) => {
  process.stderr.write(`bench:service failed: ${e instanceof Error ? e.stack : String(e)}\n`);
  await local?.stop();
  process.exit(1);
});
