import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { listCrews, listUsers } from "@/database/queries/users";
import { ROLE_LABELS } from "@/domain/roles";
import { AddPersonForm } from "./_components/add-person-form";
import { QualificationBadge } from "@/components/qualifications/qualification-badge";

export const dynamic = "force-dynamic";

// Crew (admin): people, roles and who is qualified for which procedure (49 CFR 192.285).
export default async function CrewPage() {
  await requireUser("manageCrew");
  const [people, crews, statuses] = await Promise.all([listUsers(), listCrews(), qualificationStatusOverview()]);
  const active = statuses.filter((s) => s.userIsActive);
  const lapsing = active.filter((s) => s.status.state === "due-soon");
  const lapsed = active.filter((s) => s.status.state === "lapsed" || s.status.state === "requalification-needed");
  const qualified = active.filter((s) => s.status.qualified);
  const byPerson = new Map<number, typeof statuses>();
  for (const s of statuses) byPerson.set(s.userId, [...(byPerson.get(s.userId) ?? []), s]);
  const list = (rows: typeof statuses, empty: string) =>
    rows.length ? (
      <ul className="flex flex-col gap-1">
        {rows.map((s) => (
          <li key={`${s.userId}-${s.procedureId}`}>
            <Link className="font-semibold text-brand underline" href={`/crew/${s.userId}`}>
              {s.userName}
            </Link>{" "}
            · {s.procedureCode} · <QualificationBadge status={s.status} />
          </li>
        ))}
      </ul>
    ) : (
      <p>{empty}</p>
    );
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Crew</h1>
      <div className="grid gap-4 lg:grid-cols-3">
        <section aria-labelledby="lapsing" className="rounded-md border-2 border-caution bg-white p-4">
          <h2 id="lapsing" className="mb-2 text-lg font-bold">
            Lapse within 30 days
          </h2>
          {list(lapsing, "Nobody lapses within 30 days.")}
        </section>
        <section aria-labelledby="lapsed" className="rounded-md border-2 border-fail bg-white p-4">
          <h2 id="lapsed" className="mb-2 text-lg font-bold">
            Lapsed or requalification needed
          </h2>
          {list(lapsed, "Nobody has lapsed.")}
        </section>
        <section aria-labelledby="qualified" className="rounded-md border-2 border-pass bg-white p-4">
          <h2 id="qualified" className="mb-2 text-lg font-bold">
            Qualified now
          </h2>
          {list(qualified, "Nobody is qualified yet.")}
        </section>
      </div>
      <section aria-labelledby="people">
        <h2 id="people" className="mb-2 text-xl font-bold">
          People
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">Name</th>
                <th className="p-2">Roles</th>
                <th className="p-2">Crew</th>
                <th className="p-2">Qualifications</th>
                <th className="p-2">Account</th>
              </tr>
            </thead>
            <tbody>
              {people.map((p) => (
                <tr key={p.id} className="border-b border-slate-200 align-top">
                  <td className="p-2">
                    <Link className="font-semibold text-brand underline" href={`/crew/${p.id}`}>
                      {p.name}
                    </Link>
                    <div className="text-sm text-slate-700">{p.email}</div>
                  </td>
                  <td className="p-2">{p.roles.map((r) => ROLE_LABELS[r]).join(", ")}</td>
                  <td className="p-2">{p.crewName ?? "—"}</td>
                  <td className="p-2">
                    <ul className="flex flex-col gap-1">
                      {(byPerson.get(p.id) ?? []).map((s) => (
                        <li key={s.procedureId}>
                          {s.procedureCode}: <QualificationBadge status={s.status} />
                        </li>
                      ))}
                    </ul>
                  </td>
                  <td className="p-2">{p.isActive ? "Active" : <span className="font-semibold text-fail">Deactivated</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
      <section aria-labelledby="add-person" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="add-person" className="mb-2 text-xl font-bold">
          Add a person
        </h2>
        <AddPersonForm crews={crews} />
      </section>
    </div>
  );
}
