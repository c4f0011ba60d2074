import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { UploadFileStatus, UploadStatus } from '~/contracts/uploads';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { maySeeUpload } from '~/lib/access';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { fitRetries } from '~/lib/server/jobs/fit-attempts';
import type { SweepNoteJson } from '../intake/ingest-stored-file';

/**
 * One upload and the state of each of its files. People who may upload see any upload; a
 * test station sees only its own.
 */
export async function getUpload({ actor, id }: { actor: Actor | null; id: unknown }): Promise<UploadStatus> {
  requirePermission(actor, 'sweeps:upload');
  const uploadId = z.string().uuid('must be an upload id').parse(id);
  const db = getDb();
  const [upload] = await db.select().from(schema.upload).where(eq(schema.upload.id, uploadId));
  if (!upload || !maySeeUpload(actor, upload)) {
    throw new AppError('upload_not_found', { id: uploadId });
  }
  const files = await db.select().from(schema.uploadFile).where(eq(schema.uploadFile.uploadId, uploadId)).orderBy(asc(schema.uploadFile.id));
  const originalIds = [...new Set(files.map((f) => f.duplicateOfId).filter((x): x is number => x !== null))];
  const originals = originalIds.length ? await db.select().from(schema.uploadFile).where(inArray(schema.uploadFile.id, originalIds)) : [];
  const byId = new Map(originals.map((o) => [o.id, o]));
  const sourceIds = files.map((f) => f.duplicateOfId ?? f.id);
  const noted = sourceIds.length
    ? await db
        .select({ uploadFileId: schema.sweep.uploadFileId, serial: schema.part.serial, notes: sql<SweepNoteJson[] | null>`${schema.sweep.metadata}->'notes'` })
        .from(schema.sweep)
        .innerJoin(schema.part, eq(schema.part.id, schema.sweep.partId))
        .where(and(inArray(schema.sweep.uploadFileId, sourceIds), sql`jsonb_array_length(coalesce(${schema.sweep.metadata}->'notes', '[]'::jsonb)) > 0`))
        .orderBy(asc(schema.sweep.indexInFile))
    : [];
  const notesByFile = new Map<number, UploadFileStatus['notes']>();
  for (const n of noted) {
    if (n.uploadFileId === null) continue;
    const list = notesByFile.get(n.uploadFileId) ?? [];
    for (const note of n.notes ?? []) list.push({ serial: n.serial, ...note });
    notesByFile.set(n.uploadFileId, list);
  }

  const queuedIds = [...new Set(sourceIds.filter((id, i) => (files[i].duplicateOfId !== null ? byId.get(id)?.state : files[i].state) === 'queued'))];
  const retries = await fitRetries(queuedIds);

  const out: UploadFileStatus[] = files.map((f) => {
    const o = f.duplicateOfId !== null ? byId.get(f.duplicateOfId) : undefined;
    const src = o ?? f;
    return {
      id: f.id,
      name: f.originalName,
      size_bytes: f.sizeBytes,
      sha256: f.sha256,
      state: src.state,
      reason: src.reason,
      error_code: src.errorCode,
      serials: src.serials,
      duplicate_of: o ? { file_id: o.id, upload_id: o.uploadId, name: o.originalName } : null,
      finished_at: (src.finishedAt ?? null)?.toISOString() ?? null,
      notes: notesByFile.get(src.id) ?? [],
      retry: src.state === 'queued' ? (retries.get(src.id) ?? null) : null,
    };
  });
  const counts = { queued: 0, fitted: 0, needs_review: 0, rejected: 0 };
  for (const f of out) counts[f.state]++;
  return { upload_id: upload.id, created_at: upload.createdAt.toISOString(), tags: upload.tags as UploadStatus['tags'], done: counts.queued === 0, counts, files: out };
}
