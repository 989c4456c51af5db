/**
 * npm run bench:startup — start-up time of the compiled `veer` command against `node -e 0` (the peer: Node's own
 * start-up), measured in the same run, alternating one of each per round; wall time of the whole process.
 * Target: `veer --help` within 4× of `node -e 0` (median of the per-round ratios).
 *
 * `npm run bench:startup -- --baseline DIR` also times `npm run demo`'s command (`node bin/veer.js plan
 * examples/flyby-demo.json`) here and in the checkout DIR (e.g. a worktree of an older commit), alternating,
 * and reports the median difference. Target for the compiled build: at least 0.7 s faster than the tsx one.
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

let demoRow = '—';
if (baseline) {
  const demo = ['bin/veer.js', 'plan', 'examples/flyby-demo.json'];
  const [thenMs, nowMs] = alternate([() => wallMs(demo, resolve(baseline)), () => wallMs(demo)], DEMO_ROUNDS);
  const saved = spreadOf(thenMs.map((t, i) => (t - nowMs[i]) / 1000));
  demoRow = saved.median.toFixed(2);
  lines.push(`## \`npm run demo\`'s command, here against the checkout ${baseline} ${DEMO_ROUNDS} alternating rounds`, '',
    '| checkout | wall ms, median (min–max) |', '|---|---|',
    `| baseline (${baseline}) | ${formatSpread(spreadOf(thenMs), 0)} |`,
    `| this one | ${formatSpread(spreadOf(nowMs), 0)} |`, '',
    `Saved per run (per round): ${formatSpread(saved, 2)} s (target ≥ 0.7 s): ${saved.median >= 0.7 ? 'met' : 'NOT met'}.`, '');
}

const heading = '## Run history';
const row = `| ${new Date().toISOString().slice(0, 16)}Z | ${codeVersion()} | ${spreadOf(nodeMs).median.toFixed(0)} | ${spreadOf(helpMs).median.toFixed(0)} | ${ratio.median.toFixed(2)} | ${demoRow} |`;
lines.push(heading, '', '| date | code | node -e 0 ms | veer --help ms | ratio | demo saved s |', '|---|---|---|---|---|---|',
  ...historyRows(RESULTS, heading, row), '');
writeFileSync(RESULTS, lines.join('\n'));
console.log(lines.join('\n'));
