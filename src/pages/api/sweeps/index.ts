import { AppError } from '~/lib/server/errors';
import { capRequestBody, endpoint, json } from '~/lib/server/http';
import { receiveSweepUpload, type IncomingFile } from '~/lib/server/services/uploads/receive';
import { UPLOAD_TAG_FIELDS } from '~/contracts/uploads';
import { MAX_UPLOAD_REQUEST_BYTES } from '~/lib/server/services/uploads/limits';

/** Multipart upload of sweep files (fields `file`, tags lot/device_type/...). Answers 202 at once. */
export const POST = endpoint(async ({ request }, actor) => {
  const type = request.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw new AppError('upload_not_multipart');
  }
  const tooLarge = (what: string) =>
    new AppError('upload_request_too_large', { what, limitBytes: MAX_UPLOAD_REQUEST_BYTES }, { limit_bytes: MAX_UPLOAD_REQUEST_BYTES });
  const length = Number(request.headers.get('content-length') ?? 0);
  if (length > MAX_UPLOAD_REQUEST_BYTES) throw tooLarge(`${length} bytes`);
  // Chunked requests carry no Content-Length: the cap is applied while the body streams in.
  const capped = capRequestBody(request, MAX_UPLOAD_REQUEST_BYTES);
  let form: FormData;
  try {
    form = await capped.request.formData();
  } catch {
    if (capped.exceeded()) throw tooLarge('larger than that');
    throw new AppError('upload_unreadable');
  }
  const files: IncomingFile[] = [];
  for (const value of form.getAll('file')) {
    if (typeof value === 'string') continue;
    files.push({ name: value.name, bytes: new Uint8Array(await value.arrayBuffer()) });
  }
  const tags: Record<string, string> = {};
  for (const key of UPLOAD_TAG_FIELDS) {
    const v = form.get(key);
    if (typeof v === 'string') {
      if (v.includes('\u0000')) throw new AppError('nul_in_field', { field: key });
      tags[key] = v;
    }
  }
  return json(await receiveSweepUpload({ actor, files, tags }), 202);
});
