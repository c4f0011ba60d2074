/**
 * Label stock the print pages lay out for. Sizes in millimetres; a sheet layout prints a grid
 * of labels on a page, a roll layout prints one label per page of the label's own size.
 */
export interface LabelLayout {
  id: string;
  name: string;
  labelWidthMm: number;
  labelHeightMm: number;
  /** For sheets: the page, grid, margins and gaps. */
  sheet?: { pageWidthMm: number; pageHeightMm: number; columns: number; rows: number; marginTopMm: number; marginLeftMm: number; gapXMm: number; gapYMm: number };
}

export const LABEL_LAYOUTS: readonly LabelLayout[] = [
  { id: 'roll-62x29', name: '62 × 29 mm roll label', labelWidthMm: 62, labelHeightMm: 29 },
  { id: 'roll-50x25', name: '50 × 25 mm roll label', labelWidthMm: 50, labelHeightMm: 25 },
  {
    id: 'a4-3x8',
    name: 'A4 sheet, 3 × 8 labels of 70 × 37 mm',
    labelWidthMm: 70,
    labelHeightMm: 37,
    sheet: { pageWidthMm: 210, pageHeightMm: 297, columns: 3, rows: 8, marginTopMm: 0.5, marginLeftMm: 0, gapXMm: 0, gapYMm: 0 },
  },
];

export function labelLayout(id: string | null | undefined): LabelLayout {
  return LABEL_LAYOUTS.find((l) => l.id === id) ?? LABEL_LAYOUTS[0];
}
