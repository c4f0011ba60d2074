import { z } from 'zod';
import { AppError } from '../errors';
import { describeIssue } from '../field-path-words';

/**
 * A bin plan for one device type: one or two axes over data-sheet figures, each cut into
 * half-open ranges [lo, hi) — a value exactly on an edge belongs to the upper range — plus a
 * hold bin for parts outside the grid or missing a figure.
 *
 * Bin codes (our own scheme, stable for a given plan): one letter per axis quantity
 * (I = IDSS, P = pinch-off VP, G = VGS at the reference current) followed by the 1-based range
 * index, zero-padded to at least two digits; two axes are joined by "-" in plan order, e.g.
 * "I07-P03". The hold bin is "HOLD".
 */

export const BIN_QUANTITIES = ['idss', 'vp', 'vgs_at_current'] as const;
export type BinQuantity = (typeof BIN_QUANTITIES)[number];

export const HOLD_BIN_CODE = 'HOLD';
export const HOLD_BIN_LABEL = 'Hold (outside the bin plan)';

export const BIN_AXIS_LETTER: Record<BinQuantity, string> = {
  idss: 'I',
  vp: 'P',
  vgs_at_current: 'G',
};

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

export const BinAxisEdges = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('uniform'),
    startValue: finite,
    width: finite.refine((w) => w > 0, 'width must be greater than 0'),
    count: z.number().int('count must be a whole number').min(1).max(999),
  }),
  z.object({
    kind: z.literal('explicit'),
    edges: z.array(finite).min(2, 'explicit edges need at least 2 values').max(1000),
  }),
]);
export type BinAxisEdges = z.infer<typeof BinAxisEdges>;

export const BinAxis = z.object({
  /** 'idss': A at the type's test VDS; 'vp': V, datasheet sign; 'vgs_at_current': V. */
  quantity: z.enum(BIN_QUANTITIES),
  edges: BinAxisEdges,
  /** Required for 'vgs_at_current': the drain current (A, magnitude) the VGS figure is taken at. */
  referenceCurrentA: z.number().positive().optional(),
});
export type BinAxis = z.infer<typeof BinAxis>;

export const BinPlan = z
  .object({
    axes: z.array(BinAxis).min(1, 'a plan has one or two axes').max(2, 'a plan has one or two axes'),
    /**
     * Codes this version gives grid cells instead of their positional code ("I07-P03" →
     * "I07-P03.v2"), so that no version reuses a code for a different range; see
     * `withStableBinCodes`. Written by the server when a version is saved.
     */
    codes: z.record(z.string(), z.string().regex(/^[A-Z0-9][A-Za-z0-9.-]{0,39}$/, 'a bin code is letters, digits, "." and "-"')).optional(),
  })
  .superRefine((plan, ctx) => {
    for (const issue of binPlanIssues(plan)) {
      ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
    }
  });
export type BinPlan = z.infer<typeof BinPlan>;

/** Figures of one part, in SI and datasheet sign; a missing figure sends the part to hold. */
export interface BinFigures {
  idssA?: number | null;
  vpV?: number | null;
  vgsAtCurrentV?: number | null;
}

export interface BinPlanIssue {
  path: (string | number)[];
  message: string;
}

/**
 * A plan that breaks the rules. The message names each field in words, relative to the plan;
 * `fields` gives each path for programs, under `at` (where the plan sits in its request).
 */
export class BinPlanError extends AppError<'bin_plan_invalid'> {
  constructor(
    readonly issues: BinPlanIssue[],
    at: readonly (string | number)[] = [],
  ) {
    super(
      'bin_plan_invalid',
      { problems: issues.map((i) => describeIssue(i.path, i.message)) },
      { fields: issues.map((i) => ({ field: [...at, ...i.path].join('.'), message: i.message })) },
    );
    this.name = 'BinPlanError';
  }
}

/** Checks the rules zod's shape cannot: strictly increasing edges, distinct axes, reference current. */
export function binPlanIssues(plan: BinPlan): BinPlanIssue[] {
  const issues: BinPlanIssue[] = [];
  if (plan.axes.length < 1 || plan.axes.length > 2) {
    issues.push({ path: ['axes'], message: `a plan has one or two axes, got ${plan.axes.length}` });
  }
  plan.axes.forEach((axis, i) => {
    issues.push(...binAxisIssues(axis, ['axes', i]));
  });
  if (plan.axes.length === 2 && plan.axes[0].quantity === plan.axes[1].quantity) {
    issues.push({
      path: ['axes', 1, 'quantity'],
      message: `both axes bin on '${plan.axes[0].quantity}'; use two different quantities`,
    });
  }
  return issues;
}

export function binAxisIssues(axis: BinAxis, path: (string | number)[] = []): BinPlanIssue[] {
  const issues: BinPlanIssue[] = [];
  const e = axis.edges;
  if (e.kind === 'explicit') {
    if (e.edges.length < 2) {
      issues.push({ path: [...path, 'edges', 'edges'], message: 'need at least 2 edges' });
    }
    e.edges.forEach((v, k) => {
      if (!Number.isFinite(v)) {
        issues.push({ path: [...path, 'edges', 'edges', k], message: `edge ${k + 1} is not a finite number` });
      } else if (k > 0 && !(v > e.edges[k - 1])) {
        issues.push({
          path: [...path, 'edges', 'edges', k],
          message: `edges must be strictly increasing, but edge ${k + 1} (${v}) is not above edge ${k} (${e.edges[k - 1]})`,
        });
      }
    });
  } else {
    if (!Number.isFinite(e.startValue)) {
      issues.push({ path: [...path, 'edges', 'startValue'], message: 'startValue must be a finite number' });
    }
    if (!(e.width > 0) || !Number.isFinite(e.width)) {
      issues.push({ path: [...path, 'edges', 'width'], message: `width must be greater than 0, got ${e.width}` });
    }
    if (!Number.isInteger(e.count) || e.count < 1 || e.count > 999) {
      issues.push({ path: [...path, 'edges', 'count'], message: `count must be a whole number from 1 to 999, got ${e.count}` });
    }
  }
  if (axis.quantity === 'vgs_at_current' && !(axis.referenceCurrentA !== undefined && axis.referenceCurrentA > 0)) {
    issues.push({
      path: [...path, 'referenceCurrentA'],
      message: "a 'vgs_at_current' axis needs referenceCurrentA, the drain current in A (> 0)",
    });
  }
  return issues;
}

/**
 * Parses untrusted input (an admin's form, a stored JSON plan) into a BinPlan or throws
 * BinPlanError; `at` is the plan's path in the request, for the error's `fields`.
 */
export function parseBinPlan(input: unknown, at: readonly (string | number)[] = []): BinPlan {
  const result = BinPlan.safeParse(input);
  if (result.success) return result.data;
  // The shape checks and binPlanIssues can both report one field; keep the first per field.
  const seen = new Set<string>();
  const issues: BinPlanIssue[] = [];
  for (const i of result.error.issues) {
    const path = i.path.map((p) => (typeof p === 'symbol' ? String(p) : p));
    const key = path.join('.');
    if (seen.has(key)) continue;
    seen.add(key);
    issues.push({ path, message: i.message });
  }
  throw new BinPlanError(issues, at);
}

/** Throws BinPlanError when a plan built in code breaks the rules. */
export function assertValidBinPlan(plan: BinPlan): void {
  const issues = binPlanIssues(plan);
  if (issues.length > 0) throw new BinPlanError(issues);
}
