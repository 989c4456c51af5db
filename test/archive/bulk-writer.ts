/**
 * A fast bulk writer for large archives in tests and benchmarks: sealed entries (real hashes, a real chain)
 * inserted in one SQLite transaction, bypassing the per-entry append path. Entries are job-submitted entries
 * with an invented problem of about 1 KB, so no plan projection rows are needed for the chain to verify.
 */
import Database from 'better-sqlite3';
import { ENTRY_COLUMNS, entryValues } from '../../archive/rows.ts';
import { sealEntry } from '../../archive/chain.ts';
import type { ArchiveEntry } from '../../archive/index.ts';
import { PROBLEM } from './fixtures.ts';

/** Appends `count` entries after the archive's head in the SQLite file `file`; returns the new head. */
export function bulkAppendSqlite(file: string, count: number): { sequence: number; hash: string } {
  const db = new Database(file);
  try {
    const head = db.prepare('SELECT sequence, hash FROM archive_head WHERE id = 1').get() as { sequence: number; hash: string };
    const insert = db.prepare(`INSERT INTO archive_entries (${ENTRY_COLUMNS.join(', ')}) VALUES (${ENTRY_COLUMNS.map(() => '?').join(', ')})`);
    const filler = 'x'.repeat(800); // pads the payload to a realistic problem size
    let previous = head;
    db.transaction(() => {
      for (let i = 1; i <= count; i += 1) {
        const sequence = head.sequence + i;
        const entry: ArchiveEntry = sealEntry({
          sequence, at: new Date(Date.UTC(2031, 0, 1) + sequence * 1000).toISOString(), actor: 'bulk', kind: 'job-submitted',
          planId: null, jobId: `bulk-${sequence}`, previousHash: previous.hash,
          payload: { problem: { ...PROBLEM, n: sequence, note: filler }, problemHash: sequence.toString(16).padStart(64, '0'), reason: 'bulk test entry' },
        });
        insert.run(...entryValues(entry));
        previous = { sequence, hash: entry.hash };
      }
      db.prepare('UPDATE archive_head SET sequence = ?, hash = ? WHERE id = 1').run(previous.sequence, previous.hash);
    })();
    return previous;
  } finally {
    db.close();
  }
}
