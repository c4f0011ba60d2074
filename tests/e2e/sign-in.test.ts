import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** What each demo person's navigation must show, and what it must not. */
const NAV = [
  { email: 'admin@demo.sluice.test', shows: ['People', 'Stations', 'Bin plans'], hides: ['Match sets', 'Upload sweeps'] },
  { email: 'inspector@demo.sluice.test', shows: ['Upload sweeps', 'Review queue'], hides: ['People', 'Match sets'] },
  { email: 'designer@demo.sluice.test', shows: ['Match sets', 'Stage estimates'], hides: ['People', 'Upload sweeps'] },
  { email: 'stores@demo.sluice.test', shows: ['Receive & move', 'Pick lists'], hides: ['People', 'Match sets'] },
];

describe('signing in through the real form', () => {
  it.each(NAV)('$email sees their own navigation', async ({ email, shows, hides }) => {
    const context = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const page = await context.newPage();
    await signInThroughForm(page, email);
    const nav = page.getByRole('navigation', { name: 'Main' });
    for (const label of shows) await nav.getByRole('link', { name: label, exact: true }).waitFor({ state: 'visible' });
    for (const label of hides) expect(await nav.getByRole('link', { name: label, exact: true }).count()).toBe(0);
    await screenshot(page, `nav-${email.split('@')[0]}`);
    await context.close();
  });

  it('a designer opening the admin page is refused with a clear page', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInThroughForm(page, 'designer@demo.sluice.test');
    const res = await page.goto(`${BASE_URL}/admin/users`);
    expect(res?.status()).toBe(403);
    await page.getByRole('heading', { name: 'This page is not for your role' }).waitFor();
    await screenshot(page, 'designer-refused-admin');
    await context.close();
  });

  it('a wrong password shows a message and stays on the form', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByLabel('E-mail').fill('designer@demo.sluice.test');
    await page.getByLabel('Password').fill('wrong-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').waitFor();
    expect(await page.getByRole('alert').textContent()).toContain('do not match');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await context.close();
  });
});
