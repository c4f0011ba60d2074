import { z } from 'zod';

export const ReviewTarget = z.object({
  serial: z.string().min(1),
  /** The fit the reviewer looked at; refused when a newer fit has replaced it. */
  fit_id: z.number().int().positive().optional(),
  note: z.string().trim().max(1000).optional(),
});

export const RefitInput = ReviewTarget.extend({
  /** Points to leave out, as [curve index, point index] of the current sweep. */
  excluded_points: z.array(z.tuple([z.number().int().min(0), z.number().int().min(0)])).max(100_000),
});
