#!/usr/bin/env node
// `npm run setup`: makes sure the real parts the tests use are on this machine, and installs the missing ones.
//   redis-server                  Debian package `redis-server`
//   PostgreSQL initdb and pg_ctl  Debian package `postgresql`     (PG_BIN, else /usr/lib/postgresql/<newest>/bin)
//   Chromium                      Debian package `chromium`       (CHROMIUM_PATH, else /usr/bin/chromium)
// Needed even when REDIS_URL / DATABASE_URL name servers: the Redis restart tests and the PostgreSQL harness
// tests start servers of their own. Missing ones come from apt-get when running as root (or through `sudo -n`
// when that needs no password); otherwise it stops with the exact command to run. Before installing it prints
// every package apt-get will install or upgrade for them (dependencies included, from `apt-get -s`), after it
// what is installed. When everything is present it only looks (a few ms) and installs nothing: run it any
// number of times. Plain JavaScript on purpose: it runs before anything is built. `--check` reports without
// installing.
import { spawnSync } from 'node:child_process';
import { accessSync, constants, existsSync, readdirSync } from 'node:fs';
import { delimiter, join } from 'node:path';
import { pathToFileURL } from 'node:url';

/** True when `name` is an executable file in one of PATH's folders. */
export function onPath(name, pathVar = process.env.PATH ?? '') {
  return pathVar.split(delimiter).filter(Boolean).some((dir) => {
    try { accessSync(join(dir, name), constants.X_OK); return true; } catch { return false; }
  });
}

/** The folder holding initdb and pg_ctl, in the order test/harness/postgres.ts looks; null when none. */
export function postgresBinDir(env = process.env, root = '/usr/lib/postgresql') {
  if (env.PG_BIN && existsSync(join(env.PG_BIN, 'initdb'))) return env.PG_BIN;
  if (!existsSync(root)) return null;
  const versions = readdirSync(root).filter((v) => existsSync(join(root, v, 'bin', 'initdb')) && existsSync(join(root, v, 'bin', 'pg_ctl')));
  return versions.length ? join(root, versions.sort((a, b) => Number(b) - Number(a))[0], 'bin') : null;
}

/** Where the tests look for Chromium: CHROMIUM_PATH, else Debian's /usr/bin/chromium. */
export function chromiumPath(env = process.env) {
  return env.CHROMIUM_PATH ?? '/usr/bin/chromium';
}

/** Debian packages still needed for the tests, given the environment (what the test harness will look for). */
export function missingPackages(env = process.env, pgRoot = '/usr/lib/postgresql') {
  const need = [];
  if (!onPath('redis-server', env.PATH)) need.push('redis-server');
  if (!postgresBinDir(env, pgRoot)) need.push('postgresql');
  if (!existsSync(chromiumPath(env))) need.push('chromium');
  return need;
}

/**
 * What `apt-get -s install` (a simulation) says it would do: one entry per `Inst` line, the package, the
 * version installed now (null when new) and the version it brings.
 */
export function parseAptSimulation(text) {
  return text.split('\n').flatMap((line) => {
    const m = /^Inst (\S+) (?:\[([^\]]+)\] )?\((\S+)/.exec(line);
    return m ? [{ name: m[1], from: m[2] ?? null, to: m[3] }] : [];
  });
}

/** One line per package: `name version (new)` or `name old → new (upgrade)`. */
export function describePlan(plan) {
  return plan.map((p) => (p.from ? `${p.name} ${p.from} → ${p.to} (upgrade)` : `${p.name} ${p.to} (new)`));
}

function run(cmd, args, capture = false) {
  if (!capture) process.stderr.write(`setup: ${cmd} ${args.join(' ')}\n`);
  const r = spawnSync(cmd, args, {
    stdio: capture ? ['ignore', 'pipe', 'inherit'] : 'inherit', encoding: 'utf8', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (exit ${r.status ?? r.signal ?? r.error?.message})`);
  return r.stdout ?? '';
}

function install(need) {
  const aptArgs = ['install', '-y', '-q', '--no-install-recommends', ...need];
  const asRoot = process.getuid?.() === 0;
  const sudoOk = !asRoot && onPath('sudo') && spawnSync('sudo', ['-n', 'true'], { stdio: 'ignore' }).status === 0;
  if (!onPath('apt-get') || (!asRoot && !sudoOk)) {
    throw new Error(`missing ${need.join(', ')}; install them (Debian: sudo apt-get ${aptArgs.join(' ')}), `
      + 'or point PG_BIN / CHROMIUM_PATH at your own (redis-server must be on PATH)');
  }
  const [cmd, ...pre] = asRoot ? ['apt-get'] : ['sudo', '-n', 'apt-get'];
  run(cmd, [...pre, 'update', '-q']);
  const plan = parseAptSimulation(run(cmd, [...pre, '-s', '-q', 'install', '--no-install-recommends', ...need], true));
  process.stderr.write(`setup: apt-get will install ${plan.length} package(s) for ${need.join(', ')}:\n`
    + describePlan(plan).map((l) => `setup:   ${l}\n`).join(''));
  run(cmd, [...pre, ...aptArgs]);
  const still = missingPackages();
  if (still.length) throw new Error(`still missing after apt-get: ${still.join(', ')}`);
  process.stderr.write(`setup: installed ${need.join(', ')}; the tests' parts are all present now\n`);
}

function main(argv) {
  const need = missingPackages();
  if (need.length === 0) return 0;
  if (argv.includes('--check')) {
    process.stdout.write(`setup: missing ${need.join(' ')}\n`);
    return 1;
  }
  process.stderr.write(`setup: the tests need ${need.join(', ')}; installing from Debian's packages\n`);
  install(need);
  return 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  try {
    process.exitCode = main(process.argv.slice(2));
  } catch (error) {
    process.stderr.write(`setup: ${error.message}\n`);
    process.exitCode = 1;
  }
}
