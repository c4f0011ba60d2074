import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import type { PartsPage } from '~/contracts/parts';
import { closeDb, getDb } from '~/db/client';
import { signIn, type Session } from '../helpers/http';

// GET /api/parts pages and filters on the server. Each answer is checked against the same
// question asked of the database directly: the total, and the page's serials in serial order.

let inspector: Session;
beforeAll(async () => {
  inspector = await signIn('inspector@demo.sluice.test');
});
afterAll(async () => {
  await closeDb();
});

async function list(query: string): Promise<PartsPage> {
  const res = await inspector.fetch(`/api/parts?${query}`);
  expect(res.status).toBe(200);
  return (await res.json()) as PartsPage;
}

async function expected(where: ReturnType<typeof sql>): Promise<string[]> {
  const r = await getDb().execute<{ serial: string }>(sql`
    SELECT p.serial FROM part p JOIN device_type dt ON dt.id = p.device_type_id
    LEFT JOIN lot l ON l.id = p.lot_id LEFT JOIN bin b ON b.id = p.bin_id
    WHERE ${where} ORDER BY p.serial COLLATE "default"`);
  return r.rows.map((x) => x.serial);
}

describe('the parts list', () => {
  it('pages one type in serial order, every part once', async () => {
    const all = await expected(sql`dt.name = 'WS-N30'`);
    expect(all.length).toBeGreaterThan(30);
    const seen: string[] = [];
    const first = await list('device_type=WS-N30&page_size=25&page=1');
    expect(first.total).toBe(all.length);
    expect(first.page_count).toBe(Math.ceil(all.length / 25));
    for (let page = 1; page <= first.page_count; page++) {
      const p = await list(`device_type=WS-N30&page_size=25&page=${page}`);
      seen.push(...p.parts.map((x) => x.serial));
      expect(p.parts.every((x) => x.device_type === 'WS-N30')).toBe(true);
    }
    expect(seen).toEqual(all);
  });

  it('filters by status, lot, bin and serial text as the database does', async () => {
    const [{ lot, bin }] = (
      await getDb().execute<{ lot: string; bin: string }>(sql`
        SELECT l.code AS lot, b.code AS bin FROM part p JOIN lot l ON l.id = p.lot_id JOIN bin b ON b.id = p.bin_id
        GROUP BY l.code, b.code ORDER BY count(*) DESC LIMIT 1`)
    ).rows;
    const cases: [string, ReturnType<typeof sql>][] = [
      ['status=in_stock', sql`p.status = 'in_stock'`],
      [`lot=${encodeURIComponent(lot!)}`, sql`l.code = ${lot}`],
      [`bin=${encodeURIComponent(bin!)}&status=in_stock`, sql`b.code = ${bin} AND p.status = 'in_stock'`],
      ['q=0', sql`p.serial ILIKE '%0%'`],
      ['device_type=NO-SUCH-TYPE', sql`false`],
    ];
    for (const [query, where] of cases) {
      const want = await expected(where);
      const got = await list(`${query}&page_size=200`);
      expect({ query, total: got.total }).toEqual({ query, total: want.length });
      expect(got.parts.map((x) => x.serial)).toEqual(want.slice(0, 200));
    }
  });
});
