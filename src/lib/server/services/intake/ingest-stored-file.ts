import { and, eq, inArray, isNull, notInArray, sql, type SQL } from 'drizzle-orm';
import type { FitResult, FittedResult } from '../../../../core/fit/definitions';
import { fitCurveFamily } from '../../../../core/fit/fit-curve-family';
import { checkPartTransition, type PartStatus } from '../../../../core/stock/part-transitions';
import { capLength, decodeSweepBytes, escapeForMessage, MAX_MESSAGE_LENGTH, parseSweepFile, SweepFileError, type ParsedSweepFile, type SweepNote } from '../../../../core/sweep-file';
import { storableText } from '../../../../core/text/storable-text';
import { getDb, schema } from '../../../../db/client';
import { insertRowsAsJson, jsonRecordset } from '../../../../db/insert-rows-as-json';
import { writeAudit } from '../../audit';
import { describeFailure } from '../../failure-text';
import type { Actor } from '../../identity';
import { readStoredUpload } from '../../storage/uploads-fs';
import { assignBinsForParts } from '../bins/assign-bins';
import { fitColumns } from '../fits/fit-columns';
import { changePartStatuses, type StatusChange } from '../parts/change-status';
import { toStoredCurves } from '../sweeps/stored-curves';
import { UploadTags } from '../uploads/schemas';
import { deviceTypesByName, type DeviceTypeRecord } from './catalogue-cache';
import { readFileHints } from './file-hints';
import { IngestRejection } from './rejection';

export type UploadFileState = 'queued' | 'fitted' | 'needs_review' | 'rejected';

export interface IngestOutcome {
  uploadFileId: number;
  state: UploadFileState;
  reason: string | null;
  serials: string[];
}

/** Statuses in which a part cannot take a new sweep: it is promised to someone or gone. */
const NO_NEW_SWEEP: Partial<Record<PartStatus, string>> = {
  reserved: 'is reserved for a designer; release the reservation before retesting it',
  issued: 'has been issued; take it back as a return before retesting it',
  scrapped: 'is scrapped; a scrapped part is never measured again',
};

interface PartPlan {
  serial: string;
  indexInFile: number;
  lotId: number | null;
  temperatureC: number | null;
  station: string | null;
  operator: string | null;
  metadata: Record<string, unknown>;
  curves: ReturnType<typeof toStoredCurves>;
  pointCount: number;
  fit: FittedResult;
}

interface FilePlan {
  type: DeviceTypeRecord;
  parts: PartPlan[];
}

type UploadFileRow = typeof schema.uploadFile.$inferSelect;
type LotRecord = typeof schema.lot.$inferSelect;

/** A file read, parsed and fitted, waiting to be stored. */
interface PlannedFile {
  file: UploadFileRow;
  actor: Actor;
  plan: FilePlan;
}

/**
 * Reads one stored upload file, parses it, fits every part in it and stores the parts,
 * sweeps and fits in one transaction; see `ingestStoredFiles`. The demo seed and the tests
 * call this; the fitting job takes files a batch at a time.
 */
export async function ingestStoredFile(uploadFileId: number): Promise<IngestOutcome> {
  const [outcome] = await ingestStoredFiles([uploadFileId]);
  return outcome;
}

/**
 * Reads stored upload files, parses them, fits every part in them and stores the parts,
 * sweeps and fits, moving each part to `accepted` (and into its bin) or to `needs_review`.
 * Files are stored together, several to a transaction (one per uploader, and never two files
 * with the same serial or the same bytes in one), which saves the database round trips that
 * dominate a busy intake. A file that cannot be used is marked `rejected` with a reason naming
 * the file, line and column, and stores nothing else; when storing refuses one file of a
 * group, the group is rolled back and stored file by file, so the others still land. An
 * unexpected error on one file (a bug, a lost connection) is thrown once the rest is stored,
 * so the job is retried for it alone. Safe to run twice: a file that is no longer `queued` is
 * left as it is. Outcomes come back in the order of `uploadFileIds`.
 */
export async function ingestStoredFiles(uploadFileIds: number[]): Promise<IngestOutcome[]> {
  const ids = [...new Set(uploadFileIds)];
  if (ids.length === 0) return [];
  const rows = await uploadFilesWithUploader(inArray(schema.uploadFile.id, ids));
  const rowById = new Map(rows.map((r) => [r.file.id, r]));
  const outcomes = new Map<number, IngestOutcome>();
  const lots = lotLookup();
  const planned: PlannedFile[] = [];
  // Unexpected errors (not a reason to refuse the file): kept while the others go on.
  const failures: { uploadFileId: number; error: unknown }[] = [];

  for (const id of ids) {
    const row = rowById.get(id);
    if (!row) throw new Error(`upload_file ${id} does not exist`);
    const { file, upload } = row;
    if (file.state !== 'queued' || file.duplicateOfId !== null) {
      outcomes.set(id, outcomeOf(file));
      continue;
    }
    const actor = uploaderOf(upload, row.stationName);
    const tagsParsed = UploadTags.safeParse(upload.tags ?? {});
    const tags: UploadTags = tagsParsed.success ? tagsParsed.data : {};
    const defaultStation = tags.station ?? row.stationName ?? null;
    try {
      let bytes: Buffer;
      try {
        bytes = await readStoredUpload(file.storedPath);
      } catch {
        throw new IngestRejection('stored_file_missing', `${file.originalName}: the stored copy (${file.storedPath}) could not be read; upload the file again.`);
      }
      planned.push({ file, actor, plan: await planFile(bytes, file.originalName, tags, defaultStation, lots) });
    } catch (err) {
      if (err instanceof SweepFileError || err instanceof IngestRejection) outcomes.set(id, await markRejected(file.id, err.message, err.code, actor));
      else failures.push({ uploadFileId: id, error: err });
    }
  }

  for (const group of storageGroups(planned)) {
    for (const outcome of await storeGroup(group, failures)) outcomes.set(outcome.uploadFileId, outcome);
  }
  if (failures.length) {
    // The rest of the batch is stored; the job is retried for these (done files are skipped).
    const first = failures[0].error;
    throw new Error(`upload file(s) ${failures.map((f) => f.uploadFileId).join(', ')} could not be ingested: ${describeFailure(first)}`, { cause: first });
  }
  return uploadFileIds.map((id) => outcomes.get(id)!);
}

/**
 * Splits planned files into groups stored one transaction each, in order: one uploader per
 * group (the audit names one actor), and no serial or SHA-256 twice in a group, so that a
 * retest in the same batch lands after the sweep it follows.
 */
function storageGroups(planned: PlannedFile[]): PlannedFile[][] {
  const groups: { actorKey: string; serials: Set<string>; shas: Set<string>; files: PlannedFile[] }[] = [];
  for (const f of planned) {
    const actorKey = `${f.actor.userId ?? ''}|${f.actor.stationId ?? ''}`;
    const serials = f.plan.parts.map((p) => p.serial);
    // The first group that takes the file without clashing, but never ahead of a group that
    // already holds one of its serials or its bytes.
    let at = groups.length;
    for (let i = groups.length - 1; i >= 0; i--) {
      const g = groups[i];
      const clashes = g.shas.has(f.file.sha256) || serials.some((s) => g.serials.has(s));
      if (clashes) break;
      if (g.actorKey === actorKey) at = i;
    }
    if (at === groups.length) groups.push({ actorKey, serials: new Set(), shas: new Set(), files: [] });
    const g = groups[at];
    g.files.push(f);
    g.shas.add(f.file.sha256);
    for (const s of serials) g.serials.add(s);
  }
  return groups.map((g) => g.files);
}

/**
 * Stores a group in one transaction. When that fails, stores each file alone, so that one
 * refused file (or one that meets an unexpected error, kept in `failures`) holds up no other.
 */
async function storeGroup(group: PlannedFile[], failures: { uploadFileId: number; error: unknown }[]): Promise<IngestOutcome[]> {
  try {
    return await persistPlans(group);
  } catch (err) {
    if (group.length > 1) {
      const out: IngestOutcome[] = [];
      for (const f of group) out.push(...(await storeGroup([f], failures)));
      return out;
    }
    if (err instanceof IngestRejection) return [await markRejected(group[0].file.id, err.message, err.code, group[0].actor)];
    failures.push({ uploadFileId: group[0].file.id, error: err });
    return [];
  }
}

/** Lots by code, each read once per batch of files. */
function lotLookup(): (codes: string[]) => Promise<Map<string, LotRecord>> {
  const known = new Map<string, LotRecord | null>();
  return async (codes) => {
    const missing = codes.filter((c) => !known.has(c));
    if (missing.length) {
      const rows = await getDb().select().from(schema.lot).where(inArray(schema.lot.code, missing));
      for (const c of missing) known.set(c, null);
      for (const r of rows) known.set(r.code, r);
    }
    const out = new Map<string, LotRecord>();
    for (const c of codes) {
      const lot = known.get(c);
      if (lot) out.set(c, lot);
    }
    return out;
  };
}

/** Upload files with their upload and the name of the station that sent them, if one did. */
function uploadFilesWithUploader(...where: SQL[]) {
  return getDb()
    .select({ file: schema.uploadFile, upload: schema.upload, stationName: schema.stationToken.name })
    .from(schema.uploadFile)
    .innerJoin(schema.upload, eq(schema.upload.id, schema.uploadFile.uploadId))
    .leftJoin(schema.stationToken, eq(schema.stationToken.id, schema.upload.stationTokenId))
    .where(and(...where));
}

/** Who the audit log names for a file's parts: the person or station that uploaded it. */
function uploaderOf(upload: typeof schema.upload.$inferSelect, stationName: string | null): Actor {
  return {
    userId: upload.userId,
    stationId: upload.stationTokenId,
    label: stationName ? `station ${stationName}` : (upload.userId ?? 'unknown'),
    permissions: [],
  };
}

function outcomeOf(file: UploadFileRow): IngestOutcome {
  return { uploadFileId: file.id, state: file.state, reason: file.reason, serials: file.serials };
}

/** A parser note as kept in sweep.metadata.notes and shown with the upload and on the part page. */
export interface SweepNoteJson {
  code: SweepNote['code'];
  vgs_v: number | null;
  lines: number[];
  message: string;
}

function toSweepNoteJson(n: SweepNote): SweepNoteJson {
  return { code: n.code, vgs_v: n.vgsV ?? null, lines: n.lines.slice(0, 50), message: n.message };
}

/** Parse and fit: everything that needs no database row locked. */
async function planFile(
  bytes: Buffer,
  fileName: string,
  tags: UploadTags,
  defaultStation: string | null,
  lotsByCode: (codes: string[]) => Promise<Map<string, LotRecord>>,
): Promise<FilePlan> {
  // Binary, compressed, UTF-16 and NUL-bearing files are refused here, before any of their text is read.
  const text = decodeSweepBytes(bytes, fileName);
  const hints = readFileHints(text);
  const types = await deviceTypesByName();
  const typeName = hints.deviceType ?? tags.device_type;
  const known = [...types.values()].map((t) => t.name).sort().join(', ') || 'none yet';
  if (!typeName) {
    // A file that is unreadable anyway gets the parser's reason, which is the more useful one.
    parseSweepFile({ text, fileName, byteLength: bytes.byteLength, ...(tags.channel ? { channel: tags.channel } : {}) });
    throw new IngestRejection(
      'no_device_type',
      `${fileName}: no device type — the file has no "# device type:" line and the upload gave none. Tag the upload with one of the known types: ${known}.`,
    );
  }
  const type = types.get(typeName.toLowerCase());
  if (!type) {
    throw new IngestRejection('unknown_device_type', `${fileName}: device type "${typeName}" is not known. Known types: ${known}. An admin adds types on the Device types page.`);
  }
  for (const [declared, where] of [
    [hints.channel, 'the file'],
    [tags.channel, 'the upload'],
  ] as const) {
    if (declared && declared !== type.channel) {
      throw new IngestRejection(
        'channel_conflict',
        `${fileName}: ${where} says ${declared.toUpperCase()}-channel, but device type ${type.name} is ${type.channel.toUpperCase()}-channel. Correct the channel or the device type.`,
      );
    }
  }

  const parsed: ParsedSweepFile = parseSweepFile({ text, fileName, byteLength: bytes.byteLength, channel: type.channel });
  const parts: PartPlan[] = [];
  const lotCodes = new Set<string>();
  for (const p of parsed.parts) {
    const code = p.metadata.lot ?? tags.lot;
    if (code) lotCodes.add(code);
  }
  const lotByCode = lotCodes.size ? await lotsByCode([...lotCodes]) : new Map<string, LotRecord>();

  parsed.parts.forEach((p, indexInFile) => {
    const lotCode = p.metadata.lot ?? tags.lot;
    let lotId: number | null = null;
    if (lotCode) {
      const lot = lotByCode.get(lotCode);
      if (!lot) throw new IngestRejection('unknown_lot', `${fileName}: lot "${lotCode}" (part ${p.serial}) is not known. An inspector creates it on the Lots page first.`);
      if (lot.deviceTypeId !== type.id) {
        throw new IngestRejection('type_conflict', `${fileName}: lot "${lotCode}" is a lot of another device type, not ${type.name}. Check the lot or the device type.`);
      }
      lotId = lot.id;
    }
    const temperatureC = p.metadata.temperatureC ?? tags.temperature_c ?? null;
    const result: FitResult = fitCurveFamily(
      { curves: p.curves.map((c) => ({ vgsV: c.vgsV, points: { vdsV: c.points.vdsV, idA: c.points.idA } })) },
      { vdsTestV: type.vdsTestV, ...(temperatureC !== null ? { temperatureC } : {}) },
    );
    if (result.status !== 'fitted') {
      throw new IngestRejection(
        'not_fittable',
        `${fileName}: part ${p.serial} could not be fitted — ${result.flags.map((f) => f.message).join(' ')} Check the fixture and measure the part again.`,
      );
    }
    const curves = toStoredCurves(p.curves);
    parts.push({
      serial: p.serial,
      indexInFile,
      lotId,
      temperatureC,
      station: p.metadata.station ?? defaultStation,
      operator: p.metadata.operator ?? tags.operator ?? null,
      metadata: {
        file_name: fileName,
        format: parsed.format,
        sign_convention: parsed.signConvention,
        channel_source: parsed.channelSource ?? null,
        serial_source: p.serialSource,
        lot: lotCode ?? null,
        sweep_kind: p.kind,
        notes: p.notes.map(toSweepNoteJson),
        extra: p.metadata.extra,
      },
      curves,
      pointCount: curves.reduce((s, c) => s + c.vds_v.length, 0),
      fit: result,
    });
  });
  return { type, parts };
}

/**
 * Stores a group of planned files in ONE transaction (see `storageGroups` for what may share
 * one). Throws IngestRejection, storing nothing, when a part cannot take a new sweep.
 */
async function persistPlans(group: PlannedFile[]): Promise<IngestOutcome[]> {
  const actor = group[0].actor;
  return getDb().transaction(async (tx) => {
    const ids = group.map((f) => f.file.id).sort((a, b) => a - b);
    const locked = await tx.select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, ids)).orderBy(schema.uploadFile.id).for('update');
    const lockedById = new Map(locked.map((l) => [l.id, l]));
    const out: IngestOutcome[] = [];
    let live = group.filter((f) => {
      const now = lockedById.get(f.file.id);
      if (now && now.state === 'queued' && now.duplicateOfId === null) return true;
      out.push(outcomeOf(now ?? f.file));
      return false;
    });
    if (live.length === 0) return out;

    // The same bytes may have been fitted meanwhile from another upload: no second sweep.
    // Locks in SHA order, so two groups cannot wait on each other.
    const shas = [...new Set(live.map((f) => f.file.sha256))].sort();
    await tx.execute(
      sql`select pg_advisory_xact_lock(hashtextextended(t.sha, 0)) from (select sha from (values ${sql.join(
        shas.map((s) => sql`(${s})`),
        sql`, `,
      )}) as v(sha) order by sha offset 0) as t`,
    );
    const earlier = await tx
      .select()
      .from(schema.uploadFile)
      .where(
        and(
          inArray(schema.uploadFile.sha256, shas),
          notInArray(schema.uploadFile.id, ids),
          isNull(schema.uploadFile.duplicateOfId),
          inArray(schema.uploadFile.state, ['fitted', 'needs_review']),
        ),
      )
      .orderBy(schema.uploadFile.id);
    const earlierBySha = new Map<string, UploadFileRow>();
    for (const e of earlier) if (!earlierBySha.has(e.sha256)) earlierBySha.set(e.sha256, e);
    const copies = live.filter((f) => earlierBySha.has(f.file.sha256));
    for (const f of copies) {
      const first = earlierBySha.get(f.file.sha256)!;
      await tx.update(schema.uploadFile).set({ duplicateOfId: first.id, finishedAt: new Date() }).where(eq(schema.uploadFile.id, f.file.id));
      out.push({ uploadFileId: f.file.id, state: first.state, reason: null, serials: first.serials });
    }
    live = live.filter((f) => !earlierBySha.has(f.file.sha256));
    if (live.length === 0) return out;

    const entries = live.flatMap((f) => f.plan.parts.map((p) => ({ f, p })));
    const bySerial = [...entries].sort((a, b) => (a.p.serial < b.p.serial ? -1 : a.p.serial > b.p.serial ? 1 : 0));
    await tx
      .insert(schema.part)
      .values(bySerial.map(({ f, p }) => ({ serial: p.serial, deviceTypeId: f.plan.type.id, lotId: p.lotId })))
      .onConflictDoNothing({ target: schema.part.serial });
    // Locked in id order, as every status change locks them, so batches cannot deadlock.
    const partRows = await tx
      .select()
      .from(schema.part)
      .where(inArray(schema.part.serial, bySerial.map((e) => e.p.serial)))
      .orderBy(schema.part.id)
      .for('update');
    const partBySerial = new Map(partRows.map((r) => [r.serial, r]));
    for (const { f, p } of entries) {
      const existing = partBySerial.get(p.serial)!;
      const type = f.plan.type;
      if (existing.deviceTypeId !== type.id) {
        throw new IngestRejection('type_conflict', `${f.file.originalName}: part ${p.serial} is already known as another device type, not ${type.name}. Check the serial or the device type.`);
      }
      const refusal = NO_NEW_SWEEP[existing.status];
      if (refusal) throw new IngestRejection('part_unavailable', `${f.file.originalName}: part ${p.serial} ${refusal}.`);
    }

    const sweeps = await insertRowsAsJson(
      tx,
      schema.sweep,
      entries.map(({ f, p }) => ({
        partId: partBySerial.get(p.serial)!.id,
        uploadFileId: f.file.id,
        indexInFile: p.indexInFile,
        vgsStepsV: p.curves.map((c) => c.vgs_v),
        curves: p.curves,
        pointCount: p.pointCount,
        temperatureC: p.temperatureC,
        station: p.station,
        operator: p.operator,
        metadata: p.metadata,
      })),
      ['id', 'partId'],
    );
    const sweepByPart = new Map(sweeps.map((s) => [s.partId, s.id]));

    // A clean fit goes to accepted where the part's state allows; otherwise a person looks.
    const targets = entries.map(({ f, p }) => {
      const part = partBySerial.get(p.serial)!;
      const wanted: PartStatus = p.fit.needsReview ? 'needs_review' : 'accepted';
      const to: PartStatus = part.status === wanted || checkPartTransition(part.status, wanted).ok ? wanted : 'needs_review';
      return { f, p, part, to };
    });
    const fits = await insertRowsAsJson(
      tx,
      schema.fit,
      targets.map(({ f, p, part, to }) =>
        fitColumns(p.fit, f.plan.type.channel, { sweepId: sweepByPart.get(part.id)!, partId: part.id }, to === 'accepted' ? 'auto_accepted' : 'needs_review'),
      ),
      ['id', 'partId'],
    );
    const fitByPart = new Map(fits.map((f) => [f.partId, f.id]));

    const currentFits = jsonRecordset(
      schema.part,
      targets.map(({ p, part }) => ({ id: part.id, currentFitId: fitByPart.get(part.id)!, lotId: p.lotId })),
    );
    await tx.execute(sql`
      update ${schema.part} set current_fit_id = x.current_fit_id, lot_id = coalesce(${schema.part.lotId}, x.lot_id), updated_at = now()
      from ${currentFits.from} where ${schema.part.id} = x.id`);
    await writeAudit(
      tx,
      actor,
      targets.map(({ f, p, part }) => ({
        action: 'part.sweep',
        subjectType: 'part',
        subjectId: p.serial,
        after: {
          sweep_id: sweepByPart.get(part.id),
          fit_id: fitByPart.get(part.id),
          upload_file_id: f.file.id,
          file_name: f.file.originalName,
          flags: p.fit.flags.map((flag) => flag.code),
        },
      })),
    );

    const changes: StatusChange[] = targets
      .filter((t) => t.part.status !== t.to)
      .map((t) => ({ partId: t.part.id, to: t.to, reason: `fitted from ${t.f.file.originalName}` }));
    await changePartStatuses(tx, actor, changes, { action: 'part.fit' });
    await assignBinsForParts(
      tx,
      actor,
      targets.filter((t) => t.to === 'accepted').map((t) => t.part.id),
    );

    const toReview = new Set(targets.filter((t) => t.to === 'needs_review').map((t) => t.f));
    const finished = live.map((f) => ({
      id: f.file.id,
      state: (toReview.has(f) ? 'needs_review' : 'fitted') as UploadFileState,
      serials: f.plan.parts.map((p) => p.serial),
    }));
    await tx.execute(sql`
      update ${schema.uploadFile} set state = x.state, reason = null, error_code = null, serials = x.serials, finished_at = now()
      from ${jsonRecordset(schema.uploadFile, finished).from} where ${schema.uploadFile.id} = x.id`);
    for (const f of finished) out.push({ uploadFileId: f.id, state: f.state, reason: null, serials: f.serials });
    return out;
  });
}

/**
 * Refuses files that could not be ingested after every retry (an unexpected error each
 * time), so that they end `rejected` with the error instead of staying `queued` for ever. The
 * stored bytes are kept; files no longer queued are left as they are.
 */
export async function refuseAfterRepeatedFailure(uploadFileIds: number[], error: unknown): Promise<IngestOutcome[]> {
  if (uploadFileIds.length === 0) return [];
  const rows = await uploadFilesWithUploader(inArray(schema.uploadFile.id, uploadFileIds), eq(schema.uploadFile.state, 'queued'));
  const why = describeFailure(error);
  const out: IngestOutcome[] = [];
  for (const { file, upload, stationName } of rows) {
    const actor = uploaderOf(upload, stationName);
    const reason = `${file.originalName}: could not be fitted after repeated attempts — internal error: ${why}. The file is kept as uploaded; upload it again, and tell an admin if this recurs.`;
    out.push(await markRejected(file.id, reason, 'internal_error', actor));
  }
  return out;
}

/** Marks a queued file rejected with its reason, made storable first (it may quote the file's bytes). */
async function markRejected(uploadFileId: number, rawReason: string, code: string, actor: Actor): Promise<IngestOutcome> {
  const reason = storableText(rawReason);
  return getDb().transaction(async (tx) => {
    const updated = await tx
      .update(schema.uploadFile)
      .set({ state: 'rejected', reason, errorCode: code, finishedAt: new Date() })
      .where(and(eq(schema.uploadFile.id, uploadFileId), eq(schema.uploadFile.state, 'queued')))
      .returning();
    if (updated.length === 0) {
      const [now] = await tx.select().from(schema.uploadFile).where(eq(schema.uploadFile.id, uploadFileId));
      return outcomeOf(now);
    }
    await writeAudit(tx, actor, { action: 'upload_file.reject', subjectType: 'upload_file', subjectId: uploadFileId, after: { code }, reason });
    return { uploadFileId, state: 'rejected', reason, serials: [] };
  });
}
