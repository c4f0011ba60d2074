import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { closeDb } from '~/db/client';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL, signIn } from '../helpers/http';
import { COARSE_PLAN, createAcceptedParts, createTestType, uniqueName } from '../integration/stock-fixtures';

let browser: Browser;
let type: { id: number; name: string };
let serials: string[];

beforeAll(async () => {
  browser = await launchBrowser();
  const [admin, stores] = await Promise.all([signIn('admin@demo.sluice.test'), signIn('stores@demo.sluice.test')]);
  type = await createTestType('n');
  expect((await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: COARSE_PLAN } })).status).toBe(201);
  const loc = await (await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Browser drawer') } })).json();
  const bins = await (await stores.fetch(`/api/bins?device_type=${type.name}`)).json();
  for (const b of bins.bins) await stores.fetch(`/api/bins/${b.id}`, { method: 'PUT', json: { home_location_id: loc.id } });
  const parts = await createAcceptedParts(type.id, [
    { idssA: 5e-3, vpV: -2.5 },
    { idssA: 5.4e-3, vpV: -2.2 },
    { idssA: 8.5e-3, vpV: -1.2 },
    { idssA: 3.1e-3, vpV: -3.6 },
  ]);
  serials = parts.map((p) => p.serial);
  // One part is on the shelf already, so scanning it must say it cannot be received.
  await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: [serials[3]] } });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

async function scan(page: Page, text: string) {
  // A USB scanner is a keyboard: it types the characters and presses Enter.
  await page.keyboard.type(text, { delay: 5 });
  await page.keyboard.press('Enter');
}

describe('stores in the browser', () => {
  it('receive by scanning: each serial is checked as it arrives, the batch goes in one go, the box keeps focus', async () => {
    const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    const page = await context.newPage();
    await signInThroughForm(page, 'stores@demo.sluice.test', undefined, '/stores');
    await page.goto(`${BASE_URL}/stores`);
    const input = page.getByTestId('scan-input');
    await input.waitFor();
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'scan-input');
    for (const s of [serials[0], serials[1], serials[2], serials[3], 'NOT-A-SERIAL', serials[0]]) await scan(page, s);
    const batch = page.getByTestId('batch-receive');
    for (const s of serials.slice(0, 3)) await batch.locator(`tr[data-serial="${s}"][data-state="ready"]`).waitFor();
    await batch.locator(`tr[data-serial="${serials[3]}"][data-state="problem"]`).waitFor();
    await batch.locator('tr[data-serial="NOT-A-SERIAL"][data-state="problem"]').waitFor();
    expect(await page.getByText(`${serials[0]} already in this batch.`).count()).toBe(1);
    expect(await batch.locator(`tr[data-serial="${serials[3]}"]`).textContent()).toContain('in stock');
    await screenshot(page, 'stores-receive-scanned');
    await page.getByRole('button', { name: 'Receive 3 parts' }).click();
    for (const s of serials.slice(0, 3)) await batch.locator(`tr[data-serial="${s}"][data-state="done"]`).waitFor();
    await page.getByText('3 parts received in one batch.').waitFor();
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'scan-input');
    expect(await batch.locator(`tr[data-serial="${serials[0]}"]`).textContent()).toContain('bin I02-P02');
    await screenshot(page, 'stores-receive-done');
    await context.close();
  });

  it('the bin map draws the grid over the parts; clicking a bin lists its parts', async () => {
    const context = await browser.newContext({ viewport: { width: 1500, height: 950 } });
    const page = await context.newPage();
    await signInThroughForm(page, 'designer@demo.sluice.test', undefined, `/bins?device_type=${type.name}`);
    await page.goto(`${BASE_URL}/bins?device_type=${type.name}`);
    await page.getByTestId('bin-grid').waitFor();
    expect(await page.locator('[data-testid="bin-grid"] rect').count()).toBe(16);
    await page.locator('[data-bin-code="I02-P02"] rect').click();
    const list = page.getByRole('region', { name: 'Parts in bin I02-P02' });
    await list.getByText(serials[0]).waitFor();
    await list.getByText(serials[1]).waitFor();
    expect(await list.getByText(serials[2]).count()).toBe(0);
    await screenshot(page, 'bin-map-test-type');
    // The demo type, populated by the demo scenario.
    await page.goto(`${BASE_URL}/bins?device_type=WS-N30`);
    await page.getByTestId('bin-grid').waitFor();
    await page.waitForTimeout(300);
    await screenshot(page, 'bin-map-demo');
    await page.goto(`${BASE_URL}/stock?device_type=WS-N30&include_empty=0&sort=on_hand&dir=desc`);
    await page.getByTestId('bin-stock-table').waitFor();
    await screenshot(page, 'bin-stock-demo');
    await context.close();
  });

  it('admin previews a plan edit before saving; stores pages for labels and locations render', async () => {
    const context = await browser.newContext({ viewport: { width: 1500, height: 950 } });
    const page = await context.newPage();
    await signInThroughForm(page, 'admin@demo.sluice.test', undefined, '/admin/bin-plans');
    await page.goto(`${BASE_URL}/admin/bin-plans`);
    try {
      await page.locator(`#plan-type option[value="${type.name}"]`).waitFor({ state: 'attached', timeout: 60_000 });
    } catch (err) {
      await screenshot(page, 'bin-plans-not-ready');
      throw new Error(`the bin-plan editor did not offer ${type.name}; the page said: ${(await page.locator('main').textContent())?.slice(0, 400)}`, { cause: err });
    }
    await page.getByLabel('Device type').selectOption(type.name);
    await page.locator('#axis0-width').fill('1');
    await page.locator('#axis0-count').fill('8');
    await page.getByRole('button', { name: 'Preview the moves' }).click();
    await page.getByRole('region', { name: 'Preview' }).waitFor();
    // Derived: with 1 mA steps from 2 mA every part changes IDSS index (5.0 and 5.4 mA → I04,
    // 8.5 mA → I07, 3.1 mA → I02), so all four would move.
    expect(await page.getByTestId('moved-count').textContent()).toBe('4');
    await screenshot(page, 'bin-plan-preview');
    await context.close();

    const sc = await browser.newContext({ viewport: { width: 1300, height: 900 } });
    const sp = await sc.newPage();
    await signInThroughForm(sp, 'stores@demo.sluice.test', undefined, '/locations');
    await sp.goto(`${BASE_URL}/locations`);
    await sp.getByRole('table').waitFor();
    await screenshot(sp, 'locations');
    await sp.goto(`${BASE_URL}/labels`);
    await sp.getByText('Select all').waitFor();
    await screenshot(sp, 'labels-picker');
    await sp.goto(`${BASE_URL}/labels/print?kind=part&layout=a4-3x8&serials=${serials.join(',')}`);
    await sp.locator('[data-barcode]').first().waitFor();
    await screenshot(sp, 'labels-print-a4');
    await sp.goto(`${BASE_URL}/labels/print?kind=part&layout=roll-62x29&symbology=datamatrix&serials=${serials.join(',')}`);
    await screenshot(sp, 'labels-print-roll-dm');
    await sc.close();
  });
});
