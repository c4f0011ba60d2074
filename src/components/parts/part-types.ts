import { PART_STATUSES, describePartStatus } from '~/core/stock/part-transitions';
import type { AuditEntryJson } from '~/lib/server/services/audit/describe-rows';
import type { getPartBySerial } from '~/lib/server/services/parts/get';
import type { getPartOperatingPoint } from '~/lib/server/services/parts/operating-point';

/** The part page's operating-point section (IDSS at the test VDS, model against measurements). */
export type PartOperatingJson = NonNullable<Awaited<ReturnType<typeof getPartBySerial>>['operating']>;
/** GET /api/parts/{serial}/operating-point. */
export type OperatingPointJson = Awaited<ReturnType<typeof getPartOperatingPoint>>;
import type { ApiCurve } from '../charts/chart-data';

export interface FlagDetail {
  code: string;
  message: string;
  excluded_points?: number[];
}

/** GET /api/parts/{serial}, as the part page reads it. */
export interface PartJson {
  serial: string;
  channel: 'n' | 'p';
  status: string;
  device_type: string;
  lot: string | null;
  bin_code: string | null;
  bin_label: string | null;
  location: string | null;
  fit_id: number | null;
  model: string | null;
  engine_version: string | null;
  vto_v: number | null;
  beta_a_per_v2: number | null;
  lambda_per_v: number | null;
  rs_ohm: number | null;
  rd_ohm: number | null;
  idss_a: number | null;
  idss_measured_a: number | null;
  idss_vds_v: number | null;
  vp_v: number | null;
  gfs_s: number | null;
  gos_s: number | null;
  rds_on_ohm: number | null;
  rms_rel: number | null;
  rms_a: number | null;
  r_squared: number | null;
  iterations: number | null;
  points_fitted: number | null;
  extended_test: { f_statistic: number | null; p_value: number | null; kept: boolean } | null;
  flags: string[];
  flag_details: FlagDetail[];
  review: string | null;
  review_note: string | null;
  fitted_at: string | null;
  standard_errors: Record<string, number | null> | null;
  test_conditions: { temperature_c: number | null; station: string | null; operator: string | null; vds_test_v: number; measured_at: string } | null;
  model_card: string | null;
  current_sweep: {
    sweep_id: number;
    curves: ApiCurve[];
    excluded_points: [number, number][];
    /** What the intake left out or kept short, and why (gate leakage, short curves). */
    notes: { code: string; vgs_v: number | null; message: string }[];
  } | null;
  sweeps: {
    sweep_id: number;
    measured_at: string;
    file_name: string | null;
    upload_id: string | null;
    temperature_c: number | null;
    station: string | null;
    operator: string | null;
    point_count: number;
    vgs_steps_v: number[];
    is_current: boolean;
    fits: { fit_id: number; fitted_at: string; idss_a: number; vp_v: number; rms_rel: number | null; flags: string[]; review: string; is_current: boolean }[];
  }[];
  operating: PartOperatingJson | null;
  audit: AuditEntryJson[] | null;
}

/** Short plain names for the fitter's flag codes; the full sentence comes with each flag. */
export const FLAG_WORDS: Record<string, string> = {
  poor_fit: 'poor fit',
  self_heating: 'self-heating',
  breakdown: 'breakdown onset',
  too_few_saturation_points: 'too few points in saturation',
  too_few_curves: 'too few curves',
  parameter_at_bound: 'parameter at its limit',
  no_convergence: 'fit did not converge',
  model_disagrees: 'model differs from measurements',
};

export function flagWord(code: string): string {
  return FLAG_WORDS[code] ?? code.replace(/_/g, ' ');
}

/** Status words shared with the server's messages. */
export const STATUS_WORDS: Record<string, string> = Object.fromEntries(
  PART_STATUSES.map((status) => [status, describePartStatus(status)]),
);

export function statusClass(status: string): string {
  if (status === 'accepted' || status === 'in_stock') return 'tag-ok';
  if (status === 'needs_review' || status === 'retest') return 'tag-review';
  if (status === 'scrapped' || status === 'quarantined') return 'tag-fault';
  if (status === 'reserved' || status === 'issued') return 'tag-held';
  return 'tag-plain';
}
