import { describeIssue, fieldPathWords } from '~/core/field-path-words';

/**
 * The one error type services throw. Each code is permanent; the HTTP layer maps it to a
 * status with `toResponse`. Messages say what happened, why, and what to do next.
 */
export type AppErrorCode =
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'invalid_input'
  | 'conflict'
  | 'invalid_transition'
  | 'too_large'
  | 'rate_limited'
  | 'internal';

const STATUS: Record<AppErrorCode, number> = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  invalid_input: 400,
  conflict: 409,
  invalid_transition: 409,
  too_large: 413,
  rate_limited: 429,
  internal: 500,
};

export class AppError extends Error {
  readonly code: AppErrorCode;
  readonly details: Record<string, unknown> | undefined;
  constructor(code: AppErrorCode, message: string, details?: Record<string, unknown>) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.details = details;
  }
  get status(): number {
    return STATUS[this.code];
  }
}

/**
 * Turns a zod error into an invalid_input AppError. The message names each field in words
 * ("axis 1, edges: width must be greater than 0"); `fields` keeps the paths for programs.
 */
export function fromZodError(error: { issues: { path: PropertyKey[]; message: string }[] }): AppError {
  const fields = error.issues.map((i) => ({ field: i.path.map(String).join('.') || '(body)', label: fieldPathWords(i.path) || 'the request', message: i.message }));
  const text = error.issues.map((i) => describeIssue(i.path, i.message)).join('; ');
  return new AppError('invalid_input', `The request is not valid — ${text}.`, { fields });
}

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', ...headers },
  });
}

/** Maps any thrown value to a JSON error response; unexpected errors are logged, not leaked. */
export function toResponse(err: unknown): Response {
  if (err instanceof AppError) {
    return json({ error: { code: err.code, message: err.message, ...(err.details ?? {}) } }, err.status);
  }
  if (err && typeof err === 'object' && 'issues' in err && Array.isArray((err as { issues: unknown }).issues)) {
    const e = fromZodError(err as { issues: { path: PropertyKey[]; message: string }[] });
    return toResponse(e);
  }
  const data = postgresDataException(err);
  if (data) {
    // A value the request carried that no column can hold, missed by the request's own checks.
    console.warn('[api] request value refused by PostgreSQL:', data.message);
    return json(
      { error: { code: 'invalid_input', message: `A value in the request cannot be used: ${data.message}. Check the ids, numbers, dates and text you sent.` } },
      400,
    );
  }
  console.error(err);
  return json({ error: { code: 'internal', message: 'Something went wrong on the server; it has been logged.' } }, 500);
}

/** PostgreSQL's data exceptions (SQLSTATE class 22: out of range, bad text, NUL bytes), wrapped or not. */
function postgresDataException(err: unknown): { code: string; message: string } | null {
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, message } = e as { code?: unknown; message?: unknown };
    if (typeof code === 'string' && /^22[0-9A-Z]{3}$/.test(code) && typeof message === 'string') return { code, message };
  }
  return null;
}
