import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import type { Browser } from 'playwright-core';
import { closeDb, getDb, schema } from '~/db/client';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { BASE_URL } from '../helpers/http';
import { waitForMail } from '../helpers/mail';
import { insertMatchStock } from '../integration/match-fixture';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  const [{ n }] = await getDb()
    .select({ n: sql<number>`count(*)::int` })
    .from(schema.part)
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(sql`${schema.deviceType.name} = 'WS-N30' AND ${schema.part.status} = 'in_stock'`);
  if (n < 150) await insertMatchStock({ typeName: 'WS-N30', existingType: true, count: 240, seed: 30, serialPrefix: 'MTN' });
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe('designer asks for matched pairs, stores pick them by scanning', () => {
  it('goes from /match through the reservation to a complete pick list', async () => {
    const designerCtx = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const d = await designerCtx.newPage();
    await signInThroughForm(d, 'designer@demo.sluice.test', undefined, '/match');
    await d.getByRole('form', { name: 'Match request' }).waitFor();
    await d.getByLabel('How many sets').fill('3');
    await d.getByLabel(/Drain current ID/).fill('1');
    await d.getByLabel(/Drain–source voltage VDS/).fill('10');
    await d.getByLabel(/Largest \|ΔVGS\|/).fill('10');
    await d.getByLabel(/Largest IDSS mismatch/).fill('10');
    await screenshot(d, 'match-form');
    await d.getByRole('button', { name: 'Propose sets' }).click();
    const results = d.getByRole('region', { name: 'Proposed sets' });
    await results.getByRole('heading', { name: /matched pairs/ }).waitFor();
    expect(await results.getByRole('heading', { name: /matched pairs/ }).first().textContent()).toMatch(/3 of 3 matched pairs/);
    expect(await results.getByRole('article').count()).toBe(3);
    await screenshot(d, 'match-proposal');

    await d.getByLabel(/For \(optional note to stores\)/).fill('phono preamp, board 2');
    await Promise.all([d.waitForURL(/\/reservations\/[0-9a-f-]{36}/), d.getByRole('button', { name: 'Reserve all 6 parts' }).click()]);
    await d.getByRole('heading', { name: /Reservation R-[0-9A-F]{8}/ }).waitFor();
    await d.getByTestId('expires-at').waitFor();
    expect(await d.getByTestId('expires-at').textContent()).toMatch(/Held until .+\(in (2 days 23 h|3 days)\)/);
    const code = (await d.getByRole('heading', { name: /Reservation R-/ }).textContent())!.match(/R-[0-9A-F]{8}/)![0];
    const listHref = await d.getByRole('link', { name: /PL-\d+/ }).getAttribute('href');
    await screenshot(d, 'reservation-new');

    const storesCtx = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const s = await storesCtx.newPage();
    await signInThroughForm(s, 'stores@demo.sluice.test', undefined, '/pick-lists');
    await s.getByRole('table', { name: 'Pick lists' }).waitFor();
    await screenshot(s, 'pick-lists-open');
    await s.goto(`${BASE_URL}${listHref}`);
    const input = s.getByLabel('Scan the part’s serial');
    await input.waitFor();
    expect(await input.evaluate((el) => el === document.activeElement)).toBe(true);

    // A wrong serial is refused, saying why, and the input keeps focus for the next scan.
    await input.fill('NOT-A-SERIAL');
    await input.press('Enter');
    await s.getByTestId('scan-feedback').filter({ hasText: 'Refused' }).waitFor();
    expect(await s.getByTestId('scan-feedback').textContent()).toMatch(/NOT-A-SERIAL is not on pick list/);
    await s.waitForFunction(() => document.activeElement?.id === 'scan-serial');
    await screenshot(s, 'pick-list-refused');

    for (let k = 0; k < 6; k++) {
      const prompt = s.getByRole('form', { name: 'Scan a serial' });
      const serial = (await prompt.locator('strong.font-mono').textContent())!.trim();
      await s.waitForFunction(() => document.activeElement?.id === 'scan-serial');
      await s.keyboard.type(serial); // as a scanner would: keystrokes into whatever has focus
      await s.keyboard.press('Enter');
      await s.getByTestId('pick-progress').filter({ hasText: `${k + 1} of 6 picked` }).waitFor();
      if (k === 2) await screenshot(s, 'pick-list-half');
    }
    await s.getByTestId('scan-feedback').filter({ hasText: 'The list is complete' }).waitFor();
    await screenshot(s, 'pick-list-complete');

    const mail = await waitForMail('designer@demo.sluice.test', new RegExp(`issued \\(reservation ${code}\\)`));
    expect(mail.text).toContain(code);
    await d.reload();
    await d.getByText('issued', { exact: true }).first().waitFor();
    await screenshot(d, 'reservation-issued');
    await d.goto(`${BASE_URL}/reservations`);
    await d.getByRole('table', { name: 'Your reservations' }).waitFor();
    await screenshot(d, 'reservations-list');

    // The designer hands one part back: stores tick it, and its line says it came back.
    const back = s.getByRole('form', { name: 'Take parts back' });
    const first = back.locator('label:has(input[type="checkbox"]) span.font-mono').first();
    const backSerial = (await first.textContent())!.trim();
    await back.getByRole('checkbox', { name: backSerial }).check();
    await back.getByRole('button', { name: /Take back 1 part/ }).click();
    await s.getByText(`Took back ${backSerial}`).waitFor();
    const row = s.getByRole('row').filter({ hasText: backSerial });
    await row.getByText('taken back, in stock').waitFor();
    await screenshot(s, 'pick-list-taken-back');
    await designerCtx.close();
    await storesCtx.close();
  });
});
