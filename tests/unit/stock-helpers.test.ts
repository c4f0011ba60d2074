import { describe, expect, it } from 'vitest';
import { lowStockStep } from '~/core/stock/low-stock';
import { collectScanBatch, cleanScannedSerial } from '~/core/stock/scan-batch';
import { countsFromStatusRows } from '~/core/stock/stock-counts';
import { sortForPicking } from '~/core/stock/pick-order';
import { gridCells, mapExtent, type MapBin } from '~/components/bins/bin-grid';
import { axisToForm, formToPlan } from '~/components/bin-plans/plan-form';

describe('lowStockStep (the alert rule of the issue: once per drop below, re-arm at or above)', () => {
  it.each([
    { onHand: 5, threshold: 6, alerted: false, mayDrop: true, step: 'alert' },
    { onHand: 5, threshold: 6, alerted: true, mayDrop: true, step: 'none' },
    { onHand: 6, threshold: 6, alerted: true, mayDrop: true, step: 're_arm' },
    { onHand: 6, threshold: 6, alerted: false, mayDrop: true, step: 'none' },
    { onHand: 0, threshold: 0, alerted: false, mayDrop: true, step: 'none' },
    { onHand: 2, threshold: 6, alerted: false, mayDrop: false, step: 'none' },
    { onHand: 9, threshold: 6, alerted: true, mayDrop: false, step: 're_arm' },
  ] as const)('on hand $onHand, threshold $threshold, alerted $alerted, may drop $mayDrop → $step', ({ step, ...state }) => {
    expect(lowStockStep(state)).toBe(step);
  });

  it('a run of single-part drops from 10 to 0 against threshold 6 alerts exactly once', () => {
    let alerted = false;
    let alerts = 0;
    for (let onHand = 9; onHand >= 0; onHand--) {
      const s = lowStockStep({ onHand, threshold: 6, alerted });
      if (s === 'alert') (alerts++, (alerted = true));
      if (s === 're_arm') alerted = false;
    }
    expect(alerts).toBe(1);
  });
});

describe('collectScanBatch (what a USB scanner types: the serial, then Enter)', () => {
  it('strips control characters and whitespace, drops blanks, keeps each serial once in order', () => {
    const out = collectScanBatch(['\u0002WS-0001\r', 'WS-0002\n', '', '  WS-0001 ', 'WS-0003\tWS-0004']);
    expect(out.serials).toEqual(['WS-0001', 'WS-0002', 'WS-0003', 'WS-0004']);
    expect(out.repeated).toEqual(['WS-0001']);
  });
  it('upper-cases by the one serial rule, so "ab-1" and "AB-1" are one part', () => {
    expect(collectScanBatch(['ab-1', 'AB-1']).serials).toEqual(['AB-1']);
    expect(cleanScannedSerial('\u001d X \u0004')).toBe('X');
  });
});

describe('countsFromStatusRows', () => {
  it('folds GROUP BY rows into on hand, reserved and issued, ignoring other states', () => {
    expect(
      countsFromStatusRows([
        { status: 'in_stock', count: 4 },
        { status: 'reserved', count: 2 },
        { status: 'issued', count: 1 },
        { status: 'scrapped', count: 9 },
        { status: 'accepted', count: 3 },
      ]),
    ).toEqual({ onHand: 4, reserved: 2, issued: 1 });
  });
});

describe('sortForPicking', () => {
  it('walks locations in natural order, then bins, then serials; no location last', () => {
    const items = [
      { serial: 'B', locationName: 'Drawer 10', binCode: 'I01' },
      { serial: 'C', locationName: null, binCode: 'I01' },
      { serial: 'A', locationName: 'Drawer 2', binCode: 'I03' },
      { serial: 'D', locationName: 'Drawer 2', binCode: 'I01' },
    ];
    expect(sortForPicking(items).map((i) => i.serial)).toEqual(['D', 'A', 'B', 'C']);
  });
});

describe('bin map geometry', () => {
  const bin = (over: Partial<MapBin>): MapBin => ({
    id: 1, code: 'X', label: '', is_hold: false, on_hand: 0, reserved: 0, issued: 0, low: false, low_stock_threshold: 0, location: null,
    idss_lo_a: null, idss_hi_a: null, vp_lo_v: null, vp_hi_v: null, ...over,
  });
  it('a one-axis plan spans the chart in the other direction; the hold bin is not drawn', () => {
    const bins = [bin({ id: 1, idss_lo_a: 2e-3, idss_hi_a: 4e-3 }), bin({ id: 2, is_hold: true })];
    const extent = mapExtent(bins, [{ idss_a: 3e-3, vp_v: -2 }]);
    const cells = gridCells(bins, extent);
    expect(cells).toHaveLength(1);
    expect(cells[0].y0).toBe(extent.y[0]);
    expect(cells[0].y1).toBe(extent.y[1]);
    expect(extent.x[0]).toBeLessThan(2e-3);
    expect(extent.x[1]).toBeGreaterThan(4e-3);
  });
});

describe('plan form units (mA and V typed, SI sent)', () => {
  it('round-trips a uniform IDSS axis in mA and an explicit VP axis in V', () => {
    const plan = formToPlan([
      { quantity: 'idss', kind: 'uniform', start: '2', width: '0.5', count: '36', edges: '', referenceCurrentMa: '' },
      { quantity: 'vp', kind: 'explicit', start: '', width: '', count: '', edges: '-4, -2.5, \u22121.2, -0.6', referenceCurrentMa: '' },
    ]);
    expect(plan.axes[0].edges).toEqual({ kind: 'uniform', startValue: 0.002, width: 0.0005, count: 36 });
    expect(plan.axes[1].edges).toEqual({ kind: 'explicit', edges: [-4, -2.5, -1.2, -0.6] });
    expect(axisToForm(plan.axes[0]).width).toBe('0.5');
  });
});
