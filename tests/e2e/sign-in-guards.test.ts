import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, screenshot } from '../helpers/browser';
import { BASE_URL, DEMO_PASSWORD } from '../helpers/http';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('the sign-in form under attack (issue 12, findings 2 and 4)', () => {
  it.each([
    { w: 1440, h: 900, tag: 'desk' },
    { w: 390, h: 844, tag: 'phone' },
  ])('says which limit was reached, and never follows next= off the site ($tag)', async ({ w, h, tag }) => {
    const context = await browser.newContext({ viewport: { width: w, height: h } });
    const page = await context.newPage();
    const email = `typo-${tag}-${randomUUID().slice(0, 8)}@demo.sluice.test`;
    await page.goto(`${BASE_URL}/sign-in?next=${encodeURIComponent('/%5Cevil.test/phish')}`);
    // Five failures lock this one account (SLUICE_SIGN_IN_FAILURES_PER_ACCOUNT default); the sixth try is refused.
    for (let i = 0; i < 6; i++) {
      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password').fill('wrong-password-x');
      await Promise.all([page.waitForResponse((r) => r.url().endsWith('/api/auth/sign-in/email')), page.getByRole('button', { name: 'Sign in' }).click()]);
      await page.getByRole('button', { name: 'Sign in' }).waitFor({ state: 'visible' });
    }
    await expect.poll(() => page.getByRole('alert').innerText()).toMatch(/Too many failed sign-ins for this account \(5 in 15 minutes\)\. Try again in \d+ minutes?/);
    await screenshot(page, `sign-in-locked-${tag}`);
    // The same address is not locked for a colleague; the off-site next= sends them home.
    await page.getByLabel('E-mail').fill('designer@demo.sluice.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await Promise.all([page.waitForURL((u) => !u.pathname.startsWith('/sign-in')), page.getByRole('button', { name: 'Sign in' }).click()]);
    expect(new URL(page.url()).origin).toBe(BASE_URL);
    expect(new URL(page.url()).pathname).toBe('/home');
    await context.close();
  });
});
