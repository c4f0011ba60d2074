import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { Browser, Page } from 'playwright-core';
import { closeDb, getDb, schema } from '~/db/client';
import { seededRandom } from '~/core/random/seeded-random';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';

/** The statistics and estimates pages in a real browser, on rows of our own. */

const RUN = Date.now().toString(36).toUpperCase(); // serials and codes are upper-case (normalizeSerial)
const TYPE = `E2E-N-${RUN}`;
const LOTS = [`E2E-A-${RUN}`, `E2E-B-${RUN}`, `E2E-C-${RUN}`];
// Serials are upper-case (normalizeSerial): the estimates page upper-cases what is typed, as every screen does.
const PAIR = [`E2E-${RUN.toUpperCase()}-P1`, `E2E-${RUN.toUpperCase()}-P2`];

async function seed() {
  const db = getDb();
  const [type] = await db
    .insert(schema.deviceType)
    .values({ name: TYPE, channel: 'n', vdsTestV: 10, idssMinA: 3e-3, idssMaxA: 16e-3, vpMinV: -4, vpMaxV: -1 })
    .returning();
  const [plan] = await db.insert(schema.binPlan).values({ deviceTypeId: type.id, version: 1, definition: { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [2e-3, 6e-3, 10e-3, 14e-3, 18e-3] } }] }, isActive: true }).returning();
  const bins = await db
    .insert(schema.bin)
    .values(['A1', 'A2', 'A3', 'A4', 'HOLD'].map((code) => ({ binPlanId: plan.id, code, label: code === 'HOLD' ? 'Hold' : `IDSS range ${code}`, ranges: [] })))
    .returning();
  const rnd = seededRandom(7);
  const gauss = () => Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd());
  const statuses = ['in_stock', 'in_stock', 'accepted', 'reserved', 'needs_review', 'in_stock', 'scrapped', 'in_stock'] as const;
  const serials: { serial: string; lotIdx: number }[] = LOTS.flatMap((_, li) => Array.from({ length: 60 }, (_, i) => ({ serial: `${LOTS[li]}-${i}`, lotIdx: li })));
  serials.push({ serial: PAIR[0], lotIdx: 2 }, { serial: PAIR[1], lotIdx: 2 });
  const lots = await db
    .insert(schema.lot)
    .values(LOTS.map((code, i) => ({ code, deviceTypeId: type.id, supplier: 'Weir Street Semis', receivedAt: new Date(Date.UTC(2025, i * 2, 5)) })))
    .returning();
  for (const [n, s] of serials.entries()) {
    const pair = PAIR.indexOf(s.serial);
    const idss = pair >= 0 ? [9.8e-3, 10.05e-3][pair] : (8 + s.lotIdx * 0.8 + gauss() * 1.8) * 1e-3;
    const vp = pair >= 0 ? [-2.9, -2.93][pair] : -(2.4 + s.lotIdx * 0.1 + gauss() * 0.35);
    const status = pair >= 0 ? 'in_stock' : statuses[n % statuses.length];
    const binCode = status === 'needs_review' || status === 'scrapped' ? null : idss < 6e-3 ? 'A1' : idss < 9e-3 ? 'A2' : idss < 12e-3 ? 'A3' : 'A4';
    const [part] = await db
      .insert(schema.part)
      .values({ serial: s.serial, deviceTypeId: type.id, lotId: lots[s.lotIdx].id, status, binId: binCode ? bins.find((b) => b.code === binCode)!.id : null })
      .returning();
    const [sweep] = await db.insert(schema.sweep).values({ partId: part.id, vgsStepsV: [0], curves: [], pointCount: 0 }).returning();
    const lambda = 0.003;
    const [fit] = await db
      .insert(schema.fit)
      .values({
        sweepId: sweep.id,
        partId: part.id,
        model: 'level1',
        engineVersion: 'test',
        vtoV: vp,
        betaAPerV2: idss / (vp * vp * (1 + lambda * 10)),
        lambdaPerV: lambda,
        idssA: idss,
        idssVdsV: 10,
        vpV: vp,
        gfsS: (2 * idss) / Math.abs(vp),
        gosS: (lambda * idss) / (1 + lambda * 10),
        rdsOnOhm: Math.abs(vp) / (2 * idss),
        rmsRel: 0.002,
        detail: {},
        review: 'auto_accepted',
      })
      .returning();
    await db.update(schema.part).set({ currentFitId: fit.id }).where(eq(schema.part.id, part.id));
  }
}

let browser: Browser;
beforeAll(async () => {
  await seed();
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

async function designerPage(): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 1000 }, acceptDownloads: true });
  const page = await context.newPage();
  await signInThroughForm(page, 'designer@demo.sluice.test');
  return page;
}

describe('statistics page', () => {
  it('shows a device type with charts, tables and working downloads', async () => {
    const page = await designerPage();
    await page.goto(`${BASE_URL}/statistics?device_type=${TYPE}`);
    await page.getByRole('heading', { name: TYPE }).waitFor();
    await page.getByRole('heading', { name: 'Summary' }).waitFor();
    expect(await page.locator('figure svg').count()).toBeGreaterThanOrEqual(6);
    await page.waitForTimeout(600);
    await screenshot(page, 'statistics-type');

    const [svgDownload] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('figure', { name: 'VP against IDSS' }).getByRole('button', { name: 'SVG' }).click(),
    ]);
    expect(svgDownload.suggestedFilename()).toMatch(/vp-idss\.svg$/);
    const svgText = fs.readFileSync((await svgDownload.path())!, 'utf8');
    expect(svgText).toContain('<svg');
    expect(svgText).toContain('http://www.w3.org/2000/svg');
    expect((svgText.match(/<circle/g) ?? []).length).toBeGreaterThanOrEqual(180);

    const [pngDownload] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('figure', { name: 'IDSS (mA)' }).getByRole('button', { name: 'PNG' }).click(),
    ]);
    const png = fs.readFileSync((await pngDownload.path())!);
    expect(png.subarray(1, 4).toString()).toBe('PNG');

    const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'CSV · summary' }).click()]);
    expect(fs.readFileSync((await csvDownload.path())!, 'utf8')).toMatch(/^device_type,figure,unit,n,mean/);

    await page.getByLabel('Lot', { exact: true }).selectOption(LOTS[1]);
    await page.getByRole('button', { name: 'Show statistics' }).click();
    await page.waitForURL((u) => u.searchParams.get('lot') === LOTS[1]);
    await page.getByText('the selected lot in red').waitFor();
    await page.waitForTimeout(600);
    await screenshot(page, 'statistics-lot');
    await page.context().close();
  });
});

describe('estimates page', () => {
  it('estimates the mixer from data-sheet values and shows the difference to a measured level', async () => {
    const page = await designerPage();
    await page.goto(`${BASE_URL}/estimates`);
    await page.getByText('Models used.').waitFor();
    // The mixer starts unticked and biased from the part; the bench case below has its own
    // fixed bias and drive levels, typed in as a person would.
    expect(await page.getByLabel('estimate the mixer').isChecked()).toBe(false);
    await page.getByLabel('estimate the mixer').check();
    await page.getByLabel('a fixed VGS0').check();
    await page.getByLabel('VGS0 (V)').fill('-1.78');
    await page.getByLabel('LO amplitude (mV peak)').fill('400');
    await page.getByLabel('RF amplitude (mV peak)').fill('132');
    await page.getByRole('button', { name: 'Estimate' }).click();
    const table = page.getByRole('table', { name: /Mixer products of/ });
    await table.waitFor();
    await page.getByLabel(/Measured LO of/).fill('-28.4');
    const diff = await page.getByTestId('difference-lo').textContent();
    // The bench case: the estimate lands within 0.2 dB of the measured −28.4 dBV.
    const value = Number(diff!.replace('\u2212', '-').replace(/[^\d.+-]/g, ''));
    expect(Math.abs(value)).toBeLessThanOrEqual(0.2);
    await page.getByLabel(/Measured LO − RF of/).fill('-40');
    await screenshot(page, 'estimates-datasheet');

    await page.getByLabel('LO amplitude (mV peak)').fill('-5');
    await page.getByRole('button', { name: 'Estimate' }).click();
    const fieldError = page.locator('#est-lo_mv-error');
    await fieldError.waitFor();
    expect(await fieldError.textContent()).toContain('expected a peak amplitude');
    await screenshot(page, 'estimates-error');
    await page.context().close();
  });

  it('estimates each part of a set and what the pair mismatch means', async () => {
    const page = await designerPage();
    await page.goto(`${BASE_URL}/estimates`);
    await page.getByLabel('A set (reservation or serials)').check();
    await page.getByLabel('Reservation id or serials').fill(PAIR.join(', '));
    await page.getByRole('button', { name: 'Estimate' }).click();
    await page.getByRole('table', { name: 'Pairs of set 1' }).waitFor();
    await page.getByRole('region', { name: `Estimates for ${PAIR[1]}` }).waitFor();
    const pairRow = await page.getByRole('table', { name: 'Pairs of set 1' }).locator('tbody tr').first().textContent();
    expect(pairRow).toContain('mV');
    expect(pairRow).toContain('dB');
    await screenshot(page, 'estimates-set');
    await page.context().close();
  });
});
