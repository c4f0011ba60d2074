import { clearAccountFailures, recordSignInFailure, signInRefusal } from './services/auth/sign-in-guard';
import { AppError, json, toResponse, type AppErrorCode } from './errors';
import { readBodyCapped } from './http';

const AUTH_STATUS_CODES: Record<number, AppErrorCode> = {
  400: 'invalid_input',
  401: 'unauthenticated',
  403: 'forbidden',
  404: 'not_found',
  413: 'too_large',
  429: 'rate_limited',
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
  const code = AUTH_STATUS_CODES[res.status] ?? (res.status >= 500 ? 'internal' : 'invalid_input');
  const message =
    res.status === 429
      ? 'Too many requests to the sign-in service from this address in the last minute. Wait a minute, then try again.'
      : typeof body.message === 'string' && body.message
        ? body.message
        : `The sign-in service answered ${res.status}.`;
  return json({ error: { code, message, ...(typeof body.code === 'string' ? { auth_code: body.code } : {}) } }, res.status, headers);
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
    return toResponse(new AppError('invalid_input', 'The sign-in request is not valid JSON: send {"email": …, "password": …}.'));
  }
  const subject = { email, address };
  const refusal = await signInRefusal(subject);
  if (refusal) {
    return json({ error: { code: 'rate_limited', message: refusal.message, limit: refusal.kind } }, 429, { 'retry-after': String(refusal.retryAfterS) });
  }
  const res = await signIn(bodyText);
  if (res.status === 401) await recordSignInFailure(subject);
  else if (res.ok && email) await clearAccountFailures(email);
  return res;
}
