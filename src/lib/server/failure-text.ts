import { DrizzleQueryError } from 'drizzle-orm';
import { storableText } from '~/core/text/storable-text';

/**
 * What went wrong, in words worth storing and showing: for a statement the database refused,
 * its own message (Drizzle's error quotes the whole statement and every parameter, which
 * can be megabytes of curves and hides the reason at the end); otherwise the error's message.
 * Storable (see `storableText`) and at most `maxLength` long.
 */
export function describeFailure(error: unknown, maxLength = 1000): string {
  if (error instanceof DrizzleQueryError && error.cause) {
    const cause = error.cause as { message?: string; detail?: string };
    const detail = cause.detail ? ` (${cause.detail})` : '';
    return storableText(`the database refused a statement: ${cause.message ?? String(cause)}${detail}`, maxLength);
  }
  if (error instanceof Error) return storableText(error.message, maxLength);
  return storableText(error, maxLength);
}
