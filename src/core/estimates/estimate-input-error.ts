export interface EstimateInputIssue {
  /** Dotted path of the offending input field, e.g. "lo.amplitudeV". */
  field: string;
  /** What was expected and what was received. */
  message: string;
}

/** Inputs to a stage estimate were out of range. Names every field at fault. */
export class EstimateInputError extends Error {
  readonly code = 'estimate_input_invalid';
  constructor(readonly issues: EstimateInputIssue[]) {
    super(
      `The stage estimate cannot be computed: ${issues.map((i) => `${i.field}: ${i.message}`).join('; ')}. Correct the inputs and try again.`,
    );
    this.name = 'EstimateInputError';
  }
}

export function throwIfIssues(issues: EstimateInputIssue[]): void {
  if (issues.length > 0) throw new EstimateInputError(issues);
}
