/** The largest id a table's `serial`/`integer` key can hold (PostgreSQL int4). */
export const MAX_ROW_ID = 2_147_483_647;

/** A row id written as text: whole decimal digits from 1 to MAX_ROW_ID, else null. */
export function parseRowId(raw: string | null | undefined): number | null {
  if (!raw || !/^\d{1,10}$/.test(raw)) return null;
  const id = Number(raw);
  return id >= 1 && id <= MAX_ROW_ID ? id : null;
}
