/**
 * One source for operating-point figures: a reserved pair's VGS and gm at 1 mA / 10 V read the
 * same on the match page, on each part's page (its operating-point form) and on the stage-
 * estimates page (the set estimated from the reservation), all compared at 25 °C. The pages
 * carry each figure's full value in a data-value attribute beside the rounded text.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import type { Browser, Page } from 'playwright-core';
import { closeDb, getDb, schema } from '~/db/client';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';
import { insertMatchStock } from '../integration/match-fixture';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  const [{ n }] = await getDb()
    .select({ n: sql<number>`count(*)::int` })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(sql`${schema.deviceType.name} = 'WS-N30' AND ${schema.part.status} = 'in_stock'`);
  if (n < 150) await insertMatchStock({ typeName: 'WS-N30', existingType: true, count: 240, seed: 31, serialPrefix: 'OPC' });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

const valueOf = async (page: Page, testId: string) => Number(await page.getByTestId(testId).getAttribute('data-value'));

describe('the same part at the same point shows the same figures everywhere', () => {
  it('match page, part pages and stage estimates agree on VGS and gm of a reserved pair', async () => {
    const ctx = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const d = await ctx.newPage();
    await signInThroughForm(d, 'designer@demo.sluice.test', undefined, '/match');
    await d.getByRole('form', { name: 'Match request' }).waitFor();
    // The demo type, whose parts were fitted from real sweeps (other suites add types of their own).
    const type = d.getByLabel('Device type');
    await type.locator('option', { hasText: 'WS-N30' }).first().waitFor({ state: 'attached' });
    await type.selectOption((await type.locator('option', { hasText: 'WS-N30' }).first().getAttribute('value'))!);
    await d.getByLabel('How many sets').fill('1');
    await d.getByLabel(/Drain current ID/).fill('1');
    await d.getByLabel(/Drain–source voltage VDS/).fill('10');
    await d.getByLabel(/Largest \|ΔVGS\|/).fill('10');
    await d.getByRole('button', { name: 'Propose sets' }).click();
    const set = d.getByRole('article', { name: 'Set 1' });
    await set.waitFor();
    const serials = (await set.locator('td.font-mono').allTextContents()).map((s) => s.trim());
    expect(serials).toHaveLength(2);
    const onMatch = new Map<string, { vgs: number; gm: number }>();
    for (const s of serials) onMatch.set(s, { vgs: await valueOf(d, `vgs-${s}`), gm: await valueOf(d, `gm-${s}`) });
    expect(await set.getByTestId('set-dvgs').textContent()).toMatch(/± .*mV \(1σ\)/);
    await screenshot(d, 'consistency-match');
    await Promise.all([d.waitForURL(/\/reservations\/[0-9a-f-]{36}/), d.getByRole('button', { name: /Reserve all 2 parts/ }).click()]);
    const reservationId = d.url().match(/[0-9a-f-]{36}/)![0];

    for (const s of serials) {
      await d.goto(`${BASE_URL}/parts/${encodeURIComponent(s)}`);
      const form = d.getByRole('form', { name: 'Figures at your operating point' });
      await form.waitFor();
      await form.locator('input[name="id_ma"]').fill('1');
      await form.locator('input[name="vds_v"]').fill('10');
      await form.locator('input[name="temperature_c"]').fill('25');
      await form.getByRole('button', { name: 'Show figures' }).click();
      await d.getByTestId('operating-point-result').waitFor();
      expect(await valueOf(d, 'op-vgs')).toBeCloseTo(onMatch.get(s)!.vgs, 12);
      expect(await valueOf(d, 'op-gm')).toBeCloseTo(onMatch.get(s)!.gm, 12);
    }
    await screenshot(d, 'consistency-part-page');

    await d.goto(`${BASE_URL}/estimates`);
    await d.getByRole('form', { name: 'Stage estimate inputs' }).waitFor();
    await d.getByLabel('A set (reservation or serials)').check();
    await d.locator('#est-set_ref').fill(reservationId);
    await d.locator('#est-target_ma').fill('1');
    await d.locator('#est-vds_v').fill('10');
    await d.getByRole('form', { name: 'Stage estimate inputs' }).locator('button[type="submit"]').click();
    for (const s of serials) {
      await d.getByTestId(`set-vgs-${s}`).waitFor();
      expect(await valueOf(d, `set-vgs-${s}`)).toBeCloseTo(onMatch.get(s)!.vgs, 12);
      expect(await valueOf(d, `set-gm-${s}`)).toBeCloseTo(onMatch.get(s)!.gm, 12);
    }
    await screenshot(d, 'consistency-estimates');
    await ctx.close();
  });
});
