/** A reason to refuse a whole file that is not the parser's: unknown type or lot, a part that cannot take a sweep. */
export class IngestRejection extends Error {
  constructor(
    readonly code: 'unknown_device_type' | 'no_device_type' | 'unknown_lot' | 'channel_conflict' | 'not_fittable' | 'part_unavailable' | 'type_conflict' | 'stored_file_missing',
    message: string,
  ) {
    super(message);
    this.name = 'IngestRejection';
  }
}
