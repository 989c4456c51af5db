/**
 * The SQLite token store keeps identities it found in memory: a revocation must still take effect on the very
 * next look-up, whether it was made through this store, through a second connection on the same file (the
 * `veer tokens revoke` command of another process stands for that), and the memory kept stays bounded.
 * Real SQLite files in a temp folder. The invalidation rests on `PRAGMA data_version`, documented at
 * https://sqlite.org/pragma.html#pragma_data_version (changes when another connection commits; not on the
 * connection's own commits).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { generateTokenSecret, SQLITE_TOKENS_FILE, SqliteTokenStore } from '../../api/auth/index.ts';
import { main } from '../../cli/main.ts';

describe('identities kept in memory by the SQLite token store', () => {
  let dir: string;
  let file: string;
  let store: SqliteTokenStore;
  const others: SqliteTokenStore[] = [];
  const another = (): SqliteTokenStore => {
    const s = new SqliteTokenStore(file);
    others.push(s);
    return s;
  };
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'veer-token-cache-'));
    file = join(dir, SQLITE_TOKENS_FILE);
    store = new SqliteTokenStore(file);
  });
  afterEach(async () => {
    await store.close();
    for (const s of others.splice(0)) await s.close();
    rmSync(dir, { recursive: true, force: true });
  });

  /** Adds a token and looks it up twice, so the second answer came from memory. */
  async function keptToken(name: string): Promise<{ token: string; id: string }> {
    const { token, record } = await store.add(name, ['submitter']);
    expect(await store.identify(token)).toEqual({ name, roles: ['submitter'], tokenId: record.id });
    expect(await store.identify(token)).toEqual({ name, roles: ['submitter'], tokenId: record.id });
    expect(store.cachedIdentityCount).toBe(1);
    return { token, id: record.id };
  }

  describe('when a kept token is revoked through a second connection on the same file', () => {
    it('should refuse it on the very next look-up', async () => {
      const { token, id } = await keptToken('ann');
      expect((await another().revoke(id))?.revokedAt).not.toBeNull();
      expect(await store.identify(token)).toBeUndefined();
      expect(store.cachedIdentityCount).toBe(0);
    });
  });

  describe('when a kept token is revoked by the veer tokens command', () => {
    it('should refuse it on the very next look-up', async () => {
      const { token, id } = await keptToken('bob');
      const out = vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
      try {
        expect(await main(['tokens', 'revoke', id, '--data-dir', dir, '--database-url', '', '--json'])).toBe(0);
      } finally {
        out.mockRestore();
      }
      expect(await store.identify(token)).toBeUndefined();
    });
  });

  describe('when a kept token is revoked through the same store', () => {
    it('should refuse it on the very next look-up, here and on other connections', async () => {
      const { token, id } = await keptToken('cy');
      const other = another();
      expect((await other.identify(token))?.tokenId).toBe(id);
      await store.revoke(id);
      expect(await store.identify(token)).toBeUndefined();
      expect(await other.identify(token)).toBeUndefined();
    });
  });

  describe('when tokens are added while others are kept', () => {
    it('should identify the new ones at once, through either connection, and keep the old ones valid', async () => {
      const { token: first, id } = await keptToken('dee');
      const other = another();
      const viaOther = await other.add('eve', ['auditor']);
      const viaStore = await store.add('fay', ['reviewer']);
      expect(await store.identify(viaOther.token)).toEqual({ name: 'eve', roles: ['auditor'], tokenId: viaOther.record.id });
      expect(await store.identify(viaStore.token)).toEqual({ name: 'fay', roles: ['reviewer'], tokenId: viaStore.record.id });
      expect(await other.identify(viaStore.token)).toEqual({ name: 'fay', roles: ['reviewer'], tokenId: viaStore.record.id });
      expect((await store.identify(first))?.tokenId).toBe(id);
    });
  });

  describe('when a kept identity is handed out', () => {
    it('should be frozen, so no request can change what the next one gets', async () => {
      const { token } = await keptToken('gil');
      const identity = (await store.identify(token))!;
      expect(Object.isFrozen(identity)).toBe(true);
      expect(() => identity.roles.push('admin')).toThrow(TypeError);
      expect((await store.identify(token))?.roles).toEqual(['submitter']);
    });
  });

  describe('when more tokens are presented than the bound', () => {
    it('should keep at most the bound and still identify every token', async () => {
      const bounded = new SqliteTokenStore(file, { cachedIdentitiesMax: 3 });
      others.push(bounded);
      const added = [];
      for (let i = 0; i < 5; i++) added.push(await store.add(`user${i}`, ['reviewer']));
      for (const { token, record } of added) {
        expect((await bounded.identify(token))?.tokenId).toBe(record.id);
        expect(bounded.cachedIdentityCount).toBeLessThanOrEqual(3);
      }
      expect(bounded.cachedIdentityCount).toBe(3);
      for (const { token, record } of added) expect((await bounded.identify(token))?.tokenId).toBe(record.id);
      await store.revoke(added[4].record.id);
      expect(await bounded.identify(added[4].token)).toBeUndefined();
    });

    it('should keep nothing for unknown tokens', async () => {
      await keptToken('hal');
      for (let i = 0; i < 200; i++) expect(await store.identify(generateTokenSecret())).toBeUndefined();
      expect(store.cachedIdentityCount).toBe(1);
    });

    it('should refuse a bound that is not a positive integer, naming the option', () => {
      expect(() => new SqliteTokenStore(file, { cachedIdentitiesMax: 0 })).toThrow(/^cachedIdentitiesMax:/);
      expect(() => new SqliteTokenStore(file, { cachedIdentitiesMax: 2.5 })).toThrow(/^cachedIdentitiesMax:/);
    });
  });
});
