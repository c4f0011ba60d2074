import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { signIn, type Session } from '../helpers/http';
import { COARSE_PLAN, createAcceptedParts, createTestType, partsBySerial, uniqueName } from './stock-fixtures';
import { BinMapJson, BinPartsPage } from '~/contracts/bins';
import { LocationList, LocationRecord } from '~/contracts/locations';
import { AwaitingLotList, PartLookup, StockActionResult } from '~/contracts/stock';
import { expectContract } from '../helpers/contract';

let admin: Session, inspector: Session, designer: Session, stores: Session;
let type: { id: number; name: string };
let parts: Awaited<ReturnType<typeof createAcceptedParts>>;
let homeId: number;
let otherBarcode: string;

/**
 * Figures and the bin each must land in under COARSE_PLAN, worked by hand (derived): IDSS index
 * = floor((IDSS − 2 mA)/2 mA) + 1, VP index = floor((VP + 4 V)/1 V) + 1, ranges half-open
 * [lo, hi), so a value on an edge goes up; outside 2–10 mA or −4–0 V → HOLD.
 */
const CASES: { idssA: number; vpV: number; code: string }[] = [
  { idssA: 2.5e-3, vpV: -3.5, code: 'I01-P01' },
  { idssA: 5.0e-3, vpV: -2.5, code: 'I02-P02' },
  { idssA: 6.0e-3, vpV: -2.5, code: 'I03-P02' }, // on the 6 mA edge: upper bin
  { idssA: 9.9e-3, vpV: -0.7, code: 'I04-P04' },
  { idssA: 7.0e-3, vpV: -2.0, code: 'I03-P03' }, // on the −2 V edge: upper bin
  { idssA: 12e-3, vpV: -1.5, code: 'HOLD' }, // IDSS above the grid
  { idssA: 4.4e-3, vpV: -4.5, code: 'HOLD' }, // VP below the grid
  { idssA: 5.5e-3, vpV: -2.2, code: 'I02-P02' },
  { idssA: 5.1e-3, vpV: -2.9, code: 'I02-P02' },
  { idssA: 3.0e-3, vpV: -1.0, code: 'I01-P04' },
];

beforeAll(async () => {
  [admin, inspector, designer, stores] = await Promise.all(
    ['admin', 'inspector', 'designer', 'stores'].map((r) => signIn(`${r}@demo.sluice.test`)),
  );
  type = await createTestType('n');
  // Parts accepted before the type has any plan: they wait without a bin.
  parts = await createAcceptedParts(type.id, CASES);
});
afterAll(async () => {
  await closeDb();
});

async function binsOf(query = '') {
  const res = await designer.fetch(`/api/bins?device_type=${encodeURIComponent(type.name)}&page_size=1000${query}`);
  expect(res.status).toBe(200);
  return (await res.json()) as { bins: { id: number; code: string; label: string; on_hand: number; reserved: number; issued: number; location: { name: string } | null; low_stock_threshold: number; idss_lo_a: number | null; vp_hi_v: number | null }[]; total: number };
}

async function countsFromParts() {
  const rows = await getDb()
    .select({ code: schema.bin.code, status: schema.part.status, n: sql<number>`count(*)::int` })
    .from(schema.part)
    .innerJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .innerJoin(schema.binPlan, and(eq(schema.binPlan.id, schema.bin.binPlanId), eq(schema.binPlan.isActive, true)))
    .where(eq(schema.part.deviceTypeId, type.id))
    .groupBy(schema.bin.code, schema.part.status);
  const out = new Map<string, { in_stock: number; reserved: number; issued: number }>();
  for (const r of rows) {
    const c = out.get(r.code) ?? { in_stock: 0, reserved: 0, issued: 0 };
    if (r.status === 'in_stock' || r.status === 'reserved' || r.status === 'issued') c[r.status] += r.n;
    out.set(r.code, c);
  }
  return out;
}

describe('binning, receiving and counting', () => {
  it('parts accepted before any plan have no bin; activating the plan bins every one of them', async () => {
    const before = await partsBySerial(parts.map((p) => p.serial));
    expect([...before.values()].every((p) => p.binId === null)).toBe(true);

    const preview = await admin.fetch('/api/bin-plans/preview', { method: 'POST', json: { device_type: type.name, definition: COARSE_PLAN } });
    expect(preview.status).toBe(200);
    const p = await preview.json();
    expect(p.bin_count).toBe(17);
    expect(p.newly_binned_count).toBe(CASES.length);
    expect(p.moved_count).toBe(0);

    const res = await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: COARSE_PLAN, based_on_plan_id: p.based_on_plan_id } });
    expect(res.status).toBe(201);
    expect((await res.json()).plan.version).toBe(1);
    const after = await partsBySerial(parts.map((x) => x.serial));
    CASES.forEach((c, i) => expect(after.get(parts[i].serial)!.binCode, `${parts[i].serial} ${c.idssA} A ${c.vpV} V`).toBe(c.code));
  });

  it('a part accepted later is binned on accept (assignBinsForParts) into the active plan', async () => {
    const [late] = await createAcceptedParts(type.id, [{ idssA: 8.2e-3, vpV: -3.1 }], { prefix: uniqueName('LATE') });
    parts.push(late);
    CASES.push({ idssA: 8.2e-3, vpV: -3.1, code: 'I04-P01' });
    expect((await partsBySerial([late.serial])).get(late.serial)!.binCode).toBe('I04-P01');
  });

  it('labels state ranges in plain units; the API gives ranges in SI with units in the names', async () => {
    const { bins, total } = await binsOf();
    expect(total).toBe(17);
    const b = bins.find((x) => x.code === 'I02-P02')!;
    // Derived from the plan: IDSS [4, 6) mA, VP [−3, −2) V, pinch-off spoken from the smaller magnitude.
    expect(b.label).toBe('IDSS 4.0–6.0 mA · VP −2.0 to −3.0 V');
    expect(b.idss_lo_a).toBeCloseTo(4e-3, 12);
    expect(b.vp_hi_v).toBeCloseTo(-2, 12);
  });

  it('stores set home locations; receiving by scanned serials puts parts at their bin home, one batch', async () => {
    const loc = await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Test cabinet'), description: 'integration' } });
    expect(loc.status).toBe(201);
    homeId = expectContract(LocationRecord, await loc.json()).id;
    const other = await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Overflow'), barcode: uniqueName('LOC-OVF') } });
    otherBarcode = (await other.json()).barcode;
    const { bins } = await binsOf();
    for (const b of bins) {
      const r = await stores.fetch(`/api/bins/${b.id}`, { method: 'PUT', json: { home_location_id: homeId } });
      expect(r.status).toBe(200);
    }
    const listed = await (await designer.fetch('/api/locations')).json();
    expectContract(LocationList, listed);
    expect(listed.locations.find((l: { id: number }) => l.id === homeId).bin_count).toBe(17);
    const serials = parts.slice(0, 8).map((p) => `  ${p.serial}\r`); // as a scanner may send them
    const res = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials } });
    expect(res.status).toBe(200);
    const body = await res.json();
    expectContract(StockActionResult, body);
    expect(body.count).toBe(8);
    const now = await partsBySerial(parts.map((p) => p.serial));
    for (const p of parts.slice(0, 8)) {
      expect(now.get(p.serial)!.status).toBe('in_stock');
      expect(now.get(p.serial)!.locationId).toBe(homeId);
    }
    // A scanned serial looks up as what stores may do with it now; the lots still waiting are listed.
    const looked = expectContract(PartLookup, await (await stores.fetch(`/api/stock/lookup?serial=${encodeURIComponent(parts[0].serial)}`)).json());
    expect(looked).toMatchObject({ serial: parts[0].serial, status: 'in_stock', can: { receive: false, move: true, return: false } });
    expectContract(AwaitingLotList, await (await stores.fetch('/api/stock/awaiting')).json());
  });

  it('on-hand per bin equals the parts in stock in it (counted by hand from the cases)', async () => {
    const expected = new Map<string, number>();
    CASES.slice(0, 8).forEach((c) => expected.set(c.code, (expected.get(c.code) ?? 0) + 1));
    const { bins } = await binsOf();
    const fromParts = await countsFromParts();
    for (const b of bins) {
      expect(b.on_hand, b.code).toBe(expected.get(b.code) ?? 0);
      expect(b.on_hand, b.code).toBe(fromParts.get(b.code)?.in_stock ?? 0);
    }
    expect(bins.reduce((s, b) => s + b.on_hand, 0)).toBe(8);
  });

  it('a batch with one part that cannot be received changes nothing and names that part', async () => {
    const res = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: [parts[8].serial, parts[0].serial] } });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error.code).toBe('invalid_transition');
    expect(body.error.refused.map((r: { serial: string }) => r.serial)).toEqual([parts[0].serial]);
    expect((await partsBySerial([parts[8].serial])).get(parts[8].serial)!.status).toBe('accepted');
    const unknown = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: ['NO-SUCH-SERIAL', parts[8].serial] } });
    expect(unknown.status).toBe(404);
    expect((await unknown.json()).error.unknown).toEqual(['NO-SUCH-SERIAL']);
  });

  it('moves parts by location barcode, and back home without one', async () => {
    const res = await stores.fetch('/api/stock/move', { method: 'POST', json: { serials: [parts[0].serial, parts[1].serial], location_barcode: otherBarcode } });
    expect(res.status).toBe(200);
    expect((await res.json()).parts.every((p: { to: string }) => p.to === 'in_stock')).toBe(true);
    const moved = await partsBySerial([parts[0].serial]);
    expect(moved.get(parts[0].serial)!.locationId).not.toBe(homeId);
    const back = await stores.fetch('/api/stock/move', { method: 'POST', json: { serials: [parts[0].serial] } });
    expect(back.status).toBe(200);
    expect((await partsBySerial([parts[0].serial])).get(parts[0].serial)!.locationId).toBe(homeId);
    const notInStock = await stores.fetch('/api/stock/move', { method: 'POST', json: { serials: [parts[9].serial], location_barcode: otherBarcode } });
    expect(notInStock.status).toBe(409);
  });

  it('scrap needs a reason and keeps it in the audit log', async () => {
    const none = await stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: [parts[7].serial] } });
    expect(none.status).toBe(400);
    const res = await stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: [parts[7].serial], reason: 'cracked package' } });
    expect(res.status).toBe(200);
    const [audit] = await getDb()
      .select()
      .from(schema.auditLog)
      .where(and(eq(schema.auditLog.subjectId, parts[7].serial), eq(schema.auditLog.action, 'stock.scrap')));
    expect(audit.reason).toBe('cracked package');
    expect((audit.before as { status: string }).status).toBe('in_stock');
  });

  it('issued parts are taken back and, with restock, go back on the shelf at home', async () => {
    // Issue is the pick-list engineer's; here the part is set issued straight in the database.
    await getDb().update(schema.part).set({ status: 'issued', locationId: null }).where(eq(schema.part.serial, parts[2].serial));
    let { bins } = await binsOf();
    expect(bins.find((b) => b.code === CASES[2].code)!.issued).toBe(1);
    const res = await stores.fetch('/api/stock/return', { method: 'POST', json: { serials: [parts[2].serial], restock: true, reason: 'not used on the board' } });
    expect(res.status).toBe(200);
    const p = (await partsBySerial([parts[2].serial])).get(parts[2].serial)!;
    expect(p.status).toBe('in_stock');
    expect(p.locationId).toBe(homeId);
    ({ bins } = await binsOf());
    expect(bins.find((b) => b.code === CASES[2].code)!.issued).toBe(0);
  });

  it('receives a whole lot', async () => {
    const [lot] = await getDb().insert(schema.lot).values({ code: uniqueName('LOT'), deviceTypeId: type.id }).returning();
    const lotParts = await createAcceptedParts(type.id, [{ idssA: 3e-3, vpV: -3.2 }, { idssA: 3.1e-3, vpV: -3.3 }, { idssA: 3.2e-3, vpV: -3.4 }], { lotId: lot.id, prefix: uniqueName('LOTP') });
    const res = await stores.fetch('/api/stock/receive', { method: 'POST', json: { lot: lot.code } });
    expect(res.status).toBe(200);
    expect((await res.json()).count).toBe(3);
    const again = await stores.fetch('/api/stock/receive', { method: 'POST', json: { lot: lot.code } });
    expect(again.status).toBe(400);
    const rows = await partsBySerial(lotParts.map((p) => p.serial));
    expect([...rows.values()].every((r) => r.status === 'in_stock' && r.binCode === 'I01-P01')).toBe(true);
  });

  it('the table sorts and pages on the server; the CSV has every row', async () => {
    const page = await binsOf('&sort=on_hand&dir=desc&page_size=5');
    expect(page.bins).toHaveLength(5);
    expect(page.total).toBe(17);
    const onHand = page.bins.map((b) => b.on_hand);
    expect([...onHand].sort((a, b) => b - a)).toEqual(onHand);
    const second = await designer.fetch(`/api/bins?device_type=${type.id}&sort=on_hand&dir=desc&page_size=5&page=4`);
    expect((await second.json()).bins).toHaveLength(2);
    const filtered = await binsOf('&q=I02-P0&include_empty=0');
    expect(filtered.bins.map((b) => b.code)).toEqual(['I02-P02']);
    const csv = await designer.fetch(`/api/bins/export.csv?device_type=${encodeURIComponent(type.name)}`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-type')).toContain('text/csv');
    const lines = (await csv.text()).trim().split('\r\n');
    expect(lines[0].split(',')).toContain('on_hand');
    expect(lines).toHaveLength(18);
    const col = lines[0].split(',').indexOf('on_hand');
    const csvTotal = lines.slice(1).reduce((s, l) => s + Number(l.split(',')[col]), 0);
    const { bins } = await binsOf();
    expect(csvTotal).toBe(bins.reduce((s, b) => s + b.on_hand, 0));
  });

  it('the bin map gives the grid and the points; a bin lists its parts', async () => {
    const res = await designer.fetch(`/api/bins/map?device_type=${encodeURIComponent(type.name)}`);
    expect(res.status).toBe(200);
    const map = await res.json();
    expectContract(BinMapJson, map);
    expect(map.plan.version).toBe(1);
    expect(map.bins).toHaveLength(17);
    expect(map.points.length).toBeGreaterThanOrEqual(10);
    const bin = map.bins.find((b: { code: string }) => b.code === 'I02-P02');
    const list = await designer.fetch(`/api/bins/${bin.id}/parts`);
    const body = await list.json();
    // Each part as every response names it (partJson), with the fit's figures on top.
    expectContract(BinPartsPage, body);
    expect(body.parts[0]).toMatchObject({ device_type: body.bin.device_type, bin_code: 'I02-P02', bin_label: body.bin.label });
    expect(body.parts.map((p: { serial: string }) => p.serial).sort()).toEqual(
      parts.filter((_, i) => CASES[i].code === 'I02-P02').map((p) => p.serial).sort(),
    );
  });
});

describe('role rules', () => {
  it('inspectors cannot move stock', async () => {
    const res = await inspector.fetch('/api/stock/move', { method: 'POST', json: { serials: [parts[0].serial], location_barcode: otherBarcode } });
    expect(res.status).toBe(403);
    expect((await res.json()).error.code).toBe('forbidden');
  });
  it('designers cannot receive (but can read bins)', async () => {
    const res = await designer.fetch('/api/stock/receive', { method: 'POST', json: { serials: [parts[9].serial] } });
    expect(res.status).toBe(403);
    expect((await designer.fetch('/api/bins')).status).toBe(200);
    expect((await designer.fetch(`/api/bins/${1}`, { method: 'PUT', json: { low_stock_threshold: 3 } })).status).toBe(403);
  });
  it('stores cannot edit bin plans, neither preview nor save nor open the page', async () => {
    const body = { json: { device_type: type.name, definition: COARSE_PLAN }, method: 'POST' };
    expect((await stores.fetch('/api/bin-plans/preview', body)).status).toBe(403);
    expect((await stores.fetch('/api/bin-plans', body)).status).toBe(403);
    expect((await stores.fetch('/admin/bin-plans', { redirect: 'manual' })).status).toBe(403);
    expect((await stores.fetch('/api/bin-plans')).status).toBe(200);
  });
  it('only stores manage locations; inspectors do not see stock', async () => {
    expect((await designer.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('X') } })).status).toBe(403);
    expect((await inspector.fetch('/api/bins')).status).toBe(403);
    expect((await inspector.fetch('/stores', { redirect: 'manual' })).status).toBe(403);
    expect((await stores.fetch('/stores')).status).toBe(200);
  });
});
