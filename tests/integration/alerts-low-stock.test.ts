import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { signIn, type Session } from '../helpers/http';
import { caughtMail, waitForMail } from '../helpers/mail';
import { createAcceptedParts, createTestType, ONE_BIN_PLAN, uniqueName } from './stock-fixtures';

let admin: Session, stores: Session;
let type: { id: number; name: string };
let parts: { id: number; serial: string }[];
let binId: number;
let locationName: string;
const STORES = 'stores@demo.sluice.test';

const mailsForBin = () => caughtMail().filter((m) => m.subject.includes(`bin I01 of ${type.name}`));
const settle = () => new Promise((r) => setTimeout(r, 1500));

beforeAll(async () => {
  [admin, stores] = await Promise.all([signIn('admin@demo.sluice.test'), signIn(STORES)]);
  type = await createTestType('n');
  expect((await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: ONE_BIN_PLAN } })).status).toBe(201);
  locationName = uniqueName('Alert drawer');
  const loc = await (await stores.fetch('/api/locations', { method: 'POST', json: { name: locationName } })).json();
  parts = await createAcceptedParts(type.id, Array.from({ length: 13 }, (_, k) => ({ idssA: 4e-3 + k * 1e-5, vpV: -2 })));
  const bins = await (await stores.fetch(`/api/bins?device_type=${encodeURIComponent(type.name)}`)).json();
  binId = bins.bins.find((b: { code: string }) => b.code === 'I01').id;
  await stores.fetch(`/api/bins/${binId}`, { method: 'PUT', json: { home_location_id: loc.id } });
  const r = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: parts.slice(0, 10).map((p) => p.serial) } });
  expect(r.status).toBe(200);
});
afterAll(async () => {
  await closeDb();
});

describe('low-stock alerts', () => {
  it('setting a threshold below on-hand sends nothing', async () => {
    const res = await stores.fetch(`/api/bins/${binId}`, { method: 'PUT', json: { low_stock_threshold: 6 } });
    expect(res.status).toBe(200);
    await settle();
    expect(mailsForBin()).toHaveLength(0);
  });

  it('six concurrent scraps crossing the threshold send ONE e-mail naming bin, location and counts', async () => {
    const results = await Promise.all(
      parts.slice(0, 6).map((p) => stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: [p.serial], reason: 'alert test' } }).then((r) => r.status)),
    );
    expect(results).toEqual([200, 200, 200, 200, 200, 200]);
    const mail = await waitForMail(STORES, new RegExp(`bin I01 of ${type.name}`));
    await settle();
    expect(mailsForBin()).toHaveLength(1);
    // The crossing is the scrap that took on-hand from 6 to 5 (threshold 6).
    expect(mail.subject).toContain('5 on hand (threshold 6)');
    expect(mail.text).toContain(locationName);
    expect(mail.text).toMatch(/On hand:\s+5/);
    expect(mail.text).toMatch(/Reserved:\s+0/);
    expect(mail.text).toMatch(/Issued:\s+0/);
    const rows = await getDb().select().from(schema.lowStockAlert).where(eq(schema.lowStockAlert.binId, binId));
    expect(rows).toHaveLength(1);
    expect(rows[0].mailedAt).not.toBeNull();
  });

  it('receiving back to the threshold re-arms silently; the next drop below alerts once more', async () => {
    const up = await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: parts.slice(10, 13).map((p) => p.serial) } });
    expect(up.status).toBe(200);
    const [bin] = await getDb().select().from(schema.bin).where(eq(schema.bin.id, binId));
    expect(bin.lowStockAlertedAt).toBeNull();
    await settle();
    expect(mailsForBin()).toHaveLength(1);
    // On hand 7; one batch of two takes it to 5: one new crossing, one mail.
    const down = await stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: parts.slice(6, 8).map((p) => p.serial), reason: 'alert test' } });
    expect(down.status).toBe(200);
    expect((await down.json()).low_stock_alerts).toHaveLength(1);
    await settle();
    expect(mailsForBin()).toHaveLength(2);
    expect(mailsForBin()[1].to).toContain(STORES);
    // Already alerted: a further drop sends nothing.
    await stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: [parts[8].serial], reason: 'alert test' } });
    await settle();
    expect(mailsForBin()).toHaveLength(2);
  });
});
