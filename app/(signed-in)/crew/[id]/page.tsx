import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import { listProcedures } from "@/database/queries/procedures";
import { listQualificationFailuresForUser, listQualificationsForUser, qualificationStatusOverview } from "@/database/queries/qualifications";
import { findUserById, listCrews } from "@/database/queries/users";
import { isoDateOf } from "@/domain/dates/civil";
import { QUALIFICATION_METHOD_LABELS } from "@/domain/qualifications/schemas";
import { ROLE_LABELS } from "@/domain/roles";
import { FailureForm } from "../_components/failure-form";
import { PersonAccessForm } from "../_components/person-access-form";
import { QualificationBadge } from "@/components/qualifications/qualification-badge";
import { QualificationForm } from "../_components/qualification-form";
import { ResetPasswordForm } from "../_components/reset-password-form";

export const dynamic = "force-dynamic";

export default async function PersonPage({ params }: { params: Promise<{ id: string }> }) {
  await requireUser("manageCrew");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const person = await findUserById({ id });
  if (!person) notFound();
  const [crews, procedures, statuses, qualifications, failures] = await Promise.all([
    listCrews(),
    listProcedures({ activeOnly: true }),
    qualificationStatusOverview({ userId: id }),
    listQualificationsForUser({ userId: id }),
    listQualificationFailuresForUser({ userId: id }),
  ]);
  const today = isoDateOf(new Date());
  const procedureOptions = procedures.map((p) => ({ id: p.id, label: `${p.code} — ${p.name}` }));
  return (
    <div className="flex flex-col gap-6">
      <p>
        <Link href="/crew" className="text-brand underline">
          All crew
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{person.name}</h1>
      <p>
        {person.email} · {person.roles.map((r) => ROLE_LABELS[r]).join(", ")} · {person.crewName ?? "no crew"} · {person.isActive ? "active" : "deactivated"}
      </p>
      <section aria-labelledby="status" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="status" className="mb-2 text-xl font-bold">
          Qualification status
        </h2>
        {statuses.length ? (
          <ul className="flex flex-col gap-2">
            {statuses.map((s) => (
              <li key={s.procedureId}>
                <span className="font-semibold">{s.procedureCode}</span>: <QualificationBadge status={s.status} />
                <div className="text-sm text-slate-700">{s.status.reason}.</div>
              </li>
            ))}
          </ul>
        ) : (
          <p>No qualification on record: {person.name} may not make joints.</p>
        )}
      </section>
      <section aria-labelledby="record-qualification" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="record-qualification" className="mb-2 text-xl font-bold">
          Record a qualification or requalification
        </h2>
        <QualificationForm person={{ id: person.id, name: person.name }} procedures={procedureOptions} today={today} />
      </section>
      <section aria-labelledby="history">
        <h2 id="history" className="mb-2 text-xl font-bold">
          Qualification record
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left text-sm">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">Date</th>
                <th className="p-2">Procedure</th>
                <th className="p-2">Test</th>
                <th className="p-2">Specimen result</th>
                <th className="p-2">Evaluator</th>
                <th className="p-2">Evidence</th>
              </tr>
            </thead>
            <tbody>
              {qualifications.map((q) => (
                <tr key={q.id} className="border-b border-slate-200">
                  <td className="p-2">{q.qualifiedOn}</td>
                  <td className="p-2">{q.procedureCode}</td>
                  <td className="p-2">{QUALIFICATION_METHOD_LABELS[q.method]}</td>
                  <td className="p-2">{q.specimenResult}</td>
                  <td className="p-2">{q.evaluator}</td>
                  <td className="p-2">
                    {q.evidenceAttachmentId ? (
                      <a className="text-brand underline" href={`/crew/evidence/${q.evidenceAttachmentId}`}>
                        Open evidence
                      </a>
                    ) : (
                      "—"
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {qualifications.length === 0 ? <p className="p-2">None recorded.</p> : null}
        </div>
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
      </section>
      <section aria-labelledby="record-failure" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="record-failure" className="mb-2 text-xl font-bold">
          Record a failed production-joint test
        </h2>
        <FailureForm person={{ id: person.id, name: person.name }} procedures={procedureOptions} today={today} />
      </section>
      <section aria-labelledby="access" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="access" className="mb-2 text-xl font-bold">
          Roles and access
        </h2>
        <PersonAccessForm key={person.version} person={{ id: person.id, version: person.version, name: person.name, roles: person.roles, isActive: person.isActive, crewId: person.crewId }} crews={crews} />
      </section>
      <section aria-labelledby="password" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="password" className="mb-2 text-xl font-bold">
          Reset password
        </h2>
        <ResetPasswordForm person={{ id: person.id, name: person.name }} />
      </section>
    </div>
  );
}
