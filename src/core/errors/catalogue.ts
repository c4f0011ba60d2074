/**
 * Every error Sluice reports, by its permanent code: the kind of failure (which the HTTP layer
 * turns into a status) and the sentence a person reads — what happened, why, and what to do
 * next. A code never changes meaning once shipped; a new failure gets a new code. Messages
 * that quote values take them as typed parameters. Pure: islands may import it too.
 */

/** What sort of failure, independent of any transport. `toResponse` maps each to a status. */
export type ErrorKind =
  | 'invalid_input'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'method_not_allowed'
  | 'conflict'
  | 'invalid_transition'
  | 'too_large'
  | 'unprocessable'
  | 'rate_limited'
  | 'unavailable'
  | 'internal';

export const ERROR_KINDS: readonly ErrorKind[] = [
  'invalid_input',
  'unauthenticated',
  'forbidden',
  'not_found',
  'method_not_allowed',
  'conflict',
  'invalid_transition',
  'too_large',
  'unprocessable',
  'rate_limited',
  'unavailable',
  'internal',
];

interface CatalogueEntry {
  kind: ErrorKind;
  // Parameters differ per entry; `ErrorParams<C>` recovers each one's type.
  message: (params: never) => string;
}

const plural = (n: number, one: string, many: string) => (n === 1 ? one : many);
const list = (items: readonly string[], none: string) => items.join(', ') || none;

/** The shared sentence of every sweep-file problem: where, what, and what was expected. */
const sweepFile = (kind: ErrorKind = 'invalid_input') => ({
  kind,
  message: (p: { where: string; problem: string; expected: string }) => `${p.where}: ${p.problem}. Expected ${p.expected}.`,
});

/** A refusal reported by a service Sluice calls (the sign-in library), in its own words. */
const relayed = (kind: ErrorKind) => ({
  kind,
  message: (p: { message?: string; status: number }) => p.message || `The sign-in service answered ${p.status}.`,
});

export const ERROR_CATALOGUE = {
  // ── Requests: shape, size, address ─────────────────────────────────────────────────────
  validation_failed: { kind: 'invalid_input', message: (p: { text: string }) => `The request is not valid — ${p.text}.` },
  body_not_json: { kind: 'invalid_input', message: () => 'The request body is not valid JSON.' },
  nul_in_field: {
    kind: 'invalid_input',
    message: (p: { field: string }) => `The field ${p.field} holds a NUL character (\\u0000), which Sluice cannot store. Remove it and send again.`,
  },
  nul_in_address: {
    kind: 'invalid_input',
    message: () => 'The address holds a NUL character (%00), which no Sluice route takes. Remove it and try again.',
  },
  bad_row_id: {
    kind: 'invalid_input',
    message: (p: { raw: string; what: string; max: number }) => `"${p.raw}" is not a ${p.what} id: expected a whole number from 1 to ${p.max}.`,
  },
  value_refused_by_database: {
    kind: 'invalid_input',
    message: (p: { reason: string }) => `A value in the request cannot be used: ${p.reason}. Check the ids, numbers, dates and text you sent.`,
  },
  body_too_large: {
    kind: 'too_large',
    message: (p: { what: string; limitBytes: number }) => `${p.what} is larger than ${p.limitBytes} bytes, the most this route takes. Send less in one request.`,
  },
  route_not_found: {
    kind: 'not_found',
    message: (p: { method: string; path: string }) => `There is no API route ${p.method} ${p.path}. The routes are listed in docs/api-sweeps.md.`,
  },
  method_not_allowed: {
    kind: 'method_not_allowed',
    message: (p: { route: string; method: string; allowed: readonly string[] }) => `${p.route} does not take ${p.method}; it takes ${p.allowed.join(', ')}.`,
  },
  // A refusal the framework wrote as text (its own checks); its words are kept.
  request_refused: { kind: 'invalid_input', message: (p: { text: string; status: number }) => p.text || `The request was refused (${p.status}).` },
  request_refused_forbidden: { kind: 'forbidden', message: (p: { text: string; status: number }) => p.text || `The request was refused (${p.status}).` },
  request_refused_too_large: { kind: 'too_large', message: (p: { text: string; status: number }) => p.text || `The request was refused (${p.status}).` },
  server_failed: { kind: 'internal', message: (p: { text: string; status: number }) => p.text || `The request was refused (${p.status}).` },
  unexpected: { kind: 'internal', message: () => 'Something went wrong on the server; it has been logged.' },
  database_unreachable: { kind: 'internal', message: () => 'The database does not answer.' },
  configuration_invalid: { kind: 'internal', message: (p: { lines: readonly string[] }) => `Sluice configuration is invalid:\n${p.lines.join('\n')}` },
  auth_secret_missing: {
    kind: 'internal',
    message: () =>
      'BETTER_AUTH_SECRET is not set. `npm start` generates one in .data/secrets.env on first run; when running the server by hand, export it from there.',
  },
  json_rows_bad_column: { kind: 'internal', message: (p: { helper: string; column: string }) => `${p.helper}: ${p.column} is not a column of this table` },
  notice_channel_name: { kind: 'internal', message: (p: { channel: string }) => `not a plain channel name: ${p.channel}` },
  json_rows_uneven_keys: {
    kind: 'internal',
    message: (p: { column: string }) => `jsonRecordset: every row must set the same keys; ${p.column} is not set in the first`,
  },

  // ── Who is asking ──────────────────────────────────────────────────────────────────────
  sign_in_required: { kind: 'unauthenticated', message: () => 'Sign in first: this needs an account.' },
  station_token_unknown: { kind: 'unauthenticated', message: () => 'The station token is unknown or revoked.' },
  permission_missing: { kind: 'forbidden', message: (p: { need: string }) => `Your roles do not allow this (it needs ${p.need}).` },
  people_only: { kind: 'forbidden', message: (p: { what: string }) => `${p.what} are made by people, not stations.` },
  sign_in_not_json: { kind: 'invalid_input', message: () => 'The sign-in request is not valid JSON: send {"email": …, "password": …}.' },
  sign_in_limit_account: {
    kind: 'rate_limited',
    message: (p: { limit: number; windowMinutes: number; retryMinutes: number }) =>
      `Too many failed sign-ins for this account (${p.limit} in ${p.windowMinutes} minutes). Try again in ${p.retryMinutes} ${plural(p.retryMinutes, 'minute', 'minutes')}, or ask an admin to send a password reset.`,
  },
  sign_in_limit_address: {
    kind: 'rate_limited',
    message: (p: { limit: number; windowMinutes: number; retryMinutes: number }) =>
      `Too many failed sign-ins from this address (${p.limit} in ${p.windowMinutes} minutes). Try again in ${p.retryMinutes} ${plural(p.retryMinutes, 'minute', 'minutes')}.`,
  },
  sign_in_service_busy: {
    kind: 'rate_limited',
    message: () => 'Too many requests to the sign-in service from this address in the last minute. Wait a minute, then try again.',
  },
  auth_invalid_input: relayed('invalid_input'),
  auth_unauthenticated: relayed('unauthenticated'),
  auth_forbidden: relayed('forbidden'),
  auth_not_found: relayed('not_found'),
  auth_too_large: relayed('too_large'),
  auth_failed: relayed('internal'),
  person_not_found: { kind: 'not_found', message: () => 'No such person.' },
  email_taken: { kind: 'conflict', message: (p: { email: string }) => `${p.email} already has an account.` },
  own_admin_role: { kind: 'conflict', message: () => 'You cannot remove your own admin role; ask another admin.' },
  own_account_disabled: { kind: 'conflict', message: () => 'You cannot disable your own account.' },
  station_token_not_found: { kind: 'not_found', message: () => 'No station token with that id; it may have been removed.' },

  // ── Catalogue: device types, lots, locations, bins, bin plans ─────────────────────────
  device_type_not_found: {
    kind: 'not_found',
    message: (p: { ref: string | number; known: readonly string[] }) => `There is no device type ${JSON.stringify(p.ref)}. Known types: ${list(p.known, 'none yet')}.`,
  },
  device_type_ref_not_found: {
    kind: 'not_found',
    message: (p: { ref: string }) => `There is no device type "${p.ref}". Give its id or exact name (see Device types).`,
  },
  device_type_id_not_found: { kind: 'not_found', message: (p: { id: number }) => `No device type with id ${p.id}.` },
  device_type_unknown: {
    kind: 'invalid_input',
    message: (p: { name: string; known: readonly string[] }) => `Device type ${p.name} is not known. Known types: ${list(p.known, 'none')}.`,
  },
  device_type_exists: { kind: 'conflict', message: (p: { name: string }) => `A device type named ${p.name} already exists; edit it instead.` },
  device_type_name_taken: { kind: 'conflict', message: (p: { name: string }) => `Another device type is already named ${p.name}.` },
  device_type_channel_fixed: {
    kind: 'conflict',
    message: (p: { name: string; parts: number; channel: string }) =>
      `${p.name} has ${p.parts} parts measured as ${p.channel.toUpperCase()}-channel; its channel cannot change. Create a new type instead.`,
  },
  lot_exists: { kind: 'conflict', message: (p: { code: string }) => `Lot ${p.code} already exists.` },
  lot_not_found: { kind: 'not_found', message: (p: { ref: string }) => `There is no lot "${p.ref}".` },
  lot_nothing_to_receive: { kind: 'invalid_input', message: (p: { code: string }) => `Lot ${p.code} has no accepted parts waiting to be received.` },
  location_not_found: { kind: 'not_found', message: (p: { id: number }) => `There is no location with id ${p.id}.` },
  home_location_not_found: {
    kind: 'not_found',
    message: (p: { id: number }) => `There is no location with id ${p.id}; create it under Locations first.`,
  },
  location_barcode_not_found: {
    kind: 'not_found',
    message: (p: { barcode: string }) => `No location has the barcode ${p.barcode}. Scan a location label, or create the location first.`,
  },
  location_taken: { kind: 'conflict', message: (p: { name: string; what: string }) => `Location "${p.name}" already has ${p.what}; choose another.` },
  location_in_use: {
    kind: 'conflict',
    message: (p: { name: string; bins: number; parts: number; picks: number }) =>
      `"${p.name}" is still in use (${p.bins} bin(s) call it home, ${p.parts} part(s) were put there, ${p.picks} pick line(s) name it). Move them first, or rename the location instead.`,
  },
  bin_not_found: { kind: 'not_found', message: (p: { id: number }) => `There is no bin with id ${p.id}.` },
  bin_map_needs_type: { kind: 'invalid_input', message: () => 'Give ?device_type=<id or name>.' },
  bin_plan_not_found: { kind: 'not_found', message: (p: { id: number }) => `There is no bin plan with id ${p.id}.` },
  bin_plan_invalid: {
    kind: 'invalid_input',
    message: (p: { problems: readonly string[] }) => `The bin plan is not valid: ${p.problems.join('; ')}. Correct the plan and save it again.`,
  },
  bin_plan_too_many_bins: {
    kind: 'invalid_input',
    message: (p: { bins: number; max: number }) => `The plan makes ${p.bins} bins; at most ${p.max} are allowed. Use wider ranges or fewer of them.`,
  },
  bin_plan_changed: {
    kind: 'conflict',
    message: (p: { typeName: string; activeVersion: number | null }) =>
      `The active plan of ${p.typeName} changed since this preview (now ${p.activeVersion !== null ? `version ${p.activeVersion}` : 'none'}). Preview again before saving.`,
  },

  // ── Parts, fits, review ────────────────────────────────────────────────────────────────
  part_not_found: {
    kind: 'not_found',
    message: (p: { serial: string; field?: string }) =>
      `No part with serial ${p.serial}${p.field ? ` (${p.field})` : ''}. Check the serial on the label, or search the parts list.`,
  },
  part_id_not_found: { kind: 'not_found', message: (p: { id: number }) => `Part id ${p.id} does not exist.` },
  serial_unknown: {
    kind: 'not_found',
    message: (p: { serial: string }) => `Serial ${p.serial} is not known. Check the label, or upload the part's sweep first.`,
  },
  serials_unknown_in_batch: {
    kind: 'not_found',
    message: (p: { serials: readonly string[] }) =>
      `Nothing was changed: ${plural(p.serials.length, 'serial', 'serials')} ${p.serials.join(', ')} ${plural(p.serials.length, 'is', 'are')} not known. Check the label, or upload the part's sweep first.`,
  },
  serial_missing: { kind: 'invalid_input', message: () => 'Scan or type a serial.' },
  part_listed_twice: { kind: 'invalid_input', message: () => 'The same part is listed twice; choose each part once.' },
  part_twice_in_batch: { kind: 'invalid_input', message: () => 'The same part appears twice in one batch.' },
  part_has_no_fit: {
    kind: 'conflict',
    message: (p: { serial: string; field?: string }) =>
      `Part ${p.serial} has no current fit${p.field ? ` (${p.field})` : ''}: upload a sweep of it, or wait for its fit to finish.`,
  },
  part_has_no_model_card: { kind: 'not_found', message: (p: { serial: string }) => `Part ${p.serial} has no fit yet, so it has no model card.` },
  part_has_no_fit_to_review: { kind: 'conflict', message: (p: { serial: string }) => `Part ${p.serial} has no fit to review.` },
  fit_superseded: {
    kind: 'conflict',
    message: (p: { serial: string; currentFitId: number; reviewedFitId: number }) =>
      `Part ${p.serial} has a newer fit (${p.currentFitId}) than the one you reviewed (${p.reviewedFitId}); reload the page and look again.`,
  },
  part_cannot_run_there: {
    kind: 'invalid_input',
    message: (p: { serial: string; idA: number; vdsV: number; reason: string }) => `Part ${p.serial} cannot run at ${p.idA} A and ${p.vdsV} V: ${p.reason}.`,
  },
  status_change_refused: {
    kind: 'invalid_transition',
    message: (p: { refused: readonly { serial: string; reason: string }[] }) => `Nothing was changed: ${p.refused.map((r) => `${r.serial} — ${r.reason}`).join('; ')}.`,
  },
  point_not_in_sweep: {
    kind: 'invalid_input',
    message: (p: { curve: number; point: number; curves: number }) =>
      `Cannot leave that point out: point [${p.curve}, ${p.point}] is not in this sweep (it has ${p.curves} curves).`,
  },
  refit_not_possible: {
    kind: 'invalid_input',
    message: (p: { left: number; flags: readonly string[] }) =>
      `With those ${p.left} points left out no fit is possible: ${p.flags.join(' ')} Leave fewer points out.`,
  },
  curve_family_shape: {
    kind: 'unprocessable',
    message: (
      p: { problem: 'no_curves' } | { problem: 'unequal_columns'; curve: number; vdsCount: number; idCount: number } | { problem: 'not_finite'; curve: number; point: number },
    ) =>
      p.problem === 'no_curves'
        ? 'The curve family has no curves; upload a sweep with at least one VGS step.'
        : p.problem === 'unequal_columns'
          ? `Curve ${p.curve} has ${p.vdsCount} VDS values and ${p.idCount} ID values (or no VGS); each point needs both.`
          : `Curve ${p.curve}, point ${p.point} is not a finite number; fix or drop it before fitting.`,
  },
  barcode_not_encodable: {
    kind: 'invalid_input',
    message: (p: { text: string; symbology: string; reason: string }) => `Cannot encode "${p.text}" as ${p.symbology}: ${p.reason}`,
  },

  // ── Uploads and intake ─────────────────────────────────────────────────────────────────
  upload_not_multipart: {
    kind: 'invalid_input',
    message: () => 'Send the sweep files as multipart/form-data, one or more fields named "file".',
  },
  upload_unreadable: {
    kind: 'invalid_input',
    message: () => 'The multipart body could not be read; send the files as multipart/form-data fields named "file".',
  },
  upload_request_too_large: {
    kind: 'too_large',
    message: (p: { what: string; limitBytes: number }) =>
      `The request is ${p.what}; one request may carry at most ${p.limitBytes} bytes. Send the files in several requests.`,
  },
  upload_has_no_files: {
    kind: 'invalid_input',
    message: () => 'The request has no files: send multipart/form-data with one or more fields named "file".',
  },
  upload_too_many_files: {
    kind: 'too_large',
    message: (p: { files: number; max: number }) => `The request has ${p.files} files; at most ${p.max} are taken at once. Send them in several requests.`,
  },
  upload_file_name_nul: {
    kind: 'invalid_input',
    message: (p: { position: number; shownName: string }) =>
      `File ${p.position} of the request has a name with a NUL character ("${p.shownName}"), which Sluice cannot store. Rename the file and send it again; nothing of this request was kept.`,
  },
  upload_not_found: { kind: 'not_found', message: (p: { id: string }) => `No upload ${p.id}. Check the id that POST /api/sweeps returned.` },
  upload_lot_absent: {
    kind: 'not_found',
    message: (p: { upload: string; lot: string; lots: readonly string[] }) => `Upload ${p.upload} has no files of lot ${p.lot}. Lots in it: ${p.lots.join(', ')}.`,
  },
  upload_still_fitting: {
    kind: 'conflict',
    message: (p: { upload: string }) => `Some files of upload ${p.upload} are still being fitted; mail the summary once all are done.`,
  },
  lot_summary_lot_unknown: { kind: 'not_found', message: (p: { lot: string }) => `Lot ${p.lot} is not known: create it first, then mail its summary.` },
  mail_not_taken: {
    kind: 'internal',
    message: (p: { to: string; reason: string }) => `The mail server did not take the message to ${p.to} (${p.reason}). Nothing was sent; try again later.`,
  },
  upload_file_missing: { kind: 'internal', message: (p: { id: number }) => `upload_file ${p.id} does not exist` },
  ingest_failed: {
    kind: 'internal',
    message: (p: { ids: readonly number[]; reason: string }) => `upload file(s) ${p.ids.join(', ')} could not be ingested: ${p.reason}`,
  },
  job_failed: { kind: 'internal', message: (p: { queue: string; reason: string }) => `${p.queue}: ${p.reason}` },

  // Sweep files (the parser): these codes are also the stored reasons of refused files.
  not_text: sweepFile(),
  too_large: sweepFile('too_large'),
  empty_file: sweepFile(),
  no_header: sweepFile(),
  missing_column: sweepFile(),
  duplicate_column: sweepFile(),
  bad_header: sweepFile(),
  unknown_unit: sweepFile(),
  ragged_row: sweepFile(),
  empty_cell: sweepFile(),
  non_numeric: sweepFile(),
  not_finite: sweepFile(),
  bad_metadata: sweepFile(),
  mixed_signs: sweepFile(),
  duplicate_point: sweepFile(),
  too_few_points: sweepFile(),
  too_few_curves: sweepFile(),
  implausible_value: sweepFile(),
  bad_serial: sweepFile(),

  // Whole-file refusals of intake that are not the parser's (also stored reasons).
  no_device_type: {
    kind: 'invalid_input',
    message: (p: { file: string; known: string }) =>
      `${p.file}: no device type — the file has no "# device type:" line and the upload gave none. Tag the upload with one of the known types: ${p.known}.`,
  },
  unknown_device_type: {
    kind: 'invalid_input',
    message: (p: { file: string; typeName: string; known: string }) =>
      `${p.file}: device type "${p.typeName}" is not known. Known types: ${p.known}. An admin adds types on the Device types page.`,
  },
  channel_conflict: {
    kind: 'invalid_input',
    message: (p: { file: string; where: string; declared: string; typeName: string; typeChannel: string }) =>
      `${p.file}: ${p.where} says ${p.declared.toUpperCase()}-channel, but device type ${p.typeName} is ${p.typeChannel.toUpperCase()}-channel. Correct the channel or the device type.`,
  },
  unknown_lot: {
    kind: 'invalid_input',
    message: (p: { file: string; lot: string; serial: string }) =>
      `${p.file}: lot "${p.lot}" (part ${p.serial}) is not known. An inspector creates it on the Lots page first.`,
  },
  type_conflict: {
    kind: 'conflict',
    message: (p: { file: string; typeName: string } & ({ lot: string } | { serial: string })) =>
      'lot' in p
        ? `${p.file}: lot "${p.lot}" is a lot of another device type, not ${p.typeName}. Check the lot or the device type.`
        : `${p.file}: part ${p.serial} is already known as another device type, not ${p.typeName}. Check the serial or the device type.`,
  },
  not_fittable: {
    kind: 'invalid_input',
    message: (p: { file: string; serial: string; flags: readonly string[] }) =>
      `${p.file}: part ${p.serial} could not be fitted — ${p.flags.join(' ')} Check the fixture and measure the part again.`,
  },
  part_unavailable: { kind: 'conflict', message: (p: { file: string; serial: string; refusal: string }) => `${p.file}: part ${p.serial} ${p.refusal}.` },
  stored_file_missing: {
    kind: 'internal',
    message: (p: { file: string; storedPath: string }) => `${p.file}: the stored copy (${p.storedPath}) could not be read; upload the file again.`,
  },

  // ── Statistics ─────────────────────────────────────────────────────────────────────────
  statistics_type_unknown: {
    kind: 'not_found',
    message: (p: { ref: string }) => `No device type '${p.ref}' (device_type). Give a type name as listed under Device types.`,
  },
  statistics_lot_unknown: { kind: 'not_found', message: (p: { ref: string }) => `No lot '${p.ref}' (lot). Give a lot code as listed under Lots.` },
  statistics_lot_of_other_type: {
    kind: 'invalid_input',
    message: (p: { lot: string; typeName: string }) => `Lot ${p.lot} holds another device type than ${p.typeName} (lot). Clear one of the two.`,
  },
  histogram_bin_count: { kind: 'internal', message: (p: { k: number }) => `histogram needs a whole bin count ≥ 1, got ${p.k}.` },
  histogram_too_few_edges: { kind: 'internal', message: () => 'histogram needs at least 2 edges.' },
  histogram_edges_not_increasing: {
    kind: 'internal',
    message: (p: { index: number; edge: number; previous: number }) =>
      `histogram edges must be strictly increasing: edge ${p.index} (${p.edge}) is not above edge ${p.index - 1} (${p.previous}).`,
  },
  cpk_needs_limit: { kind: 'internal', message: () => 'cpk needs at least one specification limit (lsl or usl).' },
  cpk_limits_reversed: { kind: 'internal', message: (p: { lsl: number; usl: number }) => `cpk needs lsl below usl, got lsl ${p.lsl} and usl ${p.usl}.` },
  yield_count_invalid: {
    kind: 'internal',
    message: (p: { status: string; count: number }) => `yieldBreakdown: count for '${p.status}' must be a whole number ≥ 0, got ${p.count}.`,
  },

  // ── Estimates ──────────────────────────────────────────────────────────────────────────
  estimate_input_invalid: {
    kind: 'invalid_input',
    message: (p: { problems: readonly string[] }) => `The stage estimate cannot be computed — ${p.problems.join('; ')}. Correct the inputs and try again.`,
  },
  estimate_form_invalid: { kind: 'invalid_input', message: (p: { problems: readonly string[] }) => `Check the marked inputs: ${p.problems.join('; ')}.` },
  api_refused: {
    kind: 'internal',
    message: (p: { status: number; message?: string }) => p.message ?? `The server answered ${p.status}.`,
  },
  estimate_vgs0_unknown: {
    kind: 'conflict',
    message: (p: { serial: string }) => `${p.serial} has no fit, so VP/2 is unknown; choose a fixed VGS0.`,
  },
  estimate_reservation_not_found: {
    kind: 'not_found',
    message: (p: { id?: number | string }) => `No reservation ${p.id ?? ''} of yours (reservation_id). Copy the id from your reservation's page.`,
  },
  estimate_reservation_empty: { kind: 'conflict', message: (p: { id: number | string }) => `Reservation ${p.id} holds no parts (reservation_id).` },

  // ── Matching, reservations, pick lists ────────────────────────────────────────────────
  device_type_bins_unknown: {
    kind: 'invalid_input',
    message: (p: { missing: readonly string[]; bins: readonly string[] }) =>
      `No bin ${p.missing.join(', ')} in this type's bin plans. Its bins: ${list(p.bins, 'none (no bin plan yet)')}.`,
  },
  match_request_invalid: {
    kind: 'invalid_input',
    message: (
      p: { problem: 'count'; count: number } | { problem: 'tolerance'; name: string; value: number } | { problem: 'operating_point' },
    ) =>
      `The match request cannot be answered as asked: ${
        p.problem === 'count'
          ? `count must be a whole number ≥ 0, got ${p.count}`
          : p.problem === 'tolerance'
            ? `tolerance ${p.name} must be ≥ 0 (Infinity for none), got ${p.value}`
            : 'the operating point needs VDS > 0 (N-equivalent), a drain current > 0 or a source resistor ≥ 0'
      }.`,
  },
  cascode_needs_current: {
    kind: 'invalid_input',
    message: () =>
      'The match request cannot be answered as asked: a cascode shares one drain current between its parts: give the operating point as a current (idA, vdsV).',
  },
  match_search_budget: { kind: 'internal', message: () => 'The exact set search went over its state budget.' },
  match_thread_stock_missing: {
    kind: 'internal',
    message: (p: { key: number }) => `Stock ${p.key} was not sent to this figures thread before it was asked to evaluate it.`,
  },
  match_figures_mismatch: {
    kind: 'internal',
    message: (p: { candidates: number; figures: number }) =>
      `Precomputed figures cover ${p.figures} parts but the match was given ${p.candidates}: the figures belong to another stock.`,
  },
  stock_changing: { kind: 'conflict', message: () => 'Stock is changing too fast to propose sets right now; ask again in a moment.' },
  proposal_not_found: {
    kind: 'not_found',
    message: (p: { id: string }) => `There is no match proposal ${p.id} of yours. Ask for a new one on the match page.`,
  },
  proposal_already_confirmed: {
    kind: 'conflict',
    message: (p: { reservation: string }) => `This proposal was already confirmed as reservation ${p.reservation}.`,
  },
  proposal_has_no_sets: {
    kind: 'invalid_input',
    message: () => 'This proposal has no sets to reserve. Loosen the tolerances or change the operating point and ask again.',
  },
  parts_taken: {
    kind: 'conflict',
    message: (p: { serials: readonly string[] }) =>
      `Nothing was reserved: ${plural(p.serials.length, 'part', 'parts')} ${p.serials.join(', ')} ${plural(p.serials.length, 'is', 'are')} no longer available. Ask for a fresh proposal; it will draw from what is in stock now.`,
  },
  reservation_not_found: {
    kind: 'not_found',
    message: (p: { id: string | number }) => `There is no reservation ${p.id} of yours. Your reservations are listed at /reservations.`,
  },
  reservation_not_active: {
    kind: 'conflict',
    message: (p: { code: string; status: string }) => `Reservation ${p.code} is ${p.status}; only an active reservation can be cancelled.`,
  },
  reservation_has_no_figures: { kind: 'not_found', message: (p: { code: string }) => `Reservation ${p.code} has no stored match figures to export.` },
  set_not_found: { kind: 'not_found', message: (p: { setNo: number; label: string; sets: number }) => `There is no set ${p.setNo} in ${p.label}; it has ${p.sets}.` },
  pick_list_not_found: {
    kind: 'not_found',
    message: (p: { id: string; ownOnly?: boolean }) => `There is no pick list ${p.id}${p.ownOnly ? ' for your reservations' : ''}.`,
  },
  pick_list_closed: {
    kind: 'conflict',
    message: (p: { code: string; status: string }) =>
      `Pick list ${p.code} is ${p.status}; nothing more is picked on it.${p.status === 'cancelled' ? ' Put any parts taken for it back in their locations.' : ''}`,
  },
  pick_list_reservation_closed: {
    kind: 'conflict',
    message: (p: { reservation: string; status: string }) => `Reservation ${p.reservation} is ${p.status}; this list can no longer be picked.`,
  },
  not_on_pick_list: {
    kind: 'conflict',
    message: (p: { serial: string; code: string; part: { status: string; location: string | null } | null }) =>
      `${p.serial} is not on pick list ${p.code}. ${
        p.part
          ? `That part is ${p.part.status}${p.part.location ? ` at ${p.part.location}` : ''}; leave it where it is.`
          : 'No part has that serial: compare it with the label and scan or type it again.'
      }`,
  },
  already_picked: {
    kind: 'conflict',
    message: (p: { serial: string; line: number; at: string; picker: string | null }) =>
      `${p.serial} was already picked (line ${p.line}, at ${p.at} UTC${p.picker ? ` by ${p.picker}` : ''}).`,
  },
  return_refused: { kind: 'conflict', message: (p: { problems: readonly string[] }) => `Nothing was taken back: ${p.problems.join('; ')}.` },
} as const satisfies Record<string, CatalogueEntry>;

export type ErrorCode = keyof typeof ERROR_CATALOGUE;

/** The parameters the message of `code` takes (undefined when it takes none). */
export type ErrorParams<C extends ErrorCode> = Parameters<(typeof ERROR_CATALOGUE)[C]['message']>[0];

/** The sentence for `code` with its parameters. */
export function errorMessage<C extends ErrorCode>(code: C, params: ErrorParams<C>): string {
  return (ERROR_CATALOGUE[code].message as (p: ErrorParams<C>) => string)(params);
}

export function errorKind(code: ErrorCode): ErrorKind {
  return ERROR_CATALOGUE[code].kind;
}
