import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { signIn, type Session } from '../helpers/http';
import { COARSE_PLAN, createAcceptedParts, createTestType, uniqueName } from './stock-fixtures';
import { StockCountJson } from '~/contracts/stock';
import { expectContract } from '../helpers/contract';

let admin: Session, stores: Session, designer: Session;
let drawer: { id: number; name: string; barcode: string };
let other: { id: number; name: string; barcode: string };
let serials: string[];

beforeAll(async () => {
  [admin, stores, designer] = await Promise.all(['admin', 'stores', 'designer'].map((r) => signIn(`${r}@demo.sluice.test`)));
  const type = await createTestType('n');
  await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: COARSE_PLAN } });
  const make = async (name: string) => (await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName(name) } })).json();
  drawer = await make('Count drawer');
  other = await make('Count other');
  serials = (await createAcceptedParts(type.id, [1, 2, 3, 4, 5].map((i) => ({ idssA: (4 + i * 0.1) * 1e-3, vpV: -2.5 })))).map((p) => p.serial);
  // Records: parts 0–2 in the drawer, part 3 in the other drawer, part 4 accepted but never received.
  expect((await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: serials.slice(0, 3), location_barcode: drawer.barcode } })).status).toBe(200);
  expect((await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: [serials[3]], location_barcode: other.barcode } })).status).toBe(200);
});
afterAll(async () => {
  await closeDb();
});

const count = (json: Record<string, unknown>, who = stores) => who.fetch('/api/stores/count', { method: 'POST', json });

async function parts() {
  const rows = await getDb().select().from(schema.part).where(inArray(schema.part.serial, serials));
  return new Map(rows.map((r) => [r.serial, r]));
}

describe('stock count (issue 13, stores)', () => {
  // Scanned in the drawer: part 0 and 1 (recorded there), part 3 (recorded in the other
  // drawer), part 4 (not received), and a serial nobody has. Part 2 was not found.
  const scanned = () => [serials[0], serials[1], serials[3], serials[4], 'NOT-A-PART'];

  it('compares without changing anything, naming each class', async () => {
    const res = await count({ location_barcode: drawer.barcode, serials: scanned() });
    expect(res.status).toBe(200);
    const body = await res.json();
    expectContract(StockCountJson, body);
    expect(body.location.name).toBe(drawer.name);
    expect(body.recorded).toBe(3);
    expect(body.found).toEqual([serials[0], serials[1]]);
    expect(body.missing.map((p: { serial: string }) => p.serial)).toEqual([serials[2]]);
    expect(body.misplaced).toEqual([expect.objectContaining({ serial: serials[3], recorded_at: other.name, status: 'in_stock' })]);
    expect(body.unexpected).toEqual([expect.objectContaining({ serial: serials[4], status: 'accepted' })]);
    expect(body.unknown).toEqual(['NOT-A-PART']);
    expect(body.applied).toBeNull();
    const p = await parts();
    expect(p.get(serials[2])!.status).toBe('in_stock');
    expect(p.get(serials[3])!.locationId).toBe(other.id);
  });

  it('corrects the records in one go, audited, and a second apply changes nothing', async () => {
    const res = await count({ location_barcode: drawer.barcode, serials: scanned(), apply: true });
    expect(res.status).toBe(200);
    const body = await res.json();
    expectContract(StockCountJson, body);
    expect(body.applied).toEqual({ moved_here: [serials[3]], held: [serials[2]], left_reserved: [] });
    const p = await parts();
    expect(p.get(serials[3])!.locationId).toBe(drawer.id);
    expect(p.get(serials[3])!.status).toBe('in_stock');
    expect(p.get(serials[2])!.status).toBe('quarantined');
    expect(p.get(serials[2])!.locationId).toBeNull();
    expect(p.get(serials[4])!.status).toBe('accepted'); // not touched: it needs receiving, not a count
    const audit = await getDb()
      .select()
      .from(schema.auditLog)
      .where(and(eq(schema.auditLog.subjectType, 'location'), eq(schema.auditLog.subjectId, String(drawer.id)), eq(schema.auditLog.action, 'stock.count')));
    expect(audit).toHaveLength(1);
    expect(audit[0]!.after).toMatchObject({ found: 2, missing: [serials[2]], misplaced: [serials[3]], unknown: ['NOT-A-PART'] });
    const moved = await getDb().select().from(schema.auditLog).where(and(eq(schema.auditLog.subjectId, serials[3]!), eq(schema.auditLog.action, 'stock.count_move')));
    expect(moved).toHaveLength(1);

    const again = await (await count({ location_barcode: drawer.barcode, serials: [serials[0], serials[1], serials[3]], apply: true })).json();
    expect(again.missing).toEqual([]);
    expect(again.misplaced).toEqual([]);
    expect(again.applied).toEqual({ moved_here: [], held: [], left_reserved: [] });
  });

  it('says which location barcode is unknown, and is for stores only', async () => {
    const res = await count({ location_barcode: 'NO-SUCH-DRAWER', serials: [] });
    expect(res.status).toBe(404);
    expect((await res.json()).error.message).toMatch(/No location has the barcode NO-SUCH-DRAWER/);
    expect((await count({ location_barcode: drawer.barcode, serials: [] }, designer)).status).toBe(403);
    expect((await designer.fetch('/stores/count', { redirect: 'manual' })).status).toBe(403);
  });
});
