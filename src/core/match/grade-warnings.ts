/**
 * Common-practice grades for matched duals and the warnings a match request shows against
 * them. Duals are graded by |VGS1 − VGS2| at the operating current (5–25 mV grades; 10 mV is a
 * usual one), IDSS ratio ≥ 0.95 and gfs ratio ≥ 0.97: common practice. Mismatches here are
 * 1 − min/max, the complement of those ratios (see `measureSetMismatch`).
 */
export const COMMON_PRACTICE_GRADES = {
  maxDvgsV: 0.01,
  maxIdssMismatch: 0.05,
  maxGmMismatch: 0.03,
} as const;

export interface AskedTolerances {
  /** null = no limit asked. */
  maxDvgsV: number | null;
  maxGmMismatch: number | null;
  maxIdssMismatch: number | null;
}

export type GradeFigure = 'dvgs' | 'gm' | 'idss';

export interface GradeWarning {
  figure: GradeFigure;
  /** One sentence for the designer. */
  message: string;
}

const EPS = 1e-9;
const mv = (v: number) => `${Number((v * 1e3).toPrecision(3))} mV`;
const ratio = (mismatch: number) => (1 - mismatch).toFixed(mismatch < 0.001 ? 4 : 3);

/** Warnings for a request whose tolerances are missing or looser than common practice. */
export function toleranceWarnings(t: AskedTolerances): GradeWarning[] {
  const g = COMMON_PRACTICE_GRADES;
  const out: GradeWarning[] = [];
  if (t.maxDvgsV === null) out.push({ figure: 'dvgs', message: `No |ΔVGS| limit: sets with any VGS difference may be proposed (common practice: ${mv(g.maxDvgsV)} or tighter).` });
  else if (t.maxDvgsV > g.maxDvgsV + EPS) out.push({ figure: 'dvgs', message: `|ΔVGS| up to ${mv(t.maxDvgsV)} is looser than the common-practice ${mv(g.maxDvgsV)}.` });
  if (t.maxGmMismatch === null) out.push({ figure: 'gm', message: `No gm limit: sets with any gfs ratio may be proposed (common practice: ratio ≥ ${ratio(g.maxGmMismatch)}).` });
  else if (t.maxGmMismatch > g.maxGmMismatch + EPS) out.push({ figure: 'gm', message: `A gm mismatch of ${(t.maxGmMismatch * 100).toFixed(1)} % (gfs ratio ≥ ${ratio(t.maxGmMismatch)}) is looser than the common-practice ratio ≥ ${ratio(g.maxGmMismatch)}.` });
  if (t.maxIdssMismatch === null) out.push({ figure: 'idss', message: `No IDSS limit: sets with any IDSS ratio may be proposed (common practice: ratio ≥ ${ratio(g.maxIdssMismatch)}).` });
  else if (t.maxIdssMismatch > g.maxIdssMismatch + EPS) out.push({ figure: 'idss', message: `An IDSS mismatch of ${(t.maxIdssMismatch * 100).toFixed(1)} % (IDSS ratio ≥ ${ratio(t.maxIdssMismatch)}) is looser than the common-practice ratio ≥ ${ratio(g.maxIdssMismatch)}.` });
  return out;
}

export interface SetFigures {
  dvgsV: number;
  gmMismatch: number;
  idssMismatch: number;
}

/** The figures of one proposed set that fall outside the common-practice grades. */
export function setGradeWarnings(s: SetFigures): GradeWarning[] {
  const g = COMMON_PRACTICE_GRADES;
  const out: GradeWarning[] = [];
  if (s.dvgsV > g.maxDvgsV + EPS) out.push({ figure: 'dvgs', message: `|ΔVGS| ${mv(s.dvgsV)} is above the common-practice ${mv(g.maxDvgsV)}` });
  if (s.gmMismatch > g.maxGmMismatch + EPS) out.push({ figure: 'gm', message: `gfs ratio ${ratio(s.gmMismatch)} is below the common-practice ${ratio(g.maxGmMismatch)}` });
  if (s.idssMismatch > g.maxIdssMismatch + EPS) out.push({ figure: 'idss', message: `IDSS ratio ${ratio(s.idssMismatch)} is below the common-practice ${ratio(g.maxIdssMismatch)}` });
  return out;
}

/** Whether a set meets every tolerance that was asked (an unasked one is met by any set). */
export function meetsAskedTolerances(s: SetFigures, t: AskedTolerances): boolean {
  const within = (v: number, limit: number | null) => limit === null || v <= limit * (1 + 1e-12);
  return within(s.dvgsV, t.maxDvgsV) && within(s.gmMismatch, t.maxGmMismatch) && within(s.idssMismatch, t.maxIdssMismatch);
}

export type ProposalVerdict = 'best_possible' | 'not_proven_best' | 'outside_common_practice' | 'none_found';

/**
 * What the proposal's heading may claim. "best possible" needs the search's proof of
 * optimality, every tolerance asked, and every set within them and within common practice;
 * with a tolerance left empty or a set outside common practice the claim would mislead.
 */
export function proposalVerdict(args: { exact: boolean; tolerances: AskedTolerances; sets: readonly SetFigures[]; matched: boolean }): ProposalVerdict {
  if (args.sets.length === 0) return 'none_found';
  if (!args.matched) return args.exact ? 'best_possible' : 'not_proven_best';
  const t = args.tolerances;
  const allAsked = t.maxDvgsV !== null && t.maxGmMismatch !== null && t.maxIdssMismatch !== null;
  const allMet = args.sets.every((s) => meetsAskedTolerances(s, t));
  const inPractice = args.sets.every((s) => setGradeWarnings(s).length === 0);
  if (!allAsked || !allMet || !inPractice) return 'outside_common_practice';
  return args.exact ? 'best_possible' : 'not_proven_best';
}
