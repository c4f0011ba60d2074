import {
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  serial,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { user } from './auth';
import { deviceType, location } from './catalogue';
import { part } from './measurement';

/** A versioned bin plan of a device type; exactly one version per type is active. */
export const binPlan = pgTable(
  'bin_plan',
  {
    id: serial('id').primaryKey(),
    deviceTypeId: integer('device_type_id')
      .notNull()
      .references(() => deviceType.id),
    version: integer('version').notNull(),
    name: text('name').notNull().default(''),
    /** The plan's axes and edges, as src/core/binning defines them. */
    definition: jsonb('definition').notNull(),
    isActive: boolean('is_active').notNull().default(false),
    createdBy: text('created_by').references(() => user.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('bin_plan_version_unique').on(t.deviceTypeId, t.version)],
);

export const bin = pgTable(
  'bin',
  {
    id: serial('id').primaryKey(),
    binPlanId: integer('bin_plan_id')
      .notNull()
      .references(() => binPlan.id),
    code: text('code').notNull(),
    label: text('label').notNull(),
    /** [{ axis, lo, hi }] in SI, datasheet sign. */
    ranges: jsonb('ranges').notNull(),
    isHold: boolean('is_hold').notNull().default(false),
    homeLocationId: integer('home_location_id').references(() => location.id),
    lowStockThreshold: integer('low_stock_threshold').notNull().default(0),
    /** Set when a low-stock mail went out; cleared when on-hand rises back to the threshold. */
    lowStockAlertedAt: timestamp('low_stock_alerted_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('bin_plan_code_unique').on(t.binPlanId, t.code)],
);

/** Every bin a part was ever put in, under which plan version. */
export const binAssignment = pgTable(
  'bin_assignment',
  {
    id: serial('id').primaryKey(),
    partId: integer('part_id')
      .notNull()
      .references(() => part.id),
    binId: integer('bin_id')
      .notNull()
      .references(() => bin.id),
    fitId: integer('fit_id'),
    assignedBy: text('assigned_by'),
    assignedAt: timestamp('assigned_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('bin_assignment_part_idx').on(t.partId)],
);

export const lowStockAlert = pgTable('low_stock_alert', {
  id: serial('id').primaryKey(),
  binId: integer('bin_id')
    .notNull()
    .references(() => bin.id),
  onHand: integer('on_hand').notNull(),
  threshold: integer('threshold').notNull(),
  crossedAt: timestamp('crossed_at', { withTimezone: true }).notNull().defaultNow(),
  mailedAt: timestamp('mailed_at', { withTimezone: true }),
});

export const matchProposal = pgTable('match_proposal', {
  id: uuid('id').primaryKey().defaultRandom(),
  designerUserId: text('designer_user_id')
    .notNull()
    .references(() => user.id),
  deviceTypeId: integer('device_type_id')
    .notNull()
    .references(() => deviceType.id),
  request: jsonb('request').notNull(),
  result: jsonb('result').notNull(),
  confirmedReservationId: uuid('confirmed_reservation_id'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const reservationStatusEnum = pgEnum('reservation_status', [
  'active',
  'issued',
  'cancelled',
  'expired',
]);

export const reservation = pgTable(
  'reservation',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    proposalId: uuid('proposal_id').references(() => matchProposal.id),
    designerUserId: text('designer_user_id')
      .notNull()
      .references(() => user.id),
    purpose: text('purpose').notNull().default(''),
    status: reservationStatusEnum('status').notNull().default('active'),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    closedAt: timestamp('closed_at', { withTimezone: true }),
  },
  (t) => [index('reservation_status_idx').on(t.status, t.expiresAt)],
);

/** Which part belongs to which set of a reservation, with the figures it was matched on. */
export const reservationPart = pgTable(
  'reservation_part',
  {
    id: serial('id').primaryKey(),
    reservationId: uuid('reservation_id')
      .notNull()
      .references(() => reservation.id),
    partId: integer('part_id')
      .notNull()
      .references(() => part.id),
    setIndex: integer('set_index').notNull(),
    role: text('role').notNull(),
    vgsV: doublePrecision('vgs_v').notNull(),
    gmS: doublePrecision('gm_s').notNull(),
    idssA: doublePrecision('idss_a').notNull(),
  },
  (t) => [index('reservation_part_res_idx').on(t.reservationId), index('reservation_part_part_idx').on(t.partId)],
);

export const pickListStatusEnum = pgEnum('pick_list_status', ['open', 'complete', 'cancelled']);

export const pickList = pgTable('pick_list', {
  id: serial('id').primaryKey(),
  reservationId: uuid('reservation_id')
    .notNull()
    .references(() => reservation.id),
  status: pickListStatusEnum('status').notNull().default('open'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  completedAt: timestamp('completed_at', { withTimezone: true }),
  completedBy: text('completed_by').references(() => user.id),
});

export const pickLine = pgTable(
  'pick_line',
  {
    id: serial('id').primaryKey(),
    pickListId: integer('pick_list_id')
      .notNull()
      .references(() => pickList.id),
    lineNo: integer('line_no').notNull(),
    partId: integer('part_id')
      .notNull()
      .references(() => part.id),
    locationId: integer('location_id').references(() => location.id),
    setIndex: integer('set_index').notNull(),
    role: text('role').notNull(),
    pickedAt: timestamp('picked_at', { withTimezone: true }),
    pickedBy: text('picked_by').references(() => user.id),
  },
  (t) => [index('pick_line_list_idx').on(t.pickListId)],
);
