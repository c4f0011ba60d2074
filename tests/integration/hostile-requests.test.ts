/**
 * Hostile requests against the running app (issue 12): each finding of the security review
 * as a table of requests and the answer they must get. Loopback only; the sign-in tests use
 * loopback addresses of their own (127.0.0.x) so their counts touch no other test.
 */
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { closeDb, getDb, schema } from '~/db/client';
import { BASE_URL, DEMO_PASSWORD, anonymous, signIn, type Session } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { insertMatchStock } from './match-fixture';

interface RawAnswer {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

/** One request over a fresh socket, optionally from another loopback address or chunked. */
function raw(
  method: string,
  path: string,
  o: { headers?: Record<string, string>; body?: string | Buffer | Buffer[]; localAddress?: string } = {},
): Promise<RawAnswer> {
  const url = new URL(path, BASE_URL);
  return new Promise((resolve, reject) => {
    const chunked = Array.isArray(o.body);
    const headers: Record<string, string | number> = { ...o.headers };
    if (!chunked && o.body !== undefined) headers['content-length'] = Buffer.byteLength(o.body as string | Buffer);
    const req = http.request({ host: url.hostname, port: url.port, path: url.pathname + url.search, method, headers, localAddress: o.localAddress, agent: false }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('error', (err: NodeJS.ErrnoException) => {
      // The server may close a refused upload before it has all of it: that is an answer too.
      if (err.code === 'EPIPE' || err.code === 'ECONNRESET') resolve({ status: -1, headers: {}, body: err.code });
      else reject(err);
    });
    if (chunked) {
      const parts = o.body as Buffer[];
      let i = 0;
      const pump = () => {
        while (i < parts.length) {
          if (!req.write(parts[i++])) return void req.once('drain', pump);
        }
        req.end();
      };
      pump();
    } else req.end(o.body);
  });
}

function errorOf(a: RawAnswer): { code: string; message: string } {
  expect(a.headers['content-type'], a.body.slice(0, 200)).toMatch(/application\/json/);
  const body = JSON.parse(a.body);
  expect(typeof body.error?.code, a.body).toBe('string');
  expect(typeof body.error?.message, a.body).toBe('string');
  return body.error;
}

let admin: Session;
let inspector: Session;
let designer: Session;
let stores: Session;
beforeAll(async () => {
  [admin, inspector, designer, stores] = await Promise.all(
    ['admin', 'inspector', 'designer', 'stores'].map((r) => signIn(`${r}@demo.sluice.test`)),
  );
});
afterAll(async () => {
  await closeDb();
});

// A loopback address no other test uses, per test.
let nextAddress = 100 + Math.floor(Math.random() * 100);
const freshAddress = () => `127.0.${nextAddress++ % 250}.${10 + Math.floor(Math.random() * 200)}`;

function signInFrom(localAddress: string, email: string, password: string, headers: Record<string, string> = {}) {
  return raw('POST', '/api/auth/sign-in/email', {
    localAddress,
    headers: { 'content-type': 'application/json', origin: BASE_URL, ...headers },
    body: JSON.stringify({ email, password }),
  });
}

// Defaults of src/lib/server/env.ts: 5 failures per account, 20 per address, in 15 minutes.
const PER_ACCOUNT = 5;
const PER_ADDRESS = 20;

describe('finding 2: sign-in limits take the address from the socket and count per account too', () => {
  it('a different X-Forwarded-For on every try does not escape the per-address limit', async () => {
    const from = freshAddress();
    const statuses: number[] = [];
    for (let i = 0; i <= PER_ADDRESS; i++) {
      const a = await signInFrom(from, `nobody-${i}-${randomUUID()}@demo.sluice.test`, 'wrong-password-x', { 'x-forwarded-for': `198.51.100.${i + 1}` });
      statuses.push(a.status);
    }
    expect(statuses.slice(0, PER_ADDRESS)).toEqual(Array(PER_ADDRESS).fill(401));
    expect(statuses[PER_ADDRESS]).toBe(429);
  });

  it('failures sent "as" another address never lock that address out', async () => {
    const victim = freshAddress();
    const attacker = freshAddress();
    for (let i = 0; i <= PER_ADDRESS; i++) {
      await signInFrom(attacker, `nobody-${i}-${randomUUID()}@demo.sluice.test`, 'wrong-password-x', { 'x-forwarded-for': victim });
    }
    const ok = await signInFrom(victim, 'stores@demo.sluice.test', DEMO_PASSWORD);
    expect(ok.status, ok.body).toBe(200);
  });

  it('one account is locked after its failures from many addresses, answering 429 in the API shape', async () => {
    const email = `typo-${randomUUID()}@demo.sluice.test`;
    for (let i = 0; i < PER_ACCOUNT; i++) expect((await signInFrom(freshAddress(), email, 'wrong-password-x')).status).toBe(401);
    const locked = await signInFrom(freshAddress(), email, 'wrong-password-x');
    expect(locked.status).toBe(429);
    expect(errorOf(locked)).toMatchObject({ code: 'rate_limited', message: expect.stringMatching(/for this account/) });
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
  });

  it("one person's typos lock their account, not the lab's shared address", async () => {
    const lab = freshAddress();
    const email = `typo-${randomUUID()}@demo.sluice.test`;
    for (let i = 0; i <= PER_ACCOUNT + 3; i++) await signInFrom(lab, email, 'wrong-password-x');
    expect((await signInFrom(lab, email, 'wrong-password-x')).status).toBe(429);
    const colleague = await signInFrom(lab, 'inspector@demo.sluice.test', DEMO_PASSWORD);
    expect(colleague.status, colleague.body).toBe(200);
  });

  it('the session records the socket address, not a forged X-Forwarded-For', async () => {
    const from = freshAddress();
    const res = await signInFrom(from, 'designer@demo.sluice.test', DEMO_PASSWORD, { 'x-forwarded-for': '203.0.113.66' });
    expect(res.status, res.body).toBe(200);
    const token = decodeURIComponent(/session_token=([^;]+)/.exec(String(res.headers['set-cookie']))![1]!).split('.')[0]!;
    const [row] = await getDb().select({ ip: schema.session.ipAddress }).from(schema.session).where(eq(schema.session.token, token));
    expect(row?.ip).toBe(from);
  });
});

/** RFC 4180 reader, enough for the exports: quoted cells, doubled quotes, CRLF. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') (cell += '"'), i++;
      else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') row.push(cell), (cell = '');
    else if (c === '\r' && text[i + 1] === '\n') {
      row.push(cell), rows.push(row), (row = []), (cell = ''), i++;
    } else cell += c;
  }
  if (cell || row.length) row.push(cell), rows.push(row);
  return rows;
}

const NUMBER = /^-?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i;
/** OWASP CSV injection: no cell may begin with = + - @ TAB CR unless it is a plain number. */
function expectNoFormulaCells(text: string) {
  const bad = parseCsv(text)
    .flat()
    .filter((c) => /^[=+\-@\t\r]/.test(c) && !NUMBER.test(c));
  expect(bad).toEqual([]);
}

describe('finding 3: every CSV export neutralises formula cells (OWASP CSV injection)', () => {
  const tag = `${Math.floor(Math.random() * 1e6)}`;
  const prefix = `=SEC${tag}`;
  const typeName = `@SEC${tag}`;
  const supplier = '=HYPERLINK("http://evil.test/x","click")';
  let proposalId = '';
  beforeAll(async () => {
    const { typeId } = await insertMatchStock({ typeName, count: 12, seed: 1212, serialPrefix: prefix });
    await getDb().update(schema.lot).set({ supplier }).where(eq(schema.lot.deviceTypeId, typeId));
    const p = await designer.fetch('/api/match/proposals', { method: 'POST', json: { device_type: typeName, shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10 } });
    const body = await p.json();
    expect(p.status, JSON.stringify(body)).toBe(201);
    proposalId = body.id;
  });

  it.each(['scatter', 'trend', 'summary', 'histograms', 'yield', 'bins'])('statistics export, table %s', async (table) => {
    const res = await designer.fetch(`/api/statistics/export?table=${table}&device_type=${encodeURIComponent(typeName)}`);
    const text = await res.text();
    expect(res.status, text).toBe(200);
    expectNoFormulaCells(text);
    expect(text).toContain(`"'${typeName}"`);
    if (table === 'scatter') {
      expect(text).toContain(`"'${prefix}-0001"`);
      expect(text).toContain(`"'${prefix}-LOT1"`);
      // N-channel VP is negative and stays a number a spreadsheet can compute with.
      const vp = parseCsv(text).slice(1).map((r) => r[5]!);
      expect(vp.length).toBeGreaterThan(0);
      for (const v of vp) expect(v).toMatch(/^-\d/);
    }
    if (table === 'trend') expect(text).toContain(`"'=HYPERLINK(""http://evil.test/x"",""click"")"`);
  });

  it('bin stock export', async () => {
    const res = await stores.fetch(`/api/bins/export.csv?device_type=${encodeURIComponent(typeName)}`);
    const text = await res.text();
    expect(res.status, text).toBe(200);
    expectNoFormulaCells(text);
    expect(text).toContain(`"'${prefix}-LO"`);
  });

  it('matched-set figures, of a proposal and of a reservation', async () => {
    const fromProposal = await (await designer.fetch(`/api/match/proposals/${proposalId}/sets/1/figures.csv`)).text();
    expectNoFormulaCells(fromProposal);
    expect(fromProposal).toMatch(new RegExp(`"'${prefix}-\\d{4}"`));
    expect(fromProposal).toMatch(new RegExp(`"'${prefix} drawer \\d"`));
    const confirm = await designer.fetch(`/api/match/proposals/${proposalId}/confirm`, { method: 'POST', json: { purpose: 'csv check' } });
    const reservation = await confirm.json();
    expect(confirm.status, JSON.stringify(reservation)).toBe(201);
    const res = await designer.fetch(`/api/reservations/${reservation.reservation.id}/sets/1/figures.csv`);
    const text = await res.text();
    expect(res.status, text).toBe(200);
    expectNoFormulaCells(text);
    expect(text).toMatch(new RegExp(`"'${prefix}-LOT\\d"`));
  });
});

describe('finding 4: sign-in goes on only to a path of this site', () => {
  it.each([
    '/%5Cevil.test/phish',
    '//evil.test/phish',
    '/\\evil.test/phish',
    '/%2F%2Fevil.test',
    '/%252F%252Fevil.test',
    'https://evil.test/',
    '/%09/evil.test',
  ])('a signed-in visit to /sign-in?next=%s goes home', async (next) => {
    const res = await designer.fetch(`/sign-in?next=${encodeURIComponent(next)}`, { redirect: 'manual' });
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe('/home');
  });
  it('a path of this site is kept, for the page redirect and the form', async () => {
    const res = await designer.fetch(`/sign-in?next=${encodeURIComponent('/parts?bin=A')}`, { redirect: 'manual' });
    expect(res.headers.get('location')).toBe('/parts?bin=A');
    const page = await (await anonymous(`/sign-in?next=${encodeURIComponent('/%5Cevil.test')}`)).text();
    expect(page).not.toContain('evil.test');
  });
});

const MIB = 1024 * 1024;
describe('finding 5: bodies are capped while they stream in', () => {
  it('a chunked JSON body past 1 MiB is refused with 413 JSON', async () => {
    const chunk = Buffer.from(`"${'x'.repeat(64 * 1024 - 2)}",`);
    const parts = [Buffer.from('{"serials":['), ...Array(20).fill(chunk), Buffer.from('"x"]}')];
    const a = await raw('POST', '/api/estimates/set', { headers: { cookie: designer.cookie, 'content-type': 'application/json', origin: BASE_URL }, body: parts });
    expect(a.status).toBe(413);
    expect(errorOf(a).code).toBe('too_large');
  });
  it('a JSON body whose Content-Length says more than 1 MiB is refused before reading it', async () => {
    const body = `{"serials":["${'y'.repeat(MIB + 10)}"]}`;
    const a = await raw('POST', '/api/estimates/set', { headers: { cookie: designer.cookie, 'content-type': 'application/json', origin: BASE_URL }, body });
    expect([413, -1]).toContain(a.status);
    if (a.status === 413) expect(errorOf(a).code).toBe('too_large');
  });
  it('a chunked upload (no Content-Length) past the request cap is refused with 413 JSON', async () => {
    // The cap is MAX_UPLOAD_REQUEST_BYTES (256 MiB); this sends a little more, in 1 MiB chunks.
    const boundary = 'sluice-hostile';
    const head = Buffer.from(`--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="big.csv"\r\ncontent-type: text/csv\r\n\r\n`);
    const block = Buffer.alloc(MIB, 0x61);
    const parts = [head, ...Array(257).fill(block), Buffer.from(`\r\n--${boundary}--\r\n`)];
    const a = await raw('POST', '/api/sweeps', {
      headers: { cookie: inspector.cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, origin: BASE_URL, 'transfer-encoding': 'chunked' },
      body: parts,
    });
    expect([413, -1]).toContain(a.status);
    if (a.status === 413) expect(errorOf(a).code).toBe('too_large');
    // The server is still there and answers the next request.
    expect((await inspector.fetch('/api/me')).status).toBe(200);
  });
});

describe('finding 6: requests that used to answer 500 get a 4xx with a reason', () => {
  it('an uploaded file whose name holds a NUL is refused before anything is stored', async () => {
    const boundary = 'sluice-nul';
    const body = Buffer.from(
      `--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="bad\u0000name.csv"\r\ncontent-type: text/csv\r\n\r\nvgs (V),vds (V),id (mA)\r\n0,0,0\r\n--${boundary}--\r\n`,
    );
    const before = await getDb().$count(schema.uploadFile);
    const a = await raw('POST', '/api/sweeps', { headers: { cookie: inspector.cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, origin: BASE_URL }, body });
    expect(a.status, a.body).toBe(400);
    expect(errorOf(a).message).toMatch(/NUL/);
    expect(await getDb().$count(schema.uploadFile)).toBe(before);
  });
  it.each([
    ['PUT', '/api/bins/99999999999999999999', () => stores, { low_stock_threshold: 1 }, 400],
    ['POST', '/api/pick-lists/PL-99999999999999999999/scan', () => stores, { serial: 'X' }, 404],
    ['GET', '/api/parts/%00', () => designer, undefined, 400],
    ['GET', '/api/bins/map?device_type=%00', () => designer, undefined, 400],
    ['GET', '/api/statistics?device_type=WS-N30&from=0000-01-01&to=9999-12-31', () => designer, undefined, 400],
    ['POST', '/api/lots', () => inspector, { code: `L-${randomUUID().slice(0, 8)}`, device_type: 'WS-N30', received_at: '+275760-09-13' }, 400],
    ['POST', '/api/estimates/set', () => designer, { serials: ['A\u0000B'], target_drain_current_a: 1e-3, vds_v: 10 }, 400],
  ] as const)('%s %s', async (method, path, who, json, status) => {
    const res = await who().fetch(path, { method, ...(json ? { json } : {}) });
    const text = await res.text();
    expect(res.status, text).toBe(status);
    expect(res.headers.get('content-type')).toMatch(/application\/json/);
    expect(JSON.parse(text).error.message.length).toBeGreaterThan(10);
  });
  it('the label page for a 5,000-character serial answers with a page that says what is wrong', async () => {
    const res = await stores.fetch(`/labels/print?kind=part&serials=${'S'.repeat(5000)}`);
    const html = await res.text();
    expect(res.status).toBeLessThan(500);
    expect(html).toMatch(/Not known, no label|too long/i);
  });
});

describe('finding 7: every /api/ answer is JSON { error: { code, message } }', () => {
  it('an unknown API path: 404 JSON', async () => {
    const res = await designer.fetch('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect((await res.json()).error).toMatchObject({ code: 'not_found', message: expect.stringContaining('/api/no-such-thing') });
  });
  it('a method the route lacks: 405 JSON with Allow', async () => {
    const res = await designer.fetch('/api/parts', { method: 'DELETE' });
    expect(res.status).toBe(405);
    expect(res.headers.get('allow')).toBe('GET');
    expect((await res.json()).error.code).toBe('method_not_allowed');
  });
  it('a bodiless DELETE without Origin: 403 JSON that says to send Origin', async () => {
    const a = await raw('DELETE', '/api/locations/1', { headers: { cookie: stores.cookie } });
    expect(a.status).toBe(403);
    expect(errorOf(a).message).toMatch(/Origin/);
  });
  it('POST …/cancel without Origin: 403 JSON', async () => {
    const a = await raw('POST', `/api/reservations/${randomUUID()}/cancel`, { headers: { cookie: designer.cookie } });
    expect(a.status).toBe(403);
    expect(errorOf(a).code).toBe('forbidden');
  });
  it('a cross-site form post to the API: 403 JSON; the same post to a page keeps Astro\'s check', async () => {
    const a = await raw('POST', '/api/lots', { headers: { cookie: inspector.cookie, origin: 'http://evil.test', 'content-type': 'application/x-www-form-urlencoded' }, body: 'code=X' });
    expect(a.status).toBe(403);
    errorOf(a);
    const page = await raw('POST', '/sign-out', { headers: { origin: 'http://evil.test', 'content-type': 'application/x-www-form-urlencoded' }, body: 'x=1' });
    expect(page.status).toBe(403);
  });
  it('a JSON post without Origin still works (stations and scripts)', async () => {
    const a = await raw('POST', '/api/estimates/self-bias', { headers: { cookie: designer.cookie, 'content-type': 'application/json' }, body: JSON.stringify({}) });
    expect(a.status).toBe(400);
    expect(errorOf(a).code).toBe('invalid_input');
  });
  it('better-auth errors come in the same shape', async () => {
    const a = await signInFrom(freshAddress(), 'designer@demo.sluice.test', 'not-the-password');
    expect(a.status).toBe(401);
    expect(errorOf(a).code).toBe('unauthenticated');
  });
});

describe("finding 8: one designer never reads another's reservation", () => {
  let other: Session;
  let reservationId = '';
  beforeAll(async () => {
    const email = `designer-two-${randomUUID().slice(0, 8)}@demo.sluice.test`;
    const res = await admin.fetch('/api/admin/users', { method: 'POST', json: { email, name: 'Dana Second', roles: ['designer'] } });
    expect(res.status).toBe(201);
    const mail = await waitForMail(email, /invited/i);
    const token = new URL(/(http:\/\/\S+\/set-password\?token=\S+)/.exec(mail.text)![1]!).searchParams.get('token');
    const set = await anonymous('/api/auth/reset-password', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, newPassword: 'second-designer-pw' }) });
    expect(set.status).toBe(200);
    other = await signIn(email, 'second-designer-pw');
    await insertMatchStock({ typeName: 'SEC-OWN', count: 8, seed: 88, serialPrefix: `SO${Math.floor(Math.random() * 1e5)}` });
    const p = await (await designer.fetch('/api/match/proposals', { method: 'POST', json: { device_type: 'SEC-OWN', shape: 'pair', count: 1, id_a: 1e-3, vds_v: 10 } })).json();
    const c = await (await designer.fetch(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: { purpose: 'ownership check' } })).json();
    reservationId = c.reservation?.id;
    expect(reservationId).toMatch(/^[0-9a-f-]{36}$/);
  });
  it('POST /api/estimates/set with its reservation_id: 404 for the other designer, 200 for the owner', async () => {
    const body = { reservation_id: reservationId, target_drain_current_a: 1e-3, vds_v: 10 };
    const theirs = await other.fetch('/api/estimates/set', { method: 'POST', json: body });
    const text = await theirs.text();
    expect(theirs.status, text).toBe(404);
    expect(text).not.toMatch(/"serial"/);
    expect((await designer.fetch('/api/estimates/set', { method: 'POST', json: body })).status).toBe(200);
  });
  it.each([
    ['GET', (id: string) => `/api/reservations/${id}`],
    ['GET', (id: string) => `/api/reservations/${id}/sets/1/figures.csv`],
    ['GET', (id: string) => `/api/reservations/${id}/sets/1/model-cards`],
    ['POST', (id: string) => `/api/reservations/${id}/cancel`],
  ] as const)('%s on the reservation: 404 for the other designer', async (method, path) => {
    const res = await other.fetch(path(reservationId), { method, ...(method === 'POST' ? { json: {} } : {}) });
    expect(res.status).toBe(404);
  });
});

describe('uploads: a station reads only its own, people read every upload', () => {
  it("a station asking for an inspector's upload gets 404; another inspector gets it", async () => {
    const boundary = 'sluice-own';
    const body = Buffer.from(
      `--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="own-${randomUUID().slice(0, 8)}.csv"\r\ncontent-type: text/csv\r\n\r\nnot a sweep ${randomUUID()}\r\n--${boundary}--\r\n`,
    );
    const up = await raw('POST', '/api/sweeps', { headers: { cookie: inspector.cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, origin: BASE_URL }, body });
    expect(up.status, up.body).toBe(202);
    const uploadId = JSON.parse(up.body).upload_id as string;
    const st = await admin.fetch('/api/admin/stations', { method: 'POST', json: { name: `ownership station ${Date.now()}` } });
    const token = (await st.json()).token as string;
    const asStation = await fetch(`${BASE_URL}/api/uploads/${uploadId}`, { headers: { authorization: `Bearer ${token}` } });
    expect(asStation.status).toBe(404);
    expect((await asStation.json()).error.code).toBe('not_found');
    expect((await inspector.fetch(`/api/uploads/${uploadId}`)).status).toBe(200);
  });
});
