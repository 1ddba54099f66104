import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import type { Coil } from "@/database/queries/coils";
import { DAMAGE_LABELS } from "@/domain/coils/life";
import { describeSize } from "@/domain/labels/label";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { CoilStatusBadge, ReviewStateBadge } from "@/components/ui/badges";
import { formatJointReference } from "@/domain/joints/reference";
import { FactBlock, FactList } from "@/components/ui/fact-list";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { TimeDisplay } from "@/components/ui/time-display";
import { traceJointOrigins } from "@/app/_server/trace/origins";
import { SectionCard } from "@/components/ui/section-card";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { JOINT_KIND_LABELS } from "@/domain/joints/schemas";
import { builtInProcedure, isFusionStandard } from "@/domain/procedures/built-in";

export const dynamic = "force-dynamic";

function Component({ title, coil, text, lengthM, system }: { title: string; coil: Coil | null; text?: string | null; lengthM: number | null; system: UnitSystem }) {
  return (
    <SectionCard id={title.toLowerCase().replace(/\W+/g, "-")} title={title} tone="card" level={3}>
      {coil ? (
        <FactList layout="stacked" columns={2}>
          <FactBlock term="Coil">
            <Link href={`/coils/${encodeURIComponent(coil.coilCode)}`} className="text-brand underline">
              {coil.coilCode}
            </Link>{" "}
            <CoilStatusBadge status={coil.status} />
          </FactBlock>
          <FactBlock term="Pipe maker and lot">
            <Link href={`/trace?manufacturer=${encodeURIComponent(coil.manufacturer)}&lot=${encodeURIComponent(coil.lot)}`} className="text-brand underline">
              {coil.manufacturer} lot {coil.lot}
            </Link>
          </FactBlock>
          <FactBlock term="Size and material">
            {describeSize(coil)} {coil.material}
          </FactBlock>
          <FactBlock term="Traceability code">{coil.traceCode ?? "none"}</FactBlock>
          <FactBlock term="Production date">{coil.productionDate ?? "not recorded"}</FactBlock>
          <FactBlock term="Laid from it with this joint">{lengthM != null ? formatQuantity(lengthM, "length-m", system) : "not recorded"}</FactBlock>
          <FactBlock term="Receipt inspection">
            {coil.inspection.passed ? "Passed" : "Failed"} on <TimeDisplay at={coil.inspection.receivedAt} precision="date" />
            {coil.inspection.receivedByName ? ` by ${coil.inspection.receivedByName}` : ""}
          </FactBlock>
          <FactBlock term="Damage, ovality, end caps">
            {coil.inspection.damageKinds.length ? coil.inspection.damageKinds.map((k) => DAMAGE_LABELS[k]).join(", ") : "no damage"}; ovality {coil.inspection.ovalityPct != null ? `${coil.inspection.ovalityPct} %` : "not measured"}; end caps{" "}
            {coil.inspection.endCapsInPlace ? "in place" : "missing"}
          </FactBlock>
        </FactList>
      ) : (
        <p>{text ? `Not a coil: ${text}` : "Not recorded"}</p>
      )}
    </SectionCard>
  );
}

// Joint → origins: everything that made one joint, as it stood on the day.
export default async function JointOriginsPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("traceLots");
  const timeZone = await organisationTimeZone();
  const jointId = await requirePageId(params, "bigint");
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
        {formatJointReference(o.joint)}: origins
      </h1>
      <SectionCard id="joint" title="Joint" tone="card" isCompact>
        <FactList layout="stacked" columns={3}>
          <FactBlock term="Job">
            {o.joint.jobCode} — {o.joint.jobName}
          </FactBlock>
          <FactBlock term="Made">
            <TimeDisplay at={o.joint.madeAt} />
          </FactBlock>
          <FactBlock term="Place">
            {o.joint.station ? `Station ${o.joint.station}` : "no station"}
            {o.joint.latitude != null && o.joint.longitude != null ? ` · ${o.joint.latitude.toFixed(5)}, ${o.joint.longitude.toFixed(5)}` : ""}
          </FactBlock>
          <FactBlock term="Kind">{JOINT_KIND_LABELS[o.joint.kind]}</FactBlock>
          <FactBlock term="Pipe">
            {formatQuantity(o.joint.outsideDiameterMm, "length-mm", system)} OD, SDR {o.joint.sdr}
          </FactBlock>
          <FactBlock term="Outcome">{OUTCOME_LABELS[o.joint.outcome]}</FactBlock>
          <FactBlock term="Review">
            <ReviewStateBadge state={o.joint.reviewState} size="sm" />
            {o.decision ? (
              <>
                {" "}
                by {o.decision.byName}, <TimeDisplay at={o.decision.at} />
                {o.decision.note ? `: “${o.decision.note}”` : ""}
              </>
            ) : null}
          </FactBlock>
          {o.joint.reviewState === "cut-out" ? (
            <FactBlock term="In the ground">
              No — cut out;{" "}
              {o.joint.replacedBy ? (
                <>
                  replaced by{" "}
                  <Link href={`/trace/joints/${o.joint.replacedBy.id}`} className="font-semibold text-brand underline">
                    {formatJointReference(o.joint.replacedBy)}
                  </Link>
                </>
              ) : (
                "not remade yet"
              )}
            </FactBlock>
          ) : null}
          {o.joint.replaces ? (
            <FactBlock term="Remakes">
              <Link href={`/trace/joints/${o.joint.replaces.id}`} className="font-semibold text-brand underline">
                {formatJointReference(o.joint.replaces)}
              </Link>{" "}
              (cut out)
            </FactBlock>
          ) : null}
        </FactList>
        <p className="mt-2">
          <Link href={`/labels?kind=joint&ids=${o.joint.id}`} className="font-semibold text-brand underline">
            Print joint tag
          </Link>
        </p>
      </SectionCard>
      <h2 className="text-xl font-bold">Components</h2>
      <div className="grid gap-4 lg:grid-cols-2">
        <Component title="Component A" coil={o.coilA} lengthM={o.joint.lengthAM} system={system} />
        <Component title="Component B" coil={o.coilB} text={o.joint.componentBText} lengthM={o.joint.lengthBM} system={system} />
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <SectionCard id="machine" title="Fusion machine" tone="card" isCompact>
          <FactList layout="stacked">
            <FactBlock term="Machine">
              {o.machine.assetTag}
              {o.machine.description ? ` — ${o.machine.description}` : ""}
            </FactBlock>
            <FactBlock term="Total effective piston area">{o.machine.pistonAreaMm2 != null ? formatQuantity(o.machine.pistonAreaMm2, "area", system) : "not on file"}</FactBlock>
            <FactBlock term="Service">
              last {o.machine.lastServiceOn ?? "not recorded"}, next due {o.machine.nextServiceDue ?? "not recorded"}
            </FactBlock>
          </FactList>
        </SectionCard>
        <SectionCard id="heater" title="Heater plate" tone="card" isCompact>
          <FactList layout="stacked">
            <FactBlock term="Plate">
              {o.heater.assetTag}
              {o.heater.description ? ` — ${o.heater.description}` : ""}
            </FactBlock>
            <FactBlock term="Last temperature check before the joint">
              {check
                ? `${formatInstant(check.checkedAt, "minute", timeZone)}, ${check.passed ? "passed" : "failed"} (${formatQuantity(check.windowMinC, "temperature", system)}–${formatQuantity(check.windowMaxC, "temperature", system)}, ${check.instrument}${check.checkedByName ? `, by ${check.checkedByName}` : ""}); next due ${check.nextDueOn}`
                : "No check on file before the joint"}
            </FactBlock>
            <FactBlock term="Check in date when the joint was made">{o.heaterCheckInDate == null ? "no check" : o.heaterCheckInDate ? "yes" : "no — the check was overdue or failed"}</FactBlock>
          </FactList>
        </SectionCard>
        <SectionCard id="fuser" title="Fuser" tone="card" isCompact>
          <FactList layout="stacked">
            <FactBlock term="Name">{o.fuser.name}</FactBlock>
            <FactBlock term={`Qualification on ${o.madeOn}`}>
              <span className={q.qualified ? "text-pass" : "text-fail"}>{q.qualified ? "Qualified" : "Not qualified"}</span> — {q.reason}
            </FactBlock>
            <FactBlock term="Qualified on">{o.fuser.qualifiedOn.length ? o.fuser.qualifiedOn.join(", ") : "never"}</FactBlock>
          </FactList>
        </SectionCard>
        <SectionCard id="procedure" title="Procedure" tone="card" isCompact>
          <FactList layout="stacked">
            <FactBlock term="Procedure">
              {o.procedure.code} — {o.procedure.name}
            </FactBlock>
            <FactBlock term="Version">
              {o.procedure.versionNo}, published <TimeDisplay at={o.procedure.publishedAt} precision="date" />
              {o.procedure.supersededAt ? `, superseded ${formatInstant(o.procedure.supersededAt, "date", timeZone)}` : ""}
            </FactBlock>
            <FactBlock term="Based on">{isFusionStandard(o.procedure.standard) ? builtInProcedure(o.procedure.standard).label : o.procedure.standard}</FactBlock>
          </FactList>
        </SectionCard>
      </div>
    </div>
  );
}
