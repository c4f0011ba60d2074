import { getDb, schema } from '~/db/client';

/** Two invented device types: an N-channel and a P-channel small-signal part. */
export const DEMO_DEVICE_TYPES = [
  {
    name: 'WS-N30',
    channel: 'n' as const,
    description: 'N-channel small-signal JFET, low-noise audio and RF front ends (invented for the demo).',
    vdsTestV: 10,
    nominalTemperatureC: 25,
    idssMinA: 2e-3,
    idssMaxA: 20e-3,
    vpMinV: -4,
    vpMaxV: -0.6,
  },
  {
    name: 'WS-P12',
    channel: 'p' as const,
    description: 'P-channel small-signal JFET, complementary pairs and current sources (invented for the demo).',
    vdsTestV: 10,
    nominalTemperatureC: 25,
    idssMinA: 2e-3,
    idssMaxA: 15e-3,
    vpMinV: 0.6,
    vpMaxV: 4,
  },
];

export async function seedDemoDeviceTypes(): Promise<void> {
  await getDb().insert(schema.deviceType).values(DEMO_DEVICE_TYPES).onConflictDoNothing({ target: schema.deviceType.name });
}
