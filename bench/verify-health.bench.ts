/**
 * /health during a large archive verification (npm run bench:verify-health; writes
 * bench/results/verify-health.md): an archive of ENTRIES entries is built by the tests' bulk writer (real hashes,
 * one SQLite transaction), then GET /health is probed every 10 ms, first with nothing else running (the peer, same
 * run) and then while GET /v1/archive/verify walks the whole chain. p50/p99/max of the probes and the walk time
 * are what this run measured; the ratio of the two p99s is what compares across machines. Target (the issue):
 * p99 under 50 ms at 150k entries. API in this process, SQLite store, local Redis (REDIS_URL when set).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join, resolve } from 'node:path';
import { pino } from 'pino';
import { loadApiConfig, startApiServer } from '../api/index.ts';
import { openTokenStore } from '../api/auth/index.ts';
import { startLocalRedis, type LocalRedis } from '../queue/index.ts';
import { bulkAppendSqlite } from '../test/archive/bulk-writer.ts';
import { codeVersion, machineLine } from './bench-stats.ts';

const ROOT = resolve(import.meta.dirname, '..');
const ENTRIES = Number(process.env.BENCH_ENTRIES ?? 150_000);
const PEER_S = 5;

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
}

async function probe(url: string, until: () => boolean): Promise<number[]> {
  const out: number[] = [];
  while (!until()) {
    const t0 = performance.now();
    await (await fetch(`${url}/health`)).text();
    out.push(performance.now() - t0);
    await new Promise((r) => setTimeout(r, 10));
  }
  return out.sort((a, b) => a - b);
}

async function main(): Promise<void> {
  const dir = mkdtempSync(join(os.tmpdir(), 'veer-verify-bench-'));
  let local: LocalRedis | null = null;
  const redisUrl = process.env.REDIS_URL ?? (local = await startLocalRedis(join(dir, 'redis'))).url;
  const tokenStore = await openTokenStore({ dataDir: dir });
  const { token } = await tokenStore.add('audit', ['auditor']);
  const config = loadApiConfig({ REDIS_URL: redisUrl, QUEUE_PREFIX: 'vbench', HOST: '127.0.0.1', PORT: '0', DATA_DIR: dir, LOG_LEVEL: 'silent', RATE_LIMIT_MAX: '1000000' });
  const api = await startApiServer(config, pino({ level: 'silent' }), { tokens: tokenStore });
  const t0 = performance.now();
  const head = bulkAppendSqlite(join(dir, 'archive.sqlite'), ENTRIES);
  const buildS = (performance.now() - t0) / 1000;

  const peerEnd = Date.now() + PEER_S * 1000;
  const peer = await probe(api.url, () => Date.now() > peerEnd);
  let done = false;
  const started = performance.now();
  const verifying = fetch(`${api.url}/v1/archive/verify`, { headers: { authorization: `Bearer ${token}` } })
    .then((r) => r.json() as Promise<{ ok: boolean; entriesChecked: number }>).finally(() => { done = true; });
  const during = await probe(api.url, () => done);
  const report = await verifying;
  const walkS = (performance.now() - started) / 1000;
  const row = (name: string, xs: number[]): string =>
    `| ${name} | ${xs.length} | ${quantile(xs, 0.5).toFixed(1)} | ${quantile(xs, 0.99).toFixed(1)} | ${(xs.at(-1) ?? NaN).toFixed(1)} |`;
  const lines = [
    '# /health during a whole-archive verification',
    '',
    `Measured on ${machineLine()}; code ${codeVersion()}.`,
    `${ENTRIES} entries (head ${head.sequence}) written by the bulk writer in ${buildS.toFixed(1)} s; verification ${report.ok ? 'sound' : 'NOT sound'}, ${report.entriesChecked} entries in ${walkS.toFixed(1)} s (in its own thread).`,
    '',
    '| GET /health probes | count | p50 ms | p99 ms | max ms |',
    '|---|---|---|---|---|',
    row(`idle API, ${PEER_S} s (peer)`, peer),
    row('while the verification runs', during),
    '',
    `p99 during ÷ p99 idle: ${(quantile(during, 0.99) / quantile(peer, 0.99)).toFixed(2)}. Target from the issue: p99 < 50 ms at 150k entries.`,
  ];
  writeFileSync(join(ROOT, 'bench/results/verify-health.md'), `${lines.join('\n')}\n`);
  process.stdout.write(`${lines.join('\n')}\n`);
  await api.close();
  await tokenStore.close();
  await local?.stop();
  rmSync(dir, { recursive: true, force: true });
}

void main();
