import Link from "next/link";
import { redirect } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import { traceLot, type TracedJoint } from "@/database/queries/trace";
import { findJointForTrace } from "@/app/_server/trace/find-joint";
import { formatJointReference, JOINT_REFERENCE_EXAMPLE } from "@/domain/joints/reference";
import { traceSearchSchema } from "@/domain/coils/schemas";
import { describeSize } from "@/domain/labels/label";
import { LOT_MATCH_LABELS } from "@/domain/coils/life";
import { fieldErrorsFromIssues } from "@/domain/result";
import { formatQuantity } from "@/domain/units/format";
import { FieldShell } from "@/components/form/field-shell";
import { CoilStatusBadge, OutcomeBadge, ReviewStateBadge } from "@/components/ui/badges";
import { DataTable } from "@/components/ui/data-table";
import { SectionCard } from "@/components/ui/section-card";
import { TimeDisplay } from "@/components/ui/time-display";
import { RunSchematic } from "./_components/run-schematic";

export const dynamic = "force-dynamic";

const MATCHED_BY = {
  lot: "Found by lot number: a coil's typed lot or the lot in its traceability code.",
  "coil-id": "Found by coil id: the whole lot of that coil is shown.",
  "trace-code": "Found by traceability code: every lot whose coils carry it is shown.",
  none: "",
} as const;

const input = "min-h-touch rounded-md border-2 border-slate-400 bg-white px-3";

/** Review state in words; a cut-out joint is marked out of the ground with its remake, a remake names what it replaced. */
function ReviewCell({ joint }: { joint: TracedJoint }) {
  const linkClass = "font-semibold text-brand underline";
  return (
    <div className="flex flex-col items-start gap-1">
      <ReviewStateBadge state={joint.reviewState} size="sm" />
      {joint.reviewState === "cut-out" ? (
        <span>
          Out of the ground;{" "}
          {joint.replacedBy ? (
            <>
              replaced by{" "}
              <Link href={`/trace/joints/${joint.replacedBy.id}`} className={linkClass}>
                {formatJointReference(joint.replacedBy)}
              </Link>
            </>
          ) : (
            "not remade yet"
          )}
        </span>
      ) : null}
      {joint.replaces ? (
        <span>
          Remakes{" "}
          <Link href={`/trace/joints/${joint.replaces.id}`} className={linkClass}>
            {formatJointReference(joint.replaces)}
          </Link>
        </span>
      ) : null}
    </div>
  );
}

// Trace: lot → ground (every coil of a lot and every joint made with them) and joint → origins.
export default async function TracePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("traceLots");
  const raw = await searchParams;
  const one = (k: string) => (typeof raw[k] === "string" ? (raw[k] as string) : undefined);
  const jointRef = one("joint");
  let jointMessage: string | null = null;
  if (jointRef !== undefined) {
    const found = await findJointForTrace(jointRef);
    if (found.ok) redirect(`/trace/joints/${found.jointId}`);
    jointMessage = found.message;
  }
  const searching = ["manufacturer", "lot", "code"].some((k) => one(k) !== undefined);
  const parsed = searching ? traceSearchSchema.safeParse({ manufacturer: one("manufacturer"), lot: one("lot"), code: one("code") }) : null;
  const fields = parsed && !parsed.success ? fieldErrorsFromIssues(parsed.error.issues) : {};
  const trace = parsed?.success ? await traceLot(parsed.data) : null;
  const system = user.unitSystem;
  const exportQuery = parsed?.success ? new URLSearchParams(Object.entries(parsed.data).filter(([, v]) => v) as [string, string][]).toString() : "";
  const jobs = trace ? [...new Map(trace.joints.map((j) => [j.jobId, { id: j.jobId, code: j.jobCode, name: j.jobName }])).values()] : [];
  const outOfLimits = trace ? trace.joints.filter((j) => j.outcome === "out-of-limits").length : 0;
  const byCodeOnly = trace ? trace.coils.filter((c) => c.foundBy === "code-lot") : [];
  const cutOut = trace ? trace.joints.filter((j) => j.reviewState === "cut-out").length : 0;
  const counts = [outOfLimits ? `${outOfLimits} out of limits` : "", cutOut ? `${cutOut} cut out` : ""].filter(Boolean).join(", ");

  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Trace</h1>
      <div className="grid gap-6 lg:grid-cols-2">
        <SectionCard id="lot-search" title="Lot → ground" tone="card" isCompact>
          <p className="mb-3 text-sm">Every coil of a lot and every joint made with them, with where, when, who, the outcome and the review: a cut-out joint is marked out of the ground, with the joint that replaced it.</p>
          <form role="search" method="get" action="/trace" className="flex flex-col gap-3" aria-describedby="lot-search-errors">
            <div className="grid gap-3 sm:grid-cols-2">
              <FieldShell id="manufacturer" label="Pipe maker" error={fields.manufacturer?.[0]}>
                {(control) => <input {...control} name="manufacturer" defaultValue={one("manufacturer") ?? ""} className={input} />}
              </FieldShell>
              <FieldShell id="lot" label="Lot" error={fields.lot?.[0]}>
                {(control) => <input {...control} name="lot" defaultValue={one("lot") ?? ""} className={input} />}
              </FieldShell>
            </div>
            <FieldShell id="code" label="Or a traceability code, coil id or label address">
              {(control) => <input {...control} name="code" defaultValue={one("code") ?? ""} autoComplete="off" spellCheck={false} className={input} />}
            </FieldShell>
            <div>
              <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
                Trace lot
              </button>
            </div>
          </form>
        </SectionCard>
        <SectionCard id="joint-search" title="Joint → origins" tone="card" isCompact>
          <p className="mb-3 text-sm">The two components with their lots, the machine, heater plate, fuser and procedure of one joint.</p>
          <form method="get" action="/trace" className="flex flex-col gap-3">
            <FieldShell id="joint" label="Joint: job code and number, joint tag address, or joint id" error={jointMessage} errorRole="alert">
              {(control) => <input {...control} name="joint" defaultValue={jointRef ?? ""} placeholder={JOINT_REFERENCE_EXAMPLE} autoComplete="off" spellCheck={false} className={input} />}
            </FieldShell>
            <div>
              <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
                Trace joint
              </button>
            </div>
          </form>
        </SectionCard>
      </div>

      {trace ? (
        <SectionCard
          id="lot-results"
          className="flex flex-col gap-4"
          title={
            trace.lots.length === 0
              ? "No lot matches this search."
              : `${trace.lots.map((l) => `${l.manufacturer} lot ${l.lot}`).join("; ")}: ${trace.coils.length} coil${trace.coils.length === 1 ? "" : "s"}, ${trace.joints.length}${trace.truncated ? "+" : ""} joint${trace.joints.length === 1 ? "" : "s"}${counts ? ` (${counts})` : ""}`
          }
        >
          {trace.lots.length ? <p className="text-sm">{MATCHED_BY[trace.matchedBy]}</p> : null}
          {byCodeOnly.length ? (
            <p role="note" className="rounded-md border-2 border-caution bg-caution-light p-3 text-sm font-semibold text-caution">
              {byCodeOnly.map((c) => `${c.coilCode} (typed lot ${c.lot})`).join(", ")} {byCodeOnly.length === 1 ? "carries" : "carry"} this lot only in {byCodeOnly.length === 1 ? "its" : "their"} traceability code: the typed lot differs.
            </p>
          ) : null}
          {trace.lots.length ? (
            <p className="flex flex-wrap gap-2">
              <a href={`/api/v1/trace/lot/export?${exportQuery}`} download className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
                Export to spreadsheet (.xlsx)
              </a>
              <a href={`/api/v1/trace/lot/csv?${exportQuery}`} download className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
                Export joints as CSV
              </a>
            </p>
          ) : null}
          {trace.coils.length ? (
            <DataTable
              caption="Coils of the lot"
              isDense
              className="rounded-md border-2 border-slate-300 bg-white"
              rows={trace.coils}
              rowKey={(c) => c.id}
              columns={[
                { header: "Coil id", cell: (c) => c.coilCode, href: (c) => `/coils/${encodeURIComponent(c.coilCode)}` },
                { header: "Size", cell: (c) => describeSize(c) },
                { header: "Code", className: "font-mono", cell: (c) => c.traceCode ?? "—" },
                ...(trace.matchedBy === "lot" ? [{ header: "Found by", cell: (c: (typeof trace.coils)[number]) => (c.foundBy ? LOT_MATCH_LABELS[c.foundBy] : "—") }] : []),
                { header: "Status", cell: (c) => <CoilStatusBadge status={c.status} /> },
                { header: "Job", cell: (c) => c.jobCode ?? "—" },
                { header: "Left", align: "right", cell: (c) => formatQuantity(c.remainingM, "length-m", system) },
              ]}
            />
          ) : null}
          {jobs.map((job) => (
            <RunSchematic
              key={job.id}
              jobCode={job.code}
              jobName={job.name}
              unitSystem={system}
              joints={trace.joints.filter((j) => j.jobId === job.id).map((j) => ({ id: j.id, jointNo: j.jointNo, station: j.station, latitude: j.latitude, longitude: j.longitude, outOfLimits: j.outcome === "out-of-limits", isCutOut: j.reviewState === "cut-out" }))}
            />
          ))}
          {trace.joints.length ? (
            <div className="flex flex-col gap-2">
              <DataTable
                caption="Joints made with the lot"
                isDense
                className="rounded-md border-2 border-slate-300 bg-white"
                rows={trace.joints.slice(0, 2000)}
                rowKey={(j) => j.id}
                columns={[
                  { header: "Job", cell: (j) => j.jobCode },
                  { header: "Joint", cell: (j) => formatJointReference(j), href: (j) => `/trace/joints/${j.id}` },
                  { header: "Made", cell: (j) => <TimeDisplay at={j.madeAt} /> },
                  { header: "Station", cell: (j) => j.station ?? "—" },
                  { header: "Lat, long", cell: (j) => (j.latitude != null && j.longitude != null ? `${j.latitude.toFixed(5)}, ${j.longitude.toFixed(5)}` : "—") },
                  { header: "Fuser", cell: (j) => j.fuserName },
                  { header: "Outcome", cell: (j) => <OutcomeBadge outcome={j.outcome} /> },
                  { header: "Review", cell: (j) => <ReviewCell joint={j} /> },
                  { header: "Components", cell: (j) => `${j.coilACode ?? "—"} × ${j.coilBCode ?? j.componentBText ?? "—"}` },
                ]}
              />
              {trace.joints.length > 2000 ? <p className="p-2">The first 2,000 joints are shown; the spreadsheet has all {trace.joints.length}.</p> : null}
            </div>
          ) : null}
          {trace.joints.length ? (
            <p>
              <Link href={`/labels?kind=joint&ids=${trace.joints.slice(0, 500).map((j) => j.id).join(",")}`} className="font-semibold text-brand underline">
                Print joint tags for these joints
              </Link>
            </p>
          ) : null}
        </SectionCard>
      ) : null}
    </div>
  );
}
