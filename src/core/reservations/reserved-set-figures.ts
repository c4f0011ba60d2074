import { fromNEquivalent, type Channel } from '../jfet-model';
import { measureSetMismatch, type SetMismatch } from '../match/set-mismatch';
import { partOperatingFigures, type OperatingRequest, type PartBasis } from '../operating-point/part-operating-figures';

/**
 * A reserved set's figures before and after one of its parts changed (a refit, a retest, a
 * scrap), at the reservation's operating point, from the parts' current fits through
 * `partOperatingFigures` (measured where the sweep reaches the point).
 */
export type ReservedOperatingPoint = OperatingRequest;

export interface ReservedPartInput {
  serial: string;
  role: string;
  status: string;
  /** Figures stored when the set was reserved (VGS datasheet sign, gm and IDSS magnitudes). */
  matched: { vgsV: number; gmS: number; idssA: number };
  /** What the current fit's figures come from; null when the part has none. */
  basis: PartBasis | null;
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

function figuresNow(
  basis: PartBasis,
  op: ReservedOperatingPoint,
  channel: Channel,
  compareAtC: number | undefined,
): { vgsV: number; gmS: number; idssA: number } | null {
  const e = partOperatingFigures(basis, op, compareAtC);
  if (!e.usable) return null;
  return { vgsV: fromNEquivalent(channel, e.figures.vgsV), gmS: e.figures.gmS, idssA: e.figures.idssA };
}

export function reservedSetFigures(
  parts: readonly ReservedPartInput[],
  op: ReservedOperatingPoint,
  channel: Channel,
  compareAtC?: number,
): ReservedSetFigures {
  const out = parts.map((p) => ({
    serial: p.serial,
    role: p.role,
    status: p.status,
    was: p.matched,
    now: p.basis ? figuresNow(p.basis, op, channel, compareAtC) : null,
  }));
  const was = measureSetMismatch(out.map((p) => ({ vgsV: p.was.vgsV, gmS: p.was.gmS, idssA: p.was.idssA })));
  const now = out.every((p) => p.now !== null) ? measureSetMismatch(out.map((p) => p.now!)) : null;
  return { parts: out, was, now };
}
