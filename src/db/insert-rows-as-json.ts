import { AppError } from '~/core/errors';
import { getTableColumns, sql, type SQL } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { DbOrTx } from './client';

type ColumnInfo = { name: string; getSQLType(): string; mapFromDriverValue(value: unknown): unknown };

/**
 * Many rows as ONE bound parameter: `jsonb_to_recordset(<json>) as x(<columns>)`, a JSON
 * array unpacked into the table's column names and types, for use after `from` in an insert
 * or update. For the hot multi-row statements (sweeps with their curves, fits, audit entries,
 * bulk updates), where building one bound parameter per value costs the worker more than the
 * database spends on the rows.
 *
 * Rows use the table's own keys, as `insert().values()` does, and all set the same keys. A
 * non-finite number in a column travels as the string PostgreSQL reads back ('NaN',
 * 'Infinity'); inside a jsonb value it becomes null, as JSON has no such numbers. Returns
 * the fragment and the column names it carries, quoted, in order.
 */
export function jsonRecordset<T extends PgTable>(table: T, rows: Partial<T['$inferInsert']>[]): { from: SQL; names: string[] } {
  const columns = columnsOf(table);
  const first = rows[0] as Record<string, unknown>;
  const keys = Object.keys(first).filter((k) => first[k] !== undefined);
  for (const k of keys) if (!columns[k]) throw new AppError('json_rows_bad_column', { helper: 'jsonRecordset', column: k });
  const parts: string[] = [];
  for (const row of rows as Record<string, unknown>[]) {
    const fields: string[] = [];
    for (const k of keys) fields.push(`${JSON.stringify(columns[k].name)}:${valueAsJson(row[k])}`);
    for (const k of Object.keys(row)) {
      if (row[k] !== undefined && !keys.includes(k)) throw new AppError('json_rows_uneven_keys', { column: k });
    }
    parts.push(`{${fields.join(',')}}`);
  }
  const names = keys.map((k) => `"${columns[k].name}"`);
  const definitions = keys.map((k, i) => `${names[i]} ${recordType(columns[k].getSQLType())}`).join(', ');
  return { from: sql`jsonb_to_recordset(${`[${parts.join(',')}]`}::jsonb) as x(${sql.raw(definitions)})`, names };
}

/**
 * Inserts many rows in one statement through `jsonRecordset`. A key the rows leave out is not
 * inserted, so the column default applies. Returns the `returning` columns of each inserted
 * row under the table's keys, in no promised order: return a column that identifies the row.
 */
export async function insertRowsAsJson<T extends PgTable, K extends keyof T['$inferSelect'] & string>(
  tx: DbOrTx,
  table: T,
  rows: T['$inferInsert'][],
  returning: readonly K[] = [],
): Promise<Pick<T['$inferSelect'], K>[]> {
  if (rows.length === 0) return [];
  const columns = columnsOf(table);
  for (const k of returning) if (!columns[k]) throw new AppError('json_rows_bad_column', { helper: 'insertRowsAsJson', column: k });
  const { from, names } = jsonRecordset(table, rows);
  const list = sql.raw(names.join(', '));
  const returned = returning.length ? sql.raw(` returning ${returning.map((k) => `"${columns[k].name}" as "${k}"`).join(', ')}`) : sql``;
  const result = await tx.execute(sql`insert into ${table} (${list}) select ${list} from ${from}${returned}`);
  // As a drizzle select would: int8 to number, and so on.
  return (result.rows as Record<string, unknown>[]).map((r) => {
    const out: Record<string, unknown> = {};
    for (const k of returning) out[k] = r[k] === null ? null : columns[k].mapFromDriverValue(r[k]);
    return out as Pick<T['$inferSelect'], K>;
  });
}

function columnsOf(table: PgTable): Record<string, ColumnInfo> {
  return getTableColumns(table) as unknown as Record<string, ColumnInfo>;
}

/** A column's type as a record field: a serial column holds plain integers. */
function recordType(sqlType: string): string {
  return ({ serial: 'integer', bigserial: 'bigint', smallserial: 'smallint' } as Record<string, string>)[sqlType] ?? sqlType;
}

function valueAsJson(value: unknown): string {
  if (value === null || value === undefined) return 'null';
  // bytea travels in PostgreSQL's hex text form.
  if (value instanceof Uint8Array) return `"\\\\x${Buffer.from(value.buffer, value.byteOffset, value.byteLength).toString('hex')}"`;
  if (typeof value === 'number' && !Number.isFinite(value)) return `"${value}"`;
  return JSON.stringify(value) ?? 'null';
}
