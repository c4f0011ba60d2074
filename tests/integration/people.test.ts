import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import pg from 'pg';
import { anonymous, signIn, BASE_URL } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { MeJson } from '~/contracts/session';
import { UserList } from '~/contracts/users';
import { expectContract } from '../helpers/contract';

describe('invitations', () => {
  it('mail a link that lets the invited person choose a password and sign in', async () => {
    const admin = await signIn('admin@demo.sluice.test');
    const email = `invitee-${Date.now()}@demo.sluice.test`;
    const res = await admin.fetch('/api/admin/users', { method: 'POST', json: { email, name: 'Iris Invitee', roles: ['inspector', 'stores'] } });
    expect(res.status).toBe(201);

    const mail = await waitForMail(email, /invited/i);
    const link = /(http:\/\/\S+\/set-password\?token=\S+)/.exec(mail.text)?.[1];
    expect(link, mail.text).toBeTruthy();
    const token = new URL(link!).searchParams.get('token');
    const page = await anonymous(new URL(link!).pathname + new URL(link!).search);
    expect(page.status).toBe(200);

    const set = await anonymous('/api/auth/reset-password', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ token, newPassword: 'a-long-new-password' }),
    });
    expect(set.status).toBe(200);

    const invited = await signIn(email, 'a-long-new-password');
    const me = await (await invited.fetch('/api/me')).json();
    expectContract(MeJson, me);
    expect(me.roles.sort()).toEqual(['inspector', 'stores']);

    const list = await (await admin.fetch('/api/admin/users')).json();
    expectContract(UserList, list);
    const row = list.users.find((u: { email: string }) => u.email === email);
    expect(row.invitationPending).toBe(false);
  });

  it('refuse a second account for the same address, naming it', async () => {
    const admin = await signIn('admin@demo.sluice.test');
    const res = await admin.fetch('/api/admin/users', { method: 'POST', json: { email: 'designer@demo.sluice.test', name: 'Again', roles: ['designer'] } });
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toContain('designer@demo.sluice.test already has an account');
  });

  it('refuse an invitation with no roles, saying which field', async () => {
    const admin = await signIn('admin@demo.sluice.test');
    const res = await admin.fetch('/api/admin/users', { method: 'POST', json: { email: 'x@demo.sluice.test', name: 'X', roles: [] } });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toContain('roles');
  });
});

describe('disabling an account', () => {
  it('ends its sessions and refuses sign-in until enabled again', async () => {
    const admin = await signIn('admin@demo.sluice.test');
    const email = `leaver-${Date.now()}@demo.sluice.test`;
    const created = await (await admin.fetch('/api/admin/users', { method: 'POST', json: { email, name: 'Lee Leaver', roles: ['designer'] } })).json();
    const mail = await waitForMail(email, /invited/i);
    const token = new URL(/(http:\/\/\S+)/.exec(mail.text)![1]).searchParams.get('token');
    await anonymous('/api/auth/reset-password', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, newPassword: 'leaver-password-1' }) });
    const leaver = await signIn(email, 'leaver-password-1');
    expect((await leaver.fetch('/api/me')).status).toBe(200);

    expect((await admin.fetch(`/api/admin/users/${created.id}/disabled`, { method: 'PUT', json: { disabled: true } })).status).toBe(200);
    expect((await leaver.fetch('/api/me')).status).toBe(401);
    await expect(signIn(email, 'leaver-password-1')).rejects.toThrow(/403/);

    await admin.fetch(`/api/admin/users/${created.id}/disabled`, { method: 'PUT', json: { disabled: false } });
    await expect(signIn(email, 'leaver-password-1')).resolves.toBeTruthy();
  });
});

describe('the demo scenario', () => {
  it('loads again without duplicating anything', async () => {
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    const count = async () =>
      (await client.query(`select (select count(*) from "user") u, (select count(*) from device_type) d, (select count(*) from lot) l, (select count(*) from part) p, (select count(*) from sweep) s`)).rows[0];
    const before = await count();
    execFileSync('node_modules/.bin/tsx', ['scripts/seed-demo.ts'], { env: process.env, stdio: 'pipe' });
    expect(await count()).toEqual(before);
    await client.end();
  });
});

describe('sign-in', () => {
  it('sets an httpOnly, SameSite session cookie', async () => {
    const res = await fetch(`${BASE_URL}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: BASE_URL },
      body: JSON.stringify({ email: 'stores@demo.sluice.test', password: process.env.SLUICE_DEMO_PASSWORD }),
    });
    const cookie = res.headers.getSetCookie().find((c) => c.includes('session_token'))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });
  it('refuses a wrong password with 401', async () => {
    const res = await fetch(`${BASE_URL}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: BASE_URL },
      body: JSON.stringify({ email: 'stores@demo.sluice.test', password: 'not-the-password' }),
    });
    expect(res.status).toBe(401);
  });
  it('refuses a cross-site form post (Astro origin check on)', async () => {
    const res = await fetch(`${BASE_URL}/sign-out`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.example' },
      body: 'x=1',
    });
    expect(res.status).toBe(403);
  });
});
