import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { BASE_URL, signIn, type Session } from '../helpers/http';
import { closeDb, getDb, schema } from '~/db/client';
import { idssA } from '~/core/jfet-model';
import { MAX_SWEEP_FILE_BYTES } from '~/core/sweep-file';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';
import { LotCreated, LotList } from '~/contracts/lots';
import { StationCreated, StationList, StationRevoked } from '~/contracts/stations';
import { UploadReceived, UploadStatus } from '~/contracts/uploads';
import { expectContract } from '../helpers/contract';

/**
 * Sweep intake end to end: POST /api/sweeps (station token and inspector), the pg-boss worker
 * that the test script starts, GET /api/uploads/{id} and GET /api/parts/{serial}.
 */

let admin: Session;
let inspector: Session;
let designer: Session;
let stationToken: string;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();

const N_TRUTH = { vtoV: -2.2, betaAPerV2: 1.5e-3, lambdaPerV: 0.015, rsOhm: 0, rdOhm: 0 };
const P_TRUTH = { vtoV: -1.6, betaAPerV2: 2.2e-3, lambdaPerV: 0.02, rsOhm: 0, rdOhm: 0 };

function nFile(serial: string, seed = 1, extra: Partial<Parameters<typeof simulateSweepCsv>[0]> = {}) {
  return simulateSweepCsv({ serial, channel: 'n', params: N_TRUTH, deviceType: 'WS-N30', temperatureC: 25, station: 'bench T', rand: seededRandom(seed), ...extra });
}

async function postSweeps(files: { name: string; text: string | Uint8Array<ArrayBuffer> }[], opts: { bearer?: string; session?: Session; tags?: Record<string, string> } = {}) {
  const form = new FormData();
  for (const f of files) form.append('file', new Blob([f.text]), f.name);
  for (const [k, v] of Object.entries(opts.tags ?? {})) form.append(k, v);
  if (opts.session) return opts.session.fetch('/api/sweeps', { method: 'POST', body: form });
  // Astro's origin check wants an Origin on multipart POSTs; a station sends the server's own.
  return fetch(`${BASE_URL}/api/sweeps`, { method: 'POST', body: form, headers: { authorization: `Bearer ${opts.bearer}`, origin: BASE_URL } });
}

async function waitForUpload(id: string, via: (path: string) => Promise<Response>) {
  for (let i = 0; i < 120; i++) {
    const res = await via(`/api/uploads/${id}`);
    expect(res.status).toBe(200);
    const body = expectContract(UploadStatus, await res.json());
    if (body.done) return body;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`upload ${id} did not finish`);
}

const asStation = (path: string) => fetch(`${BASE_URL}${path}`, { headers: { authorization: `Bearer ${stationToken}` } });

beforeAll(async () => {
  admin = await signIn('admin@demo.sluice.test');
  inspector = await signIn('inspector@demo.sluice.test');
  designer = await signIn('designer@demo.sluice.test');
  const res = await admin.fetch('/api/admin/stations', { method: 'POST', json: { name: `Test bench ${RUN}` } });
  expect(res.status).toBe(201);
  stationToken = (await res.json()).token;
});
afterAll(async () => {
  await closeDb();
});

describe('station tokens', () => {
  it('are listed without the token itself, stored hashed (common practice for API tokens)', async () => {
    const res = await admin.fetch('/api/admin/stations');
    const body = await res.json();
    expectContract(StationList, body);
    const { stations } = body;
    const mine = stations.find((s: { name: string }) => s.name === `Test bench ${RUN}`);
    expect(mine.token_prefix).toBe(stationToken.slice(0, 10));
    expect(JSON.stringify(stations)).not.toContain(stationToken);
    const rows = await getDb().select().from(schema.stationToken).where(eq(schema.stationToken.id, mine.id));
    expect(rows[0].tokenSha256).not.toBe(stationToken);
    expect(rows[0].tokenSha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('a revoked token is refused at once', async () => {
    const made = expectContract(StationCreated, await (await admin.fetch('/api/admin/stations', { method: 'POST', json: { name: `Retired ${RUN}` } })).json());
    expect((await postSweeps([{ name: 'a.csv', text: nFile(`RV-${RUN}`) }], { bearer: made.token })).status).toBe(202);
    const revoked = await admin.fetch(`/api/admin/stations/${made.id}`, { method: 'DELETE' });
    expect(revoked.status).toBe(200);
    expectContract(StationRevoked, await revoked.json());
    const res = await postSweeps([{ name: 'b.csv', text: nFile(`RV2-${RUN}`) }], { bearer: made.token });
    expect(res.status).toBe(401);
  });
});

describe('POST /api/sweeps with a station token', () => {
  let uploadId: string;
  const serial = `T-${RUN}-001`;

  it('answers 202 at once with the upload id and each file queued', async () => {
    const res = await postSweeps([{ name: `${serial}.csv`, text: nFile(serial) }], { bearer: stationToken });
    expect(res.status).toBe(202);
    const body = expectContract(UploadReceived, await res.json());
    expect(body.upload_id).toMatch(/^[0-9a-f-]{36}$/);
    expect(body.files).toEqual([{ id: expect.any(Number), name: `${serial}.csv`, state: 'queued', reason: null, duplicate_of: null }]);
    uploadId = body.upload_id;
  });

  it('the worker fits the file; the upload reports fitted and the serial', async () => {
    const status = await waitForUpload(uploadId, asStation);
    expect(status.files[0].state).toBe('fitted');
    expect(status.files[0].serials).toEqual([serial]);
  });

  it('keeps the bytes under uploads/ named by SHA-256, not by the client name', async () => {
    const [f] = await getDb().select().from(schema.uploadFile).where(eq(schema.uploadFile.uploadId, uploadId));
    const { createHash } = await import('node:crypto');
    expect(f.sha256).toBe(createHash('sha256').update(nFile(serial)).digest('hex'));
    expect(f.storedPath.endsWith(f.sha256)).toBe(true);
    expect(f.storedPath).not.toContain(serial);
    const fs = await import('node:fs');
    const path = await import('node:path');
    expect(fs.readFileSync(path.resolve(process.env.SLUICE_UPLOADS_DIR!, f.storedPath), 'utf8')).toBe(nFile(serial));
  });

  it('GET /api/parts/{serial} has the documented snake_case fields with units', async () => {
    const res = await inspector.fetch(`/api/parts/${serial}`);
    expect(res.status).toBe(200);
    const p = await res.json();
    for (const key of [
      'serial', 'channel', 'status', 'vto_v', 'beta_a_per_v2', 'lambda_per_v', 'rs_ohm', 'rd_ohm', 'idss_a', 'idss_vds_v', 'vp_v', 'gfs_s',
      'gos_s', 'rds_on_ohm', 'rms_rel', 'flags', 'fitted_at', 'standard_errors', 'device_type', 'lot', 'bin_code', 'location', 'sweeps',
    ]) expect(p).toHaveProperty(key);
    expect(p.channel).toBe('n');
    expect(p.status).toBe('accepted');
    expect(p.flags).toEqual([]);
    expect(p.device_type).toBe('WS-N30');
    expect(p.idss_vds_v).toBe(10); // the type's test VDS (demo device type)
    // 0.3 % noise: the fit lands within 4 of its own standard errors of the simulated card (derived).
    expect(Math.abs(p.vto_v - N_TRUTH.vtoV)).toBeLessThan(4 * p.standard_errors.vto_v + 1e-9);
    expect(Math.abs(p.beta_a_per_v2 - N_TRUTH.betaAPerV2)).toBeLessThan(4 * p.standard_errors.beta_a_per_v2 + 1e-12);
    // IDSS(VDS) = BETA·VTO²·(1 + λ·VDS), VP = VTO for N (PRODUCT.md, ngspice level-1): within 1 %.
    expect(p.idss_a).toBeCloseTo(idssA(N_TRUTH, 10), 4);
    expect(Math.abs(p.vp_v - N_TRUTH.vtoV) / 2.2).toBeLessThan(0.01);
    expect(p.vp_v).toBeLessThan(0);
    // gfs = 2·IDSS/|VP| (PRODUCT.md) within 1 %.
    expect(Math.abs(p.gfs_s - (2 * p.idss_a) / Math.abs(p.vp_v)) / p.gfs_s).toBeLessThan(0.01);
    expect(p.test_conditions).toMatchObject({ temperature_c: 25, station: 'bench T', vds_test_v: 10 });
    expect(p.sweeps).toHaveLength(1);
    expect(p.model_card).toMatch(/^\.model J_T_\w+ NJF\(VTO=-2\.\d+ BETA=/);
  });

  it('the same bytes again make no second sweep; the file points at the first and mirrors its state', async () => {
    const res = await postSweeps([{ name: 'renamed-copy.csv', text: nFile(serial) }], { bearer: stationToken });
    const body = await res.json();
    expect(body.files[0].duplicate_of).toEqual(expect.any(Number));
    expect(body.files[0].state).toBe('fitted');
    const status = await waitForUpload(body.upload_id, asStation);
    expect(status.files[0]).toMatchObject({ state: 'fitted', serials: [serial], duplicate_of: { upload_id: uploadId } });
    const p = await (await inspector.fetch(`/api/parts/${serial}`)).json();
    expect(p.sweeps).toHaveLength(1);
  });

  it('a retest of the serial (new bytes) adds a sweep to the part history', async () => {
    const res = await postSweeps([{ name: `${serial}-retest.csv`, text: nFile(serial, 99, { temperatureC: 27 }) }], { bearer: stationToken });
    await waitForUpload((await res.json()).upload_id, asStation);
    const p = await (await inspector.fetch(`/api/parts/${serial}`)).json();
    expect(p.sweeps).toHaveLength(2);
    expect(p.sweeps.filter((s: { is_current: boolean }) => s.is_current)).toHaveLength(1);
    expect(p.test_conditions.temperature_c).toBe(27);
  });

  it('a station may read its own upload but not the parts', async () => {
    expect((await asStation(`/api/parts/${serial}`)).status).toBe(403);
    expect((await asStation('/api/parts')).status).toBe(403);
  });
});

describe('a batch with bad files (inspector in the browser session)', () => {
  const good = `T-${RUN}-101`;
  const badNumber = nFile(`T-${RUN}-102`).replace(/\n(-?\d[^,\n]*),(\d[^,\n]*),([^\n]+)\n/, '\n$1,$2,twelve\n');
  const files = [
    { name: 'good.csv', text: nFile(good) },
    { name: 'non-numeric.csv', text: badNumber },
    { name: 'empty.csv', text: '' },
    { name: 'unknown-type.csv', text: nFile(`T-${RUN}-103`, 3, { deviceType: 'XJ-999' }) },
    { name: 'no-type.csv', text: nFile(`T-${RUN}-104`, 4, { deviceType: undefined }) },
    { name: 'too-large.csv', text: new Uint8Array(new ArrayBuffer(MAX_SWEEP_FILE_BYTES + 1)).fill(0x31) },
  ];
  let status: { files: { name: string; state: string; reason: string | null; error_code: string | null; id: number }[] };

  it('takes the good file and names each bad one with why', async () => {
    const res = await postSweeps(files, { session: inspector, tags: { temperature_c: '23.5', operator: 'it' } });
    expect(res.status).toBe(202);
    const body = await res.json();
    expect(body.files.map((f: { name: string }) => f.name)).toEqual(files.map((f) => f.name));
    // Over-size files are refused at once, naming the limit (FORMATS.md: 4 MiB).
    expect(body.files[5]).toMatchObject({ state: 'rejected' });
    expect(body.files[5].reason).toContain(`limit of ${MAX_SWEEP_FILE_BYTES} bytes (4 MiB)`);
    status = await waitForUpload(body.upload_id, (p) => inspector.fetch(p));
    const by = Object.fromEntries(status.files.map((f) => [f.name, f]));
    expect(by['good.csv'].state).toBe('fitted');
    expect(by['non-numeric.csv']).toMatchObject({ state: 'rejected', error_code: 'non_numeric' });
    expect(by['non-numeric.csv'].reason).toMatch(/^non-numeric\.csv, line \d+, column 3 \(id \(mA\)\): ID is "twelve"/);
    expect(by['empty.csv']).toMatchObject({ state: 'rejected', error_code: 'empty_file' });
    expect(by['unknown-type.csv'].reason).toContain('device type "XJ-999" is not known. Known types: ');
    expect(by['unknown-type.csv'].reason).toContain('WS-N30');
    expect(by['unknown-type.csv'].reason).toContain('WS-P12');
    expect(by['no-type.csv']).toMatchObject({ state: 'rejected', error_code: 'no_device_type' });
    expect(by['too-large.csv']).toMatchObject({ state: 'rejected', error_code: 'too_large' });
  });

  it('a rejected file stores no part, sweep or fit', async () => {
    const db = getDb();
    const rejectedIds = status.files.filter((f) => f.state === 'rejected').map((f) => f.id);
    expect(rejectedIds).toHaveLength(5);
    expect(await db.select().from(schema.sweep).where(inArray(schema.sweep.uploadFileId, rejectedIds))).toHaveLength(0);
    expect(await db.select().from(schema.part).where(inArray(schema.part.serial, [`T-${RUN}-102`, `T-${RUN}-103`, `T-${RUN}-104`]))).toHaveLength(0);
  });

  it('upload tags fill what the file does not say, the file wins where it does', async () => {
    const p = await (await inspector.fetch(`/api/parts/${good}`)).json();
    expect(p.test_conditions).toMatchObject({ temperature_c: 25, operator: 'it' });
  });
});

describe('P-channel sweeps in datasheet signs', () => {
  const serial = `TP-${RUN}-001`;
  it('are read as P, stored N-equivalent, VP positive, and give a PJF card with VTO negative (SPICE convention)', async () => {
    const text = simulateSweepCsv({ serial, channel: 'p', params: P_TRUTH, deviceType: 'WS-P12', rand: seededRandom(7) });
    expect(text).toContain('\n0.0000,-0.3750,-'); // datasheet signs: VGS ≥ 0, VDS and ID negative
    const res = await postSweeps([{ name: `${serial}.csv`, text }], { session: inspector });
    await waitForUpload((await res.json()).upload_id, (p) => inspector.fetch(p));
    const p = await (await inspector.fetch(`/api/parts/${serial}`)).json();
    expect(p.channel).toBe('p');
    expect(p.vto_v).toBeLessThan(0);
    expect(p.vp_v).toBeGreaterThan(0);
    expect(Math.abs(p.vp_v - 1.6) / 1.6).toBeLessThan(0.01);
    const card = await inspector.fetch(`/api/parts/${serial}/model-card`);
    expect(card.headers.get('content-type')).toContain('text/plain');
    expect(card.headers.get('content-disposition')).toMatch(/attachment; filename="J_TP_\w+\.lib"/);
    expect(await card.text()).toMatch(/\n\.model J_TP_\w+ PJF\(VTO=-1\.\d+ /);
  });
});

describe('role rules', () => {
  it('a designer cannot upload', async () => {
    const res = await postSweeps([{ name: 'x.csv', text: nFile(`D-${RUN}`) }], { session: designer });
    expect(res.status).toBe(403);
  });
  it('a designer can read parts, filter and page them', async () => {
    const res = await designer.fetch(`/api/parts?q=T-${RUN}&status=accepted&device_type=WS-N30&page=1&page_size=2`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.page_size).toBe(2);
    expect(body.total).toBeGreaterThanOrEqual(2);
    expect(body.parts.length).toBe(2);
    expect(body.parts.every((p: { status: string; serial: string }) => p.status === 'accepted' && p.serial.includes(`T-${RUN}`))).toBe(true);
  });
  it('POST /api/lots is for inspectors; GET /api/lots counts parts by status', async () => {
    expect((await designer.fetch('/api/lots', { method: 'POST', json: { code: `L-${RUN}`, device_type: 'WS-N30' } })).status).toBe(403);
    const made = await inspector.fetch('/api/lots', { method: 'POST', json: { code: `L-${RUN}`, device_type: 'WS-N30' } });
    expect(made.status).toBe(201);
    expectContract(LotCreated, await made.json());
    const res = await postSweeps([{ name: 'lot.csv', text: nFile(`TL-${RUN}`, 11, { lot: `L-${RUN}` }) }], { session: inspector });
    await waitForUpload((await res.json()).upload_id, (p) => inspector.fetch(p));
    const { lots } = expectContract(LotList, await (await designer.fetch('/api/lots')).json());
    expect(lots.find((l: { code: string }) => l.code === `L-${RUN}`)).toMatchObject({ part_count: 1, by_status: { accepted: 1 } });
  });
  it('an unknown lot rejects the file, naming the lot', async () => {
    const res = await postSweeps([{ name: 'nolot.csv', text: nFile(`TN-${RUN}`, 12) }], { session: inspector, tags: { lot: 'NO-SUCH-LOT' } });
    const status = await waitForUpload((await res.json()).upload_id, (p) => inspector.fetch(p));
    expect(status.files[0]).toMatchObject({ state: 'rejected', error_code: 'unknown_lot' });
    expect(status.files[0].reason).toContain('lot "NO-SUCH-LOT"');
  });
  it('the demo lots were seeded through the same intake', async () => {
    const { lots } = await (await inspector.fetch('/api/lots')).json();
    const demo = lots.filter((l: { code: string }) => l.code.startsWith('WS-'));
    expect(demo.map((l: { code: string }) => l.code).sort()).toEqual(['WS-N30-2611A', 'WS-N30-2611B', 'WS-N30-2612A', 'WS-P12-2611A']);
    expect(demo.reduce((s: number, l: { part_count: number }) => s + l.part_count, 0)).toBe(320);
  });
});
