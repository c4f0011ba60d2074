import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { ReservationConfirmed } from '~/contracts/pick-lists';
import { ReservationCancelled, ReservationList, ReservationView } from '~/contracts/reservations';
import { expectContract } from '../helpers/contract';
import { signIn, type Session } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { insertMatchStock } from './match-fixture';

let designer: Session;
let stores: Session;

beforeAll(async () => {
  [designer, stores] = await Promise.all([signIn('designer@demo.sluice.test'), signIn('stores@demo.sluice.test')]);
  await insertMatchStock({ typeName: 'MT-RES', count: 40, seed: 60, serialPrefix: 'MTR' });
});
afterAll(async () => {
  await closeDb();
});

const request = (count: number) => ({ device_type: 'MT-RES', shape: 'pair', count, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.03 });

async function propose(count: number) {
  const res = await designer.fetch('/api/match/proposals', { method: 'POST', json: request(count) });
  expect(res.status).toBe(201);
  return res.json();
}

async function partsBySerial(serials: string[]) {
  const rows = await getDb().select().from(schema.part).where(inArray(schema.part.serial, serials));
  return new Map(rows.map((r) => [r.serial, r]));
}

describe('reserving a proposal', () => {
  it('confirms in one step: parts reserved, an expiry the designer sees, a pick list sorted by location', async () => {
    const p = await propose(2);
    const serials: string[] = p.sets.flatMap((s: { parts: { serial: string }[] }) => s.parts.map((x) => x.serial));
    const res = await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: { purpose: 'test bench' } });
    expect(res.status).toBe(201);
    const out = await res.json();
    expectContract(ReservationConfirmed, out);
    // SLUICE_RESERVATION_DAYS defaults to 3 (src/lib/server/env.ts).
    const days = (new Date(out.expires_at).getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(2.99);
    expect(days).toBeLessThan(3.01);
    expect(out.reservation.status).toBe('active');
    expect(out.reservation.purpose).toBe('test bench');
    const parts = await partsBySerial(serials);
    for (const s of serials) {
      expect(parts.get(s)!.status).toBe('reserved');
      expect(parts.get(s)!.reservationId).toBe(out.reservation.id);
    }
    expect(out.pick_list.lines.map((l: { serial: string }) => l.serial).sort()).toEqual([...serials].sort());
    const locations = out.pick_list.lines.map((l: { location: string }) => l.location);
    const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
    expect([...locations].sort(collator.compare)).toEqual(locations);
    expect(out.pick_list.lines.map((l: { line_no: number }) => l.line_no)).toEqual(serials.map((_, i) => i + 1));
    // Listed among the designer's own, not visible to stores as a reservation.
    const mine = await (await designer.fetch('/api/reservations')).json();
    expectContract(ReservationList, mine);
    expect(mine.reservations.some((r: { id: string }) => r.id === out.reservation.id)).toBe(true);
    expect((await stores.fetch('/api/reservations')).status).toBe(403);
    expect((await stores.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: {} })).status).toBe(403);
    // A proposal is confirmed once.
    const again = await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: {} });
    expect(again.status).toBe(409);
    expect((await again.json()).error.message).toMatch(/already confirmed as reservation R-/);
  });

  it('a later confirmation of overlapping parts gets 409 naming them, and nothing is reserved', async () => {
    const first = await propose(3);
    const second = await propose(3); // same request, same stock: the same parts
    expect(second.sets[0].parts[0].serial).toBe(first.sets[0].parts[0].serial);
    expect((await designer.fetch(`/api/match/proposals/${first.id}/confirm`, { method: 'POST', json: {} })).status).toBe(201);
    const res = await designer.fetch(`/api/match/proposals/${second.id}/confirm`, { method: 'POST', json: {} });
    expect(res.status).toBe(409);
    const body = await res.json();
    const secondSerials: string[] = second.sets.flatMap((s: { parts: { serial: string }[] }) => s.parts.map((x) => x.serial));
    const firstSerials: string[] = first.sets.flatMap((s: { parts: { serial: string }[] }) => s.parts.map((x) => x.serial));
    const overlap = secondSerials.filter((s) => firstSerials.includes(s));
    expect(body.error.taken.map((t: { serial: string }) => t.serial).sort()).toEqual(overlap.sort());
    for (const s of overlap) expect(body.error.message).toContain(s);
    expect(body.error.message).toMatch(/Nothing was reserved.*fresh proposal/);
    // The parts of the refused proposal that were free are still free.
    const parts = await partsBySerial(secondSerials.filter((s) => !overlap.includes(s)));
    for (const p of parts.values()) expect(p.status).toBe('in_stock');
    // A fresh proposal draws on what is left.
    const fresh = await propose(3);
    for (const s of fresh.sets.flatMap((x: { parts: { serial: string }[] }) => x.parts.map((y) => y.serial))) expect(firstSerials).not.toContain(s);
  });

  it('cancelling puts the parts back in stock and cancels the pick list; set exports are served', async () => {
    const p = await propose(1);
    const out = await (await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: {} })).json();
    const cards = await designer.fetch(`/api/reservations/${out.reservation.id}/sets/1/model-cards`);
    expect(cards.headers.get('content-disposition')).toMatch(/attachment; filename="R-[0-9A-F]{8}-set1\.lib"/);
    const text = await cards.text();
    const fit = await getDb()
      .select({ vto: schema.fit.vtoV })
      .from(schema.part)
      .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
      .where(eq(schema.part.serial, p.sets[0].parts[0].serial));
    const vto = Number(new RegExp(`\\.model J_${p.sets[0].parts[0].serial.replace(/-/g, '_')} NJF\\(VTO=(\\S+)`).exec(text)![1]);
    expect(vto).toBeCloseTo(fit[0]!.vto, 6);
    expect((await designer.fetch(`/api/reservations/${out.reservation.id}/sets/2/model-cards`)).status).toBe(404);

    const res = await designer.fetch(`/api/reservations/${out.reservation.id}/cancel`, { method: 'POST', json: {} });
    expect(res.status).toBe(200);
    const cancelled = await res.json();
    expectContract(ReservationCancelled, cancelled);
    expect(cancelled.reservation.status).toBe('cancelled');
    expect(cancelled.reservation.pick_list.status).toBe('cancelled');
    const parts = await partsBySerial(p.sets[0].parts.map((x: { serial: string }) => x.serial));
    for (const x of parts.values()) {
      expect(x.status).toBe('in_stock');
      expect(x.reservationId).toBeNull();
    }
    expect((await designer.fetch(`/api/reservations/${out.reservation.id}/cancel`, { method: 'POST', json: {} })).status).toBe(409);
  });

  it('an expired, unpicked reservation returns its parts to stock (checked on read) and mails the designer', async () => {
    const p = await propose(1);
    const out = await (await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: {} })).json();
    await getDb().update(schema.reservation).set({ expiresAt: new Date(Date.now() - 60_000) }).where(eq(schema.reservation.id, out.reservation.id));
    const view = await (await designer.fetch(`/api/reservations/${out.reservation.id}`)).json();
    expectContract(ReservationView, view);
    expect(view.status).toBe('expired');
    expect(view.pick_list.status).toBe('cancelled');
    for (const part of view.sets[0].parts) expect(part.status).toBe('in_stock');
    const mail = await waitForMail('designer@demo.sluice.test', new RegExp(`Reservation ${out.reservation.code} expired`));
    expect(mail.text).toContain(p.sets[0].parts[0].serial);
  });
});
