/**
 * The SQLite store (better-sqlite3, WAL mode): the embedded default, one file in the data folder.
 * Appends are serialised in the database: every write runs in a `BEGIN IMMEDIATE` transaction, which takes
 * SQLite's single write lock across all processes using the file (others wait up to `busyTimeoutMs`).
 * Inside one process the connection is shared, so a small queue keeps one transaction at a time on it.
 */
import Database from 'better-sqlite3';
import { closeSync, mkdirSync, openSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { MIGRATION_HISTORY_COLUMNS, pendingMigrations } from '../migrations.ts';
import { ArchiveWrites } from '../archive-writes.ts';
import { checkedListing, checkedPlan, type ArchiveTx } from '../operations.ts';
import { clampLimit, ENTRY_COLUMNS, entryFromRow, entryValues, JOB_COLUMNS, jobFromRow, jobValues, PLAN_COLUMNS, planFromRow, planValues } from '../rows.ts';
import { verifyOffThread } from '../verify-off-thread.ts';
import { verifySource, type VerifySource } from '../verify.ts';
import { SQLITE_ARCHIVE_MIGRATIONS } from './sqlite-migrations.ts';
import type { ArchivablePlan, ArchiveEntry, EntryKind, JobRecord, PlanArchive, PlanFilter, PlanRecord, VerifyOptions, VerifyReport } from '../../contract/archive-types.ts';
import type { ManeuverPlan } from '../../contract/plan-types.ts';

export interface SqliteArchiveOptions {
  /** Path of the database file (created with its folder if missing). */
  file: string;
  /** How long a writer waits for another process's write lock. @defaultValue 15000 */
  busyTimeoutMs?: number;
  /** Clock for entry times. @defaultValue () => new Date() */
  now?: () => Date;
}

type Row = Record<string, unknown>;

/** Runs the schema migrations not yet applied (inside one write transaction, so concurrent starts are safe). */
export function migrateSqlite(db: Database.Database, table = 'schema_migrations', migrations = SQLITE_ARCHIVE_MIGRATIONS): number {
  db.exec(`CREATE TABLE IF NOT EXISTS ${table} ${MIGRATION_HISTORY_COLUMNS}`);
  const run = db.transaction(() => {
    const done = new Set((db.prepare(`SELECT version FROM ${table}`).all() as Row[]).map((r) => Number(r.version)));
    let applied = 0;
    for (const m of pendingMigrations(migrations, done)) {
      db.exec(m.sql);
      db.prepare(`INSERT INTO ${table} (version, name, applied_at) VALUES (?, ?, ?)`).run(m.version, m.name, new Date().toISOString());
      applied += 1;
    }
    return applied;
  });
  return run.immediate();
}

function sqliteHead(db: Database.Database): { sequence: number; hash: string } {
  const row = db.prepare('SELECT sequence, hash FROM archive_head WHERE id = 1').get() as Row;
  return { sequence: Number(row.sequence), hash: String(row.hash) };
}

function sqlitePage(db: Database.Database, from: number, limit: number): ArchiveEntry[] {
  return (db.prepare('SELECT * FROM archive_entries WHERE sequence >= ? ORDER BY sequence LIMIT ?').all(from, limit) as Row[]).map(entryFromRow);
}

/** What verification reads (head, entries by sequence, plan projections); run it inside one read transaction. */
export function sqliteVerifySource(db: Database.Database): VerifySource {
  return {
    head: async () => sqliteHead(db),
    page: async (from, limit) => sqlitePage(db, from, limit),
    plans: async () => (db.prepare('SELECT * FROM archive_plans').all() as Row[]).map(planFromRow),
  };
}

/**
 * Opens (creating if needed) a SQLite database file in WAL mode with a busy timeout. A new file is created
 * mode 0600 in a folder created 0700 (plans, reviews and token hashes are for the service's user only); SQLite
 * gives its -wal and -shm files the database file's mode.
 */
export function openSqliteDatabase(file: string, busyTimeoutMs = 15_000): Database.Database {
  if (file !== ':memory:') {
    mkdirSync(dirname(file), { recursive: true, mode: 0o700 });
    closeSync(openSync(file, 'a', 0o600)); // an empty file is a new database to SQLite
  }
  const db = new Database(file, { timeout: busyTimeoutMs });
  db.pragma('journal_mode = WAL');
  db.pragma('synchronous = FULL');
  db.pragma(`busy_timeout = ${busyTimeoutMs}`);
  return db;
}

/**
 * One connection per file per process, shared by every SqliteArchive on that file. better-sqlite3 is
 * synchronous: a second connection in the same process waiting for the write lock would block the event
 * loop that the lock holder needs to finish, so in-process writers share the connection and its queue.
 */
interface SharedConnection { db: Database.Database; queue: Promise<unknown>; users: number }
const connections = new Map<string, SharedConnection>();

function acquire(file: string, busyTimeoutMs?: number): SharedConnection {
  const key = resolve(file);
  let shared = connections.get(key);
  if (!shared) {
    const db = openSqliteDatabase(file, busyTimeoutMs);
    migrateSqlite(db);
    shared = { db, queue: Promise.resolve(), users: 0 };
    connections.set(key, shared);
  }
  shared.users += 1;
  return shared;
}

function release(file: string): void {
  const key = resolve(file);
  const shared = connections.get(key);
  if (!shared) return;
  shared.users -= 1;
  if (shared.users <= 0) {
    connections.delete(key);
    shared.db.close();
  }
}

export class SqliteArchive extends ArchiveWrites implements PlanArchive {
  readonly storeKind = 'sqlite' as const;
  private readonly file: string;
  private readonly shared: SharedConnection;
  private readonly db: Database.Database;
  protected readonly now: () => Date;
  private readonly tx: ArchiveTx;
  private closed = false;

  constructor(options: SqliteArchiveOptions) {
    super();
    this.file = options.file;
    this.shared = acquire(options.file, options.busyTimeoutMs);
    this.db = this.shared.db;
    this.now = options.now ?? (() => new Date());
    this.tx = this.makeTx();
  }

  /** The plan record checked against its entries (ArchiveIntegrityError when the table was edited). */
  getPlan(planId: string): Promise<PlanRecord | undefined> {
    return this.read(() => checkedPlan(this.tx, planId));
  }
  getPlanByJob(jobId: string): Promise<PlanRecord | undefined> {
    return this.read(() => this.tx.getPlanByJob(jobId));
  }
  getJob(jobId: string): Promise<JobRecord | undefined> {
    return this.read(() => this.tx.getJob(jobId));
  }
  getPlanDocument(planId: string): Promise<ManeuverPlan | undefined> {
    return this.read(async () => {
      const row = this.db.prepare("SELECT * FROM archive_entries WHERE plan_id = ? AND kind = 'plan-proposed' ORDER BY sequence LIMIT 1").get(planId) as Row | undefined;
      return row ? (entryFromRow(row).payload.plan as ManeuverPlan) : undefined;
    });
  }
  listPlans(filter: PlanFilter = {}): Promise<PlanRecord[]> {
    return this.read(async () => {
      const where: string[] = [];
      const values: unknown[] = [];
      if (filter.state) { where.push('state = ?'); values.push(filter.state); }
      if (filter.spacecraftName) { where.push('spacecraft_name = ?'); values.push(filter.spacecraftName); }
      if (filter.from) { where.push('proposed_at >= ?'); values.push(filter.from); }
      if (filter.to) { where.push('proposed_at < ?'); values.push(filter.to); }
      if (filter.converged !== undefined) { where.push('converged = ?'); values.push(filter.converged ? 1 : 0); }
      const sql = `SELECT * FROM archive_plans ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
        ORDER BY proposed_sequence DESC LIMIT ? OFFSET ?`;
      const rows = (this.db.prepare(sql).all(...values, clampLimit(filter.limit), Math.max(0, filter.offset ?? 0)) as Row[]).map(planFromRow);
      return checkedListing(this.tx, rows);
    });
  }
  history(planId: string): Promise<ArchiveEntry[]> {
    return this.read(async () => {
      const plan = await checkedPlan(this.tx, planId);
      const rows = plan
        ? this.db.prepare('SELECT * FROM archive_entries WHERE plan_id = ? OR job_id = ? ORDER BY sequence').all(planId, plan.jobId)
        : this.db.prepare('SELECT * FROM archive_entries WHERE plan_id = ? ORDER BY sequence').all(planId);
      return (rows as Row[]).map(entryFromRow);
    });
  }
  entries(fromSequence = 1, limit = 1000): Promise<ArchiveEntry[]> {
    return this.read(async () => sqlitePage(this.db, fromSequence, clampLimit(limit, 1000)));
  }
  head(): Promise<{ sequence: number; hash: string }> {
    return this.read(() => this.tx.head());
  }

  /**
   * Verifies inside one read transaction (a WAL snapshot), so concurrent appends do not disturb it. A file
   * store is verified in a thread of its own on a read-only connection (verify-off-thread.ts), off this event
   * loop and off the write queue; only an in-memory store is walked here.
   */
  verify(options: VerifyOptions = {}): Promise<VerifyReport> {
    if (this.file !== ':memory:') return verifyOffThread({ kind: 'sqlite', file: resolve(this.file) }, options);
    return this.serial(async () => {
      this.db.exec('BEGIN DEFERRED');
      try {
        return await verifySource(sqliteVerifySource(this.db), options);
      } finally {
        this.db.exec('COMMIT');
      }
    });
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await this.serial(async () => release(this.file));
  }

  /** One operation at a time on this connection (the cross-process lock is SQLite's, taken by BEGIN IMMEDIATE). */
  private serial<T>(fn: () => Promise<T>): Promise<T> {
    const run = this.shared.queue.then(fn, fn);
    this.shared.queue = run.catch(() => undefined);
    return run;
  }

  private read<T>(fn: () => Promise<T>): Promise<T> {
    return this.serial(fn);
  }

  protected write<T>(fn: (tx: ArchiveTx) => Promise<T>): Promise<T> {
    return this.serial(async () => {
      this.db.exec('BEGIN IMMEDIATE');
      try {
        const result = await fn(this.tx);
        this.db.exec('COMMIT');
        return result;
      } catch (error) {
        if (this.db.inTransaction) this.db.exec('ROLLBACK');
        throw error;
      }
    });
  }

  private makeTx(): ArchiveTx {
    const db = this.db;
    const insertEntry = db.prepare(`INSERT INTO archive_entries (${ENTRY_COLUMNS.join(', ')}) VALUES (${ENTRY_COLUMNS.map(() => '?').join(', ')})`);
    const moveHead = db.prepare('UPDATE archive_head SET sequence = ?, hash = ? WHERE id = 1');
    const putPlan = db.prepare(`INSERT OR REPLACE INTO archive_plans (${PLAN_COLUMNS.join(', ')}) VALUES (${PLAN_COLUMNS.map(() => '?').join(', ')})`);
    const putJob = db.prepare(`INSERT OR REPLACE INTO archive_jobs (${JOB_COLUMNS.join(', ')}) VALUES (${JOB_COLUMNS.map(() => '?').join(', ')})`);
    return {
      head: async () => sqliteHead(db),
      insertEntry: async (entry: ArchiveEntry) => {
        insertEntry.run(...entryValues(entry));
        moveHead.run(entry.sequence, entry.hash);
      },
      getJob: async (jobId: string) => {
        const row = db.prepare('SELECT * FROM archive_jobs WHERE job_id = ?').get(jobId) as Row | undefined;
        return row ? jobFromRow(row) : undefined;
      },
      putJob: async (job: JobRecord) => { putJob.run(...jobValues(job)); },
      getPlan: async (planId: string) => {
        const row = db.prepare('SELECT * FROM archive_plans WHERE plan_id = ?').get(planId) as Row | undefined;
        return row ? planFromRow(row) : undefined;
      },
      getPlanByJob: async (jobId: string) => {
        const row = db.prepare('SELECT * FROM archive_plans WHERE job_id = ?').get(jobId) as Row | undefined;
        return row ? planFromRow(row) : undefined;
      },
      putPlan: async (plan: PlanRecord) => { putPlan.run(...planValues(plan, 'integer')); },
      proposedPlansFor: async (spacecraftName: string, targetSetKey: string) =>
        (db.prepare("SELECT * FROM archive_plans WHERE spacecraft_name = ? AND target_set_key = ? AND state = 'proposed' ORDER BY proposed_sequence")
          .all(spacecraftName, targetSetKey) as Row[]).map(planFromRow),
      entriesOfJob: async (jobId: string, kinds: readonly EntryKind[]) =>
        (db.prepare(`SELECT * FROM archive_entries WHERE job_id = ? AND kind IN (${kinds.map(() => '?').join(', ')}) ORDER BY sequence`)
          .all(jobId, ...kinds) as Row[]).map(entryFromRow),
      entriesOfPlan: async (planId: string) =>
        (db.prepare('SELECT * FROM archive_entries WHERE plan_id = ? ORDER BY sequence').all(planId) as Row[]).map(entryFromRow),
    };
  }
}
