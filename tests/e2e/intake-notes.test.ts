import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, screenshot, signInThroughForm } from '../helpers/browser';
import { signIn } from '../helpers/http';
import { intrinsicDrainCurrentA, type JfetParams } from '~/core/jfet-model';

/**
 * The part page shows what the intake did to a real tracer's file (issue: notes on the part
 * page): a power-limited family whose top curves stop early, at desk and phone sizes.
 */
let browser: Browser;
const RUN = Date.now().toString(36).slice(-5).toUpperCase();
const serial = `NX-${RUN}-1`;
const CARD: JfetParams = { vtoV: -2.2, betaAPerV2: 1.5e-3, lambdaPerV: 0.015, rsOhm: 0, rdOhm: 0 };

beforeAll(async () => {
  browser = await launchBrowser();
  const inspector = await signIn('inspector@demo.sluice.test');
  const rows: string[] = [];
  for (const vgs of [-1.6, -1.2, -0.8, -0.4, 0]) {
    for (let vds = 0; vds <= 15; vds += 0.5) {
      const id = intrinsicDrainCurrentA(CARD, vgs, vds);
      if (vds * id > 0.015) break; // a 15 mW power limit
      rows.push(`${vgs},${vds},${Number(id.toPrecision(7))}`);
    }
  }
  const form = new FormData();
  form.append('file', new Blob([[`# serial: ${serial}`, '# device type: WS-N30', 'vgs (V),vds (V),id (A)', ...rows].join('\n')]), 'limited.csv');
  const res = await inspector.fetch('/api/sweeps', { method: 'POST', body: form });
  expect(res.status).toBe(202);
  const { upload_id: id } = await res.json();
  for (let i = 0; i < 120; i++) {
    const body = await (await inspector.fetch(`/api/uploads/${id}`)).json();
    if (body.done) break;
    await new Promise((r) => setTimeout(r, 250));
  }
});
afterAll(async () => {
  await browser?.close();
});

describe('intake notes on the part page', () => {
  it.each([
    ['desk', 1440, 900],
    ['phone', 390, 844],
  ])('lists the short curves at %s size', async (name, width, height) => {
    const context = await browser.newContext({ viewport: { width, height } });
    const page = await context.newPage();
    await signInThroughForm(page, 'inspector@demo.sluice.test', undefined, `/parts/${serial.toLowerCase()}`);
    await page.getByTestId('part-serial').waitFor();
    expect(await page.getByTestId('part-serial').textContent()).toBe(serial);
    const notes = page.getByRole('note', { name: 'Intake notes' });
    await notes.waitFor();
    expect(await notes.textContent()).toContain("cut short, most likely by the tracer's power or current limit. Its points are kept in the fit.");
    // No sideways scrolling at phone size.
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
    await screenshot(page, `intake-notes-${name}`);
    await context.close();
  });
});
