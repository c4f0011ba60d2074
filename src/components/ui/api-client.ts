import { AppError } from '~/core/errors';

/** The error body every Sluice API route returns. */
export interface ApiErrorBody {
  error: { code: string; message: string; [k: string]: unknown };
}

/** The API's refusal as the island sees it: the server's message, status and body. */
export class ApiError extends AppError<'api_refused'> {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody | null,
  ) {
    super('api_refused', { status, message: body?.error?.message });
    this.name = 'ApiError';
  }
}

/** fetch() for the app's own JSON API: throws ApiError with the server's message. */
export async function apiFetch<T>(url: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, ...rest } = init;
  const res = await fetch(url, {
    credentials: 'same-origin',
    ...rest,
    headers: { accept: 'application/json', ...(json !== undefined ? { 'content-type': 'application/json' } : {}), ...rest.headers },
    body: json !== undefined ? JSON.stringify(json) : rest.body,
  });
  const text = await res.text();
  const body = text ? JSON.parse(text) : null;
  if (!res.ok) throw new ApiError(res.status, body);
  return body as T;
}

