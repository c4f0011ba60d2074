import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { formatSignificant } from '~/core/units/format-quantity';
import { signIn, type Session } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { insertMatchStock } from './match-fixture';

/**
 * A designer hears, by mail through the real SMTP sink, when a part of their reservation is
 * marked for retest, scrapped or refitted, with the set's figures when reserved and now.
 */
const DESIGNER = 'designer@demo.sluice.test';
let designer: Session;
let inspector: Session;
let stores: Session;

beforeAll(async () => {
  [designer, inspector, stores] = await Promise.all([signIn(DESIGNER), signIn('inspector@demo.sluice.test'), signIn('stores@demo.sluice.test')]);
  await insertMatchStock({ typeName: 'MT-MAIL', count: 30, seed: 91, serialPrefix: 'MTM' });
});
afterAll(async () => {
  await closeDb();
});

async function reservePair(deviceType: string, purpose: string) {
  const res = await designer.fetch('/api/match/proposals', { method: 'POST', json: { device_type: deviceType, shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10, max_dvgs_v: 0.05 } });
  expect(res.status).toBe(201);
  const proposal = await res.json();
  expect(proposal.sets.length).toBe(1);
  const confirm = await designer.fetch(`/api/match/proposals/${proposal.id}/confirm`, { method: 'POST', json: { purpose } });
  expect(confirm.status).toBe(201);
  const out = await confirm.json();
  const serials: string[] = proposal.sets[0].parts.map((p: { serial: string }) => p.serial);
  return { reservationId: out.reservation.id as string, code: `R-${(out.reservation.id as string).slice(0, 8).toUpperCase()}`, serials };
}

async function reservedFigures(reservationId: string) {
  return getDb()
    .select({ serial: schema.part.serial, vgsV: schema.reservationPart.vgsV })
    .from(schema.reservationPart)
    .innerJoin(schema.part, eq(schema.part.id, schema.reservationPart.partId))
    .where(eq(schema.reservationPart.reservationId, reservationId));
}

describe('mail to the designer when a reserved part changes', () => {
  it('marked for retest: names the part, the reason, and the set figures when reserved and now', async () => {
    const r = await reservePair('MT-MAIL', 'retest mail check');
    const res = await inspector.fetch(`/api/review/${encodeURIComponent(r.serials[0])}/retest`, { method: 'POST', json: { note: 'gate leakage seen on the shelf check' } });
    expect(res.status).toBe(200);
    const mail = await waitForMail(DESIGNER, new RegExp(`A part of your reservation ${r.code} was marked for retest`));
    expect(mail.text).toContain(`Part ${r.serials[0]} of set 1 of your reservation ${r.code} (retest mail check) was marked for retest by inspector@demo.sluice.test: gate leakage seen on the shelf check.`);
    // The fit did not change, so each VGS now equals the VGS it was reserved at (derived), printed by the one formatter.
    for (const f of await reservedFigures(r.reservationId)) {
      const vgs = formatSignificant(f.vgsV, 'V', 4);
      expect(mail.text).toContain(`VGS ${vgs} → ${vgs}`);
    }
    expect(mail.text).toMatch(/Set: \|ΔVGS\| (\S+ \S+) → \1, gm mismatch/);
    expect(mail.text).toContain(`${r.serials[0]} (a, marked for retest)`);
    expect(mail.text).toContain(`/reservations/${r.reservationId}`);
  });

  it('the set\'s model-card comments carry rounded figures, not raw floats (item 3)', async () => {
    const r = await reservePair('MT-MAIL', 'card comment check');
    const text = await (await designer.fetch(`/api/reservations/${r.reservationId}/sets/1/model-cards`)).text();
    const comment = text.split('\n').find((l) => l.startsWith('* matched at'))!;
    expect(comment).toMatch(/^\* matched at ID = 1\.000 mA, \|VDS\| = 10\.0 V; \|dVGS\| = [\d.]+ [mu]?V( \+- [\d.]+ [mu]?V \(1 sigma\))? at -?[\d.]+ C, gm mismatch = \d+\.\d\d %, IDSS mismatch = \d+\.\d\d %$/);
    expect(comment).not.toMatch(/\d{7,}/);
  });

  it('scrapped by stores: the part leaves its set, the designer is told why', async () => {
    const r = await reservePair('MT-MAIL', 'scrap mail check');
    const res = await stores.fetch('/api/stock/scrap', { method: 'POST', json: { serials: [r.serials[1]], reason: 'bent leads' } });
    expect(res.status).toBe(200);
    const mail = await waitForMail(DESIGNER, new RegExp(`A part of your reservation ${r.code} was scrapped`));
    expect(mail.text).toContain(`was scrapped by stores@demo.sluice.test: bent leads.`);
    expect(mail.text).toContain(`${r.serials[1]} (b, scrapped)`);
    const [part] = await getDb().select().from(schema.part).where(eq(schema.part.serial, r.serials[1]));
    expect(part.status).toBe('scrapped');
  });

  it('refitted on review (demo part with its real sweep): the mail carries the new figures', async () => {
    const r = await reservePair('WS-N30', 'refit mail check');
    const [before] = await getDb().select().from(schema.part).where(inArray(schema.part.serial, [r.serials[0]]));
    const res = await inspector.fetch(`/api/review/${encodeURIComponent(r.serials[0])}/refit`, {
      method: 'POST',
      json: { fit_id: before.currentFitId, excluded_points: [[0, 5], [1, 5], [2, 5]], note: 'three noisy points left out' },
    });
    expect(res.status).toBe(200);
    const mail = await waitForMail(DESIGNER, new RegExp(`A part of your reservation ${r.code} was refitted`));
    expect(mail.text).toContain('three noisy points left out');
    expect(mail.text).toContain(`${r.serials[0]} (a, waiting for review)`);
    expect(mail.text).toMatch(/Set: \|ΔVGS\| \S+ \S+ → \S+ \S+, gm mismatch \S+ % → \S+ %, IDSS mismatch/);
  });
});
