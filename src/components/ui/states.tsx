import type { ReactNode } from 'react';

export function Loading({ what }: { what: string }) {
  return (
    <p className="text-sm text-ink-faint animate-pulse" role="status">
      Loading {what}…
    </p>
  );
}

export function ErrorNotice({ error, retry }: { error: Error; retry?: () => void }) {
  return (
    <div className="notice-error" role="alert">
      <p>{error.message}</p>
      {retry && (
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
