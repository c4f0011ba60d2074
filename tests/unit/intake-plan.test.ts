import { describe, expect, it } from 'vitest';
import { IngestRejection } from '~/core/intake/ingest-rejection';
import { lotCodesOf, planParts, readSweepForType, type DeviceTypeInfo } from '~/core/intake/plan-sweep-file';
import { storageGroups } from '~/core/intake/storage-groups';
import { intrinsicDrainCurrentA } from '~/core/jfet-model';
import { SweepFileError } from '~/core/sweep-file';

/**
 * The intake's decisions without a database (src/core/intake): device type, channel, lot,
 * conditions and fit of each part, and which planned files may share a transaction. The
 * refusal texts are the ones the intake integration tests see through the API.
 */
const N30: DeviceTypeInfo = { id: 1, name: 'WS-N30', channel: 'n', vdsTestV: 10 };
const P12: DeviceTypeInfo = { id: 2, name: 'WS-P12', channel: 'p', vdsTestV: 10 };
const types = new Map([
  ['ws-n30', N30],
  ['ws-p12', P12],
]);
const CARD = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.02, rsOhm: 0, rdOhm: 0 };

function file(head: string[]): string {
  const rows = ['vgs (V),vds (V),id (A)'];
  for (const vgs of [-1.5, -1, -0.5, 0]) for (let vds = 0; vds <= 10; vds++) rows.push(`${vgs},${vds},${intrinsicDrainCurrentA(CARD, vgs, vds)}`);
  return [...head, ...rows].join('\n');
}

function refusal(fn: () => unknown): IngestRejection | SweepFileError {
  try {
    fn();
  } catch (e) {
    if (e instanceof IngestRejection || e instanceof SweepFileError) return e;
    throw e;
  }
  throw new Error('accepted');
}

const read = (text: string, tags = {}) => readSweepForType({ text, byteLength: text.length, fileName: 'f.csv', tags, typesByName: types });

describe('readSweepForType', () => {
  it('takes the type from the file before the tag, case-insensitively', () => {
    expect(read(file(['# serial: JX-1', '# device type: ws-n30']), { device_type: 'WS-P12' }).type).toBe(N30);
    expect(read(file(['# serial: JX-1']), { device_type: 'WS-N30' }).parsed.parts[0].serial).toBe('JX-1');
  });

  it('refuses a file with no type, an unknown type, and a channel the type contradicts', () => {
    expect(refusal(() => read(file(['# serial: JX-1']))).message).toBe(
      'f.csv: no device type — the file has no "# device type:" line and the upload gave none. Tag the upload with one of the known types: WS-N30, WS-P12.',
    );
    expect((refusal(() => read(file(['# serial: JX-1', '# device type: XJ-9']))) as IngestRejection).code).toBe('unknown_device_type');
    expect(refusal(() => read(file(['# serial: JX-1', '# device type: WS-N30']), { channel: 'p' })).message).toBe(
      'f.csv: the upload says P-channel, but device type WS-N30 is N-channel. Correct the channel or the device type.',
    );
  });

  it('gives the parser\'s reason for an unreadable file without a type', () => {
    expect(refusal(() => read('vgs,vds,id\n1,2,x')).constructor).toBe(SweepFileError);
  });
});

describe('planParts', () => {
  const { type, parsed } = read(file(['# serial: JX-1', '# device type: WS-N30', '# lot: L-1', '# temperature_c: 24']), { temperature_c: 30, operator: 'ana' });

  it('joins the lot, keeps the file\'s conditions over the tags, and fits', () => {
    expect(lotCodesOf(parsed, {})).toEqual(['L-1']);
    const [part] = planParts({ parsed, type, fileName: 'f.csv', tags: { temperature_c: 30, operator: 'ana' }, defaultStation: 'bench 3', lotsByCode: new Map([['L-1', { id: 7, deviceTypeId: 1 }]]) });
    expect(part).toMatchObject({ serial: 'JX-1', indexInFile: 0, lotId: 7, temperatureC: 24, station: 'bench 3', operator: 'ana', pointCount: 44 });
    expect(part.metadata).toMatchObject({ file_name: 'f.csv', format: 'long', lot: 'L-1', sweep_kind: 'output', notes: [] });
    expect(part.fit.parameters.vtoV.value).toBeCloseTo(-2, 6);
  });

  it('refuses an unknown lot and a lot of another type', () => {
    expect(refusal(() => planParts({ parsed, type, fileName: 'f.csv', tags: {}, defaultStation: null, lotsByCode: new Map() })).message).toBe(
      'f.csv: lot "L-1" (part JX-1) is not known. An inspector creates it on the Lots page first.',
    );
    expect((refusal(() => planParts({ parsed, type, fileName: 'f.csv', tags: {}, defaultStation: null, lotsByCode: new Map([['L-1', { id: 7, deviceTypeId: 2 }]]) })) as IngestRejection).code).toBe('type_conflict');
  });
});

describe('storageGroups', () => {
  const f = (actorKey: string, sha256: string, serials: string[]) => ({ actorKey, sha256, serials });

  it('groups one uploader\'s files, never two of the same serial or bytes in a group, keeping order', () => {
    const a = f('u1', 's1', ['A']);
    const b = f('u1', 's2', ['B']);
    const retestA = f('u1', 's3', ['A']);
    const other = f('u2', 's4', ['C']);
    const sameBytes = f('u1', 's2', ['B']);
    expect(storageGroups([a, b, retestA, other, sameBytes])).toEqual([[a, b], [retestA, sameBytes], [other]]);
  });
});
