import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { listProcedures } from "@/database/queries/procedures";
import { listQualificationFailuresForUser, listQualificationsForUser, qualificationStatusOverview } from "@/database/queries/qualifications";
import { findUserById, listCrews } from "@/database/queries/users";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { QUALIFICATION_METHOD_LABELS } from "@/domain/qualifications/schemas";
import { ROLE_LABELS } from "@/domain/roles";
import { FailureForm } from "../_components/failure-form";
import { PersonAccessForm } from "../_components/person-access-form";
import { QualificationStatusList } from "@/components/qualifications/qualification-lists";
import { QualificationForm } from "../_components/qualification-form";
import { ResetPasswordForm } from "../_components/reset-password-form";
import { DataTable } from "@/components/ui/data-table";
import { SectionCard } from "@/components/ui/section-card";

export const dynamic = "force-dynamic";

export default async function PersonPage({ params }: { params: Promise<{ id: string }> }) {
  await requireUser("manageCrew");
  const timeZone = await organisationTimeZone();
  const id = await requirePageId(params);
  const person = await findUserById({ id });
  if (!person) notFound();
  const [crews, procedures, statuses, qualifications, failures] = await Promise.all([
    listCrews(),
    listProcedures({ activeOnly: true }),
    qualificationStatusOverview({ userId: id, timeZone }),
    listQualificationsForUser({ userId: id }),
    listQualificationFailuresForUser({ userId: id }),
  ]);
  const today = isoDateIn(new Date(), timeZone);
  const procedureOptions = procedures.map((p) => ({ id: p.id, label: `${p.code} — ${p.name}` }));
  return (
    <div className="flex flex-col gap-6">
      <PageHeader backHref="/crew" backText="All crew" title={person.name} />
      <p>
        {person.email} · {person.roles.map((r) => ROLE_LABELS[r]).join(", ")} · {person.crewName ?? "no crew"} · {person.isActive ? "active" : "deactivated"}
      </p>
      <SectionCard id="status" title="Qualification status" tone="card">
        <QualificationStatusList statuses={statuses} empty={<>No qualification on record: {person.name} may not make joints.</>} />
      </SectionCard>
      <SectionCard id="record-qualification" title="Record a qualification or requalification" tone="card">
        <QualificationForm person={{ id: person.id, name: person.name }} procedures={procedureOptions} today={today} />
      </SectionCard>
      <SectionCard id="history" title="Qualification record">
        <DataTable
          labelledBy="history"
          isDense
          rows={qualifications}
          rowKey={(q) => q.id}
          empty="None recorded."
          columns={[
            { header: "Date", cell: (q) => q.qualifiedOn },
            { header: "Procedure", cell: (q) => q.procedureCode },
            { header: "Test", cell: (q) => QUALIFICATION_METHOD_LABELS[q.method] },
            { header: "Specimen result", cell: (q) => q.specimenResult },
            { header: "Evaluator", cell: (q) => q.evaluator },
            {
              header: "Evidence",
              cell: (q) =>
                q.evidenceAttachmentId ? (
                  <a className="text-brand underline" href={`/crew/evidence/${q.evidenceAttachmentId}`}>
                    Open evidence
                  </a>
                ) : (
                  "—"
                ),
            },
          ]}
        />
        {failures.length ? (
          <>
            <h3 className="mb-1 mt-4 font-bold">Production joints found unacceptable by test</h3>
            <ul className="list-disc pl-5 text-sm">
              {failures.map((f) => (
                <li key={f.id}>
                  {f.failedOn} · {f.procedureCode}
                  {f.jointId ? ` · joint ${f.jointId}` : ""} · {f.notes}
                </li>
              ))}
            </ul>
          </>
        ) : null}
      </SectionCard>
      <SectionCard id="record-failure" title="Record a failed production-joint test" tone="card">
        <FailureForm person={{ id: person.id, name: person.name }} procedures={procedureOptions} today={today} />
      </SectionCard>
      <SectionCard id="access" title="Roles and access" tone="card">
        <PersonAccessForm key={person.version} person={{ id: person.id, version: person.version, name: person.name, roles: person.roles, isActive: person.isActive, crewId: person.crewId }} crews={crews} />
      </SectionCard>
      <SectionCard id="password" title="Reset password" tone="card">
        <ResetPasswordForm person={{ id: person.id, name: person.name }} />
      </SectionCard>
    </div>
  );
}
