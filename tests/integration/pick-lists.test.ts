import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inArray } from 'drizzle-orm';
import { sortForPicking } from '~/core/stock/pick-order';
import { closeDb, getDb, schema } from '~/db/client';
import { PickListList, PickListView, PickReturnResult, PickScanResult } from '~/contracts/pick-lists';
import { expectContract } from '../helpers/contract';
import { signIn, type Session } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { insertMatchStock } from './match-fixture';

let designer: Session;
let stores: Session;
let inspector: Session;

beforeAll(async () => {
  [designer, stores, inspector] = await Promise.all([
    signIn('designer@demo.sluice.test'),
    signIn('stores@demo.sluice.test'),
    signIn('inspector@demo.sluice.test'),
  ]);
  await insertMatchStock({ typeName: 'MT-PICK', count: 40, seed: 70, serialPrefix: 'MTK' });
});
afterAll(async () => {
  await closeDb();
});

async function reserve(count: number) {
  const p = await (
    await designer.fetch('/api/match/proposals', {
      method: 'POST',
      json: { device_type: 'MT-PICK', shape: 'pair', count, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.03 },
    })
  ).json();
  const res = await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: { purpose: 'pick test' } });
  expect(res.status).toBe(201);
  return res.json();
}

const scan = (id: number, serial: string, who = stores) => who.fetch(`/api/pick-lists/${id}/scan`, { method: 'POST', json: { serial } });

async function statuses(serials: string[]) {
  const rows = await getDb().select().from(schema.part).where(inArray(schema.part.serial, serials));
  return new Map(rows.map((r) => [r.serial, r]));
}

describe('pick lists', () => {
  it('stores scan every line, wrong serials are refused saying why, the last scan issues the parts and mails the designer', async () => {
    const out = await reserve(2);
    const list = out.pick_list;
    const lines: { line_no: number; serial: string; set_no: number; role: string; location: string }[] = list.lines;
    expect(lines).toHaveLength(4);
    for (const l of lines) {
      expect(l.set_no).toBeGreaterThanOrEqual(1);
      expect(['a', 'b']).toContain(l.role);
    }

    // The printable list: every line once, in walking order (location natural order, then serial).
    const printed = await stores.fetch(`/pick-lists/${list.id}/print`);
    expect(printed.status).toBe(200);
    const html = await printed.text();
    const order = [...html.matchAll(/data-serial="([^"]+)"/g)].map((m) => m[1]);
    const walk = sortForPicking(lines.map((l) => ({ serial: l.serial, locationName: l.location, binCode: null }))).map((l) => l.serial);
    expect(order).toEqual(walk);
    expect(html).toContain(list.code);
    expect((await inspector.fetch(`/pick-lists/${list.id}/print`)).status).toBe(403);

    const open = await (await stores.fetch('/api/pick-lists?status=open')).json();
    expectContract(PickListList, open);
    expect(open.pick_lists.some((x: { id: number }) => x.id === list.id)).toBe(true);

    // Role rules: designers and inspectors cannot fulfil; inspectors cannot even read.
    expect((await scan(list.id, lines[0]!.serial, designer)).status).toBe(403);
    expect((await scan(list.id, lines[0]!.serial, inspector)).status).toBe(403);
    expect((await inspector.fetch(`/api/pick-lists/${list.id}`)).status).toBe(403);
    const own = await designer.fetch(`/api/pick-lists/${list.id}`);
    expect(own.status).toBe(200); // their own list, read-only
    expectContract(PickListView, await own.json());

    const refused = async (serial: string, refusal: string, message: RegExp) => {
      const res = await scan(list.id, serial);
      expect(res.status).toBe(409);
      const body = await res.json();
      expect(body.error.refusal).toBe(refusal);
      expect(body.error.message).toMatch(message);
    };
    await refused('NO-SUCH-SERIAL', 'not_on_list', /NO-SUCH-SERIAL is not on pick list PL-\d+\. No part has that serial/);
    const outsider = Array.from({ length: 40 }, (_, i) => `MTK-${String(i + 1).padStart(4, '0')}`).find((s) => !lines.some((l) => l.serial === s))!;
    await refused(outsider, 'not_on_list', new RegExp(`${outsider} is not on pick list PL-\\d+\\. That part is in stock at MTK drawer`));
    // Any order (issue 13, item 7): line 3's part first, then line 1's; each scan ticks off its own line.
    const third = await scan(list.id, lines[2]!.serial);
    expect(third.status).toBe(200);
    const thirdBody = await third.json();
    expectContract(PickScanResult, thirdBody);
    expect(thirdBody.line_no).toBe(3);
    expect(thirdBody.pick_list.lines.filter((l: { picked_at: string | null }) => l.picked_at).map((l: { line_no: number }) => l.line_no)).toEqual([3]);
    const ok = await scan(list.id, `  ${lines[0]!.serial} `); // scanners may add spaces
    expect(ok.status).toBe(200);
    const okBody = await ok.json();
    expect(okBody.line_no).toBe(1);
    expect(okBody.complete).toBe(false);
    await refused(lines[0]!.serial, 'already_picked', /already picked \(line 1/);

    expect((await scan(list.id, lines[1]!.serial)).status).toBe(200);
    const last = await (await scan(list.id, lines.at(-1)!.serial)).json();
    expectContract(PickScanResult, last);
    expect(last.complete).toBe(true);
    expect(last.issued.sort()).toEqual(lines.map((l) => l.serial).sort());
    expect(last.mailed_to).toBe('designer@demo.sluice.test');
    expect(last.pick_list.status).toBe('complete');

    const parts = await statuses(lines.map((l) => l.serial));
    for (const p of parts.values()) {
      expect(p.status).toBe('issued');
      expect(p.reservationId).toBe(out.reservation.id);
    }
    const view = await (await designer.fetch(`/api/reservations/${out.reservation.id}`)).json();
    expect(view.status).toBe('issued');
    const mail = await waitForMail('designer@demo.sluice.test', new RegExp(`issued \\(reservation ${out.reservation.code}\\)`));
    for (const l of lines) expect(mail.text).toContain(l.serial);
    await refused(lines[0]!.serial, 'list_closed', /is complete/);

    // Later, stores take two parts back: issued → returned → in stock, at the place they came from.
    const back = await stores.fetch(`/api/pick-lists/${list.id}/returns`, { method: 'POST', json: { serials: [lines[0]!.serial, lines[1]!.serial] } });
    expect(back.status).toBe(200);
    expectContract(PickReturnResult, await back.json());
    const after = await statuses([lines[0]!.serial, lines[1]!.serial]);
    for (const [serial, p] of after) {
      expect(p.status).toBe('in_stock');
      expect(p.reservationId).toBeNull();
      const [loc] = await getDb().select().from(schema.location).where(inArray(schema.location.id, [p.locationId!]));
      expect(loc!.name).toBe(lines.find((l) => l.serial === serial)!.location);
    }
    const audit = await getDb().select().from(schema.auditLog).where(inArray(schema.auditLog.subjectId, [lines[0]!.serial]));
    expect(audit.map((a) => a.action)).toEqual(expect.arrayContaining(['part.reserve', 'pick_line.pick', 'part.issue', 'part.return', 'part.restock']));
    const twice = await stores.fetch(`/api/pick-lists/${list.id}/returns`, { method: 'POST', json: { serials: [lines[0]!.serial] } });
    expect(twice.status).toBe(409);
    expect((await twice.json()).error.message).toMatch(/in stock, not issued/);
  });

  it('a cancelled reservation closes its list to scanning', async () => {
    const out = await reserve(1);
    await designer.fetch(`/api/reservations/${out.reservation.id}/cancel`, { method: 'POST', json: {} });
    const res = await scan(out.pick_list.id, out.pick_list.lines[0].serial);
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(/is cancelled.*Put any parts/);
  });
});
