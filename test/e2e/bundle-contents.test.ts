/**
 * The browser bundle holds the console and the contract room only: no numerics (propagator/, planner/) and
 * nothing of the server rooms. Read from the source maps of a real `vite build`, so what is checked is what
 * the browser downloads, not what tree-shaking might leave out.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildConsole } from './build-console.ts';

const ROOT = resolve(import.meta.dirname, '../..');
let outDir = '';
let sources: string[] = [];

/** Project-relative paths of every module in the bundle's source maps. */
function bundledSources(dir: string): string[] {
  const found = new Set<string>();
  for (const entry of readdirSync(dir, { recursive: true, encoding: 'utf8' })) {
    if (!entry.endsWith('.js.map')) continue;
    const mapFile = join(dir, entry);
    const map = JSON.parse(readFileSync(mapFile, 'utf8')) as { sources: string[]; sourceRoot?: string };
    for (const s of map.sources) found.add(relative(ROOT, resolve(join(dir, entry, '..'), map.sourceRoot ?? '', s)));
  }
  return [...found].sort();
}

describe('console bundle', () => {
  beforeAll(() => {
    outDir = mkdtempSync(join(tmpdir(), 'veer-console-bundle-'));
    buildConsole(outDir);
    sources = bundledSources(outDir);
  });
  afterAll(() => { if (outDir) rmSync(outDir, { recursive: true, force: true }); });

  it('should bundle the console and the contract room', () => {
    expect(sources).toContain('console/src/main.ts');
    expect(sources).toContain('contract/problem-schema.ts');
  });

  it('should hold no module of the project outside console/src and contract/', () => {
    const project = sources.filter((s) => !s.startsWith('node_modules/') && !s.startsWith('..'));
    const outside = project.filter((s) => !s.startsWith('console/src/') && !s.startsWith('contract/'));
    expect(outside).toEqual([]);
    expect(sources.filter((s) => s.startsWith('propagator/'))).toEqual([]);
  });
});
