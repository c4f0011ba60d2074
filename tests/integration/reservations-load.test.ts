import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '~/db/client';
import { runConfirmLoad } from '../../scripts/load-confirm';
import { BASE_URL } from '../helpers/http';
import { insertMatchStock } from './match-fixture';

afterAll(async () => {
  await closeDb();
});

describe('50 concurrent confirmations of overlapping proposals (scripts/load-confirm.ts)', () => {
  it('never reserves a part twice, names the parts in every refusal, and keeps bin counts equal to part states', async () => {
    // 60 parts: 50 proposals of 1–4 pairs each cannot all be served, so most confirmations collide.
    await insertMatchStock({ typeName: 'MT-LOAD', count: 60, seed: 50, serialPrefix: 'MTL', locations: 4 });
    const report = await runConfirmLoad({
      baseUrl: BASE_URL,
      deviceType: 'MT-LOAD',
      confirmations: 50,
      databaseUrl: process.env.DATABASE_URL,
      timeoutMs: 90_000,
    });
    console.log(`load-confirm: ${report.reserved} reserved (${report.partsReserved} parts), ${report.refused} refused, ${report.elapsedMs} ms`);
    expect(report.problems).toEqual([]);
    expect(report.confirmations).toBe(50);
    expect(report.reserved).toBeGreaterThan(1); // several winners, so "never twice" is tested across them
    expect(report.refused).toBeGreaterThan(0); // the overlap really happened
    expect(report.reserved + report.refused).toBe(50);
    expect(report.perBin.length).toBe(2);
  }, 120_000);

  it('refuses to aim at anything but this machine', async () => {
    await expect(runConfirmLoad({ baseUrl: 'http://10.0.0.5:4321', deviceType: 'MT-LOAD' })).rejects.toThrow(/only targets this machine/);
  });
});
