/**
 * Archive benchmark (npm run bench:archive): appends per second on each store (one writer, and four writer
 * processes), and verification time per 10,000 entries — each as a ratio against a peer measured in the same
 * run on the same database: a plain INSERT with no chain (appends), and re-hashing the same entries already in
 * memory (verification). Writes bench/results/archive.md.
 * SQLite: WAL, synchronous=FULL. PostgreSQL: local server from test/harness/postgres.ts with fsync on.
 */
import Database from 'better-sqlite3';
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import pg from 'pg';
import { ChainVerifier, PostgresArchive, SqliteArchive, type ArchiveEntry, type PlanArchive } from '../archive/index.ts';
import { makePlan, PROBLEM } from '../test/archive/fixtures.ts';
import { startPostgres } from '../test/harness/postgres.ts';
import { codeVersion, formatSpread, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';

const run = promisify(execFile);
const TARGET_ENTRIES = 10_000;
const RAW_INSERTS = 1_000;
const CHILD = fileURLToPath(new URL('../test/archive/archive-child.ts', import.meta.url));

const ROUNDS = 5;

interface StoreResult {
  store: string;
  entries: number;
  appendsPerS: Spread;
  transactionsPerS: Spread;
  rawInsertsPerS: Spread;
  /** Chain transactions ÷ plain INSERT transactions per second, round by round. */
  chainOverPlain: Spread;
  concurrentAppendsPerS: number;
  verifyMsPer10k: Spread;
  inMemoryMsPer10k: Spread;
  verifyOverRehash: Spread;
  ok: boolean;
}

/** Appends `pairs` job + plan pairs (50 target sets, so supersession happens too) from index `from`. */
async function appendPairs(archive: PlanArchive, from: number, pairs: number): Promise<void> {
  for (let i = from; i < from + pairs; i++) {
    const jobId = `bench-${i}`;
    await archive.recordJobSubmitted({ jobId, actor: 'bench-submitter', problem: { ...PROBLEM, i } });
    await archive.recordPlanProposed({ jobId, actor: 'bench-worker', submittedBy: 'bench-submitter', plan: makePlan({ targetSetKey: `set-${i % 50}` }) });
  }
}

async function allEntries(archive: PlanArchive): Promise<ArchiveEntry[]> {
  const out: ArchiveEntry[] = [];
  for (let from = 1; ;) {
    const page = await archive.entries(from, 1000);
    if (page.length === 0) return out;
    out.push(...page);
    from = page[page.length - 1].sequence + 1;
  }
}

async function measure(store: string, archive: PlanArchive, location: string, rawInsert: (i: number) => Promise<void>): Promise<StoreResult> {
  // Fill in ROUNDS rounds; each round appends its share of chain entries, then as many plain INSERTs (the peer),
  // so both sides of the ratio see the same load.
  const pairsPerRound = Math.ceil(TARGET_ENTRIES / 2 / ROUNDS);
  const rawPerRound = Math.ceil(RAW_INSERTS / ROUNDS);
  const entriesPerS: number[] = [];
  const transactionsPerS: number[] = [];
  const rawPerS: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    const before = (await archive.head()).sequence;
    let t = performance.now();
    await appendPairs(archive, r * pairsPerRound, pairsPerRound);
    const seconds = (performance.now() - t) / 1000;
    entriesPerS.push(((await archive.head()).sequence - before) / seconds);
    transactionsPerS.push((2 * pairsPerRound) / seconds);
    t = performance.now();
    for (let i = r * rawPerRound; i < (r + 1) * rawPerRound; i++) await rawInsert(i);
    rawPerS.push(rawPerRound / ((performance.now() - t) / 1000));
  }

  // Verification and the in-memory re-hash peer, alternated in three rounds.
  const entries = await allEntries(archive);
  const verifyMs: number[] = [];
  const memoryMs: number[] = [];
  let ok = true;
  for (let r = 0; r < 3; r += 1) {
    let t = performance.now();
    const report = await archive.verify();
    verifyMs.push(performance.now() - t);
    ok &&= report.ok;
    t = performance.now();
    new ChainVerifier().feed(entries);
    memoryMs.push(performance.now() - t);
  }

  const before = (await archive.head()).sequence;
  const outputs = await Promise.all([0, 1, 2, 3].map((p) => run(process.execPath, ['--import', 'tsx', CHILD, 'append', location, String(p), '150'])));
  const windows = outputs.map((o) => JSON.parse(o.stdout.trim()) as { startedAt: number; endedAt: number });
  // From the first writer's start to the last one's end: process start-up is outside the window.
  const concurrentSeconds = (Math.max(...windows.map((w) => w.endedAt)) - Math.min(...windows.map((w) => w.startedAt))) / 1000;
  const added = (await archive.head()).sequence - before;
  ok &&= (await archive.verify()).ok;
  const per10k = (ms: number): number => (ms * 10_000) / entries.length;
  return {
    store, entries: entries.length, appendsPerS: spreadOf(entriesPerS), transactionsPerS: spreadOf(transactionsPerS),
    rawInsertsPerS: spreadOf(rawPerS), chainOverPlain: spreadOf(ratios(transactionsPerS, rawPerS)),
    concurrentAppendsPerS: added / concurrentSeconds, verifyMsPer10k: spreadOf(verifyMs.map(per10k)),
    inMemoryMsPer10k: spreadOf(memoryMs.map(per10k)), verifyOverRehash: spreadOf(ratios(verifyMs, memoryMs)), ok,
  };
}

async function main(): Promise<void> {
  const results: StoreResult[] = [];
  const dir = mkdtempSync(join(tmpdir(), 'veer-bench-archive-'));
  const file = join(dir, 'archive.sqlite');
  const sqlite = new SqliteArchive({ file });
  const raw = new Database(file);
  raw.pragma('journal_mode = WAL');
  raw.pragma('synchronous = FULL');
  raw.exec('CREATE TABLE raw_peer (id INTEGER PRIMARY KEY, payload TEXT NOT NULL)');
  const insert = raw.prepare('INSERT INTO raw_peer (id, payload) VALUES (?, ?)');
  const sqliteVersion = (raw.prepare('SELECT sqlite_version() AS v').get() as { v: string }).v;
  process.stderr.write('bench: SQLite…\n');
  results.push(await measure('SQLite', sqlite, `sqlite:${file}`, async (i) => { insert.run(i, JSON.stringify({ ...PROBLEM, i })); }));
  raw.close();
  await sqlite.close();
  rmSync(dir, { recursive: true, force: true });

  process.stderr.write('bench: PostgreSQL…\n');
  const server = await startPostgres({ durable: true });
  let pgVersion = '?';
  try {
    const url = await server.freshDatabase();
    const archive = await new PostgresArchive({ connectionString: url }).open();
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    pgVersion = String((await client.query('SHOW server_version')).rows[0].server_version);
    await client.query('CREATE TABLE raw_peer (id INTEGER PRIMARY KEY, payload TEXT NOT NULL)');
    results.push(await measure(`PostgreSQL (${server.kind})`, archive, url,
      async (i) => { await client.query('INSERT INTO raw_peer (id, payload) VALUES ($1, $2)', [i, JSON.stringify({ ...PROBLEM, i })]); }));
    await client.end();
    await archive.close();
  } finally {
    await server.stop();
  }

  const machine = `${machineLine()}; SQLite ${sqliteVersion}; PostgreSQL ${pgVersion}`;
  const f = (x: number, d = 0): string => x.toFixed(d);
  const g = (x: Spread, d = 0): string => formatSpread(x, d);
  const sq = results[0];
  const resultsFile = new URL('./results/archive.md', import.meta.url);
  const HISTORY = '## Run history';
  const history = historyRows(resultsFile, HISTORY, `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | `
    + `${machineLine().split('; ').find((l) => l.startsWith('load')) ?? ''} | `
    + results.map((r) => `${f(r.appendsPerS.median)} | ${f(r.chainOverPlain.median, 2)}`).join(' | ') + ' |');
  const lines = [
    '# Archive benchmark (npm run bench:archive)', '',
    `Machine: ${machine}. Shared with other work, so absolute numbers vary between runs; the ratios compare contenders`,
    'measured in alternation in the same process on the same database.', '',
    `Each store is filled by one writer with ${ROUNDS * Math.ceil(TARGET_ENTRIES / 2 / ROUNDS)} job submission + plan proposal pairs (50 target sets, so`,
    'older plans get superseded: the entries column counts those too), each call its own write transaction under the store',
    'lock. SQLite: WAL, synchronous=FULL.',
    'PostgreSQL: a local server with fsync on (started by test/harness/postgres.ts; DATABASE_URL when set).',
    `The fill runs in ${ROUNDS} rounds; each round appends its share of entries and then ${Math.ceil(RAW_INSERTS / ROUNDS)} plain INSERTs (the peer),`,
    'so rates and ratios are per round: median with the min–max over rounds in brackets. Verification and the in-memory',
    're-hash peer alternate in 3 rounds. Wall time (database work happens outside this process).', '',
    '| store | entries | entries/s (1 writer) | write transactions/s (1 writer) | plain INSERT transactions/s (peer) | chain ÷ plain (transactions) | entries/s (4 processes) | verify ms per 10,000 | in-memory re-hash ms per 10,000 (peer) | verify ÷ re-hash | chain sound |',
    '|---|---|---|---|---|---|---|---|---|---|---|',
    ...results.map((r) => `| ${r.store} | ${r.entries} | ${g(r.appendsPerS)} | ${g(r.transactionsPerS)} | ${g(r.rawInsertsPerS)} | ${g(r.chainOverPlain, 2)} | ${f(r.concurrentAppendsPerS)} | ${g(r.verifyMsPer10k)} | ${g(r.inMemoryMsPer10k)} | ${g(r.verifyOverRehash, 1)} | ${r.ok ? 'yes' : 'NO'} |`),
    '',
    ...results.map((r) => `${r.store}: 4 processes ÷ 1 writer (entries/s, medians) ${f(r.concurrentAppendsPerS / r.appendsPerS.median, 2)}×.`),
    ...results.slice(1).map((r) => `${r.store} ÷ SQLite (medians): appends ${f(r.appendsPerS.median / sq.appendsPerS.median, 2)}×, 4-process appends ${f(r.concurrentAppendsPerS / sq.concurrentAppendsPerS, 2)}×, verification time ${f(r.verifyMsPer10k.median / sq.verifyMsPer10k.median, 2)}×.`),
    '',
    'Reading: a write transaction is one archive call (a job submission, or a plan proposal that may also supersede an older',
    'plan: two entries, one commit). "chain ÷ plain" compares those with a bare single-row INSERT of a small JSON text in its',
    'own transaction on the same database (same durability): the difference is the chain (hashes, head row lock), the',
    'projection rows and the larger plan payload. "verify ÷ re-hash" is what reading and parsing the rows adds to re-hashing',
    'the same entries in memory. The 4-process rate is over the window from the first writer\'s start to the last one\'s end',
    '(process start-up excluded); all writers queue on the one store lock. Earlier runs: the history below, read from this',
    'file before it is rewritten.', '',
    HISTORY, '',
    `| run (UTC) | code | load | ${results.map((r) => `${r.store} entries/s | ${r.store} chain ÷ plain`).join(' | ')} |`,
    `|---|---|---|${results.map(() => '---|---|').join('')}`,
    ...history,
  ];
  writeFileSync(resultsFile, lines.join('\n') + '\n');
  process.stdout.write(lines.join('\n') + '\n');
}

await main();
