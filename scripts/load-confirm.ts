/**
 * Concurrent confirmations of overlapping match proposals against a running Sluice server on
 * this machine (loopback only; bounded: at most 200 confirmations and 120 s).
 *
 * It signs in as a designer, asks for `confirmations` proposals of one device type whose sets
 * overlap (the same tolerance, ten currents and 1–3 pairs each, so many share parts),
 * fires every confirmation at once, and checks what came back:
 *  - no part is in two successful reservations;
 *  - every refusal is a 409 naming the parts taken, and each named part is held by a winner;
 *  - with DATABASE_URL set: every part the winners hold is `reserved` under that reservation,
 *    and per bin, in stock + reserved equals the in-stock count before the run.
 * Then (unless --keep) it cancels the reservations it made, so the stock is as it was.
 *
 *   npx tsx scripts/load-confirm.ts --base-url http://127.0.0.1:4321 --type WS-N30 [--confirmations 50]
 *     [--email designer@demo.sluice.test] [--password ...] [--keep]
 * Also run by tests/integration/reservations-load.test.ts.
 */
import { pathToFileURL } from 'node:url';
import pg from 'pg';

export interface LoadOptions {
  baseUrl: string;
  deviceType: string;
  confirmations?: number;
  email?: string;
  password?: string;
  databaseUrl?: string;
  keep?: boolean;
  timeoutMs?: number;
}

export interface LoadReport {
  confirmations: number;
  reserved: number;
  refused: number;
  partsReserved: number;
  problems: string[];
  elapsedMs: number;
  perBin: { bin: string; before: number; inStock: number; reserved: number }[];
}

const MAX_CONFIRMATIONS = 200;

function assertLoopback(baseUrl: string): void {
  const host = new URL(baseUrl).hostname.replace(/^\[|\]$/g, '');
  const ok = host === 'localhost' || host === '::1' || /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(host);
  if (!ok) throw new Error(`load-confirm only targets this machine (127.0.0.0/8, localhost, ::1); refusing ${host}`);
}

async function signIn(baseUrl: string, email: string, password: string) {
  const res = await fetch(`${baseUrl}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  return (path: string, init: { method?: string; json?: unknown; signal?: AbortSignal } = {}) =>
    fetch(`${baseUrl}${path}`, {
      method: init.method ?? 'GET',
      signal: init.signal,
      headers: { cookie, origin: baseUrl, ...(init.json !== undefined ? { 'content-type': 'application/json' } : {}) },
      body: init.json !== undefined ? JSON.stringify(init.json) : undefined,
    });
}

async function binCounts(client: pg.Client, deviceType: string): Promise<Map<string, { inStock: number; reserved: number }>> {
  const r = await client.query<{ bin: string; in_stock: number; reserved: number }>(
    `SELECT coalesce(b.code, '(none)') AS bin,
            count(*) FILTER (WHERE p.status = 'in_stock')::int AS in_stock,
            count(*) FILTER (WHERE p.status = 'reserved')::int AS reserved
     FROM part p JOIN device_type t ON t.id = p.device_type_id LEFT JOIN bin b ON b.id = p.bin_id
     WHERE t.name = $1 GROUP BY 1 ORDER BY 1`,
    [deviceType],
  );
  return new Map(r.rows.map((x) => [x.bin, { inStock: x.in_stock, reserved: x.reserved }]));
}

export async function runConfirmLoad(o: LoadOptions): Promise<LoadReport> {
  assertLoopback(o.baseUrl);
  const n = Math.min(o.confirmations ?? 50, MAX_CONFIRMATIONS);
  const deadline = AbortSignal.timeout(Math.min(o.timeoutMs ?? 120_000, 120_000));
  const started = performance.now();
  const api = await signIn(o.baseUrl, o.email ?? 'designer@demo.sluice.test', o.password ?? process.env.SLUICE_DEMO_PASSWORD ?? 'weir-street-demo');
  const db = o.databaseUrl ? new pg.Client({ connectionString: o.databaseUrl }) : null;
  await db?.connect();
  const problems: string[] = [];
  try {
    const before = db ? await binCounts(db, o.deviceType) : new Map();

    // Overlapping proposals: ten operating currents (0.4–2.2 mA) and 1–3 pairs each. The picker
    // favours the closest matches, so proposals at one current ask for the same parts, and
    // proposals at nearby currents share some of them.
    const proposals: { id: string; serials: string[] }[] = [];
    for (let i = 0; i < n; i++) {
      const res = await api('/api/match/proposals', {
        method: 'POST',
        signal: deadline,
        json: { device_type: o.deviceType, shape: 'pair', count: 1 + (i % 3), id_a: 0.4e-3 * (1 + (i % 10) * 0.5), vds_v: 10, max_dvgs_v: 0.02 },
      });
      const body = await res.json();
      if (res.status !== 201) throw new Error(`proposal ${i} answered ${res.status}: ${JSON.stringify(body)}`);
      proposals.push({ id: body.id, serials: body.sets.flatMap((s: { parts: { serial: string }[] }) => s.parts.map((p) => p.serial)) });
    }
    if (proposals.every((p) => p.serials.length === 0)) throw new Error(`no sets in stock of ${o.deviceType}; nothing to load-test`);

    // All confirmations at once.
    const answers = await Promise.all(
      proposals.map(async (p) => {
        const res = await api(`/api/match/proposals/${p.id}/confirm`, { method: 'POST', json: {}, signal: deadline });
        return { p, status: res.status, body: await res.json() };
      }),
    );
    const holder = new Map<string, string>();
    const winners = answers.filter((a) => a.status === 201);
    for (const w of winners) {
      const serials: string[] = w.body.reservation.sets.flatMap((s: { parts: { serial: string }[] }) => s.parts.map((x) => x.serial));
      for (const s of serials) {
        if (holder.has(s)) problems.push(`${s} reserved twice: ${holder.get(s)} and ${w.body.reservation.code}`);
        holder.set(s, w.body.reservation.id);
      }
    }
    for (const a of answers) {
      if (a.status === 201) continue;
      const taken: { serial: string }[] | undefined = a.body?.error?.taken;
      if (a.status !== 409) problems.push(`confirmation of ${a.p.id} answered ${a.status}: ${JSON.stringify(a.body)}`);
      else if (!taken?.length) problems.push(`409 for ${a.p.id} names no parts: ${a.body?.error?.message}`);
      else {
        for (const t of taken) {
          if (!a.p.serials.includes(t.serial)) problems.push(`409 for ${a.p.id} names ${t.serial}, which it never asked for`);
          if (!holder.has(t.serial)) problems.push(`409 for ${a.p.id} names ${t.serial}, but no winner holds it`);
        }
        for (const t of taken) if (!a.body.error.message.includes(t.serial)) problems.push(`409 message does not name ${t.serial}`);
      }
    }

    const perBin: LoadReport['perBin'] = [];
    if (db) {
      const rows = await db.query<{ serial: string; status: string; reservation_id: string | null }>(
        'SELECT serial, status::text, reservation_id FROM part WHERE serial = ANY($1)',
        [[...holder.keys()]],
      );
      for (const r of rows.rows) {
        if (r.status !== 'reserved' || r.reservation_id !== holder.get(r.serial)) {
          problems.push(`${r.serial} is ${r.status} under ${r.reservation_id}, expected reserved under ${holder.get(r.serial)}`);
        }
      }
      const doubled = await db.query(
        `SELECT rp.part_id FROM reservation_part rp JOIN reservation r ON r.id = rp.reservation_id
         WHERE r.status = 'active' GROUP BY rp.part_id HAVING count(*) > 1`,
      );
      if (doubled.rowCount) problems.push(`${doubled.rowCount} parts are in more than one active reservation`);
      const after = await binCounts(db, o.deviceType);
      for (const [bin, b] of before) {
        const a = after.get(bin) ?? { inStock: 0, reserved: 0 };
        perBin.push({ bin, before: b.inStock, inStock: a.inStock, reserved: a.reserved - b.reserved });
        if (a.inStock + a.reserved !== b.inStock + b.reserved) {
          problems.push(`bin ${bin}: ${b.inStock} in stock + ${b.reserved} reserved before, ${a.inStock} + ${a.reserved} after`);
        }
      }
      const reservedNow = perBin.reduce((s, b) => s + b.reserved, 0);
      if (reservedNow !== holder.size) problems.push(`bins show ${reservedNow} newly reserved parts, the winners hold ${holder.size}`);
    }

    if (!o.keep) {
      for (const w of winners) {
        const res = await api(`/api/reservations/${w.body.reservation.id}/cancel`, { method: 'POST', json: {}, signal: deadline });
        if (res.status !== 200) problems.push(`cancelling ${w.body.reservation.code} answered ${res.status}`);
      }
    }
    return {
      confirmations: n,
      reserved: winners.length,
      refused: answers.length - winners.length,
      partsReserved: holder.size,
      problems,
      elapsedMs: Math.round(performance.now() - started),
      perBin,
    };
  } finally {
    await db?.end();
  }
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (invokedDirectly) {
  const arg = (name: string) => {
    const i = process.argv.indexOf(`--${name}`);
    return i > 0 ? process.argv[i + 1] : undefined;
  };
  const report = await runConfirmLoad({
    baseUrl: arg('base-url') ?? process.env.SLUICE_TEST_BASE_URL ?? 'http://127.0.0.1:4321',
    deviceType: arg('type') ?? 'WS-N30',
    confirmations: Number(arg('confirmations') ?? 50),
    email: arg('email'),
    password: arg('password'),
    databaseUrl: process.env.DATABASE_URL,
    keep: process.argv.includes('--keep'),
  });
  console.log(
    `${report.confirmations} concurrent confirmations: ${report.reserved} reserved (${report.partsReserved} parts), ` +
      `${report.refused} refused with the parts named, in ${report.elapsedMs} ms`,
  );
  for (const b of report.perBin) console.log(`  bin ${b.bin}: ${b.before} in stock before; now ${b.inStock} in stock, ${b.reserved} reserved by this run`);
  if (report.problems.length) {
    console.error(`PROBLEMS:\n  ${report.problems.join('\n  ')}`);
    process.exit(1);
  }
  console.log('no part reserved twice; every refusal named the parts taken; bin counts agree');
}
