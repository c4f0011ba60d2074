/** A barcode made from a name when none is given: "Cabinet A / Drawer 3" → "LOC-CABINET-A-DRAWER-3". */
export function barcodeFromName(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toUpperCase()
    .slice(0, 56);
  return `LOC-${slug || 'X'}`;
}
