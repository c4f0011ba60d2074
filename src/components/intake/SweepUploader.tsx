import Uppy from '@uppy/core';
import Dashboard from '@uppy/react/dashboard';
import XHRUpload from '@uppy/xhr-upload';
import '@uppy/core/css/style.min.css';
import '@uppy/dashboard/css/style.min.css';
import { useEffect, useMemo, useRef, useState, type FormEvent } from 'react';
import { MAX_SWEEP_FILE_BYTES } from '~/core/sweep-file/limits';
import CurveThumbnail from '../charts/CurveThumbnail';
import type { UploadFileState, UploadReceived, UploadStatus } from '~/contracts/uploads';
import type { PartJson } from '../parts/part-types';
import { q } from '../parts/figures';
import { apiFetch } from '../ui/api-client';
import { useApi } from '../api';
import { Empty, ErrorNotice } from '../ui/states';
import { retryWords, uppyVerdict, unknownLotOf } from '~/core/intake/upload-verdict';

const TAGS = ['lot', 'device_type', 'temperature_c', 'station', 'operator', 'channel'] as const;
type Tags = Record<(typeof TAGS)[number], string>;

const STATE_WORDS: Record<UploadFileState, [string, string]> = {
  queued: ['queued for fitting', 'tag-plain'],
  fitted: ['fitted', 'tag-ok'],
  needs_review: ['needs review', 'tag-review'],
  rejected: ['rejected', 'tag-fault'],
};

function useUploadPolling(ids: string[]) {
  const [byId, setById] = useState<Record<string, UploadStatus>>({});
  const [error, setError] = useState<Error>();
  const doneRef = useRef(new Set<string>());
  useEffect(() => {
    let live = true;
    let timer: ReturnType<typeof setTimeout>;
    async function poll() {
      const open = ids.filter((id) => !doneRef.current.has(id));
      for (const id of open) {
        try {
          const s = await apiFetch<UploadStatus>(`/api/uploads/${id}`);
          if (!live) return;
          if (s.done) doneRef.current.add(id);
          setById((m) => ({ ...m, [id]: s }));
          setError(undefined);
        } catch (e) {
          if (live) setError(e as Error);
        }
      }
      if (live && ids.some((id) => !doneRef.current.has(id))) timer = setTimeout(poll, 1200);
    }
    void poll();
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [ids]);
  return { byId, error };
}

/** The first part of a fitted file: a curve thumbnail with IDSS, VP and bin. */
function PartThumb({ serial, more }: { serial: string; more: number }) {
  const { data } = useApi<PartJson>(`/api/parts/${encodeURIComponent(serial)}`);
  const curves = data?.current_sweep?.curves ?? [];
  return (
    <div className="flex items-center gap-3" data-testid={`thumb-${serial}`}>
      {curves.length > 0 ? <CurveThumbnail curves={curves} label={`Measured curves of ${serial}`} /> : <div className="h-16 w-[120px] rounded border border-dashed border-paper-line" aria-hidden="true" />}
      <div className="text-xs leading-5">
        <a className="font-mono text-sm" href={`/parts/${encodeURIComponent(serial)}`}>{serial}</a>
        {data && (
          <>
            <div>IDSS {q(data.idss_a, 'A', 3)} · VP {q(data.vp_v, 'V', 3)}</div>
            <div>bin {data.bin_code ?? <span className="text-ink-faint">none yet</span>}</div>
          </>
        )}
        {more > 0 && <div className="text-ink-faint">+{more} more part{more === 1 ? '' : 's'} in this file</div>}
      </div>
    </div>
  );
}

/** Creates a lot the server did not know, from the upload page, then sends the refused files again. */
function CreateUnknownLot({ code, deviceTypes, defaultType, files, onResent }: { code: string; deviceTypes: { name: string }[]; defaultType: string; files: number; onResent: () => Promise<void> }) {
  const [type, setType] = useState(defaultType || deviceTypes[0]?.name || '');
  const [supplier, setSupplier] = useState('');
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'done' | 'error'; text?: string }>({ kind: 'idle' });
  async function create(e: FormEvent) {
    e.preventDefault();
    setState({ kind: 'busy' });
    try {
      await apiFetch('/api/lots', { method: 'POST', json: { code, device_type: type, supplier } });
      await onResent();
      setState({ kind: 'done', text: `Lot ${code} created; the ${files} refused file${files === 1 ? ' was' : 's were'} sent again (see below).` });
    } catch (err) {
      setState({ kind: 'error', text: (err as Error).message });
    }
  }
  if (state.kind === 'done') return <p className="notice-info" role="status">{state.text}</p>;
  return (
    <form className="notice-caution space-y-2" onSubmit={create} aria-label={`Create lot ${code}`}>
      <p>
        <strong>Lot {code} is not known</strong>, so {files} file{files === 1 ? ' was' : 's were'} refused. Create it here and the files go again.
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label className="field" htmlFor={`lot-type-${code}`}>Device type</label>
          <select id={`lot-type-${code}`} className="input w-44" value={type} onChange={(e) => setType(e.target.value)}>
            {deviceTypes.map((t) => <option key={t.name} value={t.name}>{t.name}</option>)}
          </select>
        </div>
        <div>
          <label className="field" htmlFor={`lot-supplier-${code}`}>Supplier (optional)</label>
          <input id={`lot-supplier-${code}`} className="input w-56" value={supplier} onChange={(e) => setSupplier(e.target.value)} />
        </div>
        <button type="submit" className="btn-primary" disabled={state.kind === 'busy' || !type}>Create lot {code} and send again</button>
      </div>
      {state.kind === 'error' && <p className="text-state-fault" role="alert">{state.text}</p>}
    </form>
  );
}

/**
 * Uppy's dashboard for sweep files (drag and drop, many at once). All files of one press of
 * Upload go in one request to POST /api/sweeps with the tags; each file's state is then
 * polled from GET /api/uploads/{id} and shown in the file's own Uppy row (fitting… / fitted /
 * needs review / rejected with the reason) and in the list below with a curve thumbnail.
 */
export default function SweepUploader({ deviceTypes, lots, canCreateLots = false }: { deviceTypes: { name: string; channel: 'n' | 'p' }[]; lots: string[]; canCreateLots?: boolean }) {
  const [tags, setTags] = useState<Tags>({ lot: '', device_type: '', temperature_c: '', station: '', operator: '', channel: '' });
  const [uploadIds, setUploadIds] = useState<string[]>([]);
  const [requestError, setRequestError] = useState<string>();
  const [pending, setPending] = useState(0);
  // Which Uppy file is which server file: upload id → [uppy file id, file name] in sending order.
  const sent = useRef(new Map<string, { uppyId: string; name: string; data: Blob }[]>());
  const uppy = useMemo(() => {
    const u = new Uppy({
      id: 'sweeps',
      autoProceed: false,
      restrictions: { maxFileSize: MAX_SWEEP_FILE_BYTES, allowedFileTypes: ['.csv', '.tsv', '.txt', 'text/csv', 'text/plain', 'text/tab-separated-values'] },
    });
    u.use(XHRUpload, {
      endpoint: '/api/sweeps',
      fieldName: 'file',
      formData: true,
      bundle: true,
      withCredentials: true,
      allowedMetaFields: [...TAGS],
      headers: { accept: 'application/json' },
      limit: 1,
    });
    return u;
  }, []);

  useEffect(() => {
    const refresh = () => setPending(uppy.getFiles().filter((f) => !f.progress.uploadStarted).length);
    const onSuccess = (file: { id: string; name?: string; data: Blob } | undefined, response: { body?: unknown }) => {
      const body = response.body as { upload_id?: string } | undefined;
      if (!body?.upload_id || !file) return;
      const id = body.upload_id;
      const list = sent.current.get(id) ?? [];
      list.push({ uppyId: file.id, name: file.name ?? '', data: file.data });
      sent.current.set(id, list);
      // The bytes are on the server; the file is not done until the server has fitted it.
      uppy.emit('postprocess-progress', uppy.getFile(file.id), { mode: 'indeterminate', message: 'Fitting on the server…' });
      setUploadIds((ids) => (ids.includes(id) ? ids : [id, ...ids]));
    };
    const onError = (_file: unknown, error: { message?: string }, response?: { body?: unknown }) => {
      const body = response?.body as { error?: { message?: string } } | undefined;
      setRequestError(body?.error?.message ?? error?.message ?? 'The upload failed.');
    };
    uppy.on('upload-success', onSuccess as never);
    uppy.on('upload-error', onError);
    uppy.on('files-added', refresh);
    uppy.on('file-removed', refresh);
    uppy.on('upload', refresh);
    uppy.on('complete', refresh);
    return () => {
      uppy.off('upload-success', onSuccess as never);
      uppy.off('upload-error', onError);
      uppy.off('files-added', refresh);
      uppy.off('file-removed', refresh);
      uppy.off('upload', refresh);
      uppy.off('complete', refresh);
      uppy.destroy();
    };
  }, [uppy]);

  useEffect(() => {
    const meta: Record<string, string> = {};
    for (const k of TAGS) meta[k] = tags[k];
    uppy.setMeta(meta);
  }, [tags, uppy]);

  const { byId, error } = useUploadPolling(uploadIds);

  // Put each server verdict on the file's own Uppy row: a tick only for a fitted file.
  useEffect(() => {
    for (const [id, status] of Object.entries(byId)) {
      const mine = sent.current.get(id) ?? [];
      const used = new Set<number>();
      for (const local of mine) {
        const f = uppy.getFile(local.uppyId);
        if (!f) continue;
        const idx = status.files.findIndex((sf, i) => !used.has(i) && sf.name === local.name);
        if (idx < 0) continue;
        used.add(idx);
        const v = uppyVerdict(status.files[idx]!);
        if (v.kind === 'working') continue;
        if (v.kind === 'done') {
          if (f.progress.postprocess || f.error) {
            uppy.setFileState(f.id, { error: null });
            uppy.emit('postprocess-complete', f);
          }
        } else if (v.kind === 'held') {
          if (f.progress.postprocess?.message !== v.message) uppy.emit('postprocess-progress', f, { mode: 'determinate', value: 1, message: v.message });
        } else if (f.error !== v.message) {
          uppy.emit('postprocess-complete', f);
          uppy.setFileState(f.id, { error: v.message });
        }
      }
    }
  }, [byId, uppy]);

  async function resend(uploadId: string, names: string[]) {
    const local = (sent.current.get(uploadId) ?? []).filter((l) => names.includes(l.name));
    const form = new FormData();
    for (const k of TAGS) if (tags[k]) form.append(k, tags[k]);
    for (const l of local) form.append('file', l.data, l.name);
    const out = await apiFetch<UploadReceived>('/api/sweeps', { method: 'POST', body: form });
    sent.current.set(out.upload_id, local.map((l) => ({ ...l })));
    setUploadIds((ids) => [out.upload_id, ...ids]);
  }

  const set = (k: keyof Tags) => (e: { target: { value: string } }) => setTags((t) => ({ ...t, [k]: e.target.value }));

  return (
    <div className="space-y-5">
      <section className="card" aria-labelledby="tags-heading">
        <h2 id="tags-heading" className="mb-1 text-lg">Tags for files that do not say</h2>
        <p className="mb-3 text-sm text-ink-soft">A file's own <code className="text-xs"># device type:</code>, <code className="text-xs"># lot:</code>, <code className="text-xs"># temperature_c:</code>, … lines win over these.</p>
        <div className="grid gap-3 sm:grid-cols-2 md:grid-cols-3 lg:grid-cols-6">
          <div>
            <label className="field" htmlFor="tag-device-type">Device type</label>
            <select className="input" id="tag-device-type" value={tags.device_type} onChange={set('device_type')}>
              <option value="">from the file</option>
              {deviceTypes.map((t) => <option key={t.name} value={t.name}>{t.name} ({t.channel.toUpperCase()})</option>)}
            </select>
          </div>
          <div>
            <label className="field" htmlFor="tag-lot">Lot</label>
            <input className="input" id="tag-lot" list="known-lots" value={tags.lot} onChange={set('lot')} placeholder="from the file" />
            <datalist id="known-lots">{lots.map((l) => <option key={l} value={l} />)}</datalist>
          </div>
          <div>
            <label className="field" htmlFor="tag-temperature">Temperature (°C)</label>
            <input className="input" id="tag-temperature" inputMode="decimal" value={tags.temperature_c} onChange={set('temperature_c')} placeholder="e.g. 25" />
          </div>
          <div>
            <label className="field" htmlFor="tag-station">Station</label>
            <input className="input" id="tag-station" value={tags.station} onChange={set('station')} placeholder="e.g. bench 2" />
          </div>
          <div>
            <label className="field" htmlFor="tag-operator">Operator</label>
            <input className="input" id="tag-operator" value={tags.operator} onChange={set('operator')} />
          </div>
          <div>
            <label className="field" htmlFor="tag-channel">Values given as</label>
            <select className="input" id="tag-channel" value={tags.channel} onChange={set('channel')}>
              <option value="">signs in the file</option>
              <option value="n">N-channel</option>
              <option value="p">P-channel (magnitudes allowed)</option>
            </select>
          </div>
        </div>
      </section>

      <section aria-label="Sweep files" className="space-y-3">
        <Dashboard
          uppy={uppy}
          width="100%"
          height={340}
          proudlyDisplayPoweredByUppy={false}
          note={`CSV or TSV sweep files, up to ${MAX_SWEEP_FILE_BYTES / (1024 * 1024)} MiB each; long or wide format`}
          disableStatusBar
          hideRetryButton
          locale={{
            strings: {
              // Uppy's "Upload complete" only means the bytes arrived; the verdict is each file's own.
              // Short enough for Uppy's one-line title on a phone (it cuts longer ones off).
              uploadComplete: 'Sent: see each file',
              processingXFiles: { 0: 'Fitting %{smart_count} file on the server', 1: 'Fitting %{smart_count} files on the server' },
              error: 'Some files were refused: see each file',
            },
          }}
        />
        <div className="flex flex-wrap items-center gap-3">
          <button type="button" className="btn-primary" disabled={pending === 0} onClick={() => (setRequestError(undefined), void uppy.upload())}>
            Upload {pending || ''} file{pending === 1 ? '' : 's'}
          </button>
          <span className="text-sm text-ink-soft">Each file's row shows what the server made of it: fitting…, fitted (✓), needs review, or rejected with the reason.</span>
        </div>
      </section>
      {requestError && <p className="notice-error" role="alert">{requestError}</p>}

      <section aria-labelledby="states-heading" className="space-y-3">
        <h2 id="states-heading" className="text-lg">What happened to each file</h2>
        {error && <ErrorNotice error={error} />}
        {uploadIds.length === 0 && <Empty>Files you upload appear here with their state: queued, fitted, needs review or rejected (with the reason).</Empty>}
        {uploadIds.map((id) => {
          const s = byId[id];
          const unknownLots = new Map<string, string[]>();
          for (const f of s?.files ?? []) {
            const code = unknownLotOf(f);
            if (code) unknownLots.set(code, [...(unknownLots.get(code) ?? []), f.name]);
          }
          return (
            <div key={id} className="card space-y-3" data-testid="upload-status">
              <div className="flex flex-wrap items-baseline gap-3 text-sm">
                <span className="font-semibold">Upload {id.slice(0, 8)}</span>
                {s ? (
                  <span className="text-ink-soft">
                    {s.counts.fitted} fitted · {s.counts.needs_review} need review · {s.counts.rejected} rejected · {s.counts.queued} queued
                    {s.done ? '' : ' — fitting…'}
                    {s.files.some((f) => f.retry) ? ` (${s.files.filter((f) => f.retry).length} being retried after a failure)` : ''}
                  </span>
                ) : (
                  <span className="text-ink-faint">waiting for the server…</span>
                )}
                {s?.done && <a className="text-sm" href={`/upload/${id}/summary`}>Summary per lot (can be mailed to the supplier)</a>}
              </div>
              {canCreateLots &&
                [...unknownLots].map(([code, names]) => (
                  <CreateUnknownLot key={code} code={code} files={names.length} deviceTypes={deviceTypes} defaultType={tags.device_type} onResent={() => resend(id, names)} />
                ))}
              {s && (
                <ul className="divide-y divide-paper-line">
                  {s.files.map((f) => (
                    <li key={f.id} className="grid gap-2 py-2 sm:grid-cols-[minmax(0,16rem)_8rem_minmax(0,1fr)] sm:items-start" data-testid={`file-${f.name}`} data-state={f.state}>
                      <span className="break-all font-mono text-xs">{f.name}</span>
                      <span>
                        <span className={STATE_WORDS[f.state][1]}>{STATE_WORDS[f.state][0]}</span>
                        {f.duplicate_of && <span className="block text-xs text-ink-faint">same bytes as {f.duplicate_of.name}; no second sweep</span>}
                        {f.retry && <span className="block text-xs text-ink-faint" data-testid="file-retry">{retryWords(f.retry)}</span>}
                      </span>
                      <div className="min-w-0 text-sm">
                        {f.reason && <p className={f.state === 'rejected' ? 'text-state-fault' : 'text-state-review'}>{f.reason}</p>}
                        {(f.state === 'fitted' || f.state === 'needs_review') && f.serials[0] && <PartThumb serial={f.serials[0]} more={f.serials.length - 1} />}
                      </div>
                    </li>
                  ))}
                </ul>
              )}
            </div>
          );
        })}
      </section>
    </div>
  );
}
