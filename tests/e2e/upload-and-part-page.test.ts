import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';
import { simulateSweepCsv } from '~/core/intake/simulated-sweep';
import { seededRandom } from '~/core/random/seeded-random';

let browser: Browser;
let page: Page;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const serialA = `E-${RUN}-01`;
const serialB = `E-${RUN}-02`;

beforeAll(async () => {
  browser = await launchBrowser();
  const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  page = await context.newPage();
  await signInThroughForm(page, 'inspector@demo.sluice.test', undefined, '/upload');
});
afterAll(async () => {
  await browser?.close();
});

function sweep(serial: string, seed: number, withType: boolean) {
  const text = simulateSweepCsv({
    serial,
    channel: 'n',
    params: { vtoV: -1.9, betaAPerV2: 2.1e-3, lambdaPerV: 0.014, rsOhm: 12, rdOhm: 9 },
    ...(withType ? { deviceType: 'WS-N30' } : {}),
    temperatureC: 25,
    rand: seededRandom(seed),
  });
  return { name: `${serial}.csv`, mimeType: 'text/csv', buffer: Buffer.from(text) };
}

describe('upload through the Uppy dashboard', () => {
  it('shows the safety cautions, takes several files at once and shows each file state live', async () => {
    await page.getByRole('heading', { name: 'Upload sweeps' }).waitFor();
    const cautions = page.getByRole('complementary', { name: 'Before you measure' });
    expect(await cautions.textContent()).toMatch(/static[\s\S]*limits[\s\S]*pulsed[\s\S]*site's own procedures/);
    await page.locator('.uppy-Dashboard').waitFor();
    // The second file names no device type: the tag chosen here fills it in.
    await page.getByLabel('Device type').selectOption('WS-N30');
    await page.getByLabel('Operator').fill('e2e');
    const bad = { name: `E-${RUN}-bad.csv`, mimeType: 'text/csv', buffer: Buffer.from('vgs (V),vds (V),id (mA)\n-1,0,0\n-1,1,abc\n') };
    await page.locator('.uppy-Dashboard-input').first().setInputFiles([sweep(serialA, 1, true), sweep(serialB, 2, false), bad]);
    await page.getByRole('button', { name: 'Upload 3 files' }).click();
    await page.locator(`[data-testid="file-${serialA}.csv"][data-state="fitted"]`).waitFor({ timeout: 30_000 });
    await page.locator(`[data-testid="file-${serialB}.csv"][data-state="fitted"]`).waitFor({ timeout: 30_000 });
    const badRow = page.locator(`[data-testid="file-E-${RUN}-bad.csv"][data-state="rejected"]`);
    await badRow.waitFor({ timeout: 30_000 });
    expect(await badRow.textContent()).toContain('line 3, column 3 (id (mA))');
    // Issue 13, item 2: Uppy's own rows tell the truth — a tick for the two fitted files only,
    // an error carrying the server's reason for the refused one.
    await page.locator('.uppy-Dashboard-Item.is-error').waitFor({ timeout: 30_000 });
    await page.waitForFunction(() => document.querySelectorAll('.uppy-Dashboard-Item.is-complete').length === 2, undefined, { timeout: 30_000 });
    expect(await page.locator('.uppy-Dashboard-Item.is-error').count()).toBe(1);
    expect(await page.locator('.uppy-Dashboard-Item.is-error .uppy-Dashboard-Item-errorDetails').getAttribute('aria-label')).toMatch(/^Rejected: .*line 3, column 3/);
    expect(await page.locator('.uppy-Dashboard-Item.is-error.is-complete').count()).toBe(0);
    expect(await page.getByText('Complete', { exact: true }).count()).toBe(0);
    // A fitted file shows its curves in small, with IDSS, VP and bin.
    const thumb = page.getByTestId(`thumb-${serialA}`);
    await thumb.locator('svg polyline').first().waitFor();
    expect(await thumb.textContent()).toMatch(/IDSS .*A · VP [−-]?\d.*V[\s\S]*bin /);
    await screenshot(page, 'upload-states');
  });

  it('opens the part page: curves with the model, residuals, parameters, model card, history', async () => {
    await page.getByRole('link', { name: serialA }).click();
    await page.waitForURL(`**/parts/${serialA}`);
    await page.getByTestId('part-serial').waitFor();
    await page.locator('figure[aria-label="Measured curve family with the fitted model"] svg circle').first().waitFor();
    await page.locator('figure[aria-label="Residuals of the fit"] svg').first().waitFor();
    expect(await page.getByTestId('part-status').textContent()).toBe('accepted');
    const card = await page.getByTestId('model-card').textContent();
    expect(card).toMatch(/^\.model J_E_\w+ NJF\(VTO=-1\.\d+ BETA=/);
    const table = await page.getByRole('table', { name: 'Fitted parameters' }).textContent();
    expect(table).toMatch(/IDSS at VDS = 10(\.0)? V/);
    expect(table).toContain('±');
    await page.getByRole('heading', { name: 'Sweeps and retests' }).waitFor();
    await page.getByRole('heading', { name: 'Audit trail' }).waitFor();
    await screenshot(page, 'part-page');
  });

  it('the review page of a demo part flagged for breakdown shows the flag and the actions', async () => {
    await page.goto(`${BASE_URL}/review`);
    await page.getByRole('table', { name: 'Review queue' }).waitFor();
    await screenshot(page, 'review-queue');
    const link = page.locator('[data-testid^="queue-"] a').first();
    await link.click();
    await page.getByRole('button', { name: 'Accept fit' }).waitFor();
    await page.locator('figure[aria-label="Residuals of the fit"] svg').first().waitFor();
    // Each chart fits inside its card: nothing of the curve family is cut off at the right.
    const fit = await page.evaluate(() =>
      [...document.querySelectorAll('figure')].map((f) => ({ figure: f.getBoundingClientRect().width, card: f.parentElement!.getBoundingClientRect().width, svg: Number(f.querySelector('svg')?.getAttribute('width')) })),
    );
    for (const f of fit) expect(f.svg).toBeLessThanOrEqual(f.card);
    await page.getByRole('note', { name: 'Fit flags' }).waitFor();
    await page.locator('figure[aria-label="Measured curve family with the fitted model"] svg circle').first().waitFor();
    await screenshot(page, 'review-part');
  });

  it('the lots page counts parts by status', async () => {
    await page.goto(`${BASE_URL}/lots`);
    await page.getByTestId('lot-WS-N30-2611A').waitFor();
    expect(await page.getByTestId('lot-WS-N30-2611A').textContent()).toContain('80');
    await screenshot(page, 'lots');
  });
});
