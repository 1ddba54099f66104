"use client";
import type { QueueItemView } from "@/app/_server/review/queue-item-view";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { Cautions } from "@/components/ui/caution";
import { formatInstant } from "./format";
import { DecisionForm } from "./decision-form";
import { TraceSection } from "./trace-section";

const STATUS_WORDS = { ok: "Within plan", finding: "Out of limits", "not-recorded": "Not recorded", info: "—" } as const;

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
    <article aria-labelledby="joint-heading" className="flex flex-col gap-4 rounded-md border-2 border-brand bg-white p-4">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="joint-heading" className="text-xl font-bold">
          {label}
        </h2>
        <span className={`rounded px-2 py-1 font-semibold ${isOut ? "bg-fail-light text-fail" : "bg-pass-light text-pass"}`}>{OUTCOME_LABELS[item.outcome]}</span>
      </header>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="font-semibold">Job</dt>
        <dd>
          {item.jobCode} {item.jobName}
        </dd>
        <dt className="font-semibold">Made</dt>
        <dd>
          {formatInstant(item.madeAt)} by {item.fuserName}
        </dd>
        <dt className="font-semibold">Pipe</dt>
        <dd>
          OD {formatQuantity(item.outsideDiameterMm, "length-mm", unitSystem)}, SDR {item.sdr} ({item.kind.replace(/-/g, " ")})
        </dd>
        <dt className="font-semibold">Equipment</dt>
        <dd>
          Machine {item.machineTag}, heater {item.heaterTag}
        </dd>
        {item.procedureLabel ? (
          <>
            <dt className="font-semibold">Procedure</dt>
            <dd>{item.procedureLabel}</dd>
          </>
        ) : null}
        {item.station ? (
          <>
            <dt className="font-semibold">Station</dt>
            <dd>{item.station}</dd>
          </>
        ) : null}
        {item.replacesJointId ? (
          <>
            <dt className="font-semibold">Remake of</dt>
            <dd>joint record {item.replacesJointId} (cut out)</dd>
          </>
        ) : null}
      </dl>

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

      <section aria-labelledby="values-heading" className="overflow-x-auto">
        <h3 id="values-heading" className="font-bold">
          Plan and recorded values
        </h3>
        {item.comparison.length ? (
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b-2 border-slate-300">
                <th scope="col" className="py-1 pr-2">
                  Value
                </th>
                <th scope="col" className="py-1 pr-2">
                  Plan
                </th>
                <th scope="col" className="py-1 pr-2">
                  Recorded
                </th>
                <th scope="col" className="py-1">
                  Check
                </th>
              </tr>
            </thead>
            <tbody>
              {item.comparison.map((row) => (
                <tr key={row.key} className={`border-b border-slate-200 ${row.status === "finding" || row.status === "not-recorded" ? "bg-fail-light" : ""}`}>
                  <th scope="row" className="py-1 pr-2 font-semibold">
                    {row.label}
                  </th>
                  <td className="py-1 pr-2">{row.planText}</td>
                  <td className="py-1 pr-2">{row.recordedText}</td>
                  <td className={`py-1 font-semibold ${row.status === "ok" ? "text-pass" : row.status === "info" ? "" : "text-fail"}`}>{STATUS_WORDS[row.status]}</td>
                </tr>
              ))}
            </tbody>
          </table>
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
