// Loads the invented demo scenario (a small lab: people, device types, and what later steps
// add). Safe to run again: every step skips what is already there.
import { closeDb } from '~/db/client';
import { DEFAULT_DEMO_PASSWORD, seedDemoPeople } from '~/lib/server/demo/people';
import { seedDemoDeviceTypes } from '~/lib/server/demo/device-types';
import { seedDemoLots } from '~/lib/server/demo/lots';
import { seedDemoStock } from '~/lib/server/demo/stock';

const password = process.env.SLUICE_DEMO_PASSWORD ?? DEFAULT_DEMO_PASSWORD;
try {
  const people = await seedDemoPeople(password);
  await seedDemoDeviceTypes();
  await seedDemoLots();
  await seedDemoStock();
  console.log(`[sluice] demo scenario loaded (${people} new accounts)`);
} finally {
  await closeDb();
}
