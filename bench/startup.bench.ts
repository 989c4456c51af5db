/**
 * npm run bench:startup — start-up time of the compiled `veer` command against `node -e 0` (the peer: Node's own
 * start-up), measured in the same run, alternating one of each per round; wall time of the whole process.
 * Target: `veer --help` within 4× of `node -e 0` (median of the per-round ratios).
 *
 * Then `npm run demo`'s command (`node bin/veer.js plan examples/flyby-demo.json`, compiled) against the same
 * sources run the way bin/veer.js ran them before the build existed (`node --import tsx cli/run.ts ...`),
 * alternating, median of the per-round differences. Target: at least 0.7 s faster. `--baseline DIR` adds the
 * demo of another checkout DIR (e.g. a worktree of the last commit before the build) as a third contender.
 *
 * Writes bench/results/startup.md. Needs `npm run build` first (the bench refuses a missing dist/).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
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
const baseline = arg('--baseline');

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

if (!existsSync(join(ROOT, 'dist/cli/main.js'))) throw new Error('dist/ is missing: run `npm run build` first');

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
const contenders: { name: string; run: () => number }[] = [
  { name: 'same sources through tsx (node --import tsx cli/run.ts)', run: () => wallMs(['--import', 'tsx', 'cli/run.ts', ...demo]) },
  { name: 'compiled (node bin/veer.js)', run: () => wallMs(['bin/veer.js', ...demo]) },
];
if (baseline) contenders.push({ name: `checkout ${baseline} (node bin/veer.js)`, run: () => wallMs(['bin/veer.js', ...demo], resolve(baseline)) });
const demoMs = alternate(contenders.map((c) => c.run), DEMO_ROUNDS);
const savedVs = (i: number) => spreadOf(demoMs[i].map((t, k) => (t - demoMs[1][k]) / 1000));
const saved = savedVs(0);
const demoRow = saved.median.toFixed(2);
lines.push(`## \`npm run demo\`'s command, ${DEMO_ROUNDS} alternating rounds`, '',
  '| how | wall ms, median (min–max) |', '|---|---|',
  ...contenders.map((c, i) => `| ${c.name} | ${formatSpread(spreadOf(demoMs[i]), 0)} |`), '',
  `Saved by the compiled build against the same sources through tsx (per round): ${formatSpread(saved, 2)} s (target ≥ 0.7 s): ${saved.median >= 0.7 ? 'met' : 'NOT met'}.`,
  ...(baseline ? [`Against the checkout ${baseline}: ${formatSpread(savedVs(2), 2)} s (its planner may differ from this one's).`] : []), '');

const heading = '## Run history';
const row = `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${spreadOf(nodeMs).median.toFixed(0)} | ${spreadOf(helpMs).median.toFixed(0)} | ${ratio.median.toFixed(2)} | ${demoRow} |`;
lines.push(heading, '', '| date | code | node -e 0 ms | veer --help ms | ratio | demo saved s |', '|---|---|---|---|---|---|',
  ...historyRows(RESULTS, heading, row), '');
writeFileSync(RESULTS, lines.join('\n'));
console.log(lines.join('\n'));
