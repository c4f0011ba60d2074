import { z } from 'zod';
import { Channel, IsoDateTime, PartStatus } from './common';

/**
 * `GET /api/review`: which queue and how long. `model_disagrees` lists parts whose fitted
 * model puts VGS away from the measured one (an advisory flag: the parts are not held).
 */
export const ReviewQueueQuery = z.object({
  status: z.enum(['needs_review', 'retest', 'model_disagrees']).default('needs_review'),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});
export type ReviewQueueQuery = z.infer<typeof ReviewQueueQuery>;

/** A part waiting for a person, with its current fit's figures and flags in plain words. */
export const ReviewQueueItem = z.object({
  serial: z.string(),
  device_type: z.string(),
  channel: Channel,
  lot: z.string().nullable(),
  fit_id: z.number().int().nullable(),
  fitted_at: IsoDateTime.nullable(),
  file_name: z.string().nullable(),
  idss_a: z.number().nullable(),
  vp_v: z.number().nullable(),
  rms_rel: z.number().nullable(),
  flags: z.array(z.object({ code: z.string(), message: z.string() })),
  review_note: z.string().nullable(),
});
export type ReviewQueueItem = z.infer<typeof ReviewQueueItem>;

/** `GET /api/review`: oldest fit first; `total` counts the whole queue, `items` at most `limit`. */
export const ReviewQueue = z.object({
  status: ReviewQueueQuery.shape.status.unwrap(),
  total: z.number().int(),
  items: z.array(ReviewQueueItem),
});
export type ReviewQueue = z.infer<typeof ReviewQueue>;

/** `POST /api/review/{serial}/accept`: the part accepted and binned (bin_id null when its type has no active plan). */
export const FitAccepted = z.object({
  serial: z.string(),
  status: PartStatus,
  fit_id: z.number().int(),
  bin_id: z.number().int().nullable(),
});
export type FitAccepted = z.infer<typeof FitAccepted>;

/** `POST /api/review/accept`: each part with the fit the inspector looked at; a newer fit refuses the whole batch. */
export const AcceptFitsRequest = z.object({
  parts: z
    .array(z.object({ serial: z.string().min(1), fit_id: z.number().int().positive().optional() }))
    .min(1, 'choose at least one part to accept')
    .max(500, 'at most 500 parts at once'),
  note: z.string().trim().max(1000).optional(),
});
export type AcceptFitsRequest = z.infer<typeof AcceptFitsRequest>;

/** `POST /api/review/accept`: every part accepted, in serial order. */
export const FitsAccepted = z.object({ accepted: z.array(FitAccepted) });
export type FitsAccepted = z.infer<typeof FitsAccepted>;

/** `POST /api/review/{serial}/refit`: the new current fit (it waits for review again). */
export const RefitResult = z.object({
  serial: z.string(),
  fit_id: z.number().int(),
  flags: z.array(z.string()),
  rms_rel: z.number(),
  idss_a: z.number(),
  vp_v: z.number(),
});
export type RefitResult = z.infer<typeof RefitResult>;

/** `POST /api/review/{serial}/retest`: the part is to be measured again. */
export const RetestResult = z.object({ serial: z.string(), status: z.literal('retest'), fit_id: z.number().int() });
export type RetestResult = z.infer<typeof RetestResult>;

/** The body of `POST /api/review/{serial}/accept` and `…/retest`. */
export const FitDecisionRequest = z.object({
  /** The fit the reviewer looked at; refused when a newer fit has replaced it. */
  fit_id: z.number().int().positive().optional(),
  note: z.string().trim().max(1000).optional(),
});
export type FitDecisionRequest = z.infer<typeof FitDecisionRequest>;

/** What the accept and retest services take: the body with the part's serial from the path. */
export const ReviewTarget = z.object({ serial: z.string().min(1), ...FitDecisionRequest.shape });
export type ReviewTarget = z.infer<typeof ReviewTarget>;

/** The body of `POST /api/review/{serial}/refit`. */
export const RefitRequest = z.object({
  ...FitDecisionRequest.shape,
  /** Points to leave out, as [curve index, point index] of the current sweep. */
  excluded_points: z.array(z.tuple([z.number().int().min(0), z.number().int().min(0)])).max(100_000),
});
export type RefitRequest = z.infer<typeof RefitRequest>;

/** What the refit service takes: the body with the part's serial from the path. */
export const RefitInput = z.object({ serial: z.string().min(1), ...RefitRequest.shape });
export type RefitInput = z.infer<typeof RefitInput>;
