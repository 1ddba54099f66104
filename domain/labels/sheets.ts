// Label sheets: where each label of a print run falls on A4 or US Letter paper, in mm.
// Sheet sizes: A4 210 × 297 mm (ISO 216); US Letter 8½ × 11 in = 215.9 × 279.4 mm
// (ANSI/ASME Y14.1 "A" size). Label stock sizes and gaps are common office label
// sheets (common practice, no published source); the grid is centred on the sheet,
// which reproduces the margins those sheets are cut with.

import type { UnitSystem } from '@/domain/units/format';

export type SheetId = 'a4' | 'letter';

export interface Sheet {
  id: SheetId;
  label: string;
  widthMm: number;
  heightMm: number;
  /** CSS @page size keyword. */
  cssSize: 'A4' | 'letter';
}

export const SHEETS: Readonly<Record<SheetId, Sheet>> = {
  a4: { id: 'a4', label: 'A4 (210 × 297 mm)', widthMm: 210, heightMm: 297, cssSize: 'A4' },
  letter: { id: 'letter', label: 'US Letter (8½ × 11 in)', widthMm: 215.9, heightMm: 279.4, cssSize: 'letter' },
};

export const SHEET_IDS: readonly SheetId[] = ['a4', 'letter'];

/**
 * The label paper an organisation prints on: US Letter in the United States, A4 elsewhere
 * (ISO 216 is the paper standard nearly everywhere else). Beadline keeps no organisation
 * locale setting yet, so the unit system stands in for it: 'us' (US customary) → Letter,
 * 'si' → A4. The paper stays selectable on the print page; when an organisation setting
 * for its country exists, it replaces the argument here and nowhere else.
 */
export function labelPaperFor(locale: { unitSystem: UnitSystem }): SheetId {
  return locale.unitSystem === 'us' ? 'letter' : 'a4';
}

export interface LabelStock {
  id: string;
  label: string;
  widthMm: number;
  heightMm: number;
  /** Gap between columns and between rows, mm. */
  gapXMm: number;
  gapYMm: number;
  /** Least margin left free at the sheet's edges (left/right, top/bottom), mm: the stock's own margins. */
  minMarginXMm: number;
  minMarginYMm: number;
  /** The sheet this stock is usually sold on (the picker's default pairing). */
  usualSheet: SheetId;
}

const IN = 25.4;

export const LABEL_STOCKS: readonly LabelStock[] = [
  { id: 'a4-99x38', label: '99.1 × 38.1 mm, 14 a sheet', widthMm: 99.1, heightMm: 38.1, gapXMm: 2.5, gapYMm: 0, minMarginXMm: 4, minMarginYMm: 4, usualSheet: 'a4' },
  { id: 'a4-99x68', label: '99.1 × 67.7 mm, 8 a sheet', widthMm: 99.1, heightMm: 67.7, gapXMm: 2.5, gapYMm: 0, minMarginXMm: 4, minMarginYMm: 4, usualSheet: 'a4' },
  { id: 'a4-70x37', label: '70 × 37 mm, 24 a sheet', widthMm: 70, heightMm: 37, gapXMm: 0, gapYMm: 0, minMarginXMm: 0, minMarginYMm: 0, usualSheet: 'a4' },
  { id: 'letter-4x2', label: '4 × 2 in, 10 a sheet', widthMm: 4 * IN, heightMm: 2 * IN, gapXMm: 0.1875 * IN, gapYMm: 0, minMarginXMm: 0.125 * IN, minMarginYMm: 0.5 * IN, usualSheet: 'letter' },
  { id: 'letter-4x3', label: '4 × 3⅓ in, 6 a sheet', widthMm: 4 * IN, heightMm: (10 / 3) * IN, gapXMm: 0.1875 * IN, gapYMm: 0, minMarginXMm: 0.125 * IN, minMarginYMm: 0.5 * IN, usualSheet: 'letter' },
  { id: 'letter-2x1', label: '2⅝ × 1 in, 30 a sheet', widthMm: 2.625 * IN, heightMm: 1 * IN, gapXMm: 0.125 * IN, gapYMm: 0, minMarginXMm: 0.125 * IN, minMarginYMm: 0.5 * IN, usualSheet: 'letter' },
];

export function findLabelStock(id: string): LabelStock | undefined {
  return LABEL_STOCKS.find((stock) => stock.id === id);
}

export interface SheetLayout {
  sheet: Sheet;
  stock: LabelStock;
  columns: number;
  rows: number;
  perSheet: number;
  /** Left and top margin of the centred grid, mm. */
  marginLeftMm: number;
  marginTopMm: number;
}

/** Small tolerance so that stock that exactly fills a sheet (3 × 70 mm = 210 mm) fits. */
const FIT_TOLERANCE_MM = 1e-6;

/**
 * How many labels of a stock fit on a sheet and where the centred grid starts:
 * columns = ⌊(W − 2·minMarginX + gapX) / (w + gapX)⌋, rows likewise; margin = (W − used) / 2.
 * Returns columns = rows = 0 when a label is larger than the sheet.
 */
export function layoutSheet(sheet: Sheet, stock: LabelStock): SheetLayout {
  const fit = (space: number, size: number, gap: number) => Math.max(0, Math.floor((space + gap + FIT_TOLERANCE_MM) / (size + gap)));
  const columns = fit(sheet.widthMm - 2 * stock.minMarginXMm, stock.widthMm, stock.gapXMm);
  const rows = fit(sheet.heightMm - 2 * stock.minMarginYMm, stock.heightMm, stock.gapYMm);
  const usedW = columns > 0 ? columns * stock.widthMm + (columns - 1) * stock.gapXMm : 0;
  const usedH = rows > 0 ? rows * stock.heightMm + (rows - 1) * stock.gapYMm : 0;
  return {
    sheet,
    stock,
    columns,
    rows,
    perSheet: columns * rows,
    marginLeftMm: (sheet.widthMm - usedW) / 2,
    marginTopMm: (sheet.heightMm - usedH) / 2,
  };
}

export interface LabelSlot {
  /** Index into the list of labels being printed. */
  item: number;
  page: number;
  column: number;
  row: number;
  xMm: number;
  yMm: number;
}

/**
 * Places `count` labels on sheets, row by row, skipping the first `skip` positions of the
 * first sheet (a partly used sheet). Returns the slots and the number of pages.
 */
export function placeLabels(layout: SheetLayout, count: number, skip = 0): { pages: number; slots: LabelSlot[] } {
  if (layout.perSheet === 0 || count <= 0) return { pages: 0, slots: [] };
  const start = Math.max(0, Math.min(Math.floor(skip), layout.perSheet - 1));
  const slots: LabelSlot[] = [];
  for (let item = 0; item < count; item += 1) {
    const position = start + item;
    const page = Math.floor(position / layout.perSheet);
    const onPage = position % layout.perSheet;
    const row = Math.floor(onPage / layout.columns);
    const column = onPage % layout.columns;
    slots.push({
      item,
      page,
      column,
      row,
      xMm: layout.marginLeftMm + column * (layout.stock.widthMm + layout.stock.gapXMm),
      yMm: layout.marginTopMm + row * (layout.stock.heightMm + layout.stock.gapYMm),
    });
  }
  return { pages: Math.floor((start + count - 1) / layout.perSheet) + 1, slots };
}
