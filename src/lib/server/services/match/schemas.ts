import { z } from 'zod';

/** A tolerance in the request: a number, or null/absent for "not constrained". */
const Tolerance = (max?: number) => {
  const n = z.number().nonnegative();
  return (max === undefined ? n : n.max(max)).nullable().optional();
};

/**
 * `POST /api/match/proposals`. Currents and voltages may be given in datasheet sign or as
 * magnitudes: the magnitude is used (a P-channel part runs at −ID, −VDS).
 */
export const ProposalRequest = z
  .object({
    device_type: z.union([z.string().trim().min(1), z.number().int().positive()]),
    shape: z.enum(['pair', 'quad', 'cascode_pair', 'matched_cascode_pairs']),
    count: z.number().int().min(1).max(500),
    operating_point: z.enum(['current', 'idss', 'self_bias']).default('current'),
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
