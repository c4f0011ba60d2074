/**
 * The dates Sluice takes in requests: 1900-01-01 to 2999-12-31 (UTC). PostgreSQL's timestamps
 * hold neither year 0 nor JavaScript's far dates (+275760), and no lot or sweep is older or
 * newer than these bounds.
 */
export const STORABLE_DATE_MIN = new Date('1900-01-01T00:00:00.000Z');
export const STORABLE_DATE_MAX = new Date('2999-12-31T23:59:59.999Z');
export const STORABLE_DATE_RANGE_TEXT = 'a date from 1900-01-01 to 2999-12-31';

export function isStorableDate(d: Date): boolean {
  const t = d.getTime();
  return Number.isFinite(t) && t >= STORABLE_DATE_MIN.getTime() && t <= STORABLE_DATE_MAX.getTime();
}
