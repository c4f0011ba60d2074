import { and, eq, type SQL } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import type { Actor } from '~/lib/server/identity';

export type UploadFileState = 'queued' | 'fitted' | 'needs_review' | 'rejected';

export interface IngestOutcome {
  uploadFileId: number;
  state: UploadFileState;
  reason: string | null;
  serials: string[];
}

export type UploadFileRow = typeof schema.uploadFile.$inferSelect;

/** Upload files with their upload and the name of the station that sent them, if one did. */
export function uploadFilesWithUploader(...where: SQL[]) {
  return getDb()
    .select({ file: schema.uploadFile, upload: schema.upload, stationName: schema.stationToken.name })
    .from(schema.uploadFile)
    .innerJoin(schema.upload, eq(schema.upload.id, schema.uploadFile.uploadId))
    .leftJoin(schema.stationToken, eq(schema.stationToken.id, schema.upload.stationTokenId))
    .where(and(...where));
}

/** Who the audit log names for a file's parts: the person or station that uploaded it. */
export function uploaderOf(upload: typeof schema.upload.$inferSelect, stationName: string | null): Actor {
  return {
    userId: upload.userId,
    stationId: upload.stationTokenId,
    label: stationName ? `station ${stationName}` : (upload.userId ?? 'unknown'),
    permissions: [],
  };
}

export function outcomeOf(file: UploadFileRow): IngestOutcome {
  return { uploadFileId: file.id, state: file.state, reason: file.reason, serials: file.serials };
}
