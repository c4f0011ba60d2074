import type { BinAxis, BinPlan, BinQuantity } from '~/core/binning';

/** An axis as the admin types it: IDSS in mA, voltages in V, reference current in mA. */
export interface AxisForm {
  quantity: BinQuantity;
  kind: 'uniform' | 'explicit';
  start: string;
  width: string;
  count: string;
  edges: string;
  referenceCurrentMa: string;
}

export const QUANTITY_NAMES: Record<BinQuantity, string> = {
  idss: 'IDSS at the test VDS (mA)',
  vp: 'Pinch-off VP (V, datasheet sign)',
  vgs_at_current: 'VGS at a reference current (V)',
};

const factor = (q: BinQuantity) => (q === 'idss' ? 1e-3 : 1);
const si = (text: string, q: BinQuantity) => Number((Number(text.replace('\u2212', '-')) * factor(q)).toPrecision(12));
const shown = (v: number, q: BinQuantity) => String(Number((v / factor(q)).toPrecision(10)));

export function axisToForm(axis: BinAxis): AxisForm {
  const q = axis.quantity;
  const e = axis.edges;
  return {
    quantity: q,
    kind: e.kind,
    start: e.kind === 'uniform' ? shown(e.startValue, q) : '',
    width: e.kind === 'uniform' ? shown(e.width, q) : '',
    count: e.kind === 'uniform' ? String(e.count) : '',
    edges: e.kind === 'explicit' ? e.edges.map((v) => shown(v, q)).join(', ') : '',
    referenceCurrentMa: axis.referenceCurrentA ? String(Number((axis.referenceCurrentA * 1e3).toPrecision(10))) : '',
  };
}

/** The plan in SI as the API takes it; the server checks it (and names the field) on preview. */
export function formToPlan(axes: AxisForm[]): BinPlan {
  return {
    axes: axes.map((a) => ({
      quantity: a.quantity,
      edges:
        a.kind === 'uniform'
          ? { kind: 'uniform' as const, startValue: si(a.start, a.quantity), width: si(a.width, a.quantity), count: Number(a.count) }
          : { kind: 'explicit' as const, edges: a.edges.split(/[\s,;]+/).filter(Boolean).map((t) => si(t, a.quantity)) },
      ...(a.quantity === 'vgs_at_current' ? { referenceCurrentA: Number((Number(a.referenceCurrentMa) * 1e-3).toPrecision(12)) } : {}),
    })),
  };
}

/** A starting plan for a type with none: IDSS 0.5 mA steps and VP 0.4 V steps over its limits. */
export function defaultAxes(type: { channel: 'n' | 'p'; idss_min_a?: number | null; idss_max_a?: number | null }): AxisForm[] {
  return [
    { quantity: 'idss', kind: 'uniform', start: '2', width: '0.5', count: '36', edges: '', referenceCurrentMa: '' },
    type.channel === 'n'
      ? { quantity: 'vp', kind: 'uniform', start: '-4', width: '0.4', count: '9', edges: '', referenceCurrentMa: '' }
      : { quantity: 'vp', kind: 'uniform', start: '0.4', width: '0.4', count: '9', edges: '', referenceCurrentMa: '' },
  ];
}
