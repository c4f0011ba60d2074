import { AppError, type AppErrorArgs } from '../errors';
import { capLength, escapeForMessage, MAX_MESSAGE_LENGTH } from '../sweep-file';

export type IngestRejectionCode =
  | 'unknown_device_type'
  | 'no_device_type'
  | 'unknown_lot'
  | 'channel_conflict'
  | 'not_fittable'
  | 'part_unavailable'
  | 'type_conflict'
  | 'stored_file_missing';

/**
 * A reason to refuse a whole file that is not the parser's: unknown type or lot, a part that
 * cannot take a sweep. The message may quote the file (a lot code, a type name): it is
 * escaped and capped like the parser's.
 */
export class IngestRejection<C extends IngestRejectionCode = IngestRejectionCode> extends AppError<C> {
  constructor(code: C, ...args: AppErrorArgs<C>) {
    super(code, ...args);
    this.message = capLength(escapeForMessage(this.message), MAX_MESSAGE_LENGTH);
    this.name = 'IngestRejection';
  }
}
