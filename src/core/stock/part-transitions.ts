/**
 * A part's states and the moves between them. Every status change in the app goes through
 * `checkPartTransition`, so the table below is the whole life of a part.
 */
export const PART_STATUSES = [
  'measured',
  'needs_review',
  'retest',
  'accepted',
  'in_stock',
  'reserved',
  'issued',
  'returned',
  'scrapped',
  'quarantined',
] as const;
export type PartStatus = (typeof PART_STATUSES)[number];

const ALLOWED: Record<PartStatus, readonly PartStatus[]> = {
  // A new sweep of any part that is not out of the building re-enters measurement.
  measured: ['needs_review', 'accepted', 'retest', 'scrapped', 'quarantined'],
  needs_review: ['accepted', 'retest', 'measured', 'scrapped', 'quarantined'],
  retest: ['measured', 'needs_review', 'accepted', 'scrapped', 'quarantined'],
  accepted: ['in_stock', 'measured', 'needs_review', 'retest', 'scrapped', 'quarantined'],
  in_stock: ['reserved', 'issued', 'scrapped', 'quarantined', 'in_stock', 'measured', 'needs_review'],
  // A defect found while reserved: the part leaves its set (the reservation keeps it on record
  // and its designer gets a mail); it is no longer picked.
  reserved: ['in_stock', 'issued', 'quarantined', 'needs_review', 'retest', 'scrapped'],
  issued: ['returned'],
  returned: ['in_stock', 'measured', 'needs_review', 'scrapped', 'quarantined'],
  scrapped: [],
  quarantined: ['in_stock', 'measured', 'needs_review', 'retest', 'scrapped'],
};

export interface TransitionCheck {
  ok: boolean;
  /** Why the move is refused, in words for the person who asked for it. */
  reason?: string;
}

const WORDS: Record<PartStatus, string> = {
  measured: 'measured',
  needs_review: 'waiting for review',
  retest: 'marked for retest',
  accepted: 'accepted',
  in_stock: 'in stock',
  reserved: 'reserved',
  issued: 'issued',
  returned: 'returned',
  scrapped: 'scrapped',
  quarantined: 'quarantined',
};

export function describePartStatus(status: PartStatus): string {
  return WORDS[status];
}

/** Whether a part may go from `from` to `to`. `in_stock → in_stock` is a move between locations. */
export function checkPartTransition(from: PartStatus, to: PartStatus): TransitionCheck {
  if (ALLOWED[from].includes(to)) return { ok: true };
  if (from === 'scrapped') return { ok: false, reason: 'it is scrapped; a scrapped part never comes back' };
  return { ok: false, reason: `it is ${WORDS[from]}, and a part that is ${WORDS[from]} cannot become ${WORDS[to]}` };
}

export function allowedNextStatuses(from: PartStatus): readonly PartStatus[] {
  return ALLOWED[from];
}
