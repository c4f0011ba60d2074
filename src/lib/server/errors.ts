import { AppError, type ErrorKind } from '~/core/errors';
import { describeIssue, fieldPathWords } from '~/core/field-path-words';

export { AppError, isAppError, type ErrorCode } from '~/core/errors';

/** The HTTP status of each kind of failure. */
export const STATUS_OF_KIND: Record<ErrorKind, number> = {
  invalid_input: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  method_not_allowed: 405,
  conflict: 409,
  invalid_transition: 409,
  too_large: 413,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

/**
 * Turns a zod error into an invalid_input AppError. The message names each field in words
 * ("axis 1, edges: width must be greater than 0"); `fields` keeps the paths for programs.
 */
export function fromZodError(error: { issues: { path: PropertyKey[]; message: string }[] }): AppError {
  const fields = error.issues.map((i) => ({ field: i.path.map(String).join('.') || '(body)', label: fieldPathWords(i.path) || 'the request', message: i.message }));
  const text = error.issues.map((i) => describeIssue(i.path, i.message)).join('; ');
  return new AppError('validation_failed', { text }, { fields });
}

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', ...headers },
  });
}

/**
 * The API's error body: `code` is the kind of failure (what clients switch on since the first
 * release), `reason` the permanent catalogue code, then the message and the error's details.
 */
export function errorBody(err: AppError): { error: Record<string, unknown> } {
  return { error: { code: err.kind, reason: err.code, message: err.message, ...(err.details ?? {}) } };
}

/**
 * Maps any thrown value to a JSON error response: an AppError by its kind, a zod error as
 * `validation_failed`, a value PostgreSQL refused as `value_refused_by_database`; anything
 * else is logged and answered as `unexpected`, without leaking it. `init.status` keeps the
 * status of an answer relayed from elsewhere (the framework, the sign-in library).
 */
export function toResponse(err: unknown, init: { status?: number; headers?: Record<string, string> } = {}): Response {
  if (err instanceof AppError) return json(errorBody(err), init.status ?? STATUS_OF_KIND[err.kind], init.headers);
  if (err && typeof err === 'object' && 'issues' in err && Array.isArray((err as { issues: unknown }).issues)) {
    return toResponse(fromZodError(err as { issues: { path: PropertyKey[]; message: string }[] }), init);
  }
  const data = postgresDataException(err);
  if (data) {
    // A value the request carried that no column can hold, missed by the request's own checks.
    console.warn('[api] request value refused by PostgreSQL:', data.message);
    return toResponse(new AppError('value_refused_by_database', { reason: data.message }), init);
  }
  console.error(err);
  return toResponse(new AppError('unexpected'), init);
}

/** PostgreSQL's data exceptions (SQLSTATE class 22: out of range, bad text, NUL bytes), wrapped or not. */
function postgresDataException(err: unknown): { code: string; message: string } | null {
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, message } = e as { code?: unknown; message?: unknown };
    if (typeof code === 'string' && /^22[0-9A-Z]{3}$/.test(code) && typeof message === 'string') return { code, message };
  }
  return null;
}
