import Link from "next/link";
import { redirect } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import { findJointIdByReference, traceLot } from "@/database/queries/trace";
import { traceSearchSchema } from "@/domain/coils/schemas";
import { describeSize } from "@/domain/labels/label";
import { fieldErrorsFromIssues } from "@/domain/result";
import { formatQuantity } from "@/domain/units/format";
import { CoilStatusBadge } from "@/components/coils/coil-status-badge";
import { RunSchematic } from "./_components/run-schematic";

export const dynamic = "force-dynamic";

const MATCHED_BY = {
  lot: "Found by lot number.",
  "coil-id": "Found by coil id: the whole lot of that coil is shown.",
  "trace-code": "Found by traceability code: every lot whose coils carry it is shown.",
  none: "",
} as const;

const input = "min-h-touch rounded-md border-2 border-slate-400 bg-white px-3";

// Trace: lot → ground (every coil of a lot and every joint made with them) and joint → origins.
export default async function TracePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("traceLots");
  const raw = await searchParams;
  const one = (k: string) => (typeof raw[k] === "string" ? (raw[k] as string) : undefined);
  const jointRef = one("joint");
  let jointMessage: string | null = null;
  if (jointRef !== undefined) {
    const id = jointRef.trim() ? await findJointIdByReference({ reference: jointRef }) : null;
    if (id) redirect(`/trace/joints/${id}`);
    jointMessage = jointRef.trim() ? `No joint matches "${jointRef}". Use the joint id, or the job code and joint number (e.g. WO-24117 #12).` : "Enter a joint id, or the job code and joint number.";
  }
  const searching = ["manufacturer", "lot", "code"].some((k) => one(k) !== undefined);
  const parsed = searching ? traceSearchSchema.safeParse({ manufacturer: one("manufacturer"), lot: one("lot"), code: one("code") }) : null;
  const fields = parsed && !parsed.success ? fieldErrorsFromIssues(parsed.error.issues) : {};
  const trace = parsed?.success ? await traceLot(parsed.data) : null;
  const system = user.unitSystem;
  const exportQuery = parsed?.success ? new URLSearchParams(Object.entries(parsed.data).filter(([, v]) => v) as [string, string][]).toString() : "";
  const jobs = trace ? [...new Map(trace.joints.map((j) => [j.jobId, { id: j.jobId, code: j.jobCode, name: j.jobName }])).values()] : [];
  const outOfLimits = trace ? trace.joints.filter((j) => j.outcome === "out-of-limits").length : 0;

  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Trace</h1>
      <div className="grid gap-6 lg:grid-cols-2">
        <section aria-labelledby="lot-search" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="lot-search" className="mb-2 text-lg font-bold">
            Lot → ground
          </h2>
          <p className="mb-3 text-sm">Every coil of a lot and every joint made with them, with where, when, who and the outcome.</p>
          <form role="search" method="get" action="/trace" className="flex flex-col gap-3" aria-describedby="lot-search-errors">
            <div className="grid gap-3 sm:grid-cols-2">
              <div className="flex flex-col gap-1">
                <label htmlFor="manufacturer" className="text-sm font-semibold">
                  Pipe maker
                </label>
                <input id="manufacturer" name="manufacturer" defaultValue={one("manufacturer") ?? ""} className={input} aria-invalid={fields.manufacturer ? true : undefined} aria-describedby={fields.manufacturer ? "manufacturer-error" : undefined} />
                {fields.manufacturer ? (
                  <p id="manufacturer-error" className="text-sm font-semibold text-fail">
                    {fields.manufacturer[0]}
                  </p>
                ) : null}
              </div>
              <div className="flex flex-col gap-1">
                <label htmlFor="lot" className="text-sm font-semibold">
                  Lot
                </label>
                <input id="lot" name="lot" defaultValue={one("lot") ?? ""} className={input} aria-invalid={fields.lot ? true : undefined} aria-describedby={fields.lot ? "lot-error" : undefined} />
                {fields.lot ? (
                  <p id="lot-error" className="text-sm font-semibold text-fail">
                    {fields.lot[0]}
                  </p>
                ) : null}
              </div>
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor="code" className="text-sm font-semibold">
                Or a traceability code, coil id or label address
              </label>
              <input id="code" name="code" defaultValue={one("code") ?? ""} autoComplete="off" spellCheck={false} className={input} />
            </div>
            <div>
              <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
                Trace lot
              </button>
            </div>
          </form>
        </section>
        <section aria-labelledby="joint-search" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="joint-search" className="mb-2 text-lg font-bold">
            Joint → origins
          </h2>
          <p className="mb-3 text-sm">The two components with their lots, the machine, heater plate, fuser and procedure of one joint.</p>
          <form method="get" action="/trace" className="flex flex-col gap-3">
            <div className="flex flex-col gap-1">
              <label htmlFor="joint" className="text-sm font-semibold">
                Joint id, or job code and joint number
              </label>
              <input id="joint" name="joint" defaultValue={jointRef ?? ""} placeholder="WO-24117 #12" className={input} aria-invalid={jointMessage ? true : undefined} aria-describedby={jointMessage ? "joint-error" : undefined} />
              {jointMessage ? (
                <p id="joint-error" role="alert" className="text-sm font-semibold text-fail">
                  {jointMessage}
                </p>
              ) : null}
            </div>
            <div>
              <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
                Trace joint
              </button>
            </div>
          </form>
        </section>
      </div>

      {trace ? (
        <section aria-labelledby="lot-results" className="flex flex-col gap-4">
          <h2 id="lot-results" className="text-xl font-bold">
            {trace.lots.length === 0
              ? "No lot matches this search."
              : `${trace.lots.map((l) => `${l.manufacturer} lot ${l.lot}`).join("; ")}: ${trace.coils.length} coil${trace.coils.length === 1 ? "" : "s"}, ${trace.joints.length}${trace.truncated ? "+" : ""} joint${trace.joints.length === 1 ? "" : "s"}${outOfLimits ? ` (${outOfLimits} out of limits)` : ""}`}
          </h2>
          {trace.lots.length ? <p className="text-sm">{MATCHED_BY[trace.matchedBy]}</p> : null}
          {trace.lots.length ? (
            <p>
              <a href={`/api/v1/trace/lot/export?${exportQuery}`} download className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
                Export to spreadsheet (.xlsx)
              </a>
            </p>
          ) : null}
          {trace.coils.length ? (
            <div className="overflow-x-auto rounded-md border-2 border-slate-300 bg-white">
              <table className="w-full text-left text-sm">
                <caption className="p-2 text-left font-bold">Coils of the lot</caption>
                <thead className="bg-slate-100">
                  <tr>
                    <th scope="col" className="p-2">Coil id</th>
                    <th scope="col" className="p-2">Size</th>
                    <th scope="col" className="p-2">Code</th>
                    <th scope="col" className="p-2">Status</th>
                    <th scope="col" className="p-2">Job</th>
                    <th scope="col" className="p-2 text-right">Left</th>
                  </tr>
                </thead>
                <tbody>
                  {trace.coils.map((c) => (
                    <tr key={c.id} className="border-t border-slate-200">
                      <td className="p-2 font-semibold">
                        <Link href={`/coils/${encodeURIComponent(c.coilCode)}`} className="text-brand underline">
                          {c.coilCode}
                        </Link>
                      </td>
                      <td className="p-2">{describeSize(c)}</td>
                      <td className="p-2 font-mono">{c.traceCode ?? "—"}</td>
                      <td className="p-2">
                        <CoilStatusBadge status={c.status} />
                      </td>
                      <td className="p-2">{c.jobCode ?? "—"}</td>
                      <td className="p-2 text-right">{formatQuantity(c.remainingM, "length-m", system)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : null}
          {jobs.map((job) => (
            <RunSchematic
              key={job.id}
              jobCode={job.code}
              jobName={job.name}
              unitSystem={system}
              joints={trace.joints.filter((j) => j.jobId === job.id).map((j) => ({ id: j.id, jointNo: j.jointNo, station: j.station, latitude: j.latitude, longitude: j.longitude, outOfLimits: j.outcome === "out-of-limits" }))}
            />
          ))}
          {trace.joints.length ? (
            <div className="overflow-x-auto rounded-md border-2 border-slate-300 bg-white">
              <table className="w-full text-left text-sm">
                <caption className="p-2 text-left font-bold">Joints made with the lot</caption>
                <thead className="bg-slate-100">
                  <tr>
                    <th scope="col" className="p-2">Job</th>
                    <th scope="col" className="p-2">Joint</th>
                    <th scope="col" className="p-2">Made</th>
                    <th scope="col" className="p-2">Station</th>
                    <th scope="col" className="p-2">Lat, long</th>
                    <th scope="col" className="p-2">Fuser</th>
                    <th scope="col" className="p-2">Outcome</th>
                    <th scope="col" className="p-2">Components</th>
                  </tr>
                </thead>
                <tbody>
                  {trace.joints.slice(0, 2000).map((j) => (
                    <tr key={j.id} className="border-t border-slate-200">
                      <td className="p-2">{j.jobCode}</td>
                      <td className="p-2 font-semibold">
                        <Link href={`/trace/joints/${j.id}`} className="text-brand underline">
                          {j.jobCode} joint {j.jointNo}
                        </Link>
                      </td>
                      <td className="p-2">{j.madeAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                      <td className="p-2">{j.station ?? "—"}</td>
                      <td className="p-2">{j.latitude != null && j.longitude != null ? `${j.latitude.toFixed(5)}, ${j.longitude.toFixed(5)}` : "—"}</td>
                      <td className="p-2">{j.fuserName}</td>
                      <td className={`p-2 font-semibold ${j.outcome === "out-of-limits" ? "text-fail" : "text-pass"}`}>{j.outcome === "out-of-limits" ? "Out of limits" : "Within limits"}</td>
                      <td className="p-2">
                        {j.coilACode ?? "—"} × {j.coilBCode ?? j.componentBText ?? "—"}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
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
        </section>
      ) : null}
    </div>
  );
}
