import { and, inArray, isNull, ne } from 'drizzle-orm';
import { MAX_SWEEP_FILE_BYTES } from '../../../../core/sweep-file';
import { getDb, schema, transactionWithClient, type DbOrTx } from '../../../../db/client';
import { insertRowsAsJson } from '../../../../db/insert-rows-as-json';
import { writeAudit } from '../../audit';
import { AppError } from '../../errors';
import { requirePermission, type Actor } from '../../identity';
import { getBoss, QUEUES } from '../../jobs/boss';
import { storeUploadBytes } from '../../storage/uploads-fs';
import { MAX_FILES_PER_UPLOAD, UploadTags } from './schemas';

export interface IncomingFile {
  name: string;
  bytes: Uint8Array;
}

export interface ReceivedFile {
  id: number;
  name: string;
  state: 'queued' | 'fitted' | 'needs_review' | 'rejected';
  reason: string | null;
  duplicate_of: number | null;
}

const MIB = 1024 * 1024;

/**
 * Takes one POST of sweep files: keeps every file under uploads/ by SHA-256, records the
 * upload and its files, and queues one fitting job per new file. Answers before any fitting.
 * A file whose bytes were already taken (and not rejected) points at the earlier file and
 * makes no second sweep; an over-size file is rejected at once, naming the limit.
 */
export async function receiveSweepUpload({
  actor,
  files,
  tags,
  queue = true,
}: {
  actor: Actor | null;
  files: IncomingFile[];
  tags: unknown;
  /** false: record the files but queue no job (the demo seed then ingests them itself). */
  queue?: boolean;
}) {
  requirePermission(actor, 'sweeps:upload');
  const parsedTags = UploadTags.parse(tags ?? {});
  if (files.length === 0) {
    throw new AppError('invalid_input', 'The request has no files: send multipart/form-data with one or more fields named "file".');
  }
  if (files.length > MAX_FILES_PER_UPLOAD) {
    throw new AppError('too_large', `The request has ${files.length} files; at most ${MAX_FILES_PER_UPLOAD} are taken at once. Send them in several requests.`, { limit_files: MAX_FILES_PER_UPLOAD });
  }

  const stored = await Promise.all(files.map((f) => storeUploadBytes(f.bytes)));
  const db = getDb();
  const shas = [...new Set(stored.map((s) => s.sha256))];
  const earlier = await db
    .select({ id: schema.uploadFile.id, sha256: schema.uploadFile.sha256, state: schema.uploadFile.state })
    .from(schema.uploadFile)
    .where(and(inArray(schema.uploadFile.sha256, shas), isNull(schema.uploadFile.duplicateOfId), ne(schema.uploadFile.state, 'rejected')))
    .orderBy(schema.uploadFile.id);
  const originalBySha = new Map<string, { id: number; state: ReceivedFile['state'] }>();
  for (const e of earlier) if (!originalBySha.has(e.sha256)) originalBySha.set(e.sha256, { id: e.id, state: e.state });

  // The jobs are queued in the same transaction as the files: a file is never recorded
  // `queued` without its job, and no worker sees a job before its file.
  const boss = queue ? await getBoss() : null;
  const { upload, rows } = await transactionWithClient(async (tx, client) => {
    const [upload] = await tx
      .insert(schema.upload)
      .values({ userId: actor.userId, stationTokenId: actor.stationId, tags: parsedTags })
      .returning();
    // Two inserts, not one per file: first the files to fit or refuse, then the files whose
    // bytes came earlier (before, or in this same request), pointing at that first copy.
    const planned = files.map((f, i) => {
      const s = stored[i];
      const name = f.name.trim() || `file-${i + 1}`;
      const tooLarge = s.sizeBytes > MAX_SWEEP_FILE_BYTES;
      const reason = tooLarge
        ? `${name}: the file is ${s.sizeBytes} bytes, over the limit of ${MAX_SWEEP_FILE_BYTES} bytes (${MAX_SWEEP_FILE_BYTES / MIB} MiB). Expected a file of at most ${MAX_SWEEP_FILE_BYTES / MIB} MiB; split the sweeps into several files.`
        : null;
      return { name, s, tooLarge, reason, id: 0, copyOfIndex: -1 };
    });
    const firstIndexBySha = new Map<string, number>();
    planned.forEach((p, i) => {
      if (p.tooLarge || originalBySha.has(p.s.sha256)) return;
      const first = firstIndexBySha.get(p.s.sha256);
      if (first === undefined) firstIndexBySha.set(p.s.sha256, i);
      else p.copyOfIndex = first;
    });
    const valuesOf = (p: (typeof planned)[number], duplicateOfId: number | null) => ({
      uploadId: upload.id,
      originalName: p.name,
      sha256: p.s.sha256,
      sizeBytes: p.s.sizeBytes,
      storedPath: p.s.storedPath,
      state: p.tooLarge ? ('rejected' as const) : ('queued' as const),
      reason: p.reason,
      errorCode: p.tooLarge ? 'too_large' : null,
      duplicateOfId,
      finishedAt: p.tooLarge ? new Date() : null,
    });
    const firstPass = planned.filter((p) => p.copyOfIndex < 0);
    const secondPass = planned.filter((p) => p.copyOfIndex >= 0);
    const firstIds = await insertUploadFiles(
      tx,
      firstPass.map((p) => valuesOf(p, p.tooLarge ? null : (originalBySha.get(p.s.sha256)?.id ?? null))),
    );
    firstPass.forEach((p, i) => (p.id = firstIds[i]));
    if (secondPass.length) {
      const secondIds = await insertUploadFiles(
        tx,
        secondPass.map((p) => valuesOf(p, planned[p.copyOfIndex].id)),
      );
      secondPass.forEach((p, i) => (p.id = secondIds[i]));
    }
    const rows: ReceivedFile[] = planned.map((p) => {
      const earlierCopy = p.tooLarge ? undefined : originalBySha.get(p.s.sha256);
      const duplicateOf = earlierCopy?.id ?? (p.copyOfIndex >= 0 ? planned[p.copyOfIndex].id : null);
      const state = p.tooLarge ? 'rejected' : (earlierCopy?.state ?? 'queued');
      return { id: p.id, name: p.name, state, reason: p.reason, duplicate_of: duplicateOf };
    });
    await writeAudit(tx, actor, {
      action: 'upload.receive',
      subjectType: 'upload',
      subjectId: upload.id,
      after: { files: rows.length, tags: parsedTags },
    });
    const toFit = rows.filter((r) => r.reason === null && r.duplicate_of === null);
    if (boss && toFit.length) {
      await boss.insert(
        toFit.map((r) => ({ name: QUEUES.fitUploadFile, data: { uploadFileId: r.id }, retryLimit: 3, retryDelay: 5 })),
        { db: { executeSql: (text, values) => client.query(text, values) } },
      );
    }
    return { upload, rows };
  });
  return { upload_id: upload.id, files: rows };
}

/**
 * Inserts upload_file rows in one statement and returns their ids in the order given. Rows
 * are matched back by bytes and name: two rows alike in both are alike in every column, so
 * either id serves either.
 */
async function insertUploadFiles(tx: DbOrTx, rows: (typeof schema.uploadFile.$inferInsert)[]): Promise<number[]> {
  const key = (sha: string, name: string) => `${sha}/${name}`;
  const stored = await insertRowsAsJson(tx, schema.uploadFile, rows, ['id', 'sha256', 'originalName']);
  const idsByKey = new Map<string, number[]>();
  for (const r of stored.sort((a, b) => a.id - b.id)) {
    const k = key(r.sha256, r.originalName);
    const list = idsByKey.get(k);
    if (list) list.push(r.id);
    else idsByKey.set(k, [r.id]);
  }
  return rows.map((r) => idsByKey.get(key(r.sha256, r.originalName))!.shift()!);
}
