/**
 * The order a person walks the shelves: by location name in natural order ("Drawer 2" before
 * "Drawer 10"), then bin code, then serial. Parts without a location come last.
 */
export interface PickItem {
  serial: string;
  locationName: string | null;
  binCode: string | null;
}

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

export function comparePickOrder(a: PickItem, b: PickItem): number {
  if (a.locationName === null && b.locationName !== null) return 1;
  if (b.locationName === null && a.locationName !== null) return -1;
  return (
    collator.compare(a.locationName ?? '', b.locationName ?? '') ||
    collator.compare(a.binCode ?? '', b.binCode ?? '') ||
    collator.compare(a.serial, b.serial)
  );
}

export function sortForPicking<T extends PickItem>(items: readonly T[]): T[] {
  return [...items].sort(comparePickOrder);
}
