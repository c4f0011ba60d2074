/** The device-type catalogue over HTTP: admins create and change types; the answers are their contracts. */
import { beforeAll, describe, expect, it } from 'vitest';
import { DeviceTypeJson, DeviceTypeList } from '~/contracts/device-types';
import { expectContract } from '../helpers/contract';
import { signIn, type Session } from '../helpers/http';

let admin: Session;
let designer: Session;
const name = `DT-${Date.now().toString(36).toUpperCase()}`;

beforeAll(async () => {
  [admin, designer] = await Promise.all([signIn('admin@demo.sluice.test'), signIn('designer@demo.sluice.test')]);
});

describe('device types', () => {
  it('an admin creates a type, lists it and changes it; a designer may not create one', async () => {
    const body = { name, channel: 'n', vds_test_v: 15, idss_min_a: 2e-3, idss_max_a: 6e-3, vp_min_v: -3, vp_max_v: -0.5 };
    const made = await admin.fetch('/api/admin/device-types', { method: 'POST', json: body });
    expect(made.status).toBe(201);
    const created = expectContract(DeviceTypeJson, await made.json());
    // The defaults of the input schema: 25 °C, VTOTC −2.2 mV/°C, BETATCE −0.7 %/°C.
    expect(created).toMatchObject({ ...body, description: '', nominal_temperature_c: 25, vtotc_v_per_c: -0.0022, betatce_pct_per_c: -0.7 });

    const list = await (await admin.fetch('/api/admin/device-types')).json();
    expectContract(DeviceTypeList, list);
    expect(list.device_types).toContainEqual(created);

    const changed = await admin.fetch(`/api/admin/device-types/${created.id}`, { method: 'PUT', json: { ...body, vds_test_v: 10, description: 'retested at 10 V' } });
    expect(changed.status).toBe(200);
    expect(expectContract(DeviceTypeJson, await changed.json())).toMatchObject({ id: created.id, vds_test_v: 10, description: 'retested at 10 V' });

    expect((await designer.fetch('/api/admin/device-types', { method: 'POST', json: { ...body, name: `${name}-X` } })).status).toBe(403);
  });
});
