/**
 * Canonical JSON on the submission path (npm run bench:canonical-json; writes bench/results/canonical-json.md):
 * the problem hash of one submission (test/queue/fixtures.ts reachableProblem, samples 0, read through the
 * API's jobRequestSchema as POST /v1/jobs does) — CPU µs and bytes allocated per call of contract/canonical-json.ts
 * against its earlier writer (test/contract/canonical-json-reference.ts), the peer timed in alternation in the same
 * run. Bytes: young-generation growth over many calls with no garbage collection between (the run's semi-space is
 * set large; a round in which a collection ran is measured again), divided by the calls.
 */
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { canonicalJson } from '../contract/canonical-json.ts';
import { jobRequestSchema } from '../contract/http-schemas.ts';
import { planLeapSeconds, problemHash } from '../planner/index.ts';
import { BUILTIN_LEAP_SECONDS } from '../propagator/index.ts';
import { referenceCanonicalJson } from '../test/contract/canonical-json-reference.ts';
import { reachableProblem, submission } from '../test/queue/fixtures.ts';
import { alternate, codeVersion, formatSpread, heapBytesPerCall, historyRows, machineLine, ratios, spreadOf, type Spread } from './bench-stats.ts';

const RESULTS = new URL('./results/canonical-json.md', import.meta.url);
const ROUNDS = 9;
const CALLS = 2000;
/** Calls per allocation round: few enough that the young generation never fills (no collection inside). */
const BYTE_CALLS = 500;

const problem = jobRequestSchema.parse(submission(reachableProblem({ samples: 0, name: 'BENCHSAT' }))).problem;
const leap = planLeapSeconds(BUILTIN_LEAP_SECONDS);
// What problemHash serialises (planner/problem-hash.ts: the problem with its leap-second table's identity).
const hashed = { leapSeconds: { source: leap.source, sha256: leap.sha256, expiresUtc: leap.expiresUtc }, problem };
const sha256 = (text: string): string => createHash('sha256').update(text, 'utf8').digest('hex');

const contenders = {
  'canonicalJson (now)': () => canonicalJson(hashed),
  'earlier writer (peer)': () => referenceCanonicalJson(hashed),
  'problemHash (now)': () => problemHash(problem, leap),
  'SHA-256 of the earlier writer\'s text (peer)': () => sha256(referenceCanonicalJson(hashed)),
};

async function main(): Promise<void> {
  const machine = machineLine();
  const text = canonicalJson(hashed);
  if (text !== referenceCanonicalJson(hashed)) throw new Error('canonicalJson differs from the earlier writer on the problem');
  const fns = Object.values(contenders);
  const cpu = alternate(fns.map((fn) => ({ fn, repeat: CALLS })), ROUNDS).map((ms) => ms.map((m) => m * 1000));
  const bytes: number[][] = [];
  for (const fn of fns) bytes.push(await heapBytesPerCall(fn, BYTE_CALLS, ROUNDS));
  if (bytes.some((b) => b.length === 0)) throw new Error('every allocation round saw a collection: raise the semi-space');
  const names = Object.keys(contenders);
  const rows = names.map((name, i) =>
    `| ${name} | ${formatSpread(spreadOf(cpu[i]!), 2)} | ${formatSpread(spreadOf(bytes[i]!), 0)} |`);
  const ratio = (a: number, b: number): Spread => spreadOf(ratios(cpu[a]!, cpu[b]!));
  const summary = `text ${formatSpread(ratio(0, 1), 2)}, hash ${formatSpread(ratio(2, 3), 2)}`;
  const bytesRatio = (a: number, b: number): string => (spreadOf(bytes[a]!).median / spreadOf(bytes[b]!).median).toFixed(2);
  const bytesSummary = `text ${bytesRatio(0, 1)}, hash ${bytesRatio(2, 3)}`;
  const row = `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${summary} | ${bytesSummary} |`;
  const history = historyRows(RESULTS, '## History', row);
  const out = [
    '# Canonical JSON of a submission\'s problem',
    '',
    `Measured on ${machine}; code ${codeVersion()}.`,
    `Problem: reachableProblem (samples 0) through jobRequestSchema; canonical text ${text.length} characters.`,
    `CPU: ${ROUNDS} rounds of ${CALLS} calls, contenders in alternation; bytes: ${ROUNDS} rounds of ${BYTE_CALLS} calls;`
      + ' median (min–max) over rounds.',
    '',
    '| contender | CPU µs per call | bytes allocated per call |',
    '|---|---|---|',
    ...rows,
    '',
    `CPU now ÷ earlier (round by round): ${summary}. Bytes now ÷ earlier (medians): ${bytesSummary}.`,
    '',
    '## History',
    '',
    '| date | code | CPU now ÷ earlier | bytes now ÷ earlier |',
    '|---|---|---|---|',
    ...history,
    '',
  ].join('\n');
  writeFileSync(RESULTS, out);
  process.stdout.write(out);
}

await main();
