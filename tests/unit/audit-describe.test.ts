import { describe, expect, it } from 'vitest';
import { auditReferencedIds, describeAuditEntry } from '~/core/audit/describe-audit-entry';

// Rows shaped as the services write them (change-status.ts, assign-bins.ts, refit.ts); the
// wording is our own.
const names = {
  bins: new Map([
    [7, 'I05-P07'],
    [8, 'I05-P08'],
  ]),
  locations: new Map([
    [3, 'Shelf A / drawer 2'],
    [4, 'Shelf A / drawer 3'],
  ]),
  reservations: new Map([['0b7c2d1e-aaaa-bbbb-cccc-000000000000', 'R-0B7C2D1E']]),
};
const row = (action: string, before: unknown, after: unknown) => ({ action, subjectType: 'part', subjectId: 'WS-1', before, after, reason: null });

describe('describeAuditEntry', () => {
  it('writes a status change with its location in words', () => {
    const d = describeAuditEntry(row('stock.receive', { status: 'accepted', location_id: null, bin_id: 7, reservation_id: null }, { status: 'in_stock', locationId: 3 }), names);
    expect(d.what).toBe('received into stock');
    expect(d.summary).toBe('status accepted → in stock, location none → Shelf A / drawer 2');
  });
  it('writes a bin change by code (the id before, the code after)', () => {
    const d = describeAuditEntry(row('part.bin', { bin_id: 7 }, { bin_id: 8, bin_code: 'I05-P08', plan_version: 3 }), names);
    expect(d.changes[0]).toEqual({ field: 'bin', from: 'I05-P07', to: 'I05-P08' });
    expect(d.summary).toBe('bin I05-P07 → I05-P08, plan version 3');
  });
  it('leaves out what did not change and names a reservation by its code', () => {
    const d = describeAuditEntry(
      row('part.reserve', { status: 'in_stock', location_id: 3, bin_id: 7, reservation_id: null }, { status: 'reserved', reservationId: '0b7c2d1e-aaaa-bbbb-cccc-000000000000' }),
      names,
    );
    expect(d.summary).toBe('status in stock → reserved, reservation none → R-0B7C2D1E');
  });
  it('counts points left out on a refit and lists flags', () => {
    const d = describeAuditEntry(row('fit.refit', { fit_id: 10, excluded_points: [] }, { fit_id: 11, excluded_points: [[0, 1], [0, 2]], flags: ['self_heating'] }), names);
    expect(d.summary).toBe('fit 10 → 11, points left out 0 → 2, flags self heating');
  });
  it('gathers the ids to look up', () => {
    expect(auditReferencedIds([{ before: { bin_id: 7, location_id: 3 }, after: { bin_id: 8, reservation_id: 'x' } }])).toEqual({ binIds: [7, 8], locationIds: [3], reservationIds: ['x'] });
  });
});
