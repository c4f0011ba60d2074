import { afterAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { insertRowsAsJson } from '~/db/insert-rows-as-json';

/**
 * The bulk insert used on the intake path, against the real PostgreSQL: what goes in comes
 * back as `insert().values()` would have stored it (the comparison is drizzle's own insert).
 */

const RUN = Date.now().toString(36).slice(-6).toUpperCase();

afterAll(async () => {
  await closeDb();
});

describe('insertRowsAsJson', () => {
  it('stores the same rows as insert().values(): jsonb objects, SQL NULLs, defaults', async () => {
    const rows = (tag: string) => [
      { action: `json.${tag}`, subjectType: 'test', subjectId: `${RUN}-1`, before: null, after: { nested: { a: [1, 2.5, 'x'] }, flag: true }, reason: 'héllo "quoted" \\ back' },
      { action: `json.${tag}`, subjectType: 'test', subjectId: `${RUN}-2`, before: 'a string', after: [1, null], reason: null },
    ];
    const returned = await insertRowsAsJson(getDb(), schema.auditLog, rows('bulk'), ['id', 'subjectId']);
    expect(returned.map((r) => r.subjectId).sort()).toEqual([`${RUN}-1`, `${RUN}-2`]);
    await getDb().insert(schema.auditLog).values(rows('plain'));
    const stored = await getDb()
      .select()
      .from(schema.auditLog)
      .where(inArray(schema.auditLog.subjectId, [`${RUN}-1`, `${RUN}-2`]))
      .orderBy(schema.auditLog.subjectId, schema.auditLog.action);
    expect(stored).toHaveLength(4);
    const strip = ({ id: _id, at: _at, action: _action, ...rest }: (typeof stored)[number]) => rest;
    // Ordered by subject, then action: bulk before plain for each subject.
    expect(strip(stored[0])).toEqual(strip(stored[1]));
    expect(strip(stored[2])).toEqual(strip(stored[3]));
    expect(stored[0].before).toBeNull();
    expect(stored[0].at).toBeInstanceOf(Date);
    expect(returned.every((r) => typeof r.id === 'number')).toBe(true);
  });

  it('keeps non-finite numbers in double columns (PostgreSQL NaN and Infinity)', async () => {
    const name = `JSON-${RUN}`;
    await insertRowsAsJson(getDb(), schema.deviceType, [{ name, channel: 'n', vdsTestV: 10, idssMinA: Number.NaN, idssMaxA: Number.POSITIVE_INFINITY, vpMinV: null }]);
    const [row] = await getDb().select().from(schema.deviceType).where(eq(schema.deviceType.name, name));
    expect(row.idssMinA).toBeNaN();
    expect(row.idssMaxA).toBe(Number.POSITIVE_INFINITY);
    expect(row.vpMinV).toBeNull();
    expect(row.nominalTemperatureC).toBe(25); // the column default
    await getDb().delete(schema.deviceType).where(eq(schema.deviceType.name, name));
  });

  it('refuses rows that set different keys, naming the key', async () => {
    await expect(
      insertRowsAsJson(getDb(), schema.auditLog, [
        { action: 'json.mixed', subjectType: 'test', subjectId: `${RUN}-3` },
        { action: 'json.mixed', subjectType: 'test', subjectId: `${RUN}-4`, reason: 'extra' },
      ]),
    ).rejects.toThrow('reason is not set in the first');
  });
});
