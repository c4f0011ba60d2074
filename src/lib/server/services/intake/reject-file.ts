import { and, eq, inArray } from 'drizzle-orm';
import { storableText } from '~/core/text/storable-text';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { describeFailure } from '~/lib/server/failure-text';
import type { Actor } from '~/lib/server/identity';
import { outcomeOf, uploadFilesWithUploader, uploaderOf, type IngestOutcome } from './upload-file-rows';

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
export async function markRejected(uploadFileId: number, rawReason: string, code: string, actor: Actor): Promise<IngestOutcome> {
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
