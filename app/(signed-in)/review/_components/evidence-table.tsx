import type { ReactNode } from "react";

/** One column of an EvidenceTable: its header (also the cell's label on a phone) and how a row's cell reads. */
export type EvidenceColumn<Row> = { header: string; cell: (row: Row) => ReactNode; isRowHeader?: boolean };

/**
 * The evidence panel's tables (plan against recorded, typed against the trace): a plain
 * table from the `sm` breakpoint up; on a phone each row stacks — the value's name on its
 * own line, then each cell under its column's name — so a 390 px screen never scrolls
 * sideways and words are not broken. The rows keep their table roles either way.
 */
export function EvidenceTable<Row>({
  columns,
  rows,
  rowKey,
  rowClassName,
  labelledBy,
  caption,
}: {
  columns: readonly EvidenceColumn<Row>[];
  rows: readonly Row[];
  rowKey: (row: Row) => string;
  rowClassName?: (row: Row) => string;
  labelledBy?: string;
  caption?: ReactNode;
}) {
  return (
    <table role="table" aria-labelledby={labelledBy} className="w-full border-collapse text-left text-sm max-sm:block">
      {caption ? <caption className="p-1 text-left font-semibold max-sm:block">{caption}</caption> : null}
      <thead className="max-sm:sr-only">
        <tr className="border-b-2 border-slate-400">
          {columns.map((c) => (
            <th key={c.header} scope="col" className="p-1 whitespace-nowrap">
              {c.header}
            </th>
          ))}
        </tr>
      </thead>
      <tbody className="max-sm:block">
        {rows.map((row) => (
          <tr key={rowKey(row)} role="row" className={`border-b border-slate-200 align-top max-sm:block max-sm:py-1 ${rowClassName?.(row) ?? ""}`}>
            {columns.map((c) =>
              c.isRowHeader ? (
                <th key={c.header} scope="row" role="rowheader" className="p-1 text-left font-semibold max-sm:block max-sm:pb-0">
                  {c.cell(row)}
                </th>
              ) : (
                <td
                  key={c.header}
                  role="cell"
                  data-label={c.header}
                  className="p-1 break-words max-sm:flex max-sm:gap-2 max-sm:py-0 max-sm:before:w-24 max-sm:before:shrink-0 max-sm:before:text-slate-700 max-sm:before:content-[attr(data-label)]"
                >
                  <span className="min-w-0">{c.cell(row)}</span>
                </td>
              ),
            )}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
