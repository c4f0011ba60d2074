/** Parts re-binned when a plan changes: every binned part still in the building or out on issue. */
export const REBIN_STATUSES = ['accepted', 'in_stock', 'reserved', 'issued', 'returned'] as const;
