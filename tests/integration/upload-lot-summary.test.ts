import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { signIn, type Session } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { LotSummaryMailed, UploadSummaryJson } from '~/contracts/uploads';
import { expectContract } from '../helpers/contract';

/** Issue 13, inspector: a per-lot summary of an upload, mailed to the supplier contact through the SMTP sink. */
let inspector: Session, designer: Session;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const LOT = `SUM-${RUN}`;
const TRUTH = { vtoV: -2.2, betaAPerV2: 1.5e-3, lambdaPerV: 0.015, rsOhm: 0, rdOhm: 0 };
const good = (serial: string, seed: number) =>
  simulateSweepCsv({ serial, channel: 'n', params: TRUTH, deviceType: 'WS-N30', temperatureC: 25, station: 'bench S', rand: seededRandom(seed) });

beforeAll(async () => {
  [inspector, designer] = await Promise.all([signIn('inspector@demo.sluice.test'), signIn('designer@demo.sluice.test')]);
  expect((await inspector.fetch('/api/lots', { method: 'POST', json: { code: LOT, device_type: 'WS-N30', supplier: 'Kestrel Semis' } })).status).toBe(201);
});
afterAll(async () => {
  await closeDb();
});

async function upload(files: { name: string; text: string }[]) {
  const form = new FormData();
  for (const f of files) form.append('file', new Blob([f.text]), f.name);
  form.append('lot', LOT);
  const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
  expect(res.status).toBe(202);
  const { upload_id } = await res.json();
  for (let i = 0; i < 160; i++) {
    const s = await (await inspector.fetch(`/api/uploads/${upload_id}`)).json();
    if (s.done) return upload_id as string;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('upload did not finish');
}

describe('upload summary per lot', () => {
  let id: string;
  it('counts fitted files and refusals by reason under the lot', async () => {
    id = await upload([
      { name: `${RUN}-a.csv`, text: good(`${RUN}-A`, 1) },
      { name: `${RUN}-b.csv`, text: good(`${RUN}-B`, 2) },
      { name: `${RUN}-bad1.csv`, text: 'vgs (V),vds (V),id (mA)\n0,0,zero\n' },
      { name: `${RUN}-bad2.csv`, text: 'vgs (V),vds (V),id (mA)\n0,1,x\n' },
    ]);
    const res = await inspector.fetch(`/api/uploads/${id}/summary`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expectContract(UploadSummaryJson, body);
    const lot = body.lots.find((l: { lot: string }) => l.lot === LOT);
    expect(lot).toMatchObject({ files: 4, fitted: 2, rejected: 2, device_type: 'WS-N30', supplier: 'Kestrel Semis' });
    expect(lot.refusals.reduce((n: number, r: { files: number }) => n + r.files, 0)).toBe(2);
    expect(lot.refusals[0].words).not.toMatch(/_/);
    const page = await inspector.fetch(`/upload/${id}/summary`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(`Lot ${LOT}`);
  });

  it('mails the lot summary to the supplier contact, keeps the address on the lot and audits the send', async () => {
    const to = `quality-${RUN.toLowerCase()}@kestrel.example`;
    const res = await inspector.fetch(`/api/uploads/${id}/summary-mail`, { method: 'POST', json: { lot: LOT, to } });
    expect(res.status, await res.clone().text()).toBe(200);
    expectContract(LotSummaryMailed, await res.json());
    const mail = await waitForMail(to, new RegExp(`lot ${LOT}`));
    expect(mail.subject).toContain('2 fitted, 0 flagged, 2 refused');
    expect(mail.text).toMatch(/Fitted and accepted:\s+2 files \(2 parts\)/);
    expect(mail.text).toMatch(/Refused:\s+2 files/);
    const [row] = await getDb().select().from(schema.lot).where(eq(schema.lot.code, LOT));
    expect(row!.supplierEmail).toBe(to);
    const audit = await getDb().select().from(schema.auditLog).where(eq(schema.auditLog.subjectId, LOT));
    expect(audit.map((a) => a.action)).toContain('lot.summary_mail');
  });

  it('refuses a bad address in words, and designers cannot send', async () => {
    const bad = await inspector.fetch(`/api/uploads/${id}/summary-mail`, { method: 'POST', json: { lot: LOT, to: 'not an address' } });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.message).toMatch(/to: give the supplier contact’s e-mail address/);
    expect((await designer.fetch(`/api/uploads/${id}/summary-mail`, { method: 'POST', json: { lot: LOT, to: 'a@b.example' } })).status).toBe(403);
  });
});
