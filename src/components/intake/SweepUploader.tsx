import Uppy from '@uppy/core';
import Dashboard from '@uppy/react/dashboard';
import XHRUpload from '@uppy/xhr-upload';
import '@uppy/core/css/style.min.css';
import '@uppy/dashboard/css/style.min.css';
import { useEffect, useMemo, useRef, useState } from 'react';
import { MAX_SWEEP_FILE_BYTES } from '../../core/sweep-file/limits';
import { apiFetch } from '../ui/api-client';
import { Empty, ErrorNotice } from '../ui/states';

interface FileStatus {
  id: number;
  name: string;
  state: 'queued' | 'fitted' | 'needs_review' | 'rejected';
  reason: string | null;
  serials: string[];
  duplicate_of: { file_id: number; upload_id: string; name: string } | null;
}
interface UploadStatus {
  upload_id: string;
  created_at: string;
  done: boolean;
  counts: Record<FileStatus['state'], number>;
  files: FileStatus[];
}

const TAGS = ['lot', 'device_type', 'temperature_c', 'station', 'operator', 'channel'] as const;
type Tags = Record<(typeof TAGS)[number], string>;

const STATE_WORDS: Record<FileStatus['state'], [string, string]> = {
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

/**
 * Uppy's dashboard for sweep files (drag and drop, many at once). All files of one press of
 * Upload go in one request to POST /api/sweeps with the tags; each file's state is then
 * polled from GET /api/uploads/{id} until the workers have fitted or rejected it.
 */
export default function SweepUploader({ deviceTypes, lots }: { deviceTypes: { name: string; channel: 'n' | 'p' }[]; lots: string[] }) {
  const [tags, setTags] = useState<Tags>({ lot: '', device_type: '', temperature_c: '', station: '', operator: '', channel: '' });
  const [uploadIds, setUploadIds] = useState<string[]>([]);
  const [requestError, setRequestError] = useState<string>();
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
    const onSuccess = (_file: unknown, response: { body?: unknown }) => {
      const body = response.body as { upload_id?: string } | undefined;
      if (body?.upload_id) setUploadIds((ids) => (ids.includes(body.upload_id!) ? ids : [body.upload_id!, ...ids]));
    };
    const onError = (_file: unknown, error: { message?: string }, response?: { body?: unknown }) => {
      const body = response?.body as { error?: { message?: string } } | undefined;
      setRequestError(body?.error?.message ?? error?.message ?? 'The upload failed.');
    };
    uppy.on('upload-success', onSuccess);
    uppy.on('upload-error', onError);
    return () => {
      uppy.off('upload-success', onSuccess);
      uppy.off('upload-error', onError);
      uppy.destroy();
    };
  }, [uppy]);

  useEffect(() => {
    const meta: Record<string, string> = {};
    for (const k of TAGS) meta[k] = tags[k];
    uppy.setMeta(meta);
  }, [tags, uppy]);

  const { byId, error } = useUploadPolling(uploadIds);
  const set = (k: keyof Tags) => (e: { target: { value: string } }) => setTags((t) => ({ ...t, [k]: e.target.value }));

  return (
    <div className="space-y-5">
      <section className="card" aria-labelledby="tags-heading">
        <h2 id="tags-heading" className="mb-1 text-lg">Tags for files that do not say</h2>
        <p className="mb-3 text-sm text-ink-soft">A file's own <code className="text-xs"># device type:</code>, <code className="text-xs"># lot:</code>, <code className="text-xs"># temperature_c:</code>, … lines win over these.</p>
        <div className="grid gap-3 md:grid-cols-3 lg:grid-cols-6">
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

      <section aria-label="Sweep files">
        <Dashboard
          uppy={uppy}
          width="100%"
          height={340}
          proudlyDisplayPoweredByUppy={false}
          note={`CSV or TSV sweep files, up to ${MAX_SWEEP_FILE_BYTES / (1024 * 1024)} MiB each; long or wide format`}
          hideProgressDetails={false}
        />
      </section>
      {requestError && <p className="notice-error" role="alert">{requestError}</p>}

      <section aria-labelledby="states-heading" className="space-y-3">
        <h2 id="states-heading" className="text-lg">What happened to each file</h2>
        {error && <ErrorNotice error={error} />}
        {uploadIds.length === 0 && <Empty>Files you upload appear here with their state: queued, fitted, needs review or rejected (with the reason).</Empty>}
        {uploadIds.map((id) => {
          const s = byId[id];
          return (
            <div key={id} className="card" data-testid="upload-status">
              <div className="mb-2 flex flex-wrap items-baseline gap-3 text-sm">
                <span className="font-semibold">Upload {id.slice(0, 8)}</span>
                {s ? (
                  <span className="text-ink-soft">
                    {s.counts.fitted} fitted · {s.counts.needs_review} need review · {s.counts.rejected} rejected · {s.counts.queued} queued
                    {s.done ? '' : ' — fitting…'}
                  </span>
                ) : (
                  <span className="text-ink-faint">waiting for the server…</span>
                )}
              </div>
              {s && (
                <table className="table-plain">
                  <thead>
                    <tr>
                      <th>File</th>
                      <th>State</th>
                      <th>Parts</th>
                      <th>Reason</th>
                    </tr>
                  </thead>
                  <tbody>
                    {s.files.map((f) => (
                      <tr key={f.id} data-testid={`file-${f.name}`} data-state={f.state}>
                        <td className="font-mono text-xs">{f.name}</td>
                        <td>
                          <span className={STATE_WORDS[f.state][1]}>{STATE_WORDS[f.state][0]}</span>
                          {f.duplicate_of && <div className="text-xs text-ink-faint">same bytes as {f.duplicate_of.name}; no second sweep</div>}
                        </td>
                        <td className="text-xs">
                          {f.serials.map((serial) => (
                            <a key={serial} className="mr-2 font-mono" href={`/parts/${encodeURIComponent(serial)}`}>{serial}</a>
                          ))}
                        </td>
                        <td className="max-w-xl text-xs text-state-fault">{f.reason}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
            </div>
          );
        })}
      </section>
    </div>
  );
}
