/** Transactions on PostgreSQL: the BEGIN / COMMIT, ROLLBACK-on-error pattern every writer and snapshot reader uses. */
import type pg from 'pg';

/** Anything that runs a query: a pool, a pooled client or a standalone client. */
export type Queryable = Pick<pg.ClientBase, 'query'>;

/** Runs `fn` between `begin` (BEGIN, or BEGIN with an isolation level) and COMMIT; rolls back and rethrows on error. */
export async function inTransaction<T>(client: Queryable, begin: string, fn: () => Promise<T>): Promise<T> {
  try {
    await client.query(begin);
    const result = await fn();
    await client.query('COMMIT');
    return result;
  } catch (error) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw error;
  }
}

/** Takes a client from the pool for one transaction (see inTransaction) and always gives it back. */
export async function withPoolTransaction<T>(pool: pg.Pool, begin: string, fn: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await pool.connect();
  try {
    return await inTransaction(client, begin, () => fn(client));
  } finally {
    client.release();
  }
}
