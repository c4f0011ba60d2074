import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asc, inArray, sql } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { signIn, type Session } from '../helpers/http';
import { createAcceptedParts, createTestType, ONE_BIN_PLAN, partsBySerial, uniqueName } from './stock-fixtures';

let admin: Session, stores: Session;
let type: { id: number; name: string };
let accepted: { id: number; serial: string }[];
let shelved: { id: number; serial: string }[];
let locA: string, locB: string;

beforeAll(async () => {
  [admin, stores] = await Promise.all([signIn('admin@demo.sluice.test'), signIn('stores@demo.sluice.test')]);
  type = await createTestType('n');
  expect((await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: ONE_BIN_PLAN } })).status).toBe(201);
  const a = await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Race drawer A') } });
  const b = await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Race drawer B') } });
  const la = await a.json();
  locA = la.barcode;
  locB = (await b.json()).barcode;
  const fig = (k: number) => ({ idssA: 5e-3 + k * 1e-5, vpV: -2 });
  accepted = await createAcceptedParts(type.id, Array.from({ length: 30 }, (_, k) => fig(k)), { prefix: uniqueName('RA') });
  shelved = await createAcceptedParts(type.id, Array.from({ length: 40 }, (_, k) => fig(k)), { prefix: uniqueName('RS') });
  const bins = await (await stores.fetch(`/api/bins?device_type=${encodeURIComponent(type.name)}`)).json();
  for (const bin of bins.bins) await stores.fetch(`/api/bins/${bin.id}`, { method: 'PUT', json: { home_location_id: la.id } });
  const r = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: shelved.map((p) => p.serial) } });
  expect(r.status).toBe(200);
});
afterAll(async () => {
  await closeDb();
});

describe('fifty concurrent stock requests on one bin', () => {
  it('leave every count equal to the parts’ states, with an unbroken state history per part', async () => {
    // Overlapping batches on purpose: receives share parts with each other and with scraps,
    // moves share parts with scraps, so many requests race for the same rows.
    const requests: { action: string; json: Record<string, unknown> }[] = [];
    for (let i = 0; i < 17; i++) requests.push({ action: 'receive', json: { serials: [accepted[i].serial, accepted[i + 1].serial] } });
    for (let i = 0; i < 17; i++) requests.push({ action: 'move', json: { serials: [shelved[i].serial, shelved[i + 20].serial], location_barcode: i % 2 ? locA : locB } });
    for (let i = 0; i < 8; i++) requests.push({ action: 'scrap', json: { serials: [shelved[2 * i].serial], reason: 'race test' } });
    for (let i = 0; i < 8; i++) requests.push({ action: 'scrap', json: { serials: [accepted[2 * i + 1].serial, shelved[30 + i].serial], reason: 'race test' } });
    expect(requests).toHaveLength(50);

    const responses = await Promise.all(
      requests.map(async (r) => {
        const res = await stores.fetch(`/api/stock/${r.action}`, { method: 'POST', json: r.json });
        return { ...r, status: res.status, body: await res.json() };
      }),
    );
    for (const r of responses) expect([200, 409], JSON.stringify(r.body)).toContain(r.status);
    expect(responses.filter((r) => r.status === 200).length).toBeGreaterThan(10);
    expect(responses.filter((r) => r.status === 409).length).toBeGreaterThan(0);

    const all = [...accepted, ...shelved];
    const now = await partsBySerial(all.map((p) => p.serial));
    // Counts from the API equal counts of the parts' states (SQL below), part by part.
    const api = await (await stores.fetch(`/api/bins?device_type=${encodeURIComponent(type.name)}`)).json();
    const grid = api.bins.find((b: { code: string }) => b.code === 'I01');
    const inStock = [...now.values()].filter((p) => p.status === 'in_stock');
    expect(grid.on_hand).toBe(inStock.length);
    const [{ n }] = await getDb()
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.part)
      .where(sql`${schema.part.binId} = ${grid.id} and ${schema.part.status} = 'in_stock'`);
    expect(grid.on_hand).toBe(n);
    expect(grid.reserved).toBe(0);
    expect(grid.issued).toBe(0);

    // Every part's audit entries chain: each 'before' is the previous 'after'; the last 'after'
    // is the state it is in; no part was received or scrapped twice.
    const audit = await getDb()
      .select()
      .from(schema.auditLog)
      .where(inArray(schema.auditLog.subjectId, all.map((p) => p.serial)))
      .orderBy(asc(schema.auditLog.id));
    for (const p of all) {
      const entries = audit.filter((a) => a.subjectId === p.serial && a.action.startsWith('stock.'));
      let state = 'accepted';
      for (const e of entries) {
        expect((e.before as { status: string }).status, `${p.serial} ${e.action}`).toBe(state);
        state = (e.after as { status: string }).status;
      }
      expect(now.get(p.serial)!.status, p.serial).toBe(state);
      expect(entries.filter((e) => e.action === 'stock.receive').length).toBeLessThanOrEqual(1);
      expect(entries.filter((e) => e.action === 'stock.scrap').length).toBeLessThanOrEqual(1);
      if (state === 'scrapped') expect(now.get(p.serial)!.locationId).toBeNull();
    }

    // What the successful responses claim matches the end state's history.
    for (const r of responses.filter((x) => x.status === 200)) {
      for (const part of r.body.parts as { serial: string; to: string }[]) {
        const entries = audit.filter((a) => a.subjectId === part.serial && a.action === `stock.${r.action}`);
        expect(entries.length, `${r.action} ${part.serial}`).toBeGreaterThan(0);
      }
    }
    // A refused batch changed none of its parts: its parts' histories hold no entry from it,
    // which the chain check above proves; count totals agree with the responses as well.
    const received = responses.filter((r) => r.action === 'receive' && r.status === 200).reduce((s, r) => s + r.body.count, 0);
    expect(received).toBe(audit.filter((a) => a.action === 'stock.receive' && accepted.some((p) => p.serial === a.subjectId)).length);
    const scrapped = responses.filter((r) => r.action === 'scrap' && r.status === 200).reduce((s, r) => s + r.body.count, 0);
    expect(scrapped).toBe([...now.values()].filter((p) => p.status === 'scrapped').length);
    const scrappedFromShelf = audit.filter((a) => a.action === 'stock.scrap' && (a.before as { status: string }).status === 'in_stock').length;
    expect(inStock.length).toBe(40 + received - scrappedFromShelf);
  });

  it('no lock is left behind: a follow-up batch goes straight through', async () => {
    const left = await partsBySerial(shelved.map((p) => p.serial));
    const some = [...left.values()].filter((p) => p.status === 'in_stock').slice(0, 3).map((p) => p.serial);
    const res = await stores.fetch('/api/stock/move', { method: 'POST', json: { serials: some, location_barcode: locB } });
    expect(res.status).toBe(200);
  });
});
