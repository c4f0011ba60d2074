import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inArray } from 'drizzle-orm';
import { signIn, type Session } from '../helpers/http';
import { closeDb, getDb, schema } from '~/db/client';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';

/** Issue 13, item 12: an inspector accepts several flagged parts at once, all or nothing. */
let inspector: Session;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const serials = [1, 2, 3].map((i) => `RM-${RUN}-${i}`);

beforeAll(async () => {
  inspector = await signIn('inspector@demo.sluice.test');
  const form = new FormData();
  serials.forEach((s, i) => {
    const text = simulateSweepCsv({ serial: s, channel: 'n', params: { vtoV: -2.5, betaAPerV2: 1.6e-3, lambdaPerV: 0.012, rsOhm: 0, rdOhm: 0 }, deviceType: 'WS-N30', defect: 'breakdown', rand: seededRandom(40 + i) });
    form.append('file', new Blob([text]), `${s}.csv`);
  });
  const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
  expect(res.status).toBe(202);
  const { upload_id } = await res.json();
  for (let i = 0; i < 160; i++) {
    const s = await (await inspector.fetch(`/api/uploads/${upload_id}`)).json();
    if (s.done) {
      expect(s.files.map((f: { state: string }) => f.state)).toEqual(['needs_review', 'needs_review', 'needs_review']);
      return;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('upload did not finish');
});
afterAll(async () => {
  await closeDb();
});

async function states() {
  const rows = await getDb().select().from(schema.part).where(inArray(schema.part.serial, serials));
  return new Map(rows.map((r) => [r.serial, r]));
}

describe('accept several at once', () => {
  it('a stale fit in the batch refuses the whole batch; nothing changes', async () => {
    const before = await states();
    const res = await inspector.fetch('/api/review/accept', {
      method: 'POST',
      json: { parts: [{ serial: serials[0], fit_id: before.get(serials[0]!)!.currentFitId }, { serial: serials[1], fit_id: 1 }] },
    });
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(new RegExp(`${serials[1]} has a newer fit`));
    const after = await states();
    for (const s of serials) expect(after.get(s)!.status).toBe('needs_review');
  });

  it('accepts and bins the chosen parts in one go, with the note in the audit trail', async () => {
    const before = await states();
    const res = await inspector.fetch('/api/review/accept', {
      method: 'POST',
      json: { parts: serials.slice(0, 2).map((s) => ({ serial: s, fit_id: before.get(s)!.currentFitId })), note: 'breakdown points only; curves fine' },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    expect((await res.json()).accepted.map((a: { serial: string }) => a.serial).sort()).toEqual(serials.slice(0, 2).sort());
    const after = await states();
    expect(after.get(serials[0]!)!.status).toBe('accepted');
    expect(after.get(serials[1]!)!.status).toBe('accepted');
    expect(after.get(serials[2]!)!.status).toBe('needs_review');
    const audit = await getDb().select().from(schema.auditLog).where(inArray(schema.auditLog.subjectId, serials.slice(0, 2)));
    expect(audit.filter((a) => a.action === 'fit.accept').map((a) => a.reason)).toEqual(['breakdown points only; curves fine', 'breakdown points only; curves fine']);
  });

  it('refuses an empty or repeated list in words', async () => {
    const empty = await inspector.fetch('/api/review/accept', { method: 'POST', json: { parts: [] } });
    expect(empty.status).toBe(400);
    expect((await empty.json()).error.message).toContain('parts: choose at least one part to accept');
    const twice = await inspector.fetch('/api/review/accept', { method: 'POST', json: { parts: [{ serial: serials[2] }, { serial: serials[2] }] } });
    expect(twice.status).toBe(400);
  });
});
