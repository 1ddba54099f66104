import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { listCrews, listUsers } from "@/database/queries/users";
import { ROLE_LABELS, can } from "@/domain/roles";
import { DataTable } from "@/components/ui/data-table";
import { SectionCard } from "@/components/ui/section-card";
import { AddPersonForm } from "./_components/add-person-form";
import { OrganisationForm } from "./_components/organisation-form";
import { getOrganisationTimeZone, serverTimeZone } from "@/app/_server/organisation/get-time-zone";
import { formatZoned, timeZoneChoices } from "@/domain/dates/zone";
import { QualificationBadge } from "@/components/qualifications/qualification-badge";
import { QualifiedPeopleList } from "@/components/qualifications/qualification-lists";

export const dynamic = "force-dynamic";

// Crew (admin): people, roles and who is qualified for which procedure (49 CFR 192.285).
export default async function CrewPage() {
  const user = await requireUser("manageCrew");
  const zone = await getOrganisationTimeZone();
  const [people, crews, statuses] = await Promise.all([listUsers(), listCrews(), qualificationStatusOverview({ timeZone: zone.timeZone })]);
  const active = statuses.filter((s) => s.userIsActive);
  const lapsing = active.filter((s) => s.status.state === "due-soon");
  const lapsed = active.filter((s) => s.status.state === "lapsed" || s.status.state === "requalification-needed");
  const qualified = active.filter((s) => s.status.qualified);
  const byPerson = new Map<number, typeof statuses>();
  for (const s of statuses) byPerson.set(s.userId, [...(byPerson.get(s.userId) ?? []), s]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Crew</h1>
      <div className="grid gap-4 lg:grid-cols-3">
        <SectionCard id="lapsing" title="Lapse within 30 days" tone="caution" isCompact>
          <QualifiedPeopleList rows={lapsing} empty="Nobody lapses within 30 days." />
        </SectionCard>
        <SectionCard id="lapsed" title="Lapsed or requalification needed" tone="fail" isCompact>
          <QualifiedPeopleList rows={lapsed} empty="Nobody has lapsed." />
        </SectionCard>
        <SectionCard id="qualified" title="Qualified now" tone="pass" isCompact>
          <QualifiedPeopleList rows={qualified} empty="Nobody is qualified yet." />
        </SectionCard>
      </div>
      <SectionCard id="people" title="People">
        <DataTable
          labelledBy="people"
          rows={people}
          rowKey={(p) => p.id}
          columns={[
            {
              header: "Name",
              cell: (p) => (
                <>
                  <Link className="font-semibold text-brand underline" href={`/crew/${p.id}`}>
                    {p.name}
                  </Link>
                  <div className="text-sm text-slate-700">{p.email}</div>
                </>
              ),
            },
            { header: "Roles", cell: (p) => p.roles.map((r) => ROLE_LABELS[r]).join(", ") },
            { header: "Crew", cell: (p) => p.crewName ?? "—" },
            {
              header: "Qualifications",
              cell: (p) => (
                <ul className="flex flex-col gap-1">
                  {(byPerson.get(p.id) ?? []).map((s) => (
                    <li key={s.procedureId}>
                      {s.procedureCode}: <QualificationBadge status={s.status} />
                    </li>
                  ))}
                </ul>
              ),
            },
            { header: "Account", cell: (p) => (p.isActive ? "Active" : <span className="font-semibold text-fail">Deactivated</span>) },
          ]}
        />
      </SectionCard>
      <SectionCard id="add-person" title="Add a person" tone="card">
        <AddPersonForm crews={crews} />
      </SectionCard>
      {can(user, "manageOrganisation") ? (
        <SectionCard id="organisation" title="Organisation" tone="card">
          <OrganisationForm
            timeZone={zone.timeZone}
            isChosen={zone.isChosen}
            serverZone={serverTimeZone()}
            choices={timeZoneChoices(Intl.supportedValuesOf("timeZone"), zone.timeZone)}
            example={formatZoned(new Date(), zone.timeZone, "minute")}
          />
        </SectionCard>
      ) : null}
    </div>
  );
}
