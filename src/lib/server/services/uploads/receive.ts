import { and, inArray, isNull, ne, sql } from 'drizzle-orm';
import { capLength, escapeForMessage, MAX_SWEEP_FILE_BYTES, nonTextError } from '~/core/sweep-file';
import { getDb, schema, transactionWithClient, type DbOrTx } from '~/db/client';
import { insertRowsAsJson } from '~/db/insert-rows-as-json';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { getBoss, QUEUES } from '~/lib/server/jobs/boss';
import { storeUploadBytes } from '~/lib/server/storage/uploads-fs';
import { UploadTags, type UploadReceived } from '~/contracts/uploads';
import { MAX_FILES_PER_UPLOAD } from './limits';

export interface IncomingFile {
  name: string;
  bytes: Uint8Array;
}

const MIB = 1024 * 1024;

/**
 * Takes one POST of sweep files: keeps every file under uploads/ by SHA-256, records the
 * upload and its files, and queues one fitting job per new file. Answers before any fitting.
 * A file whose bytes were already taken (and not rejected) points at the earlier file and
 * makes no second sweep; an over-size file, and one that is not text (binary, compressed,
 * UTF-16, a NUL byte), is rejected at once with the reason. The raw bytes are kept either way.
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
}): Promise<UploadReceived> {
  requirePermission(actor, 'sweeps:upload');
  const parsedTags = UploadTags.parse(tags ?? {});
  if (files.length === 0) {
    throw new AppError('upload_has_no_files');
  }
  if (files.length > MAX_FILES_PER_UPLOAD) {
    throw new AppError('upload_too_many_files', { files: files.length, max: MAX_FILES_PER_UPLOAD }, { limit_files: MAX_FILES_PER_UPLOAD });
  }

  // Refused before any byte is kept: a name PostgreSQL cannot store would leave a raw file with no row.
  const nulName = files.findIndex((f) => f.name.includes('\u0000'));
  if (nulName >= 0) {
    throw new AppError('upload_file_name_nul', { position: nulName + 1, shownName: files[nulName].name.replace(/\u0000/g, '\\0') });
  }
  const stored = await Promise.all(files.map((f) => storeUploadBytes(f.bytes)));
  const db = getDb();
  const shas = [...new Set(stored.map((s) => s.sha256))];
  const earlier = await db
    .select({ id: schema.uploadFile.id, sha256: schema.uploadFile.sha256, state: schema.uploadFile.state })
    .from(schema.uploadFile)
    .where(and(inArray(schema.uploadFile.sha256, shas), isNull(schema.uploadFile.duplicateOfId), ne(schema.uploadFile.state, 'rejected')))
    .orderBy(schema.uploadFile.id);
  const originalBySha = new Map<string, { id: number; state: UploadReceived['files'][number]['state'] }>();
  for (const e of earlier) if (!originalBySha.has(e.sha256)) originalBySha.set(e.sha256, { id: e.id, state: e.state });

  // The jobs are queued in the same transaction as the files: a file is never recorded
  // `queued` without its job, and no worker sees a job before its file.
  const boss = queue ? await getBoss() : null;
  const { upload, rows } = await transactionWithClient(async (tx, client) => {
    const [upload] = await tx
      .insert(schema.upload)
      .values({ userId: actor.userId, stationTokenId: actor.stationId, tags: parsedTags })
      .returning();
    // Ids are taken from the sequence first, so that one insert can point a copy of bytes
    // sent earlier in this same request at its first copy.
    const ids = await reserveUploadFileIds(tx, files.length);
    const firstIdBySha = new Map<string, number>();
    const rows: UploadReceived['files'] = [];
    const values = files.map((f, i) => {
      const s = stored[i];
      const id = ids[i];
      const name = uploadFileName(f.name, i);
      const notText = s.sizeBytes > MAX_SWEEP_FILE_BYTES ? null : (nonTextError(f.bytes, name)?.message ?? null);
      const tooLarge = s.sizeBytes > MAX_SWEEP_FILE_BYTES || notText !== null;
      const reason = notText
        ? notText
        : tooLarge
          ? `${name}: the file is ${s.sizeBytes} bytes, over the limit of ${MAX_SWEEP_FILE_BYTES} bytes (${MAX_SWEEP_FILE_BYTES / MIB} MiB). Expected a file of at most ${MAX_SWEEP_FILE_BYTES / MIB} MiB; split the sweeps into several files.`
          : null;
      const earlierCopy = tooLarge ? undefined : originalBySha.get(s.sha256);
      const duplicateOf = tooLarge ? null : (earlierCopy?.id ?? firstIdBySha.get(s.sha256) ?? null);
      if (!tooLarge && duplicateOf === null) firstIdBySha.set(s.sha256, id);
      rows.push({ id, name, state: tooLarge ? 'rejected' : (earlierCopy?.state ?? 'queued'), reason, duplicate_of: duplicateOf });
      return {
        id,
        uploadId: upload.id,
        originalName: name,
        sha256: s.sha256,
        sizeBytes: s.sizeBytes,
        storedPath: s.storedPath,
        state: tooLarge ? ('rejected' as const) : ('queued' as const),
        reason,
        errorCode: notText ? 'not_text' : tooLarge ? 'too_large' : null,
        duplicateOfId: duplicateOf,
        finishedAt: tooLarge ? new Date() : null,
      };
    });
    await insertRowsAsJson(tx, schema.uploadFile, values);
    await writeAudit(tx, actor, {
      action: 'upload.receive',
      subjectType: 'upload',
      subjectId: upload.id,
      after: { files: rows.length, tags: parsedTags },
    });
    const toFit = rows.filter((r) => r.reason === null && r.duplicate_of === null);
    if (boss && toFit.length) {
      await boss.insert(
        // Retries, back-off, expiry and dead letters are the queue's (jobs/boss.ts).
        toFit.map((r) => ({ name: QUEUES.fitUploadFile, data: { uploadFileId: r.id } })),
        { db: { executeSql: (text, values) => client.query(text, values) } },
      );
    }
    return { upload, rows };
  });
  return { upload_id: upload.id, files: rows };
}

/** The name as sent, made storable and readable: control characters escaped, at most 200 characters. */
function uploadFileName(sent: string, index: number): string {
  return capLength(escapeForMessage(sent.trim()), 200) || `file-${index + 1}`;
}

/** `count` new upload_file ids, in order, from the table's own sequence. */
async function reserveUploadFileIds(tx: DbOrTx, count: number): Promise<number[]> {
  const result = await tx.execute(
    sql`select nextval(pg_get_serial_sequence('upload_file', 'id'))::int as id from generate_series(1, ${count})`,
  );
  return (result.rows as { id: number }[]).map((r) => r.id);
}
