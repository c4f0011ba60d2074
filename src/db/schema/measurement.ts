import {
  bigint,
  customType,
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
import { PART_STATUSES } from '~/core/stock/part-transitions';
import { stationToken, user } from './auth';
import { deviceType, location, lot } from './catalogue';

/** Raw bytes (PostgreSQL bytea); read back as a Buffer. */
const bytea = customType<{ data: Uint8Array; driverData: Buffer }>({
  dataType: () => 'bytea',
});

/** A part's life: see src/core/stock/part-transitions.ts for the allowed moves. */
export const partStatusEnum = pgEnum('part_status', PART_STATUSES);

export const part = pgTable(
  'part',
  {
    id: serial('id').primaryKey(),
    serial: text('serial').notNull().unique(),
    deviceTypeId: integer('device_type_id')
      .notNull()
      .references(() => deviceType.id),
    lotId: integer('lot_id').references(() => lot.id),
    status: partStatusEnum('status').notNull().default('measured'),
    currentFitId: integer('current_fit_id'),
    binId: integer('bin_id'),
    locationId: integer('location_id').references(() => location.id),
    reservationId: uuid('reservation_id'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('part_type_status_idx').on(t.deviceTypeId, t.status),
    // The parts list pages one type's parts in serial order.
    index('part_type_serial_idx').on(t.deviceTypeId, t.serial),
    index('part_bin_status_idx').on(t.binId, t.status),
    index('part_lot_idx').on(t.lotId),
  ],
);

/** One POST of one or more files, by a person or a test station. */
export const upload = pgTable('upload', {
  id: uuid('id').primaryKey().defaultRandom(),
  userId: text('user_id').references(() => user.id),
  stationTokenId: text('station_token_id').references(() => stationToken.id),
  /** Tags the uploader gave for files that do not say: lot, device type, temperature, ... */
  tags: jsonb('tags').notNull().default({}),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const uploadFileStateEnum = pgEnum('upload_file_state', [
  'queued',
  'fitted',
  'needs_review',
  'rejected',
]);

/** Each file as received: kept on disk under uploads/ by SHA-256, whatever happens next. */
export const uploadFile = pgTable(
  'upload_file',
  {
    id: serial('id').primaryKey(),
    uploadId: uuid('upload_id')
      .notNull()
      .references(() => upload.id),
    originalName: text('original_name').notNull(),
    sha256: text('sha256').notNull(),
    sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
    storedPath: text('stored_path').notNull(),
    state: uploadFileStateEnum('state').notNull().default('queued'),
    /** Why a file was rejected: the parser's or the fitter's message, with file/line/column. */
    reason: text('reason'),
    errorCode: text('error_code'),
    /** The earlier file with the same bytes, when this one is a repeat (no second sweep). */
    duplicateOfId: integer('duplicate_of_id'),
    serials: text('serials').array().notNull().default([]),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('upload_file_upload_idx').on(t.uploadId), index('upload_file_sha_idx').on(t.sha256)],
);

/** One measured curve family of one part. Curves are kept in N-equivalent SI units. */
export const sweep = pgTable(
  'sweep',
  {
    id: serial('id').primaryKey(),
    partId: integer('part_id')
      .notNull()
      .references(() => part.id),
    uploadFileId: integer('upload_file_id').references(() => uploadFile.id),
    /** Index of this part within its file (a file may carry many parts). */
    indexInFile: integer('index_in_file').notNull().default(0),
    vgsStepsV: doublePrecision('vgs_steps_v').array().notNull(),
    /** [{ vgs_v, vds_v: number[], id_a: number[], first_line }], N-equivalent. */
    curves: jsonb('curves').notNull(),
    pointCount: integer('point_count').notNull(),
    temperatureC: doublePrecision('temperature_c'),
    station: text('station'),
    operator: text('operator'),
    metadata: jsonb('metadata').notNull().default({}),
    /** Points an inspector excluded before a refit: [curveIndex, pointIndex][]. */
    excludedPoints: jsonb('excluded_points').notNull().default([]),
    measuredAt: timestamp('measured_at', { withTimezone: true }).notNull().defaultNow(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('sweep_part_idx').on(t.partId),
    uniqueIndex('sweep_file_index_unique').on(t.uploadFileId, t.indexInFile),
  ],
);

export const fitReviewEnum = pgEnum('fit_review', ['auto_accepted', 'needs_review', 'accepted', 'rejected', 'retest']);

/** A fit of one sweep. Figures used by binning and matching are columns; the rest is JSON. */
export const fit = pgTable(
  'fit',
  {
    id: serial('id').primaryKey(),
    sweepId: integer('sweep_id')
      .notNull()
      .references(() => sweep.id),
    partId: integer('part_id')
      .notNull()
      .references(() => part.id),
    model: text('model').notNull(),
    engineVersion: text('engine_version').notNull(),
    vtoV: doublePrecision('vto_v').notNull(),
    betaAPerV2: doublePrecision('beta_a_per_v2').notNull(),
    lambdaPerV: doublePrecision('lambda_per_v').notNull(),
    rsOhm: doublePrecision('rs_ohm').notNull().default(0),
    rdOhm: doublePrecision('rd_ohm').notNull().default(0),
    idssA: doublePrecision('idss_a').notNull(),
    idssVdsV: doublePrecision('idss_vds_v').notNull(),
    vpV: doublePrecision('vp_v').notNull(),
    gfsS: doublePrecision('gfs_s').notNull(),
    gosS: doublePrecision('gos_s').notNull(),
    rdsOnOhm: doublePrecision('rds_on_ohm').notNull(),
    rmsRel: doublePrecision('rms_rel').notNull(),
    /** Standard errors, metrics, derived figures with errors, excluded points: the full result. */
    detail: jsonb('detail').notNull(),
    /**
     * The measurements in compact form (`packOperatingTable`'s float64 values, little-endian):
     * operating-point figures are read from them.
     */
    operatingTable: bytea('operating_table'),
    /** One standard deviation of a VGS taken from the model outside the measured range (V). */
    modelVgsSigmaV: doublePrecision('model_vgs_sigma_v'),
    flags: text('flags').array().notNull().default([]),
    review: fitReviewEnum('review').notNull(),
    reviewedBy: text('reviewed_by').references(() => user.id),
    reviewedAt: timestamp('reviewed_at', { withTimezone: true }),
    reviewNote: text('review_note'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('fit_part_idx').on(t.partId), index('fit_sweep_idx').on(t.sweepId)],
);

/** Who did what to which thing, and the before/after. Written in the same transaction. */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigint('id', { mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
    actorUserId: text('actor_user_id'),
    actorStationId: text('actor_station_id'),
    action: text('action').notNull(),
    subjectType: text('subject_type').notNull(),
    subjectId: text('subject_id').notNull(),
    before: jsonb('before'),
    after: jsonb('after'),
    reason: text('reason'),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_subject_idx').on(t.subjectType, t.subjectId), index('audit_at_idx').on(t.at)],
);
