import { useState, type FormEvent } from 'react';

export default function ForgotPasswordForm() {
  const [sent, setSent] = useState(false);
  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const email = new FormData(e.currentTarget).get('email');
    await fetch('/api/auth/request-password-reset', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, redirectTo: '/set-password' }),
    });
    setSent(true);
  }
  if (sent) return <p className="notice-info" role="status">If that address has an account, a link to choose a new password is on its way.</p>;
  return (
    <form onSubmit={submit} className="space-y-4">
      <div>
        <label className="field" htmlFor="email">E-mail</label>
        <input className="input" id="email" name="email" type="email" required />
      </div>
      <button className="btn-primary" type="submit">Send the link</button>
    </form>
  );
}
