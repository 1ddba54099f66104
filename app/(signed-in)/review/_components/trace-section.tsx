"use client";
import { useRef, useState } from "react";
import type { QueueItemView } from "@/app/_server/review/queue-item-view";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/form/field";
import { FieldShell } from "@/components/form/field-shell";
import { OutcomeBadge } from "@/components/ui/badges";
import { TimeDisplay } from "@/components/ui/time-display";
import { formatDifference, formatQuantity, type UnitSystem } from "@/domain/units/format";
import { TraceChart } from "./trace-chart";
import { EvidenceTable } from "./evidence-table";


/** The joint page a refusal names ("… attached to WO-1 joint 12 (/joints/345) …"), to link it. */
function jointPathIn(text: string): string | null {
  return /\(\/joints\/(\d+)\)/.exec(text)?.[0].slice(1, -1) ?? null;
}

/** The joint's pressure trace (chart, values read, their check) and the form to attach one. */
export function TraceSection({ item, unitSystem, onAttached }: { item: QueueItemView; unitSystem: UnitSystem; onAttached: () => Promise<void> }) {
  const label = `${item.jobCode} joint ${item.jointNo}`;
  const input = useRef<HTMLInputElement>(null);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const [lines, setLines] = useState<string[]>([]);
  const trace = item.trace;

  const upload = async (event: React.FormEvent) => {
    event.preventDefault();
    setMessage(null);
    setLines([]);
    const file = input.current?.files?.[0];
    if (!file) {
      setMessage({ text: "Check the trace file: choose a CSV file first.", tone: "error" });
      return;
    }
    setBusy(true);
    try {
      const body = new FormData();
      body.set("jointId", String(item.jointId));
      body.set("file", file);
      const response = await fetch("/api/v1/traces", { method: "POST", body });
      const json = (await response.json().catch(() => null)) as { error?: { code?: string; message: string; fields?: Record<string, string[]> }; outcome?: string } | null;
      if (!response.ok) {
        setMessage({ text: json?.error?.message ?? `The trace was not attached (${response.status}).`, tone: "error" });
        setLines(json?.error?.fields?.file ?? []);
        return;
      }
      setMessage({ text: `Trace attached to ${label}: ${json?.outcome === "out-of-limits" ? "its values are out of limits" : "its values are within the plan"}.`, tone: "success" });
      if (input.current) input.current.value = "";
      await onAttached();
    } catch {
      setMessage({ text: "The trace could not be sent; check the connection and try again. Nothing was saved.", tone: "error" });
    } finally {
      setBusy(false);
    }
  };

  return (
    <section aria-labelledby="trace-heading" className="flex flex-col gap-2">
      <h3 id="trace-heading" className="font-bold">
        Pressure trace
      </h3>
      {trace ? (
        <>
          <p className="text-sm">
            {trace.sampleCount} samples, attached <TimeDisplay at={trace.uploadedAt} /> by {trace.uploadedByName} (<a className="text-brand underline" href={trace.url}>download the file</a>). Check of the trace:{" "}
            <OutcomeBadge outcome={trace.outcome} />.
          </p>
          <TraceChart jointId={item.jointId} traceId={trace.id} unitSystem={unitSystem} label={label} />
          <EvidenceTable
            caption="Typed values and what the trace shows"
            rows={trace.rows}
            rowKey={(row) => row.key}
            rowClassName={(row) => (row.disagrees ? "bg-fail-light" : "")}
            columns={[
              { header: "Value", isRowHeader: true, cell: (row) => row.label },
              { header: "Typed", cell: (row) => (row.typed === null ? <span className="text-slate-700">not typed</span> : formatQuantity(row.typed, row.kind, unitSystem)) },
              { header: "From the trace", cell: (row) => (row.trace === null ? "—" : formatQuantity(row.trace, row.kind, unitSystem)) },
              {
                header: "Agree?",
                cell: (row) =>
                  row.allowance === null ? (
                    "—"
                  ) : row.disagrees ? (
                    <span className="font-semibold text-fail">No (more than {formatDifference(row.allowance, row.kind, unitSystem)} apart)</span>
                  ) : (
                    <span className="text-pass">Yes (within {formatDifference(row.allowance, row.kind, unitSystem)})</span>
                  ),
              },
            ]}
          />
          {trace.findings.length ? (
            <ul className="list-disc pl-5 text-sm text-fail" aria-label="Findings from the trace">
              {trace.findings.map((f, i) => (
                <li key={i}>{f.message}</li>
              ))}
            </ul>
          ) : null}
        </>
      ) : (
        <p className="text-sm text-slate-700">No pressure trace is attached.</p>
      )}
      <form onSubmit={upload} className="flex flex-col gap-2" aria-label={`Attach a pressure trace to ${label}`}>
        <FieldShell
          id={`trace-file-${item.jointId}`}
          label="Pressure trace file (CSV)"
          hint={
            <>
              Columns: <code>seconds,gauge_pressure_mpa</code> (or <code>gauge_pressure_psi</code>), optionally <code>,heater_temperature_c</code>; one sample per line.
            </>
          }
        >
          {(control) => <input ref={input} {...control} type="file" accept=".csv,text/csv,text/plain" className="min-h-touch w-full max-w-full rounded-md border-2 border-slate-400 bg-white p-2" />}
        </FieldShell>
        <FormMessage message={message?.text} tone={message?.tone} />
        {message?.tone === "error" && jointPathIn(message.text) ? (
          <p>
            <a className="inline-flex min-h-touch items-center font-semibold text-brand underline" href={jointPathIn(message.text)!}>
              Open the joint this trace belongs to
            </a>
          </p>
        ) : null}
        {lines.length ? (
          <ul className="list-disc pl-5 text-sm font-semibold text-fail" aria-label="Problems in the file">
            {lines.map((l, i) => (
              <li key={i}>{l}</li>
            ))}
          </ul>
        ) : null}
        <div>
          <Button type="submit" variant="secondary" disabled={busy}>
            {busy ? "Reading the trace…" : "Attach trace"}
          </Button>
        </div>
      </form>
    </section>
  );
}
