import { useState, type FormEvent } from 'react';
import { ROLES, type Role } from '~/lib/access';
import { apiFetch } from '../ui/api-client';
import type { UserJson } from '~/contracts/users';
import { useUsers } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';

function RolePicker({ value, onChange, idPrefix }: { value: Role[]; onChange: (r: Role[]) => void; idPrefix: string }) {
  return (
    <div className="flex flex-wrap gap-3">
      {ROLES.map((r) => (
        <label key={r} className="flex items-center gap-1 text-sm" htmlFor={`${idPrefix}-${r}`}>
          <input
            id={`${idPrefix}-${r}`}
            type="checkbox"
            checked={value.includes(r)}
            onChange={(e) => onChange(e.target.checked ? [...value, r] : value.filter((x) => x !== r))}
          />
          {r}
        </label>
      ))}
    </div>
  );
}

export default function PeopleAdmin({ selfId }: { selfId: string }) {
  const { data, error, loading, reload } = useUsers();
  const [inviteRoles, setInviteRoles] = useState<Role[]>(['designer']);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string }>();

  async function act(fn: () => Promise<unknown>, ok: string) {
    try {
      await fn();
      setMessage({ kind: 'ok', text: ok });
      reload();
    } catch (e) {
      setMessage({ kind: 'error', text: (e as Error).message });
    }
  }

  function invite(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    const email = String(f.get('email'));
    void act(
      () => apiFetch('/api/admin/users', { method: 'POST', json: { email, name: f.get('name'), roles: inviteRoles } }).then(() => form.reset()),
      `Invitation sent to ${email}.`,
    );
  }

  return (
    <div className="space-y-6">
      <form onSubmit={invite} className="card grid gap-4 md:grid-cols-[1fr_1fr_auto] items-end" aria-label="Invite a person">
        <div>
          <label className="field" htmlFor="invite-name">Name</label>
          <input className="input" id="invite-name" name="name" required />
        </div>
        <div>
          <label className="field" htmlFor="invite-email">E-mail</label>
          <input className="input" id="invite-email" name="email" type="email" required />
        </div>
        {/* On a phone the roles come before the button that sends them. */}
        <button className="btn-primary order-last md:order-none" type="submit">Send invitation</button>
        <div className="md:col-span-3">
          <span className="field">Roles</span>
          <RolePicker value={inviteRoles} onChange={setInviteRoles} idPrefix="invite-role" />
        </div>
      </form>
      {message && <p className={message.kind === 'ok' ? 'notice-info' : 'notice-error'} role="status">{message.text}</p>}
      {loading && !data && <Loading what="people" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && data.users.length === 0 && <Empty>No accounts yet.</Empty>}
      {data && data.users.length > 0 && (
        <table className="table-plain bg-paper-raised">
          <thead>
            <tr><th>Person</th><th>Roles</th><th>State</th><th></th></tr>
          </thead>
          <tbody>
            {data.users.map((u) => (
              <tr key={u.id} data-testid={`user-${u.email}`}>
                <td><div className="font-semibold">{u.name}</div><div className="text-ink-faint">{u.email}</div></td>
                <td>
                  <RolePicker
                    value={u.roles}
                    idPrefix={`roles-${u.id}`}
                    onChange={(roles) => void act(() => apiFetch(`/api/admin/users/${u.id}/roles`, { method: 'PUT', json: { roles } }), `Roles of ${u.email} saved.`)}
                  />
                </td>
                <td>
                  {u.disabled ? <span className="tag-fault">disabled</span> : u.invitationPending ? <span className="tag-review">invited</span> : <span className="tag-ok">active</span>}
                </td>
                <td className="text-right">
                  {u.id !== selfId && (
                    <button
                      type="button"
                      className="btn-quiet"
                      onClick={() => void act(() => apiFetch(`/api/admin/users/${u.id}/disabled`, { method: 'PUT', json: { disabled: !u.disabled } }), `${u.email} ${u.disabled ? 'enabled' : 'disabled'}.`)}
                    >
                      {u.disabled ? 'Enable' : 'Disable'}
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
