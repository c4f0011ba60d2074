import { useEffect, useState, type FormEvent } from 'react';
import { safeNextPath } from '~/lib/safe-next-path';

/** Signs in through better-auth's e-mail endpoint, then goes to `next`. */
export default function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);
  // The button stays disabled until the island is live, so an early click cannot submit natively.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    setBusy(true);
    setError(undefined);
    try {
      const res = await fetch('/api/auth/sign-in/email', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: form.get('email'), password: form.get('password') }),
      });
      if (res.ok) {
        // Checked again here: the page is not the only way this prop can be set.
        window.location.assign(safeNextPath(next));
        return;
      }
      if (res.status === 429) {
        // The server says which limit was reached and for how long.
        const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
        setError(body?.error?.message ?? 'Too many failed sign-ins for this account or from this address. Wait a few minutes, then try again.');
      }
      else if (res.status === 401) setError('That e-mail and password do not match an active account.');
      else if (res.status === 403) setError('This account is disabled. Ask an admin.');
      else setError(`Sign-in failed (the server answered ${res.status}).`);
    } catch {
      setError('The server could not be reached.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} method="post" className="space-y-4" aria-label="Sign in">
      <div>
        <label className="field" htmlFor="email">E-mail</label>
        <input className="input" id="email" name="email" type="email" autoComplete="username" required />
      </div>
      <div>
        <label className="field" htmlFor="password">Password</label>
        <input className="input" id="password" name="password" type="password" autoComplete="current-password" required />
      </div>
      {error && <p className="notice-error" role="alert">{error}</p>}
      <button type="submit" className="btn-primary w-full justify-center" disabled={busy || !ready}>
        {busy ? 'Signing in…' : 'Sign in'}
      </button>
    </form>
  );
}
