import { EstimateInputError } from '~/core/estimates';
import { describeIssue } from '~/core/field-path-words';
import { AppError } from '~/lib/server/errors';

/** camelCase core field paths → the snake_case names of the request ("lo.amplitudeV" → "lo.amplitude_v"). */
export function requestFieldName(corePath: string, renames: Record<string, string> = {}): string {
  if (renames[corePath]) return renames[corePath];
  return corePath
    .split('.')
    .map((p) => p.replace(/([a-z0-9])([A-Z])/g, '$1_$2').toLowerCase())
    .join('.');
}

/**
 * Runs a core estimate and turns its EstimateInputError into a 400 naming the request's fields.
 * `renames` maps core paths whose request name differs (e.g. idA → target_drain_current_a).
 */
export function withRequestFields<T>(run: () => T, renames: Record<string, string> = {}, prefix = ''): T {
  try {
    return run();
  } catch (err) {
    if (err instanceof EstimateInputError) {
      const fields = err.issues.map((i) => ({ field: prefix + requestFieldName(i.field, renames), message: i.message }));
      const words = fields.map((f) => describeIssue(f.field.split('.'), f.message));
      throw new AppError('invalid_input', `The estimate cannot be computed — ${words.join('; ')}.`, { fields });
    }
    throw err;
  }
}
