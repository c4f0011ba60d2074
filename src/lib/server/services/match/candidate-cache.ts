import type { MatchCandidate } from '~/core/match/match-types';
import type { TemperatureCoefficients } from '~/core/operating-point/part-operating-figures';
import { operatingTableFromBytes } from '~/core/operating-point/operating-table';
import { getPool } from '~/db/client';
import { listenForNotices, type NoticeChannel } from '~/db/notices';
import { BASIS_FLOATS, packBasis } from './packed-bases';

/**
 * The in-stock parts of one device type with their current fitted models, held in this server
 * process so a match request does not read 100 000 rows from PostgreSQL each time.
 *
 * Each candidate carries what `partOperatingFigures` needs: the fitted model, the measurements'
 * operating table, the sweep's temperature and the type's temperature coefficients.
 *
 * Freshness: the database announces every committed change that touches stock — a part
 * entering, leaving or changing while in stock — and every change to a device type (NOTIFY
 * sluice_stock with the type's id, migrations 0005 and 0007); while that channel is open an entry
 * stays valid until a notice for its type arrives, and a request costs no query at all. A notice
 * reaches the server a moment after its commit, so a request in that moment sees the stock as it
 * was just before — as if it had come a moment earlier. Whenever the channel is closed, or has
 * just (re)opened and notices may have been missed, each request first reads the type's stock version — count, Σ id, Σ current fit,
 * Σ bin, Σ lot and max(updated_at) over its in-stock parts — in one aggregate over the
 * (device_type_id, status) index, and rebuilds the entry when it differs. A part entering or
 * leaving stock changes the count or Σ id; a new fit, a bin change or a new lot changes its
 * sum; every status change also moves max(updated_at); the type's temperature coefficients are
 * part of the version too. A change that slips past this (two
 * moves that cancel in every sum inside one read) can only make a proposal offer a part that
 * is gone or miss one that arrived: the chosen parts are re-read from the database before they
 * are shown, and confirmation locks and re-checks every part, so a stale entry can never
 * reserve a part twice.
 */
export interface TypeStock {
  deviceTypeId: number;
  version: string;
  /** Slot i: the part's database id, bin id (0 when none) and the candidate given to the core. */
  partIds: Int32Array;
  binIds: Int32Array;
  candidates: MatchCandidate[];
  /** Serial → slot. */
  slotBySerial: Map<string, number>;
  /** This build, among all builds in this process (worker threads key their copies by it). */
  key: number;
  /** The candidates' bases in shared memory (`packBasis`, slot i for candidate i). */
  shared: { tables: Float64Array; bases: Float64Array };
  builtAt: Date;
  /** The notices seen when the entry was last known current (null: not listening then). */
  noticeMark: string | null;
}

const entries = new Map<number, TypeStock>();
let builds = 0;
const building = new Map<number, Promise<TypeStock>>();

// Stock change notices: a count per type, and a count of gaps (times notices may have been missed).
let channel: NoticeChannel | null = null;
const noticesByType = new Map<number, number>();
let gaps = 0;

function stockNotices(): NoticeChannel {
  if (!channel || channel.closed()) {
    channel = listenForNotices('sluice_stock', {
      onNotice: (payload) => {
        const id = Number(payload);
        noticesByType.set(id, (noticesByType.get(id) ?? 0) + 1);
      },
      onGap: () => void gaps++,
    });
  }
  return channel;
}

/** What the channel has said about a type so far; null when it is not open. */
function noticeMark(deviceTypeId: number): string | null {
  return stockNotices().listening() ? `${gaps}:${noticesByType.get(deviceTypeId) ?? 0}` : null;
}

const VERSION_SQL = `
  SELECT count(*)::text || ':' || coalesce(sum(id), 0)::text || ':' || coalesce(sum(current_fit_id), 0)::text || ':' ||
         coalesce(sum(bin_id), 0)::text || ':' || coalesce(sum(lot_id), 0)::text || ':' ||
         coalesce(to_char(max(updated_at) AT TIME ZONE 'UTC', 'YYYYMMDDHH24MISSUS'), '-') || ':' ||
         (SELECT vtotc_v_per_c::text || ':' || betatce_pct_per_c::text FROM device_type WHERE id = $1) AS version
  FROM part WHERE device_type_id = $1 AND status = 'in_stock'`;

const LOAD_SQL = `
  SELECT p.id, p.serial, p.lot_id, p.bin_id, f.vto_v, f.beta_a_per_v2, f.lambda_per_v, f.rs_ohm, f.rd_ohm,
         f.operating_table, f.model_vgs_sigma_v, s.temperature_c, dt.vtotc_v_per_c, dt.betatce_pct_per_c
  FROM part p JOIN fit f ON f.id = p.current_fit_id JOIN sweep s ON s.id = f.sweep_id
  JOIN device_type dt ON dt.id = p.device_type_id
  WHERE p.device_type_id = $1 AND p.status = 'in_stock'
  ORDER BY p.id`;

/** The stock version of a type: one indexed aggregate (see the module comment). */
export async function readStockVersion(deviceTypeId: number): Promise<string> {
  const r = await getPool().query<{ version: string }>({ name: 'match-stock-version', text: VERSION_SQL, values: [deviceTypeId] });
  return r.rows[0]!.version;
}

async function build(deviceTypeId: number): Promise<TypeStock> {
  // Taken before the snapshot: a change committed after it moves the mark, so a later request rebuilds.
  const mark = noticeMark(deviceTypeId);
  const client = await getPool().connect();
  try {
    // One snapshot for the version and the rows, so the version describes exactly these rows.
    await client.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
    const v = await client.query<{ version: string }>(VERSION_SQL, [deviceTypeId]);
    const rows = await client.query({ text: LOAD_SQL, values: [deviceTypeId], rowMode: 'array' });
    await client.query('COMMIT');
    const n = rows.rows.length;
    const partIds = new Int32Array(n);
    const binIds = new Int32Array(n);
    const candidates: MatchCandidate[] = new Array(n);
    const slotBySerial = new Map<string, number>();
    // Every part's operating table in one array: one allocation for the whole stock.
    let tableBytes = 0;
    for (let i = 0; i < n; i++) tableBytes += (rows.rows[i] as unknown[])[9] ? ((rows.rows[i] as unknown[])[9] as Buffer).byteLength : 0;
    // Shared memory, so a worker thread reads the same tables (parallel-figures.ts).
    const tableValues = new Float64Array(new SharedArrayBuffer(8 * Math.ceil(tableBytes / 8)));
    const packed = new Float64Array(new SharedArrayBuffer(8 * BASIS_FLOATS * n));
    let tempco: TemperatureCoefficients | undefined;
    let tableAt = 0;
    for (let i = 0; i < n; i++) {
      const [id, serial, lotId, binId, vto, beta, lambda, rs, rd, table, modelSigma, measuredAtC, vtotc, betatce] = rows.rows[i] as [
        number, string, number | null, number | null, number, number, number, number, number,
        Buffer | null, number | null, number | null, number, number,
      ];
      partIds[i] = id;
      binIds[i] = binId ?? 0;
      slotBySerial.set(serial, i);
      // One type, so one set of coefficients: shared by every candidate.
      if (!tempco || tempco.vtotcVPerC !== vtotc || tempco.betatcePctPerC !== betatce) tempco = { vtotcVPerC: vtotc, betatcePctPerC: betatce };
      candidates[i] = {
        id: serial,
        lotId: lotId === null ? null : String(lotId),
        binCode: null,
        params: { vtoV: vto, betaAPerV2: beta, lambdaPerV: lambda, rsOhm: rs, rdOhm: rd },
        table: table ? operatingTableFromBytes(table, tableValues, tableAt) : null,
        measuredAtC,
        tempco,
        modelSigmaV: modelSigma ?? NaN,
      };
      packBasis(candidates[i]!, packed, i);
      if (table) tableAt += table.byteLength / 8;
    }
    return {
      deviceTypeId,
      key: ++builds,
      version: v.rows[0]!.version,
      partIds,
      binIds,
      candidates,
      shared: { tables: tableValues, bases: packed },
      slotBySerial,
      builtAt: new Date(),
      noticeMark: mark,
    };
  } catch (err) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}

/**
 * The current in-stock candidates of a type: the cached entry when its version still holds,
 * else a fresh load (concurrent requests for one type share one load). `rebuilt` says which.
 */
export async function loadTypeStock(deviceTypeId: number): Promise<{ stock: TypeStock; rebuilt: boolean }> {
  const mark = noticeMark(deviceTypeId);
  const cached = entries.get(deviceTypeId);
  if (mark !== null && cached && cached.noticeMark === mark) return { stock: cached, rebuilt: false };
  const version = await readStockVersion(deviceTypeId);
  if (cached && cached.version === version) {
    cached.noticeMark = mark;
    return { stock: cached, rebuilt: false };
  }
  let pending = building.get(deviceTypeId);
  if (!pending) {
    pending = build(deviceTypeId).finally(() => building.delete(deviceTypeId));
    building.set(deviceTypeId, pending);
  }
  const stock = await pending;
  entries.set(deviceTypeId, stock);
  return { stock, rebuilt: true };
}

/** Drops every cached entry (tests, or after a bulk change made outside the app). */
export function clearCandidateCache(): void {
  entries.clear();
}
