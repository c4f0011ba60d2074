/**
 * What an upload widget row shows for a file, from the server's state of that file
 * (GET /api/uploads/{id}). Only a fitted file is "done" (Uppy's green tick); a file that is
 * still queued is "working"; one that needs review is "held" (no tick: it is not through);
 * a rejected one is an error carrying the server's reason.
 */
export type FileState = 'queued' | 'fitted' | 'needs_review' | 'rejected';

export type UppyVerdict =
  | { kind: 'working'; message: string }
  | { kind: 'done'; message: string }
  | { kind: 'held'; message: string }
  | { kind: 'error'; message: string };

export function uppyVerdict(file: { state: FileState; reason: string | null; retry?: { attempt: number; attempts: number } | null }): UppyVerdict {
  switch (file.state) {
    case 'queued':
      return { kind: 'working', message: file.retry ? `Fitting on the server… ${retryWords(file.retry)}` : 'Fitting on the server…' };
    case 'fitted':
      return { kind: 'done', message: 'Fitted' };
    case 'needs_review':
      return { kind: 'held', message: `Needs review${file.reason ? `: ${file.reason}` : ''}` };
    case 'rejected':
      return { kind: 'error', message: `Rejected: ${file.reason ?? 'no reason given'}` };
  }
}

/** How a queued file that is being tried again is described: "retrying, attempt 2 of 5". */
export function retryWords(retry: { attempt: number; attempts: number }): string {
  return `retrying, attempt ${retry.attempt} of ${retry.attempts}`;
}

/** The lot code a file was refused for, when the refusal is an unknown lot; else null. */
export function unknownLotOf(file: { state: FileState; error_code: string | null; reason: string | null }): string | null {
  if (file.state !== 'rejected' || file.error_code !== 'unknown_lot' || !file.reason) return null;
  const m = /lot "([^"]+)"/.exec(file.reason);
  return m ? m[1]! : null;
}
