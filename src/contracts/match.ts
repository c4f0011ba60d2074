import { z } from 'zod';
import { Channel, FigureSource, IsoDateTime } from './common';
import { PartJson } from './parts';

/** A tolerance in the request: a number, or null/absent for "not constrained". */
const Tolerance = (max?: number) => {
  const n = z.number().nonnegative();
  return (max === undefined ? n : n.max(max)).nullable().optional();
};

export const MATCH_SHAPES = ['pair', 'quad', 'cascode_pair', 'matched_cascode_pairs'] as const;
export const OPERATING_POINT_KINDS = ['current', 'idss', 'self_bias'] as const;

/**
 * `POST /api/match/proposals`. Currents and voltages may be given in datasheet sign or as
 * magnitudes: the magnitude is used (a P-channel part runs at −ID, −VDS).
 */
export const ProposalRequest = z
  .object({
    device_type: z.union([z.string().trim().min(1), z.number().int().positive()]),
    shape: z.enum(MATCH_SHAPES),
    count: z.number().int().min(1).max(500),
    operating_point: z.enum(OPERATING_POINT_KINDS).default('current'),
    id_a: z.number().refine((v) => v !== 0 && Math.abs(v) <= 1, 'give the drain current in A, between 0 and 1 A (e.g. 0.001 for 1 mA)').optional(),
    vds_v: z.number().refine((v) => v !== 0 && Math.abs(v) <= 200, 'give |VDS| in V, above 0 and at most 200 V'),
    rs_ohm: z.number().positive().max(1e7).optional(),
    max_dvgs_v: Tolerance(5),
    max_gm_mismatch: Tolerance(1),
    max_idss_mismatch: Tolerance(1),
    cascode_margin_v: z.number().nonnegative().max(50).nullable().optional(),
    same_lot: z.boolean().default(false),
    /** Parts are compared at this temperature (°C), each corrected from its sweep's temperature. */
    temperature_c: z.number().min(-60).max(200).default(25),
    bins: z.array(z.string().trim().min(1)).max(200).optional(),
    purpose: z.string().trim().max(300).optional(),
  })
  .superRefine((r, ctx) => {
    if (r.operating_point === 'current' && r.id_a === undefined) {
      ctx.addIssue({ code: 'custom', path: ['id_a'], message: 'an operating point at a current needs id_a (A)' });
    }
    if (r.operating_point === 'self_bias' && r.rs_ohm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['rs_ohm'], message: 'a self-bias operating point needs rs_ohm (Ω)' });
    }
    if ((r.shape === 'cascode_pair' || r.shape === 'matched_cascode_pairs') && r.operating_point !== 'current') {
      ctx.addIssue({
        code: 'custom',
        path: ['operating_point'],
        message: 'a cascode shares one drain current between its parts: use operating_point "current" with id_a',
      });
    }
  });
export type ProposalRequest = z.infer<typeof ProposalRequest>;

/** `POST /api/match/proposals/{id}/confirm`: an optional note for stores. */
export const ConfirmRequest = z.object({ purpose: z.string().trim().max(300).optional() });
export type ConfirmRequest = z.infer<typeof ConfirmRequest>;

/** `GET /api/match/device-types`: a type a designer can match from, with what is in stock of it. */
export const MatchableType = z.object({
  id: z.number().int(),
  name: z.string(),
  channel: Channel,
  vds_test_v: z.number(),
  in_stock: z.number().int(),
  /** Bins of the type's active plan, with how many parts of each are in stock. */
  bins: z.array(z.object({ code: z.string(), label: z.string(), in_stock: z.number().int() })),
});
export type MatchableType = z.infer<typeof MatchableType>;

export const MatchableTypeList = z.object({ device_types: z.array(MatchableType) });
export type MatchableTypeList = z.infer<typeof MatchableTypeList>;

/**
 * A part of a proposed set. Voltages at the operating point are in datasheet sign for the type's
 * channel (VGS positive for a P-channel part); currents, gm and VDS(sat) are magnitudes.
 */
export const ProposedPart = PartJson.pick({ serial: true, bin_code: true, location: true, lot: true }).extend({
  part_id: z.number().int(),
  role: z.enum(['a', 'b', 'c', 'd', 'lower', 'upper']),
  /** Matched cascode sets: which of the two cascodes (0 or 1) the part is in. */
  cascode_index: z.union([z.literal(0), z.literal(1)]).optional(),
  vgs_v: z.number(),
  /** One standard deviation of vgs_v (V); 0 when the part's fit states none. */
  vgs_sigma_v: z.number(),
  gm_s: z.number(),
  gos_s: z.number(),
  /** IDSS at this part's VDS in the set (measured where the sweep reaches it). */
  idss_a: z.number(),
  /** Where the figures came from: the part's measurements, or its fitted model (extrapolated). */
  source: FigureSource,
  /** VGS correction bringing the part from its sweep's temperature to the compare temperature (V, datasheet sign). */
  temperature_shift_v: z.number(),
  id_a: z.number(),
  /** |VDS| this part sees in the set (a cascode's lower runs at −VGS of its upper). */
  vds_v: z.number(),
  vds_sat_v: z.number(),
});
export type ProposedPart = z.infer<typeof ProposedPart>;

export const ProposedSet = z.object({
  index: z.number().int(),
  parts: z.array(ProposedPart),
  dvgs_v: z.number(),
  /** One standard deviation of dvgs_v (V). */
  dvgs_sigma_v: z.number(),
  gm_mismatch: z.number(),
  idss_mismatch: z.number(),
  /** Σ mismatch/tolerance over the constrained figures (≤ 3). */
  cost: z.number(),
  /** Cascodes: least (−VGS(upper)) − VDS(sat, lower) over the set's cascodes (V). */
  cascode_headroom_v: z.number().optional(),
});
export type ProposedSet = z.infer<typeof ProposedSet>;

/** null = not constrained. */
export const ProposalTolerances = z.object({
  max_dvgs_v: z.number().nullable(),
  max_gm_mismatch: z.number().nullable(),
  max_idss_mismatch: z.number().nullable(),
  cascode_margin_v: z.number().nullable(),
});
export type ProposalTolerances = z.infer<typeof ProposalTolerances>;

/** `POST /api/match/proposals` and `GET /api/match/proposals/{id}`: a proposal (stored as made). */
export const ProposalView = z.object({
  id: z.string(),
  created_at: IsoDateTime,
  device_type: z.object({ id: z.number().int(), name: z.string(), channel: Channel }),
  shape: z.enum(MATCH_SHAPES),
  count_requested: z.number().int(),
  operating_point: z.object({
    kind: z.enum(OPERATING_POINT_KINDS),
    /** Datasheet sign for the channel. */
    id_a: z.number().nullable(),
    vds_v: z.number(),
    rs_ohm: z.number().nullable(),
  }),
  tolerances: ProposalTolerances,
  same_lot: z.boolean(),
  bins: z.array(z.string()).nullable(),
  /** Temperature the parts are compared at (°C). */
  temperature_c: z.number(),
  /** A set meets the ΔVGS tolerance only when ΔVGS + this many σ(ΔVGS) stays within it. */
  dvgs_guard_sigmas: z.number(),
  sets: z.array(ProposedSet),
  total_cost: z.number(),
  guarantee: z.object({ kind: z.enum(['exact', 'heuristic']), note: z.string() }),
  /** How many sets (capped at the count asked) the same stock gives with looser tolerances. */
  looser: z.object({
    all_times_1_5: z.number().int(),
    all_times_2: z.number().int(),
    only_one_times_2: z.object({ max_dvgs_v: z.number(), max_gm_mismatch: z.number(), max_idss_mismatch: z.number(), cascode_margin_v: z.number() }),
  }),
  candidates: z.object({ in_stock: z.number().int(), considered: z.number().int(), unusable: z.record(z.string(), z.number().int()) }),
  /** Set once the proposal was confirmed. */
  reservation_id: z.string().nullable(),
  /** Server time spent on the request (ms), when the proposal was just made. */
  server_ms: z.number().optional(),
});
export type ProposalView = z.infer<typeof ProposalView>;
