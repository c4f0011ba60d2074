import { z } from 'zod';
import { PART_STATUSES } from '~/core/stock/part-transitions';

/** Shapes several responses share. */

export const Channel = z.enum(['n', 'p']);
export type Channel = z.infer<typeof Channel>;

export const PartStatus = z.enum(PART_STATUSES);
export type PartStatus = z.infer<typeof PartStatus>;

export const FitReview = z.enum(['auto_accepted', 'needs_review', 'accepted', 'rejected', 'retest']);
export type FitReview = z.infer<typeof FitReview>;

/** Where an operating-point figure came from: the part's measurements, or its fitted model. */
export const FigureSource = z.enum(['measured', 'model']);
export type FigureSource = z.infer<typeof FigureSource>;

/** An instant as ISO 8601 text in UTC. */
export const IsoDateTime = z.string().describe('ISO 8601 date and time, UTC');

/** A page of a list answered by the server. */
export const PageFields = {
  total: z.number().int(),
  page: z.number().int(),
  page_size: z.number().int(),
};
