/**
 * Token look-up benchmark (npm run bench:token-store; writes bench/results/token-store.md): CPU time and heap
 * growth of one `identify` on the SQLite token store, which keeps identities in memory while `PRAGMA
 * data_version` is unchanged, against its peer measured in the same run: the look-up without that map (SHA-256,
 * the prepared SELECT, identityFromRow — the store's code before the map), on its own connection to the same file.
 * Also the parts alone: the data_version read each look-up now pays, and the SELECT it saves on a hit.
 * Each contender is a synchronous call of the async function (its body has no await, so all its work is done
 * when the call returns); the caller's await continuation is the same for both and not included.
 */
import Database from 'better-sqlite3';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateTokenSecret, hashTokenSecret, SQLITE_TOKENS_FILE, SqliteTokenStore } from '../api/auth/index.ts';
import { identityFromRow, type TokenRow } from '../api/auth/token-table.ts';
import type { Identity } from '../contract/roles.ts';
import { alternate, codeVersion, formatSpread, heapBytesPerCall, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';

const TOKENS = 50;
const ROUNDS = 15;
const CALLS_PER_ROUND = 2000;
const HEAP_BATCH = 500;
const HEAP_BATCHES = 40;
const resultsFile = new URL('./results/token-store.md', import.meta.url);
const HISTORY = '## Run history';

const dir = mkdtempSync(join(tmpdir(), 'veer-token-bench-'));
const file = join(dir, SQLITE_TOKENS_FILE);
const store = new SqliteTokenStore(file);
const added = [];
for (let i = 0; i < TOKENS; i++) added.push(await store.add(`bench-${i}`, ['submitter']));
const known = added[TOKENS >> 1].token;
const unknown = generateTokenSecret();

const peerDb = new Database(file, { readonly: true });
const byHash = peerDb.prepare('SELECT * FROM api_tokens WHERE token_hash = ? AND revoked_at IS NULL');
const dataVersion = peerDb.prepare('PRAGMA data_version').pluck();
/** The look-up without the map: the SQLite store's identify before this change. */
async function identifyUncached(token: string): Promise<Identity | undefined> {
  const row = byHash.get(hashTokenSecret(token)) as TokenRow | undefined;
  return row ? identityFromRow(row) : undefined;
}
if ((await store.identify(known))?.name !== (await identifyUncached(known))?.name) throw new Error('the two look-ups disagree');
const knownHash = hashTokenSecret(known);

let sink: unknown;
const contenders: Array<{ label: string; fn: () => unknown }> = [
  { label: 'identify, known token: without the map (before)', fn: () => { sink = identifyUncached(known); } },
  { label: 'identify, known token: with the map (after, hit)', fn: () => { sink = store.identify(known); } },
  { label: 'identify, unknown token: without the map (before)', fn: () => { sink = identifyUncached(unknown); } },
  { label: 'identify, unknown token: with the map (after, never kept)', fn: () => { sink = store.identify(unknown); } },
  { label: 'part: PRAGMA data_version read (prepared, pluck)', fn: () => { sink = dataVersion.get(); } },
  { label: 'part: SELECT by hash + identityFromRow (what a hit saves)', fn: () => { sink = identityFromRow(byHash.get(knownHash) as TokenRow); } },
  { label: 'part: SHA-256 of the token (both pay it)', fn: () => { sink = hashTokenSecret(known); } },
];

const times = alternate(contenders.map((c) => ({ fn: c.fn, repeat: CALLS_PER_ROUND })), ROUNDS);
const us = times.map((round) => round.map((ms) => ms * 1000));

const bytes: Spread[] = [];
for (const c of contenders.slice(0, 4)) bytes.push(spreadOf(await heapBytesPerCall(c.fn, HEAP_BATCH, HEAP_BATCHES)));
if (sink === 42) console.log('');

const sqliteVersion = peerDb.prepare('SELECT sqlite_version()').pluck().get() as string;
peerDb.close();
await store.close();
rmSync(dir, { recursive: true, force: true });

const f = (s: Spread, d = 2): string => formatSpread(s, d);
const hitRatio = spreadOf(ratios(us[0], us[1]));
const missRatio = spreadOf(ratios(us[3], us[2]));
const versionOverSelect = spreadOf(ratios(us[4], us[5]));
const row = `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${machineLine().split('; ').find((p) => p.startsWith('load')) ?? ''} | `
  + `${spreadOf(us[0]).median.toFixed(2)} | ${spreadOf(us[1]).median.toFixed(2)} | ${hitRatio.median.toFixed(1)} | ${missRatio.median.toFixed(2)} |`;
const history = historyRows(resultsFile, HISTORY, row);
const lines = [
  '# Token look-up benchmark (npm run bench:token-store)',
  '',
  `Machine: ${machineLine()}; SQLite ${sqliteVersion}. Shared with other work.`,
  '',
  `A token store file with ${TOKENS} tokens (WAL). CPU time of this process (user + system) per call, µs; the contenders`,
  `alternate inside each of ${ROUNDS} rounds of ${CALLS_PER_ROUND} calls each after a warm-up round (bench/bench-stats.ts);`,
  'median with the min–max over rounds in brackets. Heap growth: bytes per call, median over batches of',
  `${HEAP_BATCH} calls after a full collection (batches in which a collection ran left out).`,
  '',
  '| call | µs per call | heap bytes per call |',
  '|---|---:|---:|',
  ...contenders.map((c, i) => `| ${c.label} | ${f(spreadOf(us[i]))} | ${bytes[i] ? f(bytes[i], 0) : '—'} |`),
  '',
  `Known token, without ÷ with the map (round by round): ${f(hitRatio, 1)}×.`,
  `Unknown token, with ÷ without the map: ${f(missRatio)}× (the data_version read is added to the SELECT).`,
  `data_version read ÷ SELECT + identityFromRow: ${f(versionOverSelect)}.`,
  '',
  'Reading: a hit pays the SHA-256, the data_version read and a Map look-up; any commit by another connection',
  '(`veer tokens`, another API process) or by the store itself empties the map, so the next look-up of each token',
  'pays the SELECT again. Unknown and revoked tokens are never kept: they pay the data_version read on top of the',
  'SELECT. Earlier runs: the history below, read from this file before it is rewritten.',
  '',
  HISTORY,
  '',
  '| run (UTC) | code | load | before µs (known) | after µs (hit) | before ÷ after (hit) | after ÷ before (unknown) |',
  '|---|---|---|---|---|---|---|',
  ...history,
];
writeFileSync(resultsFile, lines.join('\n') + '\n');
console.log(lines.join('\n'));
