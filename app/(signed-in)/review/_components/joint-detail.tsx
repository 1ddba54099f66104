"use client";
import type { QueueItemView } from "@/app/_server/review/queue-item-view";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { COMPARISON_STATUS_WORDS, type ComparisonRow } from "@/domain/review/queue";
import { OutcomeBadge } from "@/components/ui/badges";
import { Cautions } from "@/components/ui/caution";
import { FactList } from "@/components/ui/fact-list";
import { TimeDisplay } from "@/components/ui/time-display";
import { DecisionForm } from "./decision-form";
import { TraceSection } from "./trace-section";
import { EvidenceTable } from "./evidence-table";

/** A finding is red; an optional value left empty is neutral (it is not a finding). */
const STATUS_CLASS: Record<ComparisonRow["status"], string> = { ok: "text-pass", finding: "text-fail", "not-recorded": "text-fail", optional: "text-slate-700", info: "" };
const ROW_CLASS: Record<ComparisonRow["status"], string> = { ok: "", finding: "bg-fail-light", "not-recorded": "bg-fail-light", optional: "", info: "" };

/** One joint's evidence side by side, and the decision. */
export function JointDetail({
  item,
  unitSystem,
  isOwnJoint,
  onDecided,
  onChanged,
}: {
  item: QueueItemView;
  unitSystem: UnitSystem;
  isOwnJoint: boolean;
  onDecided: (message: string) => Promise<void>;
  onChanged: () => Promise<void>;
}) {
  const label = `${item.jobCode} joint ${item.jointNo}`;
  const isOut = item.outcome === "out-of-limits";
  return (
    <article aria-labelledby="joint-heading" className="flex min-w-0 flex-col gap-4 rounded-md border-2 border-brand bg-white p-3 sm:p-4">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="joint-heading" className="text-xl font-bold">
          {label}
        </h2>
        <OutcomeBadge outcome={item.outcome} />
      </header>
      <FactList
        className="text-sm"
        facts={[
          { term: "Job", description: `${item.jobCode} ${item.jobName}` },
          { term: "Made", description: <><TimeDisplay at={item.madeAt} /> by {item.fuserName}</> },
          { term: "Pipe", description: `OD ${formatQuantity(item.outsideDiameterMm, "length-mm", unitSystem)}, SDR ${item.sdr} (${item.kind.replace(/-/g, " ")})` },
          { term: "Equipment", description: `Machine ${item.machineTag}, heater ${item.heaterTag}` },
          { term: "Procedure", description: `${item.procedureCode} v${item.procedureVersionNo} · ${item.procedureName}${item.procedureLabel ? ` (${item.procedureLabel})` : ""}` },
          item.station ? { term: "Station", description: item.station } : null,
          item.replacesJointId ? { term: "Remake of", description: `joint record ${item.replacesJointId} (cut out)` } : null,
        ]}
      />

      <section aria-labelledby="findings-heading">
        <h3 id="findings-heading" className="font-bold">
          Findings
        </h3>
        {item.findings.length ? (
          <ul className="list-disc pl-5">
            {item.findings.map((f, i) => (
              <li key={i} className="text-fail">
                {f.message}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-pass">Every recorded value is within the plan.</p>
        )}
      </section>

      <section aria-labelledby="values-heading">
        <h3 id="values-heading" className="font-bold">
          Plan and recorded values
        </h3>
        {item.comparison.length ? (
          <EvidenceTable
            labelledBy="values-heading"
            rows={item.comparison}
            rowKey={(row) => row.key}
            rowClassName={(row) => ROW_CLASS[row.status]}
            columns={[
              { header: "Value", isRowHeader: true, cell: (row) => row.label },
              { header: "Plan", cell: (row) => row.planText },
              { header: "Recorded", cell: (row) => <span className={row.status === "optional" ? "text-slate-700" : ""}>{row.recordedText}</span> },
              { header: "Check", cell: (row) => <span className={`font-semibold ${STATUS_CLASS[row.status]}`}>{COMPARISON_STATUS_WORDS[row.status]}</span> },
            ]}
          />
        ) : (
          <p>This joint has no stored plan to compare with.</p>
        )}
      </section>

      <section aria-labelledby="photos-heading">
        <h3 id="photos-heading" className="font-bold">
          Bead photos
        </h3>
        {item.photos.length ? (
          <ul className="flex flex-wrap gap-2">
            {item.photos.map((p) => (
              <li key={p.id}>
                <a href={p.url} target="_blank" rel="noreferrer" className="block rounded border-2 border-slate-300 hover:border-brand">
                  {/* eslint-disable-next-line @next/next/no-img-element -- served by the authorised attachment route, not a static asset */}
                  <img src={p.url} alt={`${p.name}, ${label}`} className="h-32 w-32 object-cover" loading="lazy" />
                </a>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-slate-700">No photos were taken of this joint.</p>
        )}
      </section>

      <TraceSection item={item} unitSystem={unitSystem} onAttached={onChanged} />

      <section aria-labelledby="decision-heading" className="flex flex-col gap-2 border-t-2 border-slate-200 pt-3">
        <h3 id="decision-heading" className="text-lg font-bold">
          Decision
        </h3>
        {isOwnJoint ? (
          <p className="rounded-md border-2 border-caution bg-caution-light p-2 font-semibold text-caution">You made this joint yourself; another inspector must decide it.</p>
        ) : (
          <>
            <DecisionForm jointId={item.jointId} label={label} revisionNo={item.revisionNo} needsAcceptNote={isOut} onDecided={onDecided} onConflict={onChanged} />
            <Cautions kinds={["static", "coil", "procedure"]} title="Before a joint is cut out" />
          </>
        )}
      </section>
    </article>
  );
}
