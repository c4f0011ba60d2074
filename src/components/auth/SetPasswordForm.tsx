import { useState, type FormEvent } from 'react';

/** Sets a password from an invitation or reset link's token, then signs the person in. */
export default function SetPasswordForm({ token, email }: { token: string; email: string }) {
  const [error, setError] = useState<string>();
  const [done, setDone] = useState(false);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const password = String(form.get('password') ?? '');
    if (password !== String(form.get('confirm') ?? '')) {
      setError('The two passwords differ.');
      return;
    }
    if (password.length < 10) {
      setError('Choose at least 10 characters.');
      return;
    }
    setBusy(true);
    setError(undefined);
    const res = await fetch('/api/auth/reset-password', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ newPassword: password, token }),
    });
    if (!res.ok) {
      setBusy(false);
      setError('This link is no longer valid (it may have been used or expired). Ask an admin for a new invitation.');
      return;
    }
    // The password is set: sign in with it, so the person lands on their start page.
    const signIn = await fetch('/api/auth/sign-in/email', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, password }),
    });
    setBusy(false);
    if (signIn.ok) window.location.assign('/home');
    else setDone(true);
  }

  if (done) {
    return (
      <div className="notice-info" role="status">
        Your password is set, but signing you in did not work just now. <a href="/sign-in">Sign in</a> with it.
      </div>
    );
  }
  return (
    <form onSubmit={submit} className="space-y-4" aria-label="Set password">
      <div>
        <label className="field" htmlFor="password">New password (10 characters or more)</label>
        <input className="input" id="password" name="password" type="password" autoComplete="new-password" required />
      </div>
      <div>
        <label className="field" htmlFor="confirm">Repeat it</label>
        <input className="input" id="confirm" name="confirm" type="password" autoComplete="new-password" required />
      </div>
      {error && <p className="notice-error" role="alert">{error}</p>}
      <button type="submit" className="btn-primary w-full justify-center" disabled={busy}>Set password</button>
    </form>
  );
}
