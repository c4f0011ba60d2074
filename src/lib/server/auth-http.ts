import { clearAccountFailures, recordSignInFailure, signInRefusal } from './services/auth/sign-in-guard';
import { AppError, toResponse, type ErrorCode } from './errors';
import { readBodyCapped } from './http';

/** The catalogue code of a refusal relayed from better-auth, by its status (the status is kept). */
const RELAYED_CODES: Record<number, ErrorCode & `auth_${string}`> = {
  400: 'auth_invalid_input',
  401: 'auth_unauthenticated',
  403: 'auth_forbidden',
  404: 'auth_not_found',
  413: 'auth_too_large',
};

/**
 * better-auth answers errors as `{ code, message }`; Sluice's API answers
 * `{ error: { code, message } }` everywhere. Its own code is kept as `auth_code`.
 */
export async function toAuthErrorResponse(res: Response): Promise<Response> {
  if (res.status < 400) return res;
  const text = await res.text();
  let body: { code?: unknown; message?: unknown } = {};
  try {
    body = text ? (JSON.parse(text) as typeof body) : {};
  } catch {
    body = { message: text };
  }
  const headers: Record<string, string> = {};
  for (const name of ['retry-after', 'x-retry-after', 'set-cookie']) {
    const v = res.headers.get(name);
    if (v) headers[name] = v;
  }
  if (res.status === 429 && !headers['retry-after'] && headers['x-retry-after']) headers['retry-after'] = headers['x-retry-after'];
  const details = typeof body.code === 'string' ? { auth_code: body.code } : {};
  const message = typeof body.message === 'string' ? body.message : undefined;
  const error =
    res.status === 429
      ? new AppError('sign_in_service_busy', undefined, details)
      : new AppError(RELAYED_CODES[res.status] ?? (res.status >= 500 ? 'auth_failed' : 'auth_invalid_input'), { message, status: res.status }, details);
  return toResponse(error, { status: res.status, headers });
}

/**
 * POST /api/auth/sign-in/email through the failure limits: refused with 429 while the account
 * or the address is at its limit; a 401 counts a failure; a success clears the account's count.
 */
export async function withSignInGuard(request: Request, address: string, signIn: (bodyText: string) => Promise<Response>): Promise<Response> {
  let bodyText: string;
  let email = '';
  try {
    bodyText = new TextDecoder().decode(await readBodyCapped(request, 64 * 1024, 'A sign-in request'));
    const parsed = JSON.parse(bodyText) as { email?: unknown };
    if (typeof parsed?.email === 'string') email = parsed.email;
  } catch (err) {
    if (err instanceof AppError) return toResponse(err);
    return toResponse(new AppError('sign_in_not_json'));
  }
  const subject = { email, address };
  const refusal = await signInRefusal(subject);
  if (refusal) {
    return toResponse(refusal.error, { headers: { 'retry-after': String(refusal.retryAfterS) } });
  }
  const res = await signIn(bodyText);
  if (res.status === 401) await recordSignInFailure(subject);
  else if (res.ok && email) await clearAccountFailures(email);
  return res;
}
