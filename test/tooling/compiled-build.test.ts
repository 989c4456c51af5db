/**
 * What production runs: the compiled build (dist/, plain node, no TypeScript loader) of the `veer` command and of
 * `npm run serve` (API, worker with its planner threads, CCSDS export threads, the built console), and the
 * service's stop on SIGTERM or SIGINT: drained and gone, private Redis included, within 10 s (issue's limit).
 * The other tests run the sources through vitest; this file covers the built paths.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { COMMANDS } from '../../cli/commands/index.ts';
import { alive, buildAll, descendants, ROOT } from '../harness/built.ts';
import { freePort } from '../harness/free-port.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';

const STOP_LIMIT_MS = 10_000;
const dirs: string[] = [];
const tempDir = (): string => { const d = mkdtempSync(join(tmpdir(), 'veer-built-')); dirs.push(d); return d; };

function veer(args: string[]): { status: number | null; stdout: string; stderr: string } {
  return spawnSync(process.execPath, ['bin/veer.js', ...args], { cwd: ROOT, encoding: 'utf8' });
}

interface Serve { npm: ChildProcess; url: Promise<string>; exited: Promise<number | null>; stderr: () => string }

/** `npm run serve` as a user types it, on a free port with its own data folder and private Redis. */
function startServe(dataDir: string, port: number): Serve {
  const npm = spawn('npm', ['run', 'serve'], {
    cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'],
    env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', REDIS_URL: '', LOG_LEVEL: 'warn' },
  });
  let stderr = '';
  const url = new Promise<string>((resolve, reject) => {
    npm.stderr?.on('data', (d: Buffer) => {
      stderr += d.toString();
      const m = /console at (http:\/\/\S+\/console\/)/.exec(stderr);
      if (m) resolve(m[1]);
    });
    npm.once('exit', (code) => reject(new Error(`npm run serve exited (${code}) before printing the console URL:\n${stderr}`)));
  });
  const exited = new Promise<number | null>((r) => npm.once('exit', (code) => r(code)));
  return { npm, url, exited, stderr: () => stderr };
}

/** Sends `signal` to `target`, then waits for npm to exit; the ms it took and who of the tree is still alive. */
async function stopAndWatch(serve: Serve, target: number, signal: NodeJS.Signals): Promise<{ ms: number; code: number | null; left: number[]; tree: number[] }> {
  const tree = descendants(serve.npm.pid!);
  const t = Date.now();
  process.kill(target, signal);
  const code = await Promise.race([serve.exited, new Promise<null>((r) => setTimeout(() => r(null), STOP_LIMIT_MS + 5_000))]);
  return { ms: Date.now() - t, code, left: tree.filter(alive), tree };
}

beforeAll(() => { buildAll(); }, 600_000);
afterAll(() => { for (const d of dirs) rmSync(d, { recursive: true, force: true }); });

describe('the compiled build', () => {
  describe('when `veer` runs with plain node from dist/', () => {
    it('should list every command and run one', () => {
      const help = veer(['--help']);
      expect(help.status).toBe(0);
      for (const c of COMMANDS) expect(help.stdout).toContain(`  ${c.name.padEnd(12)} ${c.summary}`);
      const run = veer(['propagate', 'examples/propagate-two-body.json', '--json']);
      expect(run.stderr).not.toMatch(/tsx|ERR_/);
      expect(run.status).toBe(0);
      expect(JSON.parse(run.stdout).schema).toBe('veer.propagate.result/1');
    });

    it('should find every worker-thread module its bundle may start beside it (dist/cli-bundle/)', () => {
      const dir = join(ROOT, 'dist/cli-bundle');
      const started = readdirSync(dir).filter((f) => f.endsWith('.js'))
        .flatMap((f) => [...readFileSync(join(dir, f), 'utf8').matchAll(/"\.\/([\w-]+-thread\.js)"/g)].map((m) => m[1]));
      expect(started).toEqual(expect.arrayContaining(['verify-thread.js', 'export-thread.js', 'sample-thread.js']));
      for (const file of new Set(started)) expect(existsSync(join(dir, file)), file).toBe(true);
    });
  });

  describe('when `npm run serve` runs and gets SIGTERM', () => {
    it('should serve the console, plan on a built planner thread, export on a built export thread, then stop leaving nothing', async () => {
      const dataDir = tempDir();
      const added = veer(['tokens', 'add', 'built-test', '--role', 'submitter', '--role', 'auditor', '--data-dir', dataDir, '--json']);
      expect(added.status).toBe(0);
      const auth = { authorization: `Bearer ${JSON.parse(added.stdout).token as string}`, 'content-type': 'application/json' };
      const serve = startServe(dataDir, await freePort());
      try {
        const consoleUrl = await serve.url;
        const page = await fetch(consoleUrl);
        expect(page.status).toBe(200);
        expect(await page.text()).toMatch(/<script[^>]+src="[^"]*assets\//);
        const api = new URL(consoleUrl).origin;
        const job = await (await fetch(`${api}/v1/jobs`, { method: 'POST', headers: auth, body: JSON.stringify(submission(reachableProblem())) })).json();
        let status: any = null;
        for (let i = 0; i < 600 && status?.state !== 'completed' && status?.state !== 'failed'; i++) {
          await new Promise((r) => setTimeout(r, 100));
          status = await (await fetch(`${api}/v1/jobs/${job.jobId}`, { headers: auth })).json();
        }
        expect(status).toEqual(expect.objectContaining({ state: 'completed' }));
        const oem = await fetch(`${api}/v1/plans/${status.result.planId}/ccsds/oem?stepS=600`, { headers: auth });
        expect(oem.status).toBe(200);
        expect(await oem.text()).toMatch(/^CCSDS_OEM_VERS\s*=/m);
      } finally {
        const stop = await stopAndWatch(serve, serve.npm.pid!, 'SIGTERM');
        expect(stop.tree.length).toBeGreaterThanOrEqual(2); // node, and the private redis-server under it
        expect(stop.code).toBe(0);
        expect(stop.ms).toBeLessThan(STOP_LIMIT_MS);
        expect(stop.left).toEqual([]);
      }
    }, 180_000);
  });

  describe('when the node process of `npm run serve` gets SIGINT', () => {
    it('should stop the same way, private Redis included', async () => {
      const serve = startServe(tempDir(), await freePort());
      await serve.url;
      const [node] = descendants(serve.npm.pid!);
      const stop = await stopAndWatch(serve, node, 'SIGINT');
      expect(serve.stderr()).toMatch(/SIGINT: stopping/);
      expect(stop.code).toBe(0);
      expect(stop.ms).toBeLessThan(STOP_LIMIT_MS);
      expect(stop.left).toEqual([]);
    }, 120_000);
  });
});
