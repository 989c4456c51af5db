/**
 * contract/ sits under every room and is bundled into the browser console: it may import only its own
 * files, zod and package.json, and must not touch Node APIs (`process`, `node:*`, `Buffer`).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const CONTRACT = resolve(import.meta.dirname, '../../contract');
const files = readdirSync(CONTRACT).filter((f) => f.endsWith('.ts'));

describe('contract room', () => {
  it('should have files to check', () => {
    expect(files).toContain('problem-schema.ts');
  });

  it.each(files)('should import only contract files, zod and package.json in %s', (file) => {
    const text = readFileSync(join(CONTRACT, file), 'utf8');
    const specifiers = [...text.matchAll(/(?:from|import)\s*['"]([^'"]+)['"]/g)].map((m) => m[1]);
    const outside = specifiers.filter((s) => !/^\.\/[a-z0-9-]+\.ts$/.test(s) && s !== 'zod' && s !== '../package.json');
    expect(outside).toEqual([]);
    expect(text).not.toMatch(/\bprocess\.|\bBuffer\b|['"]node:/);
  });
});
