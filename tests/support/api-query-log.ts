// A TypeORM logger that records every SQL statement the app sends, to check that a list is one
// set-based query (plus its count) and not a query per row.
import type { Logger } from 'typeorm';

export class QueryLog implements Logger {
  readonly queries: string[] = [];
  logQuery(query: string): void {
    this.queries.push(query);
  }
  logQueryError(): void {}
  logQuerySlow(): void {}
  logSchemaBuild(): void {}
  logMigration(): void {}
  log(): void {}
  clear(): void {
    this.queries.length = 0;
  }
}
