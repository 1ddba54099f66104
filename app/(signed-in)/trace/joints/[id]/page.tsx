import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import type { Coil } from "@/database/queries/coils";
import { DAMAGE_LABELS } from "@/domain/coils/life";
import { describeSize } from "@/domain/labels/label";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { CoilStatusBadge } from "@/components/coils/coil-status-badge";
import { traceJointOrigins } from "@/app/_server/trace/origins";

export const dynamic = "force-dynamic";

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-sm text-slate-700">{label}</dt>
      <dd className="font-semibold">{children}</dd>
    </div>
  );
}

function Component({ title, coil, text, lengthM, system }: { title: string; coil: Coil | null; text?: string | null; lengthM: number | null; system: UnitSystem }) {
  return (
    <section aria-label={title} className="rounded-md border-2 border-slate-300 bg-white p-4">
      <h3 className="mb-2 text-lg font-bold">{title}</h3>
      {coil ? (
        <dl className="grid gap-2 sm:grid-cols-2">
          <Fact label="Coil">
            <Link href={`/coils/${encodeURIComponent(coil.coilCode)}`} className="text-brand underline">
              {coil.coilCode}
            </Link>{" "}
            <CoilStatusBadge status={coil.status} />
          </Fact>
          <Fact label="Pipe maker and lot">
            <Link href={`/trace?manufacturer=${encodeURIComponent(coil.manufacturer)}&lot=${encodeURIComponent(coil.lot)}`} className="text-brand underline">
              {coil.manufacturer} lot {coil.lot}
            </Link>
          </Fact>
          <Fact label="Size and material">
            {describeSize(coil)} {coil.material}
          </Fact>
          <Fact label="Traceability code">{coil.traceCode ?? "none"}</Fact>
          <Fact label="Production date">{coil.productionDate ?? "not recorded"}</Fact>
          <Fact label="Laid from it with this joint">{lengthM != null ? formatQuantity(lengthM, "length-m", system) : "not recorded"}</Fact>
          <Fact label="Receipt inspection">
            {coil.inspection.passed ? "Passed" : "Failed"} on {coil.inspection.receivedAt.toISOString().slice(0, 10)}
            {coil.inspection.receivedByName ? ` by ${coil.inspection.receivedByName}` : ""}
          </Fact>
          <Fact label="Damage, ovality, end caps">
            {coil.inspection.damageKinds.length ? coil.inspection.damageKinds.map((k) => DAMAGE_LABELS[k]).join(", ") : "no damage"}; ovality {coil.inspection.ovalityPct != null ? `${coil.inspection.ovalityPct} %` : "not measured"}; end caps{" "}
            {coil.inspection.endCapsInPlace ? "in place" : "missing"}
          </Fact>
        </dl>
      ) : (
        <p>{text ? `Not a coil: ${text}` : "Not recorded"}</p>
      )}
    </section>
  );
}

// Joint → origins: everything that made one joint, as it stood on the day.
export default async function JointOriginsPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("traceLots");
  const { id } = await params;
  const jointId = Number(id);
  if (!Number.isInteger(jointId) || jointId <= 0) notFound();
  const o = await traceJointOrigins(jointId);
  if (!o) notFound();
  const system = user.unitSystem;
  const q = o.qualification;
  const check = o.heater.lastCheck;
  return (
    <div className="flex flex-col gap-6">
      <p>
        <Link href="/trace" className="font-semibold text-brand underline">
          ← Trace
        </Link>
      </p>
      <h1 className="text-2xl font-bold">
        {o.joint.jobCode} joint {o.joint.jointNo}: origins
      </h1>
      <section aria-labelledby="joint" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="joint" className="mb-2 text-lg font-bold">
          Joint
        </h2>
        <dl className="grid gap-2 sm:grid-cols-3">
          <Fact label="Job">
            {o.joint.jobCode} — {o.joint.jobName}
          </Fact>
          <Fact label="Made">{o.joint.madeAt.toISOString().slice(0, 16).replace("T", " ")} UTC</Fact>
          <Fact label="Place">
            {o.joint.station ? `Station ${o.joint.station}` : "no station"}
            {o.joint.latitude != null && o.joint.longitude != null ? ` · ${o.joint.latitude.toFixed(5)}, ${o.joint.longitude.toFixed(5)}` : ""}
          </Fact>
          <Fact label="Kind">{o.joint.kind}</Fact>
          <Fact label="Pipe">
            {formatQuantity(o.joint.outsideDiameterMm, "length-mm", system)} OD, SDR {o.joint.sdr}
          </Fact>
          <Fact label="Outcome">
            {o.joint.outcome === "within-limits" ? "Within limits" : "Out of limits"}
            {o.joint.reviewState ? ` · ${o.joint.reviewState.replace("-", " ")}` : ""}
          </Fact>
        </dl>
        <p className="mt-2">
          <Link href={`/labels?kind=joint&ids=${o.joint.id}`} className="font-semibold text-brand underline">
            Print joint tag
          </Link>
        </p>
      </section>
      <h2 className="text-xl font-bold">Components</h2>
      <div className="grid gap-4 lg:grid-cols-2">
        <Component title="Component A" coil={o.coilA} lengthM={o.joint.lengthAM} system={system} />
        <Component title="Component B" coil={o.coilB} text={o.joint.componentBText} lengthM={o.joint.lengthBM} system={system} />
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <section aria-labelledby="machine" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="machine" className="mb-2 text-lg font-bold">
            Fusion machine
          </h2>
          <dl className="grid gap-2">
            <Fact label="Machine">
              {o.machine.assetTag}
              {o.machine.description ? ` — ${o.machine.description}` : ""}
            </Fact>
            <Fact label="Total effective piston area">{o.machine.pistonAreaMm2 != null ? formatQuantity(o.machine.pistonAreaMm2, "area", system) : "not on file"}</Fact>
            <Fact label="Service">
              last {o.machine.lastServiceOn ?? "not recorded"}, next due {o.machine.nextServiceDue ?? "not recorded"}
            </Fact>
          </dl>
        </section>
        <section aria-labelledby="heater" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="heater" className="mb-2 text-lg font-bold">
            Heater plate
          </h2>
          <dl className="grid gap-2">
            <Fact label="Plate">
              {o.heater.assetTag}
              {o.heater.description ? ` — ${o.heater.description}` : ""}
            </Fact>
            <Fact label="Last temperature check before the joint">
              {check
                ? `${check.checkedAt.toISOString().slice(0, 16).replace("T", " ")} UTC, ${check.passed ? "passed" : "failed"} (${formatQuantity(check.windowMinC, "temperature", system)}–${formatQuantity(check.windowMaxC, "temperature", system)}, ${check.instrument}${check.checkedByName ? `, by ${check.checkedByName}` : ""}); next due ${check.nextDueOn}`
                : "No check on file before the joint"}
            </Fact>
            <Fact label="Check in date when the joint was made">{o.heaterCheckInDate == null ? "no check" : o.heaterCheckInDate ? "yes" : "no — the check was overdue or failed"}</Fact>
          </dl>
        </section>
        <section aria-labelledby="fuser" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="fuser" className="mb-2 text-lg font-bold">
            Fuser
          </h2>
          <dl className="grid gap-2">
            <Fact label="Name">{o.fuser.name}</Fact>
            <Fact label={`Qualification on ${o.madeOn}`}>
              <span className={q.qualified ? "text-pass" : "text-fail"}>{q.qualified ? "Qualified" : "Not qualified"}</span> — {q.reason}
            </Fact>
            <Fact label="Qualified on">{o.fuser.qualifiedOn.length ? o.fuser.qualifiedOn.join(", ") : "never"}</Fact>
          </dl>
        </section>
        <section aria-labelledby="procedure" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="procedure" className="mb-2 text-lg font-bold">
            Procedure
          </h2>
          <dl className="grid gap-2">
            <Fact label="Procedure">
              {o.procedure.code} — {o.procedure.name}
            </Fact>
            <Fact label="Version">
              {o.procedure.versionNo}, published {o.procedure.publishedAt.toISOString().slice(0, 10)}
              {o.procedure.supersededAt ? `, superseded ${o.procedure.supersededAt.toISOString().slice(0, 10)}` : ""}
            </Fact>
            <Fact label="Based on">{o.procedure.standard}</Fact>
          </dl>
        </section>
      </div>
    </div>
  );
}
