import { and, eq, inArray, isNull, ne, sql } from 'drizzle-orm';
import type { FitResult, FittedResult } from '../../../../core/fit/definitions';
import { fitCurveFamily } from '../../../../core/fit/fit-curve-family';
import { checkPartTransition, type PartStatus } from '../../../../core/stock/part-transitions';
import { parseSweepFile, SweepFileError, type ParsedSweepFile } from '../../../../core/sweep-file';
import { getDb, schema } from '../../../../db/client';
import { writeAudit } from '../../audit';
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

/**
 * Reads one stored upload file, parses it, fits every part in it and stores the parts,
 * sweeps and fits in ONE transaction, moving each part to `accepted` (and into its bin) or to
 * `needs_review`. A file that cannot be used is marked `rejected` with a reason naming the
 * file, line and column, and stores nothing else. Safe to run twice: a file that is no longer
 * `queued` is left as it is. The fitting job, the demo seed and the bench all call this.
 */
export async function ingestStoredFile(uploadFileId: number): Promise<IngestOutcome> {
  const db = getDb();
  const [row] = await db
    .select({ file: schema.uploadFile, upload: schema.upload, stationName: schema.stationToken.name })
    .from(schema.uploadFile)
    .innerJoin(schema.upload, eq(schema.upload.id, schema.uploadFile.uploadId))
    .leftJoin(schema.stationToken, eq(schema.stationToken.id, schema.upload.stationTokenId))
    .where(eq(schema.uploadFile.id, uploadFileId));
  if (!row) throw new Error(`upload_file ${uploadFileId} does not exist`);
  const { file, upload } = row;
  if (file.state !== 'queued' || file.duplicateOfId !== null) return outcomeOf(file);

  const actor: Actor = {
    userId: upload.userId,
    stationId: upload.stationTokenId,
    label: row.stationName ? `station ${row.stationName}` : (upload.userId ?? 'unknown'),
    permissions: [],
  };
  const tagsParsed = UploadTags.safeParse(upload.tags ?? {});
  const tags: UploadTags = tagsParsed.success ? tagsParsed.data : {};
  const defaultStation = tags.station ?? row.stationName ?? null;

  let plan: FilePlan;
  try {
    let bytes: Buffer;
    try {
      bytes = await readStoredUpload(file.storedPath);
    } catch {
      throw new IngestRejection('stored_file_missing', `${file.originalName}: the stored copy (${file.storedPath}) could not be read; upload the file again.`);
    }
    plan = await planFile(bytes, file.originalName, tags, defaultStation);
  } catch (err) {
    if (err instanceof SweepFileError || err instanceof IngestRejection) return markRejected(file.id, err.message, err.code, actor);
    throw err;
  }

  try {
    return await persistPlan(file, plan, actor);
  } catch (err) {
    if (err instanceof IngestRejection) return markRejected(file.id, err.message, err.code, actor);
    throw err;
  }
}

function outcomeOf(file: typeof schema.uploadFile.$inferSelect): IngestOutcome {
  return { uploadFileId: file.id, state: file.state, reason: file.reason, serials: file.serials };
}

/** Parse and fit: everything that needs no database row locked. */
async function planFile(bytes: Buffer, fileName: string, tags: UploadTags, defaultStation: string | null): Promise<FilePlan> {
  const text = new TextDecoder('utf-8').decode(bytes);
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
  const lots = lotCodes.size
    ? await getDb().select().from(schema.lot).where(inArray(schema.lot.code, [...lotCodes]))
    : [];
  const lotByCode = new Map(lots.map((l) => [l.code, l]));

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
        extra: p.metadata.extra,
      },
      curves,
      pointCount: curves.reduce((s, c) => s + c.vds_v.length, 0),
      fit: result,
    });
  });
  return { type, parts };
}

async function persistPlan(file: typeof schema.uploadFile.$inferSelect, plan: FilePlan, actor: Actor): Promise<IngestOutcome> {
  const { type, parts } = plan;
  return getDb().transaction(async (tx) => {
    const [locked] = await tx.select().from(schema.uploadFile).where(eq(schema.uploadFile.id, file.id)).for('update');
    if (!locked || locked.state !== 'queued') return outcomeOf(locked ?? file);

    // The same bytes may have been fitted meanwhile from another upload: no second sweep.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${file.sha256}, 0))`);
    const [earlier] = await tx
      .select()
      .from(schema.uploadFile)
      .where(
        and(
          eq(schema.uploadFile.sha256, file.sha256),
          ne(schema.uploadFile.id, file.id),
          isNull(schema.uploadFile.duplicateOfId),
          inArray(schema.uploadFile.state, ['fitted', 'needs_review']),
        ),
      )
      .limit(1);
    if (earlier) {
      await tx.update(schema.uploadFile).set({ duplicateOfId: earlier.id, finishedAt: new Date() }).where(eq(schema.uploadFile.id, file.id));
      return { uploadFileId: file.id, state: earlier.state, reason: null, serials: earlier.serials };
    }

    const serials = parts.map((p) => p.serial);
    const sorted = [...parts].sort((a, b) => (a.serial < b.serial ? -1 : a.serial > b.serial ? 1 : 0));
    await tx
      .insert(schema.part)
      .values(sorted.map((p) => ({ serial: p.serial, deviceTypeId: type.id, lotId: p.lotId })))
      .onConflictDoNothing({ target: schema.part.serial });
    const partRows = await tx.select().from(schema.part).where(inArray(schema.part.serial, serials));
    const partBySerial = new Map(partRows.map((r) => [r.serial, r]));
    for (const p of parts) {
      const existing = partBySerial.get(p.serial)!;
      if (existing.deviceTypeId !== type.id) {
        throw new IngestRejection('type_conflict', `${file.originalName}: part ${p.serial} is already known as another device type, not ${type.name}. Check the serial or the device type.`);
      }
      const refusal = NO_NEW_SWEEP[existing.status];
      if (refusal) throw new IngestRejection('part_unavailable', `${file.originalName}: part ${p.serial} ${refusal}.`);
    }

    const sweeps = await tx
      .insert(schema.sweep)
      .values(
        parts.map((p) => ({
          partId: partBySerial.get(p.serial)!.id,
          uploadFileId: file.id,
          indexInFile: p.indexInFile,
          vgsStepsV: p.curves.map((c) => c.vgs_v),
          curves: p.curves,
          pointCount: p.pointCount,
          temperatureC: p.temperatureC,
          station: p.station,
          operator: p.operator,
          metadata: p.metadata,
        })),
      )
      .returning({ id: schema.sweep.id, indexInFile: schema.sweep.indexInFile });
    const sweepByIndex = new Map(sweeps.map((s) => [s.indexInFile, s.id]));

    // A clean fit goes to accepted where the part's state allows; otherwise a person looks.
    const targets = parts.map((p) => {
      const from = partBySerial.get(p.serial)!.status;
      const wanted: PartStatus = p.fit.needsReview ? 'needs_review' : 'accepted';
      const to: PartStatus = from === wanted || checkPartTransition(from, wanted).ok ? wanted : 'needs_review';
      return { p, from, to };
    });
    const fits = await tx
      .insert(schema.fit)
      .values(
        targets.map(({ p, to }) =>
          fitColumns(p.fit, type.channel, { sweepId: sweepByIndex.get(p.indexInFile)!, partId: partBySerial.get(p.serial)!.id }, to === 'accepted' ? 'auto_accepted' : 'needs_review'),
        ),
      )
      .returning({ id: schema.fit.id, partId: schema.fit.partId });
    const fitByPart = new Map(fits.map((f) => [f.partId, f.id]));

    for (const { p } of targets) {
      const part = partBySerial.get(p.serial)!;
      await tx
        .update(schema.part)
        .set({ currentFitId: fitByPart.get(part.id)!, lotId: part.lotId ?? p.lotId, updatedAt: new Date() })
        .where(eq(schema.part.id, part.id));
    }
    await writeAudit(
      tx,
      actor,
      targets.map(({ p }) => {
        const part = partBySerial.get(p.serial)!;
        return {
          action: 'part.sweep',
          subjectType: 'part',
          subjectId: p.serial,
          after: {
            sweep_id: sweepByIndex.get(p.indexInFile),
            fit_id: fitByPart.get(part.id),
            upload_file_id: file.id,
            file_name: file.originalName,
            flags: p.fit.flags.map((f) => f.code),
          },
        };
      }),
    );

    const changes: StatusChange[] = targets.filter((t) => t.from !== t.to).map((t) => ({ partId: partBySerial.get(t.p.serial)!.id, to: t.to }));
    await changePartStatuses(tx, actor, changes, { action: 'part.fit', reason: `fitted from ${file.originalName}` });
    const accepted = targets.filter((t) => t.to === 'accepted').map((t) => partBySerial.get(t.p.serial)!.id);
    await assignBinsForParts(tx, actor, accepted);

    const state: UploadFileState = targets.some((t) => t.to === 'needs_review') ? 'needs_review' : 'fitted';
    await tx.update(schema.uploadFile).set({ state, reason: null, errorCode: null, serials, finishedAt: new Date() }).where(eq(schema.uploadFile.id, file.id));
    return { uploadFileId: file.id, state, reason: null, serials };
  });
}

async function markRejected(uploadFileId: number, reason: string, code: string, actor: Actor): Promise<IngestOutcome> {
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
