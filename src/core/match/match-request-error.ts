import { AppError, type AppErrorArgs } from '../errors';

export type MatchRequestErrorCode = 'cascode_needs_current' | 'match_request_invalid';

/** A match request the picker cannot answer as asked; `message` says what to change. */
export class MatchRequestError<C extends MatchRequestErrorCode = MatchRequestErrorCode> extends AppError<C> {
  constructor(code: C, ...args: AppErrorArgs<C>) {
    super(code, ...args);
    this.name = 'MatchRequestError';
  }
}
