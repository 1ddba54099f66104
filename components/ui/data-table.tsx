import Link from "next/link";
import type { ReactNode } from "react";

/** One column of a DataTable: its header, how a row's cell reads, and where it sits. */
export type Column<Row> = {
  header: ReactNode;
  cell: (row: Row, index: number) => ReactNode;
  /** Numbers read best right-aligned; text stays left. */
  align?: "left" | "right" | "center";
  /** The cell that names the row becomes `<th scope="row">`. */
  isRowHeader?: boolean;
  /** When set, the cell's content links to this address (the row's detail page). */
  href?: (row: Row) => string;
  className?: string;
};

const ALIGN = { left: "text-left", right: "text-right", center: "text-center" } as const;

/**
 * A plain table of rows with column headers (`<th scope="col">`), named by a caption or by
 * the heading of the section around it. On a phone it scrolls sideways inside its own box,
 * never the page. With no rows it shows the empty-state sentence instead.
 */
export function DataTable<Row>({
  columns,
  rows,
  rowKey,
  caption,
  isCaptionHidden = false,
  labelledBy,
  label,
  empty,
  rowClassName,
  className = "",
  isDense = false,
}: {
  columns: readonly Column<Row>[];
  rows: readonly Row[];
  rowKey: (row: Row, index: number) => string | number;
  caption?: ReactNode;
  isCaptionHidden?: boolean;
  /** The id of a heading that names the table (when the caption would repeat it). */
  labelledBy?: string;
  /** An accessible name when no caption or heading fits. */
  label?: string;
  /** The sentence shown when there are no rows; without it an empty table keeps its headers. */
  empty?: ReactNode;
  rowClassName?: (row: Row, index: number) => string;
  className?: string;
  isDense?: boolean;
}) {
  if (rows.length === 0 && empty !== undefined) return <p className="p-2">{empty}</p>;
  const pad = isDense ? "p-1" : "p-2";
  return (
    <div className={`max-w-full overflow-x-auto ${className}`}>
      <table className={`w-full border-collapse text-left ${isDense ? "text-sm" : ""}`} aria-labelledby={labelledBy} aria-label={label}>
        {caption ? <caption className={isCaptionHidden ? "sr-only" : "p-2 text-left font-bold"}>{caption}</caption> : null}
        <thead>
          <tr className="border-b-2 border-slate-400">
            {columns.map((c, i) => (
              <th key={i} scope="col" className={`${pad} whitespace-nowrap ${ALIGN[c.align ?? "left"]}`}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row, r) => (
            <tr key={rowKey(row, r)} className={`border-b border-slate-200 align-top ${rowClassName?.(row, r) ?? ""}`}>
              {columns.map((c, i) => {
                const content = c.href ? (
                  <Link className="whitespace-nowrap font-semibold text-brand underline" href={c.href(row)}>
                    {c.cell(row, r)}
                  </Link>
                ) : (
                  c.cell(row, r)
                );
                const cls = `${pad} ${ALIGN[c.align ?? "left"]} ${c.className ?? ""}`;
                return c.isRowHeader ? (
                  <th key={i} scope="row" className={`${cls} font-normal`}>
                    {content}
                  </th>
                ) : (
                  <td key={i} className={cls}>
                    {content}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
