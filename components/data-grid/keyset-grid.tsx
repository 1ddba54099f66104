"use client";
// The one AG Grid of Beadline, over a server that pages by keyset cursor. The grid's
// infinite row model asks for blocks by row number; the server only knows "the page after
// this cursor". So each block's cursor is the `next` of the block before it: a block
// whose cursor is not known yet waits for (or fetches) the one before. With the row count
// left open until the last page arrives, the scroll bar grows as rows arrive and never
// jumps to a block no cursor leads to. Sorting and filtering happen on the server: the
// caller owns the sort (in the URL) and hears about header clicks through onSortChange.
import { useCallback, useEffect, useMemo, useRef } from "react";
import { AgGridReact } from "ag-grid-react";
import {
  AllCommunityModule,
  ModuleRegistry,
  themeQuartz,
  type CellKeyDownEvent,
  type ColDef,
  type GetRowIdParams,
  type IDatasource,
  type IGetRowsParams,
  type RowClickedEvent,
  type SortChangedEvent,
} from "ag-grid-community";

ModuleRegistry.registerModules([AllCommunityModule]);

const beadlineTheme = themeQuartz.withParams({
  accentColor: "#0b4f6c",
  fontFamily: "inherit",
  fontSize: 14,
  headerBackgroundColor: "#e6f1f6",
  headerTextColor: "#111827",
  foregroundColor: "#111827",
  rowHeight: 44,
  headerHeight: 48,
});

/** The count the endpoint gives with the first page (domain/register RegisterCount for the register). */
export type GridCount = { value: number; isExact: boolean; isEstimate: boolean; counting: boolean };

type PageJson<Raw> = { rows: Raw[]; next: string | null; count?: GridCount };

export type KeysetGridProps<Row, Raw = Row> = {
  /** Accessible name of the grid. */
  label: string;
  columnDefs: ColDef<Row>[];
  /** The JSON endpoint answering `{ rows, next, count? }` for `?<query>&after=&limit=`. */
  dataUrl: string;
  /** Filter and sort as a query string (no cursor); a new value starts again at the top. */
  query: string;
  pageSize?: number;
  rowId: (row: Row) => string;
  parseRow?: (raw: Raw) => Row;
  /** The server-side sort shown on the headers (column id and direction). */
  sort: { colId: string; dir: "asc" | "desc" } | null;
  onSortChange: (sort: { colId: string; dir: "asc" | "desc" } | null) => void;
  onRowOpen?: (row: Row) => void;
  onCount?: (count: GridCount | null) => void;
  onError?: (message: string | null) => void;
  height?: string;
};

export function KeysetGrid<Row, Raw = Row>({
  label,
  columnDefs,
  dataUrl,
  query,
  pageSize = 100,
  rowId,
  parseRow,
  sort,
  onSortChange,
  onRowOpen,
  onCount,
  onError,
  height = "70vh",
}: KeysetGridProps<Row, Raw>) {
  const callbacks = useRef({ onCount, onError, parseRow });
  useEffect(() => {
    callbacks.current = { onCount, onError, parseRow };
  }, [onCount, onError, parseRow]);

  const sortColId = sort?.colId;
  const sortDir = sort?.dir;
  const sortKey = useMemo(() => (sortColId && sortDir ? { colId: sortColId, dir: sortDir } : null), [sortColId, sortDir]);

  const datasource = useMemo<IDatasource>(() => {
    // cursorAt.get(n): cursor of the block starting at row n (null = the first page; END = past the last page).
    const END = Symbol("end");
    const cursorAt = new Map<number, string | null | typeof END>([[0, null]]);
    const inflight = new Map<number, Promise<Row[]>>();

    const fetchBlock = (startRow: number): Promise<Row[]> => {
      const running = inflight.get(startRow);
      if (running) return running;
      const promise = (async () => {
        let cursor = cursorAt.get(startRow);
        if (cursor === undefined) {
          await fetchBlock(startRow - pageSize);
          cursor = cursorAt.get(startRow);
        }
        if (cursor === END || cursor === undefined) return [];
        const params = new URLSearchParams(query);
        params.set("limit", String(pageSize));
        if (cursor) params.set("after", cursor);
        if (startRow === 0) params.set("count", "1");
        const response = await fetch(`${dataUrl}?${params.toString()}`, { headers: { accept: "application/json" }, cache: "no-store" });
        const body = (await response.json().catch(() => null)) as (PageJson<Raw> & { error?: { message?: string } }) | null;
        if (!response.ok || !body || !Array.isArray(body.rows)) {
          throw new Error(body?.error?.message ?? `The server answered ${response.status}.`);
        }
        cursorAt.set(startRow + pageSize, body.next ?? END);
        if (startRow === 0) callbacks.current.onCount?.(body.count ?? null);
        const parse = callbacks.current.parseRow;
        return parse ? body.rows.map(parse) : (body.rows as unknown as Row[]);
      })();
      inflight.set(startRow, promise);
      void promise.then(
        () => inflight.delete(startRow),
        () => inflight.delete(startRow),
      );
      return promise;
    };

    return {
      getRows: (p: IGetRowsParams) => {
        // A header click sorts the grid before the caller's new sort reaches us: leave that
        // request unanswered, the datasource for the new sort replaces this one.
        const asked = p.sortModel[0];
        if (asked && (asked.colId !== sortKey?.colId || asked.sort !== sortKey?.dir)) return;
        fetchBlock(p.startRow).then(
          (rows) => {
            callbacks.current.onError?.(null);
            const isLast = cursorAt.get(p.startRow + pageSize) === END || rows.length < pageSize;
            p.successCallback(rows, isLast ? p.startRow + rows.length : -1);
          },
          (error: Error) => {
            callbacks.current.onError?.(error.message || "The rows could not be loaded.");
            p.failCallback();
          },
        );
      },
    };
  }, [dataUrl, query, pageSize, sortKey]);

  const defs = useMemo<ColDef<Row>[]>(
    () =>
      columnDefs.map((c) => ({
        ...c,
        sort: sort && c.colId === sort.colId ? sort.dir : null,
        sortingOrder: c.sortable ? (["desc", "asc"] as const) : undefined,
      })) as ColDef<Row>[],
    [columnDefs, sort],
  );

  const handleSort = useCallback(
    (event: SortChangedEvent<Row>) => {
      if (event.source !== "uiColumnSorted") return;
      const sorted = event.api.getColumnState().find((c) => c.sort);
      onSortChange(sorted?.sort ? { colId: sorted.colId, dir: sorted.sort } : null);
    },
    [onSortChange],
  );

  const handleRowClicked = useCallback((event: RowClickedEvent<Row>) => event.data && onRowOpen?.(event.data), [onRowOpen]);
  const handleKeyDown = useCallback(
    (event: CellKeyDownEvent<Row>) => {
      const key = (event.event as KeyboardEvent | undefined)?.key;
      if (key === "Enter" && event.data) onRowOpen?.(event.data);
    },
    [onRowOpen],
  );

  return (
    <div style={{ height }} className="w-full" role="region" aria-label={label}>
      <AgGridReact<Row>
        theme={beadlineTheme}
        rowModelType="infinite"
        datasource={datasource}
        columnDefs={defs}
        defaultColDef={{ sortable: false, resizable: true, suppressHeaderMenuButton: true }}
        cacheBlockSize={pageSize}
        infiniteInitialRowCount={pageSize}
        maxBlocksInCache={40}
        maxConcurrentDatasourceRequests={2}
        getRowId={(p: GetRowIdParams<Row>) => rowId(p.data)}
        onSortChanged={handleSort}
        onRowClicked={handleRowClicked}
        onCellKeyDown={handleKeyDown}
        suppressMultiSort
        suppressColumnVirtualisation
      />
    </div>
  );
}
