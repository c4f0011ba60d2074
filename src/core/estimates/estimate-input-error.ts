import { AppError } from '../errors';

export interface EstimateInputIssue {
  /** Dotted path of the offending input field, e.g. "lo.amplitudeV". */
  field: string;
  /** What was expected and what was received. */
  message: string;
}

/**
 * Inputs to a stage estimate were out of range. Names every field at fault; `fields` keeps the
 * paths for programs. `problems` phrases each issue (by default "path: message"; a service
 * that knows the request's own field names phrases them in words).
 */
export class EstimateInputError extends AppError<'estimate_input_invalid'> {
  constructor(
    readonly issues: EstimateInputIssue[],
    problems: string[] = issues.map((i) => `${i.field}: ${i.message}`),
  ) {
    super('estimate_input_invalid', { problems }, { fields: issues.map((i) => ({ field: i.field, message: i.message })) });
    this.name = 'EstimateInputError';
  }
}

export function throwIfIssues(issues: EstimateInputIssue[]): void {
  if (issues.length > 0) throw new EstimateInputError(issues);
}
