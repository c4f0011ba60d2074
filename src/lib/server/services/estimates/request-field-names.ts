import { EstimateInputError } from '~/core/estimates';
import { describeIssue } from '~/core/field-path-words';

/** camelCase core field paths → the snake_case names of the request ("lo.amplitudeV" → "lo.amplitude_v"). */
export function requestFieldName(corePath: string, renames: Record<string, string> = {}): string {
  if (renames[corePath]) return renames[corePath];
  return corePath
    .split('.')
    .map((p) => p.replace(/([a-z0-9])([A-Z])/g, '$1_$2').toLowerCase())
    .join('.');
}

/**
 * Runs a core estimate so that an EstimateInputError names the request's fields, not the
 * core's: the same error, its fields renamed and phrased in words. `renames` maps core paths
 * whose request name differs (e.g. idA → target_drain_current_a).
 */
export function inRequestFieldNames<T>(run: () => T, renames: Record<string, string> = {}, prefix = ''): T {
  try {
    return run();
  } catch (err) {
    if (!(err instanceof EstimateInputError)) throw err;
    const issues = err.issues.map((i) => ({ field: prefix + requestFieldName(i.field, renames), message: i.message }));
    throw new EstimateInputError(
      issues,
      issues.map((i) => describeIssue(i.field.split('.'), i.message)),
    );
  }
}
