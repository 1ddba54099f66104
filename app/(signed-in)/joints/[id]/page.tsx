import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { listAttachmentsForJoint } from "@/database/queries/attachments";
import { findJointById, listJointRevisions, listOverrideUsesForJoint, type JointRecord } from "@/database/queries/joints";
import { JOINT_KIND_LABELS, SHELTER_LABELS, type TimedPhase } from "@/domain/joints/schemas";
import { missingValueText, NOT_RECORDED_OPTIONAL, RECORDED_VALUE_DEFINITIONS } from "@/domain/joints/values";
import { isRequiredValue } from "@/domain/fusion/check";
import { formatQuantity, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { OutcomeBadge, ReviewStateBadge } from "@/components/ui/badges";
import { FactLine, FactList } from "@/components/ui/fact-list";
import { TimeDisplay } from "@/components/ui/time-display";
import { REVIEW_STATE_LABELS } from "@/domain/joints/review-states";
import { REVISION_KIND_LABELS } from "@/domain/joints/revision-kinds";
import { verdictOf } from "@/app/_server/joints/record-joint";
import { PlanPanel } from "@/components/fusion/plan-panel";
import { SectionCard } from "@/components/ui/section-card";

export const dynamic = "force-dynamic";

type Params = { params: Promise<{ id: string }> };

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const { id } = await params;
  return { title: `Joint ${id}` };
}

function Value({ name, children }: { name: string; children: React.ReactNode }) {
  return <FactLine term={name}>{children}</FactLine>;
}

function quantity(v: number | null, kind: QuantityKind, system: UnitSystem): string {
  return v === null ? "not recorded" : formatQuantity(v, kind, system);
}

function check(v: boolean | null): string {
  return v === null ? "not recorded" : v ? "Yes" : "No";
}

function timedMark(joint: JointRecord, phase: TimedPhase, value: number | null): string {
  if (value === null) return "";
  return joint.timedFields.includes(phase) ? " (timed by the phase timer)" : " (typed)";
}

// Every joint as its own page: all values, findings, photos, the plan it was checked
// against, its revisions and review state, and the joint it replaces / was replaced by.
export default async function JointPage({ params }: Params) {
  const user = await requireUser();
  const id = await requirePageId(params, "bigint");
  // All four at once (the lists need only the id): one wait for the database, not two.
  const [joint, revisions, photos, overrides] = await Promise.all([findJointById({ id }), listJointRevisions({ jointId: id }), listAttachmentsForJoint({ jointId: id }), listOverrideUsesForJoint({ jointId: id })]);
  if (!joint) notFound();
  const system = user.unitSystem;
  const verdict = verdictOf(joint, system);
  const within = verdict.outcome === "within-limits";
  const q = (v: number | null, kind: QuantityKind) => quantity(v, kind, system);
  // Ambient and shelter are required only where the procedure's weather rules need them (a not-recorded finding).
  const conditionMissing = (parameter: "ambient" | "shelter") => (verdict.findings.some((f) => f.parameter === parameter && f.kind === "not-recorded") ? "not recorded" : NOT_RECORDED_OPTIONAL);

  return (
    <article className="mx-auto flex w-full max-w-3xl flex-col gap-4">
      <header className="flex flex-col gap-2">
        <h1 className="text-2xl font-bold">
          Joint {joint.jointNo} on {joint.jobCode}
        </h1>
        <p className="text-ink">
          {joint.jobName} · made <TimeDisplay at={joint.madeAt} /> by {joint.fuser.name}
        </p>
        <div className="flex flex-wrap gap-2">
          <OutcomeBadge outcome={verdict.outcome} size="lg" />
          <ReviewStateBadge state={joint.reviewState} size="lg" />
        </div>
        {joint.replacesJointId ? (
          <p>
            This joint remakes{" "}
            <Link className="inline-flex min-h-touch items-center font-semibold text-brand underline" href={`/joints/${joint.replacesJointId}`}>
              joint {joint.replacesJointNo}
            </Link>
            .
          </p>
        ) : null}
        {joint.replacedByJointId ? (
          <p className="font-semibold">
            Replaced by{" "}
            <Link className="inline-flex min-h-touch items-center text-brand underline" href={`/joints/${joint.replacedByJointId}`}>
              joint {joint.replacedByJointNo}
            </Link>
            .
          </p>
        ) : null}
      </header>

      <section aria-labelledby="findings-heading" className={`rounded-md border-2 p-3 ${within ? "border-pass bg-pass-light" : "border-fail bg-fail-light"}`}>
        <h2 id="findings-heading" className="text-xl font-bold">
          Findings
        </h2>
        {verdict.findings.length === 0 ? (
          <p>Every recorded value is within the limits of the plan below.</p>
        ) : (
          <ul className="list-disc pl-5">
            {verdict.findings.map((f) => (
              <li key={f.parameter + f.kind}>{f.message}</li>
            ))}
          </ul>
        )}
      </section>

      <SectionCard id="values-heading" title="Recorded values">
        <FactList layout="ruled">
          <Value name="Kind">{JOINT_KIND_LABELS[joint.kind]}</Value>
          <Value name="Side A">
            {joint.coilA ? (
              <>
                <Link className="inline-flex min-h-touch items-center font-semibold text-brand underline" href={`/coils/${encodeURIComponent(joint.coilA.code)}`}>
                  {joint.coilA.code}
                </Link>{" "}
                · {joint.coilA.manufacturer} lot {joint.coilA.lot}
                {joint.lengthAM !== null ? ` · ${q(joint.lengthAM, "length-m")} laid` : ""}
              </>
            ) : (
              "not recorded"
            )}
          </Value>
          <Value name="Side B">
            {joint.coilB ? (
              <>
                <Link className="inline-flex min-h-touch items-center font-semibold text-brand underline" href={`/coils/${encodeURIComponent(joint.coilB.code)}`}>
                  {joint.coilB.code}
                </Link>{" "}
                · {joint.coilB.manufacturer} lot {joint.coilB.lot}
                {joint.lengthBM !== null ? ` · ${q(joint.lengthBM, "length-m")} laid` : ""}
              </>
            ) : (
              (joint.componentBText ?? "not recorded")
            )}
          </Value>
          <Value name="Pipe">
            OD {q(joint.outsideDiameterMm, "length-mm")}, SDR {joint.sdr}
          </Value>
          <Value name="Procedure">
            {joint.procedureCode} v{joint.procedureVersionNo} · {joint.procedureName}
          </Value>
          <Value name="Machine / heater plate">
            {joint.machine.assetTag} / {joint.heater.assetTag}
          </Value>
          <Value name="Place">
            {joint.station ?? "no station"}
            {joint.latitude !== null && joint.longitude !== null ? ` · ${joint.latitude.toFixed(6)}, ${joint.longitude.toFixed(6)}` : ""}
          </Value>
          <Value name="Ambient / shelter">
            {joint.ambientC === null ? conditionMissing("ambient") : q(joint.ambientC, "temperature")} · {joint.shelter ? SHELTER_LABELS[joint.shelter] : conditionMissing("shelter")}
          </Value>
          {RECORDED_VALUE_DEFINITIONS.map((d) => {
            const v = (joint as unknown as Record<string, number | boolean | null>)[d.key] ?? null;
            // Missing: a finding only when the check requires the value (the review shows the same words).
            const missing = missingValueText(d, isRequiredValue(joint.plan, d));
            if (d.type === "check") return <Value key={d.key} name={d.label}>{v === null ? missing : check(v as boolean | null)}</Value>;
            return (
              <Value key={d.key} name={d.label}>
                {v === null ? missing : q(v as number | null, d.quantity)}
                {d.phase ? timedMark(joint, d.phase, v as number | null) : ""}
              </Value>
            );
          })}
          <Value name="Recorded">
            <TimeDisplay at={joint.recordedAt} precision="second" /> · submission {joint.clientId}
          </Value>
        </FactList>
      </SectionCard>

      {overrides.length ? (
        <section aria-labelledby="overrides-heading" className="rounded-md border-2 border-caution bg-caution-light p-3">
          <h2 id="overrides-heading" className="text-xl font-bold text-caution">
            Made under an override
          </h2>
          <ul className="list-disc pl-5">
            {overrides.map((o) => (
              <li key={o.id}>
                {o.message} Cleared by {o.grantedByName} at <TimeDisplay at={o.grantedAt} />: “{o.reason}”
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      <SectionCard id="photos-heading" title="Photos of the bead">
        {photos.length === 0 ? <p>No photos.</p> : null}
        <ul className="grid grid-cols-2 gap-2 sm:grid-cols-3">
          {photos.map((p, i) => (
            <li key={p.id}>
              <a href={`/api/v1/attachments/${p.id}`}>
                {/* eslint-disable-next-line @next/next/no-img-element */}
                <img src={`/api/v1/attachments/${p.id}`} alt={`Bead photo ${i + 1} of joint ${joint.jointNo}`} className="aspect-square w-full rounded object-cover" />
              </a>
            </li>
          ))}
        </ul>
      </SectionCard>

      <SectionCard id="plan-heading" title="The plan it was checked against" className="flex flex-col gap-2">
        <PlanPanel plan={joint.plan} system={system} procedure={`${joint.procedureCode} v${joint.procedureVersionNo}`} sources="inline" />
      </SectionCard>

      <SectionCard id="revisions-heading" title="Revisions">
        <ol className="flex flex-col gap-2">
          {revisions.map((r) => (
            <li key={r.id} className="rounded-md border-2 border-slate-300 bg-white p-3">
              <p className="font-semibold">
                {r.revisionNo}. {REVISION_KIND_LABELS[r.kind]} by {r.byUserName} at <TimeDisplay at={r.at} /> → {REVIEW_STATE_LABELS[r.reviewState]}
              </p>
              {r.reason ? <p>“{r.reason}”</p> : null}
            </li>
          ))}
        </ol>
      </SectionCard>
    </article>
  );
}
