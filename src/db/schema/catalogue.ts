import { doublePrecision, integer, pgEnum, pgTable, serial, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
import { user } from './auth';

export const channelEnum = pgEnum('channel', ['n', 'p']);

export const deviceType = pgTable('device_type', {
  id: serial('id').primaryKey(),
  name: text('name').notNull().unique(),
  channel: channelEnum('channel').notNull(),
  description: text('description').notNull().default(''),
  /** |VDS| at which IDSS is stated for this type. */
  vdsTestV: doublePrecision('vds_test_v').notNull(),
  nominalTemperatureC: doublePrecision('nominal_temperature_c').notNull().default(25),
  idssMinA: doublePrecision('idss_min_a'),
  idssMaxA: doublePrecision('idss_max_a'),
  /** Pinch-off limits in datasheet sign (negative for N, positive for P). */
  vpMinV: doublePrecision('vp_min_v'),
  vpMaxV: doublePrecision('vp_max_v'),
  /**
   * Temperature coefficients for comparing parts measured at different temperatures, in
   * ngspice's JFET forms: VTOTC (V/°C, N-equivalent VTO) and BETATCE (%/°C). Defaults: |VP|
   * +2.2 mV/°C, BETA −0.7 %/°C (from memory, application-note figures).
   */
  vtotcVPerC: doublePrecision('vtotc_v_per_c').notNull().default(-0.0022),
  betatcePctPerC: doublePrecision('betatce_pct_per_c').notNull().default(-0.7),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const lot = pgTable(
  'lot',
  {
    id: serial('id').primaryKey(),
    code: text('code').notNull(),
    deviceTypeId: integer('device_type_id')
      .notNull()
      .references(() => deviceType.id),
    supplier: text('supplier').notNull().default(''),
    /** Where the per-lot intake summary is mailed (the supplier's quality contact); '' when none. */
    supplierEmail: text('supplier_email').notNull().default(''),
    notes: text('notes').notNull().default(''),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    createdBy: text('created_by').references(() => user.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('lot_code_unique').on(t.code)],
);

/** Physical places in stores: a name a person reads and a barcode a scanner reads. */
export const location = pgTable('location', {
  id: serial('id').primaryKey(),
  name: text('name').notNull().unique(),
  barcode: text('barcode').notNull().unique(),
  description: text('description').notNull().default(''),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
