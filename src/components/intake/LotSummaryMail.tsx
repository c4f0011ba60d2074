import { useState, type FormEvent } from 'react';
import type { LotSummaryMailed } from '~/contracts/uploads';
import { apiFetch } from '../ui/api-client';

/** Mails one lot's summary of an upload to the supplier contact; the address is kept on the lot. */
export default function LotSummaryMail({ uploadId, lot, supplierEmail }: { uploadId: string; lot: string; supplierEmail: string }) {
  const [to, setTo] = useState(supplierEmail);
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'sent' | 'error'; text?: string }>({ kind: 'idle' });
  async function send(e: FormEvent) {
    e.preventDefault();
    setState({ kind: 'busy' });
    try {
      const out = await apiFetch<LotSummaryMailed>(`/api/uploads/${uploadId}/summary-mail`, { method: 'POST', json: { lot, to: to.trim() } });
      setState({ kind: 'sent', text: `Sent to ${out.sent_to}: “${out.subject}”.` });
    } catch (err) {
      setState({ kind: 'error', text: (err as Error).message });
    }
  }
  return (
    <form className="flex flex-wrap items-end gap-3" onSubmit={send} aria-label={`Mail the summary of lot ${lot}`}>
      <div className="min-w-0 flex-1 sm:flex-none">
        <label className="field" htmlFor={`mail-${lot}`}>Supplier contact</label>
        <input id={`mail-${lot}`} type="email" required className="input sm:w-72" value={to} onChange={(e) => setTo(e.target.value)} placeholder="quality@supplier.example" />
      </div>
      <button type="submit" className="btn-primary" disabled={state.kind === 'busy' || !to.trim()}>Mail this summary</button>
      {state.kind === 'sent' && <p className="notice-info w-full" role="status">{state.text}</p>}
      {state.kind === 'error' && <p className="notice-error w-full" role="alert">{state.text}</p>}
    </form>
  );
}
