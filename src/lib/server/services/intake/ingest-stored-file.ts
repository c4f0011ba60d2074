import { inArray } from 'drizzle-orm';
import { AppError } from '~/core/errors';
import { IngestRejection } from '~/core/intake/ingest-rejection';
import { lotCodesOf, planParts, readSweepForType } from '~/core/intake/plan-sweep-file';
import { storageGroups } from '~/core/intake/storage-groups';
import { decodeSweepBytes, SweepFileError } from '~/core/sweep-file';
import { getDb, schema } from '~/db/client';
import { describeFailure } from '~/lib/server/failure-text';
import { readStoredUpload } from '~/lib/server/storage/uploads-fs';
import { UploadTags } from '~/contracts/uploads';
import { deviceTypesByName } from './catalogue-cache';
import { persistPlans, type PlannedFile } from './persist-plans';
import { markRejected } from './reject-file';
import { outcomeOf, uploadFilesWithUploader, uploaderOf, type IngestOutcome } from './upload-file-rows';

export { refuseAfterRepeatedFailure } from './reject-file';
export type { IngestOutcome, UploadFileState } from './upload-file-rows';
export type { SweepNoteJson } from '~/core/intake/plan-sweep-file';

type LotRecord = typeof schema.lot.$inferSelect;

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
    if (!row) throw new AppError('upload_file_missing', { id });
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
        throw new IngestRejection('stored_file_missing', { file: file.originalName, storedPath: file.storedPath });
      }
      planned.push({ file, actor, plan: await planFile(bytes, file.originalName, tags, defaultStation, lots) });
    } catch (err) {
      if (err instanceof SweepFileError || err instanceof IngestRejection) outcomes.set(id, await markRejected(file.id, err.message, err.code, actor));
      else failures.push({ uploadFileId: id, error: err });
    }
  }

  const keyed = planned.map((f) => ({ ...f, actorKey: `${f.actor.userId ?? ''}|${f.actor.stationId ?? ''}`, sha256: f.file.sha256, serials: f.plan.parts.map((p) => p.serial) }));
  for (const group of storageGroups(keyed)) {
    for (const outcome of await storeGroup(group, failures)) outcomes.set(outcome.uploadFileId, outcome);
  }
  if (failures.length) {
    // The rest of the batch is stored; the job is retried for these (done files are skipped).
    const first = failures[0].error;
    throw new AppError('ingest_failed', { ids: failures.map((f) => f.uploadFileId), reason: describeFailure(first) }, undefined, { cause: first });
  }
  return uploadFileIds.map((id) => outcomes.get(id)!);
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

/**
 * Decode, choose the device type, parse, look up the lots, fit: everything that needs no
 * database row locked. The decisions are src/core/intake's; this loads what they need.
 */
async function planFile(
  bytes: Buffer,
  fileName: string,
  tags: UploadTags,
  defaultStation: string | null,
  lotsByCode: (codes: string[]) => Promise<Map<string, LotRecord>>,
): Promise<PlannedFile['plan']> {
  // Binary, compressed, UTF-16 and NUL-bearing files are refused here, before any of their text is read.
  const text = decodeSweepBytes(bytes, fileName);
  const { type, parsed } = readSweepForType({ text, byteLength: bytes.byteLength, fileName, tags, typesByName: await deviceTypesByName() });
  const codes = lotCodesOf(parsed, tags);
  const lots = codes.length ? await lotsByCode(codes) : new Map<string, LotRecord>();
  return { type, parts: planParts({ parsed, type, fileName, tags, defaultStation, lotsByCode: lots }) };
}
