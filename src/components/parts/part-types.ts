import { PART_STATUSES, describePartStatus } from '~/core/stock/part-transitions';
import type { OperatingPointJson, PartDetailJson, PartOperatingJson } from '~/contracts/parts';

/** The contracts the part page reads, under the names its components use. */
export type { OperatingPointJson, PartOperatingJson };
export type PartJson = PartDetailJson;

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
