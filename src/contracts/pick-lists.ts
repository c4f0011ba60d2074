import { z } from 'zod';
import { normalizeSerial } from '~/core/serial/normalize-serial';
import { IsoDateTime, PartStatus } from './common';
import { PickListStatus, ReservationStatus, ReservationView } from './reservations';

/** `GET /api/pick-lists`: the query (open lists unless said). */
export const PickListQuery = z.object({ status: z.enum(['open', 'complete', 'cancelled', 'all']).default('open') });
export type PickListQuery = z.infer<typeof PickListQuery>;

/** A row of `GET /api/pick-lists`: a list with its reservation and how far picking has got. */
export const PickListSummary = z.object({
  id: z.number().int(),
  /** PL- and the list's id. */
  code: z.string(),
  status: PickListStatus,
  created_at: IsoDateTime,
  completed_at: IsoDateTime.nullable(),
  reservation: z.object({
    id: z.string(),
    code: z.string(),
    status: ReservationStatus,
    expires_at: IsoDateTime,
    designer_name: z.string(),
    purpose: z.string(),
  }),
  device_type: z.string().nullable(),
  sets: z.number().int(),
  lines_total: z.number().int(),
  lines_picked: z.number().int(),
  /** Location of the first unpicked line: where the picker starts. */
  first_location: z.string().nullable(),
});
export type PickListSummary = z.infer<typeof PickListSummary>;

/** `GET /api/pick-lists`: oldest open first for stores; a designer sees their own. */
export const PickListList = z.object({ pick_lists: z.array(PickListSummary) });
export type PickListList = z.infer<typeof PickListList>;

/** A line of a pick list: one part, where it is, and whether it was picked. */
export const PickLineView = z.object({
  line_no: z.number().int(),
  part_id: z.number().int(),
  serial: z.string(),
  location: z.string().nullable(),
  location_barcode: z.string().nullable(),
  /** Set membership: set number (from 1) and the part's role in it. */
  set_no: z.number().int(),
  role: z.string(),
  cascode_index: z.union([z.literal(0), z.literal(1)]).optional(),
  part_status: PartStatus,
  picked_at: IsoDateTime.nullable(),
  /** Name of the person who picked it. */
  picked_by: z.string().nullable(),
});
export type PickLineView = z.infer<typeof PickLineView>;

/** `GET /api/pick-lists/{id}`: a pick list with its lines in picking order. */
export const PickListView = z.object({
  id: z.number().int(),
  code: z.string(),
  status: PickListStatus,
  created_at: IsoDateTime,
  completed_at: IsoDateTime.nullable(),
  /** Name of the person whose scan completed it. */
  completed_by: z.string().nullable(),
  device_type: z.string().nullable(),
  reservation: z.object({
    id: z.string(),
    code: z.string(),
    status: ReservationStatus,
    expires_at: IsoDateTime,
    purpose: z.string(),
    designer_name: z.string(),
    designer_user_id: z.string(),
  }),
  lines: z.array(PickLineView),
  lines_total: z.number().int(),
  lines_picked: z.number().int(),
});
export type PickListView = z.infer<typeof PickListView>;

/** `POST /api/pick-lists/{id}/scan`: the serial scanned; it fulfils whichever line of the list it belongs to, in any order. */
export const PickScanRequest = z.object({
  serial: z.string().transform(normalizeSerial).pipe(z.string().min(1, 'scan or type the serial on the part')),
});
export type PickScanRequest = z.infer<typeof PickScanRequest>;

/** `POST /api/pick-lists/{id}/scan`: the line the scan picked, and the list now. */
export const PickScanResult = z.object({
  line_no: z.number().int(),
  serial: z.string(),
  complete: z.boolean(),
  /** Parts issued when this scan completed the list. */
  issued: z.array(z.string()),
  /** Who was e-mailed that the parts were issued. */
  mailed_to: z.string().nullable(),
  pick_list: PickListView,
});
export type PickScanResult = z.infer<typeof PickScanResult>;

/** `POST /api/pick-lists/{id}/returns`: parts issued through the list to take back. */
export const PickReturnRequest = z.object({
  serials: z.array(z.string().transform(normalizeSerial).pipe(z.string().min(1))).min(1, 'name at least one serial to take back').max(500),
  /** true (default): straight back into stock at the place it was picked from; false: leave it returned (e.g. for re-measuring). */
  restock: z.boolean().default(true),
  reason: z.string().trim().max(300).optional(),
});
export type PickReturnRequest = z.infer<typeof PickReturnRequest>;

/** `POST /api/pick-lists/{id}/returns`: the serials taken back and the list now. */
export const PickReturnResult = z.object({
  returned: z.array(z.string()),
  restocked: z.boolean(),
  pick_list: PickListView,
});
export type PickReturnResult = z.infer<typeof PickReturnResult>;

/** `POST /api/match/proposals/{id}/confirm`: the reservation made from the proposal and its pick list for stores. */
export const ReservationConfirmed = z.object({
  reservation: ReservationView,
  pick_list: PickListView,
  expires_at: IsoDateTime,
});
export type ReservationConfirmed = z.infer<typeof ReservationConfirmed>;
