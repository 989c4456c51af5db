/**
 * A released migration is never edited (common practice for versioned schemas: a store that applied version 1
 * records only its number, so changed text would silently give new and old stores different schemas). Both
 * stores' version 1 is generated from one description (archive/archive-schema-v1.ts); these digests are the
 * SHA-256 of the SQL text each store applied before that, computed from the earlier source files' text.
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { POSTGRES_ARCHIVE_MIGRATIONS } from '../../archive/postgres/postgres-migrations.ts';
import { SQLITE_ARCHIVE_MIGRATIONS } from '../../archive/sqlite/sqlite-migrations.ts';

const sha256 = (text: string): string => createHash('sha256').update(text, 'utf8').digest('hex');

describe('released archive migrations', () => {
  it('should keep the SQLite store\'s version 1 text exactly as released', () => {
    expect(SQLITE_ARCHIVE_MIGRATIONS[0]?.version).toBe(1);
    expect(sha256(SQLITE_ARCHIVE_MIGRATIONS[0]!.sql)).toBe('6ccd8efc5ec4fe1e7ab78aa6cfe57fcef9b2c7f49b3d9582fcd5754e7b0a30f1');
  });

  it('should keep the PostgreSQL store\'s version 1 text exactly as released', () => {
    expect(POSTGRES_ARCHIVE_MIGRATIONS[0]?.version).toBe(1);
    expect(sha256(POSTGRES_ARCHIVE_MIGRATIONS[0]!.sql)).toBe('75c2c9ba3f71225b08b2a7297ef6bb85ee04ca353a44ecd0aec5f2b8eaeb150a');
  });
});
