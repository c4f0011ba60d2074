import { fromNEquivalent, gmAtCurrentS, idssA as modelIdssA, vgsAtCurrentV, type Channel, type JfetParams } from '../jfet-model';
import { measureSetMismatch, type SetMismatch } from '../match/set-mismatch';
import { solveSelfBias } from '../estimates/solve-self-bias';

/**
 * A reserved set's figures before and after one of its parts changed (a refit, a retest, a
 * scrap), at the reservation's operating point, from the parts' current fits (level-1 model).
 */
export type ReservedOperatingPoint =
  | { kind: 'current'; idA: number; vdsV: number }
  | { kind: 'idss'; vdsV: number }
  | { kind: 'self_bias'; rsOhm: number; vdsV: number };

export interface ReservedPartInput {
  serial: string;
  role: string;
  status: string;
  /** Figures stored when the set was reserved (VGS datasheet sign, gm and IDSS magnitudes). */
  matched: { vgsV: number; gmS: number; idssA: number };
  /** The current fit's parameters; null when the part has none. */
  params: JfetParams | null;
}

export interface ReservedPartFigures {
  serial: string;
  role: string;
  status: string;
  was: { vgsV: number; gmS: number; idssA: number };
  /** At the operating point from the current fit; null without a fit or when it cannot run there. */
  now: { vgsV: number; gmS: number; idssA: number } | null;
}

export interface ReservedSetFigures {
  parts: ReservedPartFigures[];
  was: SetMismatch;
  /** Null when a part has no figures now. */
  now: SetMismatch | null;
}

function figuresNow(p: JfetParams, op: ReservedOperatingPoint, channel: Channel): { vgsV: number; gmS: number; idssA: number } | null {
  const idss = modelIdssA(p, op.vdsV);
  if (op.kind === 'idss') return { vgsV: 0, gmS: gmAtCurrentS(p, idss, op.vdsV), idssA: idss };
  if (op.kind === 'self_bias') {
    try {
      const s = solveSelfBias(p, { rsOhm: op.rsOhm, vdsV: op.vdsV, channel });
      return { vgsV: s.vgsV, gmS: s.gmS, idssA: idss };
    } catch {
      return null;
    }
  }
  const vgsN = vgsAtCurrentV(p, op.idA, op.vdsV);
  if (!Number.isFinite(vgsN) || vgsN > 0) return null;
  return { vgsV: fromNEquivalent(channel, vgsN), gmS: gmAtCurrentS(p, op.idA, op.vdsV), idssA: idss };
}

export function reservedSetFigures(parts: readonly ReservedPartInput[], op: ReservedOperatingPoint, channel: Channel): ReservedSetFigures {
  const out = parts.map((p) => ({
    serial: p.serial,
    role: p.role,
    status: p.status,
    was: p.matched,
    now: p.params ? figuresNow(p.params, op, channel) : null,
  }));
  const was = measureSetMismatch(out.map((p) => ({ vgsV: p.was.vgsV, gmS: p.was.gmS, idssA: p.was.idssA })));
  const now = out.every((p) => p.now !== null) ? measureSetMismatch(out.map((p) => p.now!)) : null;
  return { parts: out, was, now };
}
