import { z } from 'zod';
import { FigureSource, IsoDateTime, PartStatus } from './common';
import { ProposalView } from './match';

export const RESERVATION_STATUSES = ['active', 'issued', 'cancelled', 'expired'] as const;
export const ReservationStatus = z.enum(RESERVATION_STATUSES);
export type ReservationStatus = z.infer<typeof ReservationStatus>;

export const PICK_LIST_STATUSES = ['open', 'complete', 'cancelled'] as const;
export const PickListStatus = z.enum(PICK_LIST_STATUSES);
export type PickListStatus = z.infer<typeof PickListStatus>;

/** A reservation's pick list and how far picking has got. */
const PickProgress = z.object({
  id: z.number().int(),
  /** PL- and the list's id. */
  code: z.string(),
  status: PickListStatus,
  lines_total: z.number().int(),
  lines_picked: z.number().int(),
});

/** What every view of a reservation starts with. */
const ReservationHead = z.object({
  id: z.string(),
  /** R- and the first 8 hex digits of the id. */
  code: z.string(),
  status: ReservationStatus,
  purpose: z.string(),
  created_at: IsoDateTime,
  expires_at: IsoDateTime,
  closed_at: IsoDateTime.nullable(),
});

/** A row of `GET /api/reservations`: one of the designer's reservations, with what was matched and its pick list. */
export const ReservationSummary = ReservationHead.extend({
  device_type: z.string().nullable(),
  shape: z.string().nullable(),
  sets: z.number().int(),
  parts: z.number().int(),
  pick_list: PickProgress.nullable(),
});
export type ReservationSummary = z.infer<typeof ReservationSummary>;

/** `GET /api/reservations`: the designer's own reservations, newest first. */
export const ReservationList = z.object({ reservations: z.array(ReservationSummary) });
export type ReservationList = z.infer<typeof ReservationList>;

/** A reserved part with its figures as matched (VGS in datasheet sign) and its state now. */
export const ReservedPart = z.object({
  part_id: z.number().int(),
  serial: z.string(),
  role: z.string(),
  cascode_index: z.union([z.literal(0), z.literal(1)]).optional(),
  vgs_v: z.number(),
  /** One standard deviation of vgs_v (V), as proposed; null for older reservations. */
  vgs_sigma_v: z.number().nullable(),
  gm_s: z.number(),
  idss_a: z.number(),
  /** Where the figures came from when the set was proposed. */
  source: FigureSource.nullable(),
  bin_code: z.string().nullable(),
  location: z.string().nullable(),
  /** The part's status now (reserved, issued, back in stock after a cancel, ...). */
  status: PartStatus,
  picked: z.boolean(),
});
export type ReservedPart = z.infer<typeof ReservedPart>;

export const ReservedSet = z.object({
  index: z.number().int(),
  parts: z.array(ReservedPart),
  dvgs_v: z.number().nullable(),
  /** One standard deviation of dvgs_v (V). */
  dvgs_sigma_v: z.number().nullable(),
  gm_mismatch: z.number().nullable(),
  idss_mismatch: z.number().nullable(),
  cascode_headroom_v: z.number().optional(),
});
export type ReservedSet = z.infer<typeof ReservedSet>;

/** `GET /api/reservations/{id}`: a reservation with what was asked for and its sets as matched. */
export const ReservationView = ReservationHead.extend({
  designer: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  proposal_id: z.string().nullable(),
  device_type: ProposalView.shape.device_type.nullable(),
  shape: ProposalView.shape.shape.nullable(),
  operating_point: ProposalView.shape.operating_point.nullable(),
  tolerances: ProposalView.shape.tolerances.nullable(),
  /** Temperature the parts were compared at (°C). */
  temperature_c: z.number(),
  sets: z.array(ReservedSet),
  pick_list: PickProgress.extend({ completed_at: IsoDateTime.nullable() }).nullable(),
});
export type ReservationView = z.infer<typeof ReservationView>;

/** `POST /api/reservations/{id}/cancel`: the reservation now, and the parts already picked that stores must put back. */
export const ReservationCancelled = z.object({
  reservation: ReservationView,
  put_back: z.array(z.string()),
});
export type ReservationCancelled = z.infer<typeof ReservationCancelled>;
