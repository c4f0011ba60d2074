import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb } from '~/db/client';
import { signIn, type Session } from '../helpers/http';
import { COARSE_PLAN, createAcceptedParts, createTestType, uniqueName } from './stock-fixtures';

let admin: Session, stores: Session, designer: Session;
let type: { id: number; name: string };
let serials: string[];

beforeAll(async () => {
  [admin, stores, designer] = await Promise.all(['admin', 'stores', 'designer'].map((r) => signIn(`${r}@demo.sluice.test`)));
  type = await createTestType('n');
  await admin.fetch('/api/bin-plans', { method: 'POST', json: { device_type: type.name, definition: COARSE_PLAN } });
  serials = (await createAcceptedParts(type.id, [{ idssA: 5e-3, vpV: -2.5 }, { idssA: 7e-3, vpV: -1.5 }])).map((p) => p.serial);
});
afterAll(async () => {
  await closeDb();
});

describe('labels', () => {
  it('renders a Code 128 symbol of the right width on the server', async () => {
    const res = await stores.fetch('/api/labels/barcode?text=ABCDEFGH&symbology=code128');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('image/svg+xml');
    const svg = await res.text();
    // ISO/IEC 15417 (Code 128): start, data and check characters are 11 modules each and the
    // stop pattern 13, so 8 characters of code set B make 11·(1 + 8 + 1) + 13 = 123 modules.
    const [, w] = /viewBox="0 0 (\d+) \d+"/.exec(svg)!;
    expect(Number(w) % 123).toBe(0);
    const png = await stores.fetch('/api/labels/barcode?text=I02-P02&symbology=datamatrix&format=png');
    expect(png.headers.get('content-type')).toBe('image/png');
    const bytes = new Uint8Array(await png.arrayBuffer());
    expect([...bytes.slice(1, 4)].map((b) => String.fromCharCode(b)).join('')).toBe('PNG');
  });

  it('prints bin labels and part labels laid out for the chosen stock', async () => {
    const bins = await (await stores.fetch(`/api/bins?device_type=${encodeURIComponent(type.name)}`)).json();
    const ids = bins.bins.slice(0, 5).map((b: { id: number }) => b.id).join(',');
    const sheet = await stores.fetch(`/labels/print?kind=bin&layout=a4-3x8&bins=${ids}`);
    expect(sheet.status).toBe(200);
    const html = await sheet.text();
    expect(html.match(/data-barcode=/g)).toHaveLength(5);
    expect(html).toContain('size: 210mm 297mm');
    expect(html).toContain('IDSS 2.0–4.0 mA');
    const roll = await stores.fetch(`/labels/print?kind=part&layout=roll-62x29&symbology=datamatrix&serials=${serials.join(',')},NOPE`);
    const rollHtml = await roll.text();
    expect(rollHtml).toContain('size: 62mm 29mm');
    expect(rollHtml.match(/data-barcode=/g)).toHaveLength(2);
    expect(rollHtml).toContain('NOPE');
  });

  it('a part label says where the part is now, after a move (issue 13, item 5)', async () => {
    const make = async (name: string) => (await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName(name) } })).json();
    const [first, second] = [await make('Label drawer A'), await make('Label drawer B')];
    expect((await stores.fetch('/api/stock/receive', { method: 'POST', json: { serials: [serials[0]], location_barcode: first.barcode } })).status).toBe(200);
    const before = await (await stores.fetch(`/labels/print?kind=part&serials=${serials[0]}`)).text();
    expect(before).toContain(first.name);
    expect((await stores.fetch('/api/stock/move', { method: 'POST', json: { serials: [serials[0]], location_barcode: second.barcode } })).status).toBe(200);
    const after = await (await stores.fetch(`/labels/print?kind=part&serials=${serials[0]}`)).text();
    expect(after).toContain(second.name);
    expect(after).not.toContain(first.name);
  });

  it('prints location labels whose barcode is the location barcode the move scanner reads', async () => {
    const loc = await (await stores.fetch('/api/locations', { method: 'POST', json: { name: uniqueName('Label cabinet'), description: 'left of the bench' } })).json();
    const html = await (await stores.fetch(`/labels/print?kind=location&layout=roll-62x29&locations=${loc.id}`)).text();
    expect(html.match(/data-barcode=/g)).toHaveLength(1);
    expect(html).toContain(`data-barcode="${loc.barcode}"`);
    expect(html).toContain(loc.name);
    expect(html).toContain('left of the bench');
    expect(html).toContain('<svg');
  });

  it('designers cannot print labels', async () => {
    expect((await designer.fetch('/api/labels/barcode?text=X')).status).toBe(403);
    expect((await designer.fetch('/labels', { redirect: 'manual' })).status).toBe(403);
  });
});
