import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { signIn, type Session } from '../helpers/http';
import { closeDb, getDb, schema } from '~/db/client';
import { simulateSweepCsv, type Defect } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { FitAccepted, RefitResult, RetestResult, ReviewQueue } from '~/contracts/review';
import { expectContract } from '../helpers/contract';

/** The review queue: flagged fits wait for an inspector, who accepts, refits or sends to retest. */

let inspector: Session;
let designer: Session;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const PARAMS = { vtoV: -2.5, betaAPerV2: 1.6e-3, lambdaPerV: 0.012, rsOhm: 0, rdOhm: 0 };

function file(serial: string, defect: Defect, seed: number) {
  // 5 V steps of a higher-current part so that the self-heating power is reached (derived).
  return simulateSweepCsv({ serial, channel: 'n', params: defect === 'self_heating' ? { ...PARAMS, betaAPerV2: 3.2e-3 } : PARAMS, deviceType: 'WS-N30', defect, rand: seededRandom(seed) });
}

async function upload(name: string, text: string) {
  const form = new FormData();
  form.append('file', new Blob([text]), name);
  const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
  expect(res.status).toBe(202);
  const { upload_id } = await res.json();
  for (let i = 0; i < 120; i++) {
    const s = await (await inspector.fetch(`/api/uploads/${upload_id}`)).json();
    if (s.done) return s.files[0];
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('upload did not finish');
}

const heated = `R-${RUN}-HEAT`;
const broken = `R-${RUN}-BRK`;

beforeAll(async () => {
  inspector = await signIn('inspector@demo.sluice.test');
  designer = await signIn('designer@demo.sluice.test');
  const a = await upload(`${heated}.csv`, file(heated, 'self_heating', 5));
  const b = await upload(`${broken}.csv`, file(broken, 'breakdown', 6));
  expect(a.state).toBe('needs_review');
  expect(b.state).toBe('needs_review');
});
afterAll(async () => {
  await closeDb();
});

describe('the queue', () => {
  it('lists flagged parts with their flags in plain words', async () => {
    const res = await inspector.fetch('/api/review');
    expect(res.status).toBe(200);
    const body = await res.json();
    expectContract(ReviewQueue, body);
    const { items } = body;
    const h = items.find((i: { serial: string }) => i.serial === heated);
    const b = items.find((i: { serial: string }) => i.serial === broken);
    // A negative saturation slope at high VDS·ID is self-heating; a sharp rise at the top of VDS is breakdown (PRODUCT.md, common practice).
    expect(h.flags.map((f: { code: string }) => f.code)).toContain('self_heating');
    expect(b.flags.map((f: { code: string }) => f.code)).toContain('breakdown');
    expect(h.flags[0].message.length).toBeGreaterThan(20);
  });
  it('is for inspectors: a designer gets 403', async () => {
    expect((await designer.fetch('/api/review')).status).toBe(403);
    expect((await designer.fetch(`/api/review/${heated}/accept`, { method: 'POST', json: {} })).status).toBe(403);
  });
  it('the demo seed left flagged parts in it', async () => {
    const { total } = await (await inspector.fetch('/api/review')).json();
    expect(total).toBeGreaterThanOrEqual(2 + 8);
  });
});

describe('actions', () => {
  it('exclude points and refit: the points are kept on the sweep, a new fit row becomes current', async () => {
    const before = await (await inspector.fetch(`/api/parts/${heated}`)).json();
    const excluded: [number, number][] = [
      [0, 40],
      [0, 39],
      [1, 40],
    ];
    const res = await inspector.fetch(`/api/review/${heated}/refit`, { method: 'POST', json: { fit_id: before.fit_id, excluded_points: excluded, note: 'hot top points' } });
    expect(res.status).toBe(200);
    const out = expectContract(RefitResult, await res.json());
    expect(out.fit_id).toBeGreaterThan(before.fit_id);
    const after = await (await inspector.fetch(`/api/parts/${heated}`)).json();
    expect(after.fit_id).toBe(out.fit_id);
    expect(after.status).toBe('needs_review');
    expect(after.current_sweep.excluded_points).toEqual(excluded);
    expect(after.points_fitted).toBeLessThanOrEqual(before.points_fitted - 3);
    expect(after.sweeps[0].fits).toHaveLength(2);
  });
  it('a stale fit id is refused (someone refitted meanwhile)', async () => {
    const p = await (await inspector.fetch(`/api/parts/${heated}`)).json();
    const res = await inspector.fetch(`/api/review/${heated}/accept`, { method: 'POST', json: { fit_id: p.fit_id - 1 } });
    expect(res.status).toBe(409);
  });
  it('a point outside the sweep is refused with the reason', async () => {
    const res = await inspector.fetch(`/api/review/${heated}/refit`, { method: 'POST', json: { excluded_points: [[42, 0]] } });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toContain('[42, 0]');
  });
  it('a refit of stored curves no fit can read is refused (422) with the reason, not a server fault', async () => {
    const db = getDb();
    const [part] = await db.select().from(schema.part).where(eq(schema.part.serial, heated));
    const [fit] = await db.select().from(schema.fit).where(eq(schema.fit.id, part.currentFitId!));
    const [sweep] = await db.select().from(schema.sweep).where(eq(schema.sweep.id, fit.sweepId));
    const curves = sweep.curves as { vgs_v: number; vds_v: number[]; id_a: number[] }[];
    // One ID value short on the first curve: the shape no stored sweep should have.
    const malformed = curves.map((c, i) => (i === 0 ? { ...c, id_a: c.id_a.slice(1) } : c));
    await db.update(schema.sweep).set({ curves: malformed }).where(eq(schema.sweep.id, sweep.id));
    try {
      const res = await inspector.fetch(`/api/review/${heated}/refit`, { method: 'POST', json: { excluded_points: [] } });
      expect(res.status).toBe(422);
      const { error } = await res.json();
      expect(error.code).toBe('unprocessable');
      expect(error.reason).toBe('curve_family_shape');
      expect(error.message).toMatch(/^Curve 0 has \d+ VDS values and \d+ ID values/);
    } finally {
      await db.update(schema.sweep).set({ curves }).where(eq(schema.sweep.id, sweep.id));
    }
  });
  it('accept: the part becomes accepted, the fit is marked accepted by the inspector, with audit rows', async () => {
    const p = await (await inspector.fetch(`/api/parts/${heated}`)).json();
    const res = await inspector.fetch(`/api/review/${heated}/accept`, { method: 'POST', json: { fit_id: p.fit_id, note: 'checked by hand' } });
    expect(res.status).toBe(200);
    expect(expectContract(FitAccepted, await res.json()).status).toBe('accepted');
    const after = await (await inspector.fetch(`/api/parts/${heated}`)).json();
    expect(after.status).toBe('accepted');
    expect(after.review).toBe('accepted');
    const actions = after.audit.map((a: { action: string }) => a.action);
    expect(actions).toEqual(expect.arrayContaining(['part.sweep', 'part.fit', 'fit.refit', 'fit.accept', 'part.review_accept']));
    const [row] = await getDb().select().from(schema.fit).where(eq(schema.fit.id, p.fit_id));
    expect(row.reviewedBy).not.toBeNull();
  });
  it('mark for retest; the next sweep of that serial takes it out of retest', async () => {
    const p = await (await inspector.fetch(`/api/parts/${broken}`)).json();
    const res = await inspector.fetch(`/api/review/${broken}/retest`, { method: 'POST', json: { fit_id: p.fit_id } });
    expect(res.status).toBe(200);
    expectContract(RetestResult, await res.json());
    const queue = await (await inspector.fetch('/api/review?status=retest')).json();
    expect(queue.items.map((i: { serial: string }) => i.serial)).toContain(broken);
    const again = await upload(`${broken}-again.csv`, file(broken, 'none', 8));
    expect(again.state).toBe('fitted');
    const after = await (await inspector.fetch(`/api/parts/${broken}`)).json();
    expect(after.status).toBe('accepted');
    expect(after.sweeps).toHaveLength(2);
    const part = await getDb().select().from(schema.part).where(and(eq(schema.part.serial, broken)));
    expect(part[0].currentFitId).toBe(after.fit_id);
  });
});
