import { getTableColumns, sql } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { DbOrTx } from './client';

/**
 * Inserts many rows through ONE bound parameter: a JSON array that `jsonb_to_recordset`
 * unpacks into the table's columns. For the hot multi-row inserts (sweeps with their curves,
 * fits, audit entries), where building one bound parameter per value costs the worker more
 * than the database spends storing the rows.
 *
 * Rows use the table's own keys, as `insert().values()` does, and all set the same keys; a
 * key a row leaves out is not inserted, so the column default applies. A non-finite number
 * in a column travels as the string PostgreSQL reads back ('NaN', 'Infinity'); inside a jsonb
 * value it becomes null, as JSON has no such numbers. Returns the `returning` columns of each
 * inserted row under the table's keys, in no promised order: return a column that identifies
 * the row.
 */
export async function insertRowsAsJson<T extends PgTable, K extends keyof T['$inferSelect'] & string>(
  tx: DbOrTx,
  table: T,
  rows: T['$inferInsert'][],
  returning: readonly K[] = [],
): Promise<Pick<T['$inferSelect'], K>[]> {
  if (rows.length === 0) return [];
  const columns = getTableColumns(table) as Record<string, { name: string; getSQLType(): string; mapFromDriverValue(value: unknown): unknown }>;
  const first = rows[0] as Record<string, unknown>;
  const keys = Object.keys(first).filter((k) => first[k] !== undefined);
  for (const k of [...keys, ...returning]) {
    if (!columns[k]) throw new Error(`insertRowsAsJson: ${k} is not a column of this table`);
  }
  const parts: string[] = [];
  for (const row of rows as Record<string, unknown>[]) {
    const fields: string[] = [];
    for (const k of keys) fields.push(`${JSON.stringify(columns[k].name)}:${valueAsJson(row[k])}`);
    for (const k of Object.keys(row)) {
      if (row[k] !== undefined && !keys.includes(k)) throw new Error(`insertRowsAsJson: every row must set the same keys; ${k} is not set in the first`);
    }
    parts.push(`{${fields.join(',')}}`);
  }
  const quoted = (k: string) => `"${columns[k].name}"`;
  const names = keys.map(quoted).join(', ');
  const definitions = keys.map((k) => `${quoted(k)} ${columns[k].getSQLType()}`).join(', ');
  const returned = returning.length ? sql.raw(` returning ${returning.map((k) => `${quoted(k)} as "${k}"`).join(', ')}`) : sql``;
  const result = await tx.execute(
    sql`insert into ${table} (${sql.raw(names)}) select ${sql.raw(names)} from jsonb_to_recordset(${`[${parts.join(',')}]`}::jsonb) as x(${sql.raw(definitions)})${returned}`,
  );
  // As a drizzle select would: int8 to number, and so on.
  return (result.rows as Record<string, unknown>[]).map((r) => {
    const out: Record<string, unknown> = {};
    for (const k of returning) out[k] = r[k] === null ? null : columns[k].mapFromDriverValue(r[k]);
    return out as Pick<T['$inferSelect'], K>;
  });
}

function valueAsJson(value: unknown): string {
  if (value === null || value === undefined) return 'null';
  if (typeof value === 'number' && !Number.isFinite(value)) return `"${value}"`;
  return JSON.stringify(value) ?? 'null';
}
