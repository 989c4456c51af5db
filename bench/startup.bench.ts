/**
 * npm run bench:startup — start-up time of the compiled `veer` command against `node -e 0` (the peer: Node's own
 * start-up), measured in the same run, alternating one of each per round; wall time of the whole process.
 * Target: `veer --help` within 4× of `node -e 0` (median of the per-round ratios).
 *
 * Then `npm run demo`'s command (`node bin/veer.js plan examples/flyby-demo.json`) run four ways, alternating one of
 * each per round: compiled and bundled (what bin/veer.js runs, dist/cli-bundle/), compiled without the bundle
 * (dist/cli/run.js, tsc's module tree: shows the bundle's share), the same sources through tsx
 * (`node --import tsx cli/run.ts`), and "today's" of the issue: the checkout of the commit before the build existed
 * (ISSUE_COMMIT, extracted with `git archive` into a temporary folder and run as it ran then, tsx registered by its
 * bin/veer.js; its planner is that commit's). Target: at least 0.7 s faster than the issue's demo, median of the
 * per-round differences. `--baseline-commit REV` picks another commit, `--no-baseline` leaves it out.
 *
 * Writes bench/results/startup.md. Needs `npm run build` first (the bench refuses a missing dist/).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import os, { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { codeVersion, formatSpread, historyRows, machineLine, spreadOf } from './bench-stats.ts';

const ROOT = resolve(import.meta.dirname, '..');
const RESULTS = new URL('./results/startup.md', import.meta.url);
const arg = (name: string): string | undefined => {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
};
const ROUNDS = Number(arg('--rounds') ?? 31);
const DEMO_ROUNDS = Number(arg('--demo-rounds') ?? 7);
/** The last commit before `npm ci` built anything: `veer` ran the TypeScript through tsx (the issue's "today"). */
const ISSUE_COMMIT = '19a7e4f^';
const baselineCommit = process.argv.includes('--no-baseline') ? null : arg('--baseline-commit') ?? ISSUE_COMMIT;

/** Wall time of one process run to its exit, ms; fails loudly on a non-zero exit. */
function wallMs(args: string[], cwd = ROOT): number {
  const t = process.hrtime.bigint();
  const run = spawnSync(process.execPath, args, { cwd, stdio: ['ignore', 'ignore', 'pipe'] });
  const ms = Number(process.hrtime.bigint() - t) / 1e6;
  if (run.status !== 0) throw new Error(`node ${args.join(' ')} (in ${cwd}) exited ${run.status}: ${run.stderr.toString().slice(0, 400)}`);
  return ms;
}

/** Runs the contenders in alternation for `rounds` rounds after one warm-up round; ms per run, per contender. */
function alternate(contenders: ReadonlyArray<() => number>, rounds: number): number[][] {
  for (const c of contenders) c();
  const out: number[][] = contenders.map(() => []);
  for (let r = 0; r < rounds; r++) contenders.forEach((c, i) => out[i].push(c()));
  return out;
}

if (!existsSync(join(ROOT, 'dist/cli-bundle/run.js')) || !existsSync(join(ROOT, 'dist/cli/run.js'))) {
  throw new Error('dist/ is missing: run `npm run build` first');
}

/** `rev`'s files in a temporary folder (git archive), sharing this checkout's node_modules. */
function checkout(rev: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'veer-bench-startup-'));
  const run = spawnSync('sh', ['-c', 'git archive "$1" | tar -x -C "$2"', 'sh', rev, dir], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
  if (run.status !== 0) throw new Error(`git archive ${rev} failed: ${run.stderr.toString().slice(0, 400)}`);
  symlinkSync(join(ROOT, 'node_modules'), join(dir, 'node_modules'));
  return dir;
}

const lines: string[] = ['# Start-up benchmark (npm run bench:startup)', '', `Machine: ${machineLine()}; code ${codeVersion()}.`, ''];
const [nodeMs, helpMs] = alternate([() => wallMs(['-e', '0']), () => wallMs(['bin/veer.js', '--help'])], ROUNDS);
const ratio = spreadOf(helpMs.map((h, i) => h / nodeMs[i]));
const met = ratio.median <= 4;
lines.push(`## \`veer --help\` against \`node -e 0\`, ${ROUNDS} alternating rounds (wall ms, median (min–max))`, '',
  '| command | ms |', '|---|---|',
  `| node -e 0 (peer) | ${formatSpread(spreadOf(nodeMs))} |`,
  `| node bin/veer.js --help | ${formatSpread(spreadOf(helpMs))} |`, '',
  `Ratio veer --help / node -e 0 (per round): ${formatSpread(ratio, 2)} (target ≤ 4): ${met ? 'met' : 'NOT met'}.`, '');

const demo = ['plan', 'examples/flyby-demo.json'];
const baselineDir = baselineCommit ? checkout(baselineCommit) : null;
const contenders: { name: string; run: () => number }[] = [
  { name: 'compiled, bundled (node bin/veer.js: dist/cli-bundle/)', run: () => wallMs(['bin/veer.js', ...demo]) },
  { name: 'compiled, not bundled (node dist/cli/run.js)', run: () => wallMs(['dist/cli/run.js', ...demo]) },
  { name: 'same sources through tsx (node --import tsx cli/run.ts)', run: () => wallMs(['--import', 'tsx', 'cli/run.ts', ...demo]) },
];
if (baselineDir) contenders.push({ name: `the issue's demo: checkout ${baselineCommit} (node bin/veer.js, tsx)`, run: () => wallMs(['bin/veer.js', ...demo], baselineDir) });
let demoMs: number[][];
try {
  demoMs = alternate(contenders.map((c) => c.run), DEMO_ROUNDS);
} finally {
  if (baselineDir) rmSync(baselineDir, { recursive: true, force: true });
}
/** Seconds the bundled build saved against contender i, per round. */
const savedVs = (i: number) => spreadOf(demoMs[i].map((t, k) => (t - demoMs[0][k]) / 1000));
const verdict = (s: ReturnType<typeof spreadOf>): string => `${formatSpread(s, 2)} s (target ≥ 0.7 s): ${s.median >= 0.7 ? 'met' : 'NOT met'}`;
const savedTsx = savedVs(2);
const savedIssue = baselineDir ? savedVs(3) : null;
lines.push(`## \`npm run demo\`'s command, ${DEMO_ROUNDS} alternating rounds`, '',
  '| how | wall ms, median (min–max) |', '|---|---|',
  ...contenders.map((c, i) => `| ${c.name} | ${formatSpread(spreadOf(demoMs[i]), 0)} |`), '',
  ...(savedIssue ? [`Saved against the issue's demo (per round): ${verdict(savedIssue)}.`] : []),
  `Saved against the same sources through tsx (per round; the build's share alone): ${verdict(savedTsx)}.`,
  `Saved by the bundle against tsc's module tree (per round): ${formatSpread(savedVs(1), 2)} s.`, '');

const heading = '## Run history';
const load = os.loadavg()[0].toFixed(1);
/** Rows of runs before the load and issue columns existed: those columns left empty ('–'). */
const widenOldRow = (r: string): string => {
  const cells = r.split('|').slice(1, -1);
  return cells.length === 6 ? `|${[...cells.slice(0, 2), ' – ', ...cells.slice(2), ' – '].join('|')}|` : r;
};
const row = `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${load} | ${spreadOf(nodeMs).median.toFixed(0)} | ${spreadOf(helpMs).median.toFixed(0)} | ${ratio.median.toFixed(2)} | ${savedTsx.median.toFixed(2)} | ${savedIssue ? savedIssue.median.toFixed(2) : '–'} |`;
lines.push(heading, '', '| date | code | load at end | node -e 0 ms | veer --help ms | ratio | demo saved vs tsx s | demo saved vs issue s |', '|---|---|---|---|---|---|---|---|',
  ...historyRows(RESULTS, heading, row).map(widenOldRow), '');
writeFileSync(RESULTS, lines.join('\n'));
console.log(lines.join('\n'));
