// Today for an admin: qualifications lapsing or lapsed, heater checks due, machines that
// cannot be used because their piston area is missing.
import Link from "next/link";
import { listHeatersNeedingCheck, listMachinesWithoutPistonArea } from "@/database/queries/equipment";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { QualificationBadge } from "@/components/qualifications/qualification-badge";
import { TodayPanel } from "./today-panel";

export async function TodayAdmin({ now }: { now: Date }) {
  const [statuses, heaters, machines] = await Promise.all([qualificationStatusOverview({ now }), listHeatersNeedingCheck({ now }), listMachinesWithoutPistonArea()]);
  const attention = statuses.filter((s) => s.userIsActive && (s.status.state === "due-soon" || s.status.state === "lapsed" || s.status.state === "requalification-needed"));
  return (
    <>
      <TodayPanel id="today-lapsing" title="Qualifications lapsing or lapsed" href="/crew" linkText="Open Crew" tone={attention.length ? "attention" : "plain"}>
        {attention.length ? (
          <ul className="flex flex-col gap-1">
            {attention.map((s) => (
              <li key={`${s.userId}-${s.procedureId}`}>
                <Link className="font-semibold text-brand underline" href={`/crew/${s.userId}`}>
                  {s.userName}
                </Link>{" "}
                · {s.procedureCode} · <QualificationBadge status={s.status} />
              </li>
            ))}
          </ul>
        ) : (
          <p>Nobody lapses within 30 days.</p>
        )}
      </TodayPanel>
      <TodayPanel id="today-heaters" title="Heater checks due" href="/equipment" linkText="Open Equipment" tone={heaters.length ? "attention" : "plain"}>
        {heaters.length ? (
          <ul className="flex flex-col gap-1">
            {heaters.map((h) => (
              <li key={h.id}>
                <Link className="font-semibold text-brand underline" href={`/equipment/heaters/${h.id}`}>
                  {h.assetTag}
                </Link>
                : {h.problems.join(" ")}
              </li>
            ))}
          </ul>
        ) : (
          <p>Every heater plate in service has a current passing check.</p>
        )}
      </TodayPanel>
      <TodayPanel id="today-machines" title="Machines without a piston area" href="/equipment" linkText="Open Equipment" tone={machines.length ? "attention" : "plain"}>
        {machines.length ? (
          <ul className="flex flex-col gap-1">
            {machines.map((m) => (
              <li key={m.id}>
                <Link className="font-semibold text-brand underline" href={`/equipment/machines/${m.id}`}>
                  {m.assetTag}
                </Link>
                {m.description ? ` (${m.description})` : ""}: cannot be used until its total effective piston area is entered.
              </li>
            ))}
          </ul>
        ) : (
          <p>Every machine in service has its piston area on record.</p>
        )}
      </TodayPanel>
    </>
  );
}
