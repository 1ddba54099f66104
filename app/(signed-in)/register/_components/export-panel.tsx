"use client";
// Export the current view: the file streams from the server and the panel reads it as it
// comes, showing bytes (and, for CSV, rows) received against the server's row estimate,
// then hands the finished file to the browser as a download. For the spreadsheet (whose
// bytes are compressed) the rows written come from the export's progress address, asked
// once a second; the words read "12,000 of 50,000 joints written". A long export can be stopped: the download is dropped, which stops the
// server's writer thread, and nothing is kept.
import { useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { formatCount } from "@/components/ui/display-format";

type State =
  | { kind: "idle" }
  | { kind: "running"; format: "xlsx" | "csv"; bytes: number; rows: number | null; estimate: number | null; isEstimate: boolean }
  | { kind: "done"; format: "xlsx" | "csv"; bytes: number; fileName: string }
  | { kind: "failed"; message: string };

function megabytes(bytes: number): string {
  return bytes < 1_000_000 ? `${(bytes / 1000).toFixed(0)} kB` : `${(bytes / 1_000_000).toFixed(1)} MB`;
}

/** "12,000 of 50,000 joints written", or before the first rows "50,000 joints, starting". */
function progressText(rows: number | null, estimate: number | null, isEstimate: boolean): string {
  const total = estimate === null ? null : `${isEstimate ? "about " : ""}${formatCount(estimate)}`;
  if (rows === null) return total === null ? "starting" : `${total} joints, starting`;
  return total === null ? `${formatCount(rows)} joints written` : `${formatCount(rows)} of ${total} joints written`;
}

function fileNameFrom(disposition: string | null, fallback: string): string {
  const m = disposition ? /filename="?([^";]+)"?/i.exec(disposition) : null;
  return m ? m[1] : fallback;
}

export function ExportPanel({ query }: { query: string }) {
  const [state, setState] = useState<State>({ kind: "idle" });
  const abort = useRef<AbortController | null>(null);

  const start = async (format: "xlsx" | "csv") => {
    abort.current?.abort();
    const controller = new AbortController();
    abort.current = controller;
    const params = new URLSearchParams(query);
    params.set("format", format);
    setState({ kind: "running", format, bytes: 0, rows: format === "csv" ? 0 : null, estimate: null, isEstimate: false });
    let poll: ReturnType<typeof setInterval> | null = null;
    // The last rows and total shown, for the words when the clerk stops the export.
    const reached: { rows: number | null; estimate: number | null; isEstimate: boolean } = { rows: null, estimate: null, isEstimate: false };
    try {
      const response = await fetch(`/api/v1/exports/register?${params.toString()}`, { signal: controller.signal, cache: "no-store" });
      if (!response.ok || !response.body) {
        const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
        throw new Error(body?.error?.message ?? `The server answered ${response.status}.`);
      }
      const estimateHeader = response.headers.get("x-beadline-row-estimate");
      const estimate = estimateHeader ? Number(estimateHeader) : null;
      const isEstimate = response.headers.get("x-beadline-row-estimate-kind") === "estimate";
      reached.estimate = estimate;
      reached.isEstimate = isEstimate;
      const reader = response.body.getReader();
      const chunks: Uint8Array<ArrayBuffer>[] = [];
      let bytes = 0;
      let rows = 0;
      let written: number | null = null;
      const exportId = response.headers.get("x-beadline-export-id");
      if (format === "xlsx" && exportId) {
        poll = setInterval(() => {
          void fetch(`/api/v1/exports/register/progress?id=${encodeURIComponent(exportId)}`, { signal: controller.signal, cache: "no-store" })
            .then((r) => (r.ok ? (r.json() as Promise<{ rowsWritten: number }>) : null))
            .then((p) => {
              if (p && abort.current === controller) {
                written = p.rowsWritten;
                reached.rows = written;
                setState((s) => (s.kind === "running" ? { ...s, rows: written } : s));
              }
            })
            .catch(() => undefined);
        }, 1000);
      }
      let lastPaint = 0;
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        chunks.push(value as Uint8Array<ArrayBuffer>);
        bytes += value.byteLength;
        if (format === "csv") for (let i = 0; i < value.length; i += 1) if (value[i] === 10) rows += 1;
        const now = performance.now();
        if (now - lastPaint > 150) {
          lastPaint = now;
          if (format === "csv") reached.rows = Math.max(0, rows - 1);
          setState({ kind: "running", format, bytes, rows: format === "csv" ? Math.max(0, rows - 1) : written, estimate, isEstimate });
        }
      }
      const fileName = fileNameFrom(response.headers.get("content-disposition"), `beadline-register.${format}`);
      const blob = new Blob(chunks, { type: response.headers.get("content-type") ?? "application/octet-stream" });
      const url = URL.createObjectURL(blob);
      const a = document.createElement("a");
      a.href = url;
      a.download = fileName;
      document.body.appendChild(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      setState({ kind: "done", format, bytes, fileName });
    } catch (error) {
      if ((error as Error).name === "AbortError") {
        const where = reached.rows === null ? "" : ` at ${progressText(reached.rows, reached.estimate, reached.isEstimate)}`;
        setState({ kind: "failed", message: `Export stopped${where}. Nothing was downloaded.` });
      } else setState({ kind: "failed", message: `The export failed: ${(error as Error).message}` });
    } finally {
      if (poll) clearInterval(poll);
      if (abort.current === controller) abort.current = null;
    }
  };

  const running = state.kind === "running";
  const progressValue = running && state.rows !== null && state.estimate ? Math.min(state.rows, state.estimate) : undefined;

  return (
    <div className="flex flex-col items-end gap-2">
      <div className="flex flex-wrap gap-2">
        <Button type="button" onClick={() => start("xlsx")} disabled={running}>
          Export spreadsheet (.xlsx)
        </Button>
        <Button type="button" variant="secondary" onClick={() => start("csv")} disabled={running}>
          Export CSV
        </Button>
        {running ? (
          <Button type="button" variant="danger" onClick={() => abort.current?.abort()}>
            Stop export
          </Button>
        ) : null}
      </div>
      <div aria-live="polite" role="status" className="text-sm" data-testid="export-status">
        {state.kind === "running" ? (
          <div className="flex items-center gap-2">
            <progress max={state.estimate ?? undefined} value={progressValue} aria-label="Export progress" className="w-40" />
            <span>
              Exporting {state.format === "xlsx" ? "spreadsheet" : "CSV"}: {progressText(state.rows, state.estimate, state.isEstimate)} ({megabytes(state.bytes)} received) …
            </span>
          </div>
        ) : state.kind === "done" ? (
          <span className="font-semibold text-pass">
            Downloaded {state.fileName} ({megabytes(state.bytes)}).
          </span>
        ) : state.kind === "failed" ? (
          <span className="font-semibold text-fail">{state.message}</span>
        ) : null}
      </div>
    </div>
  );
}
