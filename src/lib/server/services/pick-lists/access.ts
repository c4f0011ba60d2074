import { AppError } from '../../errors';
import type { Actor } from '../../identity';

/**
 * Stores read every pick list (pickLists:read); a designer reads the lists of their own
 * reservations (match:reserve). Throws 401/403 otherwise; returns which view the actor has.
 */
export function pickListReader(actor: Actor | null): 'stores' | 'designer' {
  if (!actor) throw new AppError('unauthenticated', 'Sign in first: this needs an account.');
  if (actor.permissions.includes('pickLists:read')) return 'stores';
  if (actor.permissions.includes('match:reserve')) return 'designer';
  throw new AppError('forbidden', 'Your roles do not allow this (it needs pickLists:read or match:reserve).', {
    missing: 'pickLists:read',
  });
}
