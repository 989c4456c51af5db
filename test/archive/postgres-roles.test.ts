/**
 * The database-role advice in README ("Operating the archive"): the service runs under a PostgreSQL role that does
 * not own the tables, with only the grants listed there. Checked on a real server: everything the service does
 * works (start-up with migrations already applied, appends, reviews, verification, tokens), and the role can
 * neither delete entries nor drop the append-only trigger. PostgreSQL privilege rules: its manual, GRANT.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTokenStore } from '../../api/auth/index.ts';
import { PostgresArchive } from '../../archive/index.ts';
import { startPostgres, type TestPostgres } from '../harness/postgres.ts';
import { makePlan, PROBLEM } from './fixtures.ts';

let server: TestPostgres;
beforeAll(async () => { server = await startPostgres(); });
afterAll(async () => { await server?.stop(); });

async function sql(url: string, statement: string): Promise<void> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try { await client.query(statement); } finally { await client.end(); }
}

describe('archive under a non-owner PostgreSQL role', () => {
  describe('when the service runs with the README grants only', () => {
    it('should do its work but be unable to delete entries or drop the guard', async () => {
      const ownerUrl = await server.freshDatabase();
      const schema = /search_path=(\w+)/.exec(decodeURIComponent(ownerUrl))![1];
      // The owner applies the migrations once.
      await (await new PostgresArchive({ connectionString: ownerUrl }).open()).close();
      await (await openTokenStore({ databaseUrl: ownerUrl })).close();
      const role = `veer_app_${process.pid}`;
      await sql(ownerUrl, `DROP ROLE IF EXISTS ${role}`).catch(() => undefined);
      await sql(ownerUrl, `CREATE ROLE ${role} LOGIN`);
      await sql(ownerUrl, `GRANT USAGE ON SCHEMA ${schema} TO ${role};
        GRANT SELECT, INSERT ON ${schema}.archive_entries TO ${role};
        GRANT SELECT, INSERT, UPDATE ON ${schema}.archive_head, ${schema}.archive_plans, ${schema}.archive_jobs, ${schema}.api_tokens TO ${role};
        GRANT SELECT ON ${schema}.schema_migrations, ${schema}.auth_schema_migrations TO ${role};`);
      const appUrl = new URL(ownerUrl);
      appUrl.username = role;
      const archive = await new PostgresArchive({ connectionString: appUrl.toString() }).open();
      const tokens = await openTokenStore({ databaseUrl: appUrl.toString() });
      try {
        await archive.recordJobSubmitted({ jobId: 'j1', actor: 'ann', problem: PROBLEM });
        const { planId } = await archive.recordPlanProposed({ jobId: 'j1', actor: 'w', submittedBy: 'ann', plan: makePlan() });
        await archive.recordReview({ planId, reviewer: 'bob', decision: 'reject', comment: 'aim point off', acknowledgedCaveatCodes: [] });
        expect(await archive.verify()).toMatchObject({ ok: true, entriesChecked: 3 });
        const { record } = await tokens.add('cy', ['auditor'], 'root');
        expect((await tokens.revoke(record.id, 'root'))?.revokedBy).toBe('root');
        await expect(sql(appUrl.toString(), 'DELETE FROM archive_entries WHERE sequence = 1')).rejects.toThrow(/permission denied/);
        await expect(sql(appUrl.toString(), 'DROP TRIGGER archive_entries_no_change ON archive_entries')).rejects.toThrow(/must be owner/);
        await expect(sql(appUrl.toString(), 'UPDATE archive_entries SET actor = \'mallory\' WHERE sequence = 1')).rejects.toThrow(/permission denied/);
      } finally {
        await tokens.close();
        await archive.close();
        await sql(ownerUrl, `DROP OWNED BY ${role}; DROP ROLE ${role}`).catch(() => undefined);
      }
    });
  });
});
