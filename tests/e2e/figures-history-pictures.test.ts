import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, asc, eq, sql } from 'drizzle-orm';
import type { Browser, Page } from 'playwright-core';
import { closeDb, getDb, schema } from '~/db/client';
import { E24 } from '~/core/estimates/preferred-values';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';

/**
 * Issue 13, items 3, 4, 8, 9, 10 and 11 in a real browser on the demo scenario: figures in one
 * format, the lot trend's honesty, match grades, stage estimates from the part, the audit log
 * in words, and the pictures (share per bin, bin-plan preview). Every page at 1440×900 and
 * 390×844.
 */
let browser: Browser;
let stockedSerial: string;
let smallVpSerial: string;
let smallVp: number;

beforeAll(async () => {
  browser = await launchBrowser();
  const db = getDb();
  const [stocked] = await db
    .select({ serial: schema.part.serial })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(and(eq(schema.part.status, 'in_stock'), eq(schema.deviceType.name, 'WS-N30')))
    .orderBy(asc(schema.part.serial))
    .limit(1);
  stockedSerial = stocked.serial;
  // The in-stock N-channel part with the smallest pinch-off: a fixed VGS0 of −1.78 V cuts it off.
  const [small] = await db
    .select({ serial: schema.part.serial, vp: schema.fit.vpV })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(and(eq(schema.part.status, 'in_stock'), eq(schema.deviceType.name, 'WS-N30')))
    .orderBy(sql`${schema.fit.vpV} desc`)
    .limit(1);
  smallVpSerial = small.serial;
  smallVp = small.vp;
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

async function as(email: string, next: string, width = 1440, height = 900): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height } });
  const page = await context.newPage();
  await signInThroughForm(page, email, undefined, next);
  await page.goto(`${BASE_URL}${next}`);
  return page;
}

const scrollWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

describe('readable history (item 10)', () => {
  it('the admin audit log searches by serial and person and says each change in words', async () => {
    const page = await as('admin@demo.sluice.test', '/admin/audit');
    await page.getByTestId('audit-count').waitFor();
    await page.getByLabel('Serial or subject contains').fill(stockedSerial);
    await page.getByLabel('Person or station').fill('stores@');
    await page.getByRole('button', { name: 'Search' }).click();
    await page.waitForURL((u) => u.search.includes('serial='));
    const entry = page.getByTestId('audit-entry').filter({ hasText: 'received into stock' }).filter({ hasText: stockedSerial }).first();
    await entry.waitFor();
    const text = await entry.innerText();
    expect(text).toContain(stockedSerial);
    expect(text).toContain('status accepted → in stock');
    expect(text).toContain('by stores@demo.sluice.test');
    expect(text).toMatch(/\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC/);
    expect(text).not.toContain('{"');
    await screenshot(page, 'audit-log-1440');
    await page.context().close();
  });

  it('the part page shows its audit trail in words and its figures rounded to their uncertainty (item 3)', async () => {
    const page = await as('inspector@demo.sluice.test', `/parts/${encodeURIComponent(stockedSerial)}`);
    const trail = page.getByRole('list', { name: 'Audit trail' });
    await trail.waitFor();
    const words = await trail.innerText();
    expect(words).toContain('status accepted → in stock');
    expect(words).not.toContain('{"status"');
    // Standard errors carry one or two significant digits (GUM 7.2.6, from memory).
    const errors = await page.getByRole('table', { name: 'Fitted parameters' }).locator('tbody tr td:nth-child(3)').allInnerTexts();
    const given = errors.filter((e) => e.startsWith('±'));
    expect(given.length).toBeGreaterThan(3);
    for (const e of given) {
      const number = e.replace(/^± /, '').replace(/ .*$/, '');
      // Significant digits: no leading zeros, and no trailing zeros of a whole number ("150" has two).
      const digits = (number.includes('.') ? number.replace('.', '') : number.replace(/0+$/, '')).replace(/^0+/, '');
      expect(digits.length, e).toBeLessThanOrEqual(2);
    }
    await screenshot(page, 'part-page-figures-1440');
    await page.context().close();
  });
});

describe('match grades (item 8)', () => {
  it('starts at common-practice grades, warns when one is left empty, and then does not claim "best possible"', async () => {
    const page = await as('designer@demo.sluice.test', '/match');
    const grades = await page.getByTestId('common-practice-grades').innerText();
    expect(grades).toContain('|ΔVGS| ≤ 10 mV');
    expect(grades).toContain('IDSS ratio ≥ 0.95');
    expect(grades).toContain('gfs ratio ≥ 0.97');
    expect(await page.getByTestId('tolerance-warnings').count()).toBe(0);
    expect(await page.locator('#m-gm').inputValue()).toBe('3');
    expect(await page.locator('#m-idss').inputValue()).toBe('5');
    await page.locator('#m-gm').fill('');
    await page.locator('#m-idss').fill('');
    const warnings = await page.getByTestId('tolerance-warnings').innerText();
    expect(warnings).toContain('No gm limit');
    expect(warnings).toContain('No IDSS limit');
    await page.getByRole('button', { name: 'Propose sets' }).click();
    const verdict = page.getByTestId('proposal-verdict');
    await verdict.waitFor();
    expect(await verdict.innerText()).not.toBe('best possible');
    await screenshot(page, 'match-grades-1440');
    await page.context().close();
  });
});

describe('stage estimates from the part (item 9)', () => {
  it('explains beside the field a VGS0 the part cannot take, and gives E24 and E96 resistors', async () => {
    expect(smallVp).toBeGreaterThan(-1.78);
    const page = await as('designer@demo.sluice.test', '/estimates');
    await page.getByLabel('A stored part (serial)').check();
    await page.getByRole('textbox', { name: 'Serial' }).fill(smallVpSerial);
    await page.getByText('the bias and drive levels start from these').waitFor();
    expect(await page.getByLabel('estimate the mixer').isChecked()).toBe(false);
    await page.getByLabel('estimate the mixer').check();
    await page.getByLabel('a fixed VGS0').check();
    await page.getByLabel('VGS0 (V)').fill('-1.78');
    const err = page.locator('#est-vgs0_v-error');
    await err.waitFor();
    expect(await err.innerText()).toContain("past this part's pinch-off");
    await page.getByLabel('VP/2 of the part').check();
    expect(await page.locator('#est-vgs0_v-error').count()).toBe(0);
    await page.getByRole('button', { name: 'Estimate' }).click();
    await page.getByRole('table', { name: /Mixer products of/ }).waitFor();
    const e24 = page.getByTestId('preferred-E24');
    await e24.waitFor();
    const rs = Number((await e24.locator('td').nth(1).innerText()).replace('\u2212', '-'));
    const unit = await page.getByRole('table', { name: 'Self-bias operating points' }).locator('thead th').nth(1).innerText();
    const ohms = rs * (unit.includes('kΩ') ? 1e3 : unit.includes('MΩ') ? 1e6 : 1);
    // IEC 60063: an E24 value is one of the 24 mantissas times a power of ten.
    const mantissa = Number((ohms / 10 ** Math.floor(Math.log10(ohms))).toPrecision(2));
    expect(E24 as readonly number[]).toContain(mantissa);
    await page.getByTestId('preferred-E96').waitFor();
    await screenshot(page, 'estimates-from-part-1440');
    await page.context().close();
  });
});

describe('pictures and the lot trend (items 4 and 11)', () => {
  it('statistics: share per bin as a VP × IDSS grid; no trend from lots received minutes apart', async () => {
    const page = await as('designer@demo.sluice.test', '/statistics?device_type=WS-N30');
    await page.getByTestId('bin-share-grid').waitFor();
    const cells = await page.getByTestId('bin-share-grid').locator('tbody td').count();
    expect(cells).toBeGreaterThan(20);
    const drift = await page.getByTestId('trend-drift').first().innerText();
    expect(drift).toContain('a trend needs');
    expect(drift).not.toMatch(/per 30 days/);
    await screenshot(page, 'statistics-grid-1440');
    await page.context().close();
  });

  it('bin-plan preview draws the old and new grids over the parts and counts the parts to carry', async () => {
    const page = await as('admin@demo.sluice.test', '/admin/bin-plans');
    await page.locator('#plan-type option[value="WS-N30"]').waitFor({ state: 'attached', timeout: 60_000 });
    await page.getByLabel('Device type').selectOption('WS-N30');
    await page.getByRole('button', { name: 'Preview the moves' }).click();
    await page.getByRole('region', { name: 'Preview' }).waitFor();
    await page.getByRole('figure', { name: 'Old and new bin grids over the parts' }).waitFor();
    expect(await page.getByTestId('physical-moves').innerText()).toMatch(/^\d+ parts? on the shelves must be carried/);
    // The active plan again: nothing changes bin, so nothing is carried.
    expect(await page.getByTestId('moved-count').innerText()).toBe('0');
    await screenshot(page, 'bin-plan-preview-grid-1440');
    await page.context().close();
  });
});

describe('the same pages on a phone (390 × 844)', () => {
  it.each([
    ['admin@demo.sluice.test', '/admin/audit', 'audit-count', 'audit-log-390', true],
    ['designer@demo.sluice.test', '/statistics?device_type=WS-N30', 'bin-share-grid', 'statistics-grid-390', true],
    ['designer@demo.sluice.test', '/match', 'common-practice-grades', 'match-grades-390', true],
    ['designer@demo.sluice.test', '/estimates', null, 'estimates-390', true],
    ['admin@demo.sluice.test', '/admin/bin-plans', null, 'bin-plans-390', false],
  ] as const)('%s %s', async (email, path, testId, name, noSideways) => {
    const page = await as(email, path, 390, 844);
    if (path === '/admin/bin-plans') {
      await page.getByRole('button', { name: 'Preview the moves' }).click();
      await page.getByRole('figure', { name: 'Old and new bin grids over the parts' }).waitFor();
    } else if (testId) await page.getByTestId(testId).waitFor();
    else await page.getByRole('button', { name: 'Estimate' }).waitFor();
    await screenshot(page, name);
    if (noSideways) expect(await scrollWidth(page)).toBeLessThanOrEqual(390);
    await page.context().close();
  });
});
