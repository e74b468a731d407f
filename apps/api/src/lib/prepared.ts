// Hot reads as named prepared statements. A parameterised query sent the ordinary way is an unnamed
// statement that PostgreSQL parses and plans again on every call; for Beadroll's list and status queries
// (a qualification's state is a long CASE over continuity_states, repeated in subselects) the planning
// took far longer than the execution: the Welders list spent 17 ms planning and 0.3 ms executing its
// count. A named statement is parsed once per pooled connection and, after PostgreSQL's first few
// custom plans, runs on its cached generic plan when that costs no more.
// The name is a hash of the text, so one call site that builds a few shapes of SQL (filters present or
// not) gets one statement per shape. Call sites are a bounded set of queries written in this code base;
// never pass text with values spliced in (each distinct text stays prepared for the connection's life).
import { createHash } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { Pool } from 'pg';

const names = new Map<string, string>();

function statementName(text: string): string {
  let name = names.get(text);
  if (!name) {
    name = `br_${createHash('sha1').update(text).digest('hex').slice(0, 24)}`;
    names.set(text, name);
  }
  return name;
}

/**
 * Runs a read as a named prepared statement on the pool. Inside a transaction (the manager has its own
 * query runner) it runs on that transaction's connection as an ordinary query.
 */
export async function preparedQuery<T>(db: EntityManager, text: string, values: unknown[]): Promise<T[]> {
  if (db.queryRunner) return db.query<T[]>(text, values);
  // TypeORM's PostgreSQL driver keeps the pg Pool it opened as `master`.
  const pool = (db.connection.driver as unknown as { master: Pool }).master;
  // Logged like every other query, so the query-count tests and a query log see it.
  db.connection.logger.logQuery(text, values);
  const result = await pool.query<T & Record<string, unknown>>({ name: statementName(text), text, values });
  return result.rows;
}
