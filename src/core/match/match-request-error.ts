export type MatchRequestErrorCode = 'cascode_needs_current' | 'invalid_request';

/** A match request the picker cannot answer as asked; `message` says what to change. */
export class MatchRequestError extends Error {
  constructor(
    readonly code: MatchRequestErrorCode,
    message: string,
  ) {
    super(message);
    this.name = 'MatchRequestError';
  }
}
