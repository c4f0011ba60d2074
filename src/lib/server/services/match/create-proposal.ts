import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import { DVGS_GUARD_SIGMAS } from '~/core/match/set-mismatch';
import type { MatchCandidate, MatchResult, MatchTolerances, OperatingPoint } from '~/core/match/match-types';
import { getDb, getPool, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { loadTypeStock, type TypeStock } from './candidate-cache';
import { withStockFigures } from './parallel-figures';
import { findDeviceType, resolveBinCodes, type MatchDeviceType } from './device-type';
import { ProposalRequest, type ProposalView, type ProposedSet } from '~/contracts/match';
import type { PartJson } from '~/contracts/parts';
import { partJson } from '../parts/part-json';

/** What is stored in match_proposal.result (the view without id, dates and reservation). */
export type StoredProposalResult = Omit<ProposalView, 'id' | 'created_at' | 'reservation_id' | 'server_ms'>;

interface ChosenPartRow {
  id: number;
  serial: string;
  status: PartJson['status'];
  bin_code: string | null;
  bin_label: string | null;
  location: string | null;
  lot: string | null;
}

/** The chosen parts as they are now (status, bin, location, lot), by part id. */
async function readChosenParts(type: MatchDeviceType, ids: number[]): Promise<Map<number, PartJson>> {
  if (ids.length === 0) return new Map();
  const r = await getPool().query<ChosenPartRow>({
    name: 'match-chosen-parts',
    text: `SELECT p.id, p.serial, p.status::text AS status, b.code AS bin_code, b.label AS bin_label, l.name AS location, lt.code AS lot
           FROM part p LEFT JOIN bin b ON b.id = p.bin_id LEFT JOIN location l ON l.id = p.location_id
           LEFT JOIN lot lt ON lt.id = p.lot_id
           WHERE p.id = ANY($1::int[])`,
    values: [ids],
  });
  return new Map(
    r.rows.map((row) => [
      row.id,
      partJson({
        part: row,
        type,
        lot: row.lot === null ? null : { code: row.lot },
        bin: row.bin_code === null ? null : { code: row.bin_code, label: row.bin_label ?? '' },
        location: row.location === null ? null : { name: row.location },
      }),
    ]),
  );
}

const orInfinity = (v: number | null | undefined) => (v === null || v === undefined ? Infinity : v);

/**
 * Proposes matched sets from the type's stock at the designer's operating point and stores the
 * proposal: `chooseMatchedSets` over the in-stock parts (from the candidate cache), then the
 * chosen parts' bins and locations read fresh. A chosen part found gone from stock (the cache
 * raced a change) is dropped and the picker runs again, at most twice.
 */
export async function createMatchProposal({ actor, input }: { actor: Actor | null; input: unknown }): Promise<ProposalView> {
  const started = performance.now();
  requirePermission(actor, 'match:request');
  if (!actor.userId) throw new AppError('people_only', { what: 'Match proposals' });
  const designerUserId = actor.userId;
  const req = ProposalRequest.parse(input);
  const type = await findDeviceType(req.device_type);
  const { stock } = await loadTypeStock(type.id);

  let slots: number[] | null = null;
  if (req.bins && req.bins.length) {
    const binIds = await resolveBinCodes(type.id, req.bins);
    slots = [];
    for (let i = 0; i < stock.binIds.length; i++) if (binIds.has(stock.binIds[i]!)) slots.push(i);
  }
  let candidates: MatchCandidate[] = slots ? slots.map((i) => stock.candidates[i]!) : stock.candidates;

  const operatingPoint: OperatingPoint =
    req.operating_point === 'current'
      ? { kind: 'current', idA: Math.abs(req.id_a!), vdsV: Math.abs(req.vds_v) }
      : req.operating_point === 'idss'
        ? { kind: 'idss', vdsV: Math.abs(req.vds_v) }
        : { kind: 'self_bias', rsOhm: req.rs_ohm!, vdsV: Math.abs(req.vds_v) };
  const tolerances: MatchTolerances = {
    maxDvgsV: orInfinity(req.max_dvgs_v),
    maxGmMismatch: orInfinity(req.max_gm_mismatch),
    maxIdssMismatch: orInfinity(req.max_idss_mismatch),
    cascodeMarginV: req.cascode_margin_v ?? 0,
  };

  let result: MatchResult | undefined;
  let fresh = new Map<number, PartJson>();
  for (let attempt = 0; attempt < 3; attempt++) {
    const input = { candidates, operatingPoint, shape: req.shape, count: req.count, tolerances, options: { sameLot: req.same_lot }, temperatureC: req.temperature_c };
    result = await withStockFigures(stock, candidates, operatingPoint, req.temperature_c, (evaluated) => chooseMatchedSets({ ...input, evaluated }));
    const chosen = result.sets.flatMap((s) => s.parts.map((p) => stock.partIds[stock.slotBySerial.get(p.id)!]!));
    fresh = await readChosenParts(type, chosen);
    const gone = new Set(chosen.filter((id) => fresh.get(id)?.status !== 'in_stock'));
    if (gone.size === 0) break;
    candidates = candidates.filter((c) => !gone.has(stock.partIds[stock.slotBySerial.get(c.id)!]!));
    if (attempt === 2) throw new AppError('stock_changing');
  }

  const view = presentResult(type, req, stock, candidates.length, result!, fresh);
  const [row] = await getDb()
    .insert(schema.matchProposal)
    .values({ designerUserId, deviceTypeId: type.id, request: req, result: view })
    .returning({ id: schema.matchProposal.id, createdAt: schema.matchProposal.createdAt });
  return {
    id: row!.id,
    created_at: row!.createdAt.toISOString(),
    reservation_id: null,
    ...view,
    server_ms: Math.round((performance.now() - started) * 10) / 10,
  };
}

function presentResult(
  type: MatchDeviceType,
  req: ProposalRequest,
  stock: TypeStock,
  considered: number,
  result: MatchResult,
  fresh: Map<number, PartJson>,
): StoredProposalResult {
  const sign = type.channel === 'n' ? 1 : -1;
  const sets: ProposedSet[] = result.sets.map((s, index) => {
    const set: ProposedSet = {
      index,
      parts: s.parts.map((p) => {
        const partId = stock.partIds[stock.slotBySerial.get(p.id)!]!;
        const f = fresh.get(partId);
        return {
          part_id: partId,
          serial: p.id,
          role: p.role,
          ...(p.cascodeIndex !== undefined ? { cascode_index: p.cascodeIndex } : {}),
          vgs_v: sign * p.vgsV,
          vgs_sigma_v: p.vgsSigmaV,
          gm_s: p.gmS,
          gos_s: p.gosS,
          idss_a: p.idssA,
          source: p.source,
          temperature_shift_v: sign * p.temperatureShiftV,
          id_a: p.idA,
          vds_v: p.vdsV,
          vds_sat_v: p.vdsSatV,
          bin_code: f?.bin_code ?? null,
          location: f?.location ?? null,
          lot: f?.lot ?? null,
        };
      }),
      dvgs_v: s.dvgsV,
      dvgs_sigma_v: s.dvgsSigmaV,
      gm_mismatch: s.gmMismatch,
      idss_mismatch: s.idssMismatch,
      cost: s.costs.total,
    };
    if (s.cascodeHeadroomV !== undefined) set.cascode_headroom_v = s.cascodeHeadroomV;
    return set;
  });
  const unusable: Record<string, number> = {};
  for (const u of result.unusable) unusable[u.code] = (unusable[u.code] ?? 0) + 1;
  const l = result.looser;
  return {
    device_type: { id: type.id, name: type.name, channel: type.channel },
    shape: req.shape,
    count_requested: req.count,
    operating_point: {
      kind: req.operating_point,
      id_a: req.operating_point === 'current' ? sign * Math.abs(req.id_a!) : null,
      vds_v: sign * Math.abs(req.vds_v),
      rs_ohm: req.operating_point === 'self_bias' ? req.rs_ohm! : null,
    },
    tolerances: {
      max_dvgs_v: req.max_dvgs_v ?? null,
      max_gm_mismatch: req.max_gm_mismatch ?? null,
      max_idss_mismatch: req.max_idss_mismatch ?? null,
      cascode_margin_v: req.shape.includes('cascode') ? (req.cascode_margin_v ?? 0) : null,
    },
    same_lot: req.same_lot,
    bins: req.bins && req.bins.length ? req.bins : null,
    temperature_c: req.temperature_c,
    dvgs_guard_sigmas: DVGS_GUARD_SIGMAS,
    sets,
    total_cost: result.totalCost,
    guarantee: result.guarantee,
    looser: {
      all_times_1_5: l.allTimes1_5,
      all_times_2: l.allTimes2,
      only_one_times_2: {
        max_dvgs_v: l.onlyOneTimes2.maxDvgsV,
        max_gm_mismatch: l.onlyOneTimes2.maxGmMismatch,
        max_idss_mismatch: l.onlyOneTimes2.maxIdssMismatch,
        cascode_margin_v: l.onlyOneTimes2.cascodeMarginV,
      },
    },
    candidates: { in_stock: stock.candidates.length, considered, unusable },
  };
}
