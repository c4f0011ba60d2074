import type { ReactNode } from 'react';
import { ApiError } from './api-client';

export function Loading({ what }: { what: string }) {
  return (
    <p className="text-sm text-ink-faint animate-pulse" role="status">
      Loading {what}…
    </p>
  );
}

/** A refusal that asking again will not change (not found, not allowed, a bad request). */
function isFinal(error: Error): boolean {
  return error instanceof ApiError && error.status >= 400 && error.status < 500 && error.status !== 408 && error.status !== 429;
}

export function ErrorNotice({ error, retry }: { error: Error; retry?: () => void }) {
  return (
    <div className="notice-error" role="alert">
      <p>{error.message}</p>
      {retry && !isFinal(error) && (
        <button type="button" className="btn-quiet mt-2" onClick={retry}>
          Try again
        </button>
      )}
    </div>
  );
}

export function Empty({ children }: { children: ReactNode }) {
  return <p className="rounded border border-dashed border-paper-line px-4 py-6 text-center text-sm text-ink-faint">{children}</p>;
}
