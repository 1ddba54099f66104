// Today for an admin: qualifications lapsing or lapsed, heater checks due, machines that
// cannot be used because their piston area is missing.
import Link from "next/link";
import { listHeatersNeedingCheck, listMachinesWithoutPistonArea } from "@/database/queries/equipment";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { QualifiedPeopleList } from "@/components/qualifications/qualification-lists";
import { TodayPanel } from "./today-panel";

export async function TodayAdmin({ now }: { now: Date }) {
  const timeZone = await organisationTimeZone();
  const [statuses, heaters, machines] = await Promise.all([qualificationStatusOverview({ now, timeZone }), listHeatersNeedingCheck({ now, timeZone }), listMachinesWithoutPistonArea()]);
  const attention = statuses.filter((s) => s.userIsActive && (s.status.state === "due-soon" || s.status.state === "lapsed" || s.status.state === "requalification-needed"));
  return (
    <>
      <TodayPanel id="today-lapsing" title="Qualifications lapsing or lapsed" href="/crew" linkText="Open Crew" tone={attention.length ? "attention" : "plain"}>
        <QualifiedPeopleList rows={attention} empty="Nobody lapses within 30 days." />
      </TodayPanel>
      <TodayPanel id="today-heaters" title="Heater checks due" href="/equipment" linkText="Open Equipment" tone={heaters.length ? "attention" : "plain"}>
        <EquipmentLinks items={heaters} path="/equipment/heaters" note={(h) => `: ${h.problems.join(" ")}`} empty="Every heater plate in service has a current passing check." />
      </TodayPanel>
      <TodayPanel id="today-machines" title="Machines without a piston area" href="/equipment" linkText="Open Equipment" tone={machines.length ? "attention" : "plain"}>
        <EquipmentLinks
          items={machines}
          path="/equipment/machines"
          note={(m) => `${m.description ? ` (${m.description})` : ""}: cannot be used until its total effective piston area is entered.`}
          empty="Every machine in service has its piston area on record."
        />
      </TodayPanel>
    </>
  );
}

/** Machines or heater plates, each asset tag linked to its page and followed by why it is listed. */
function EquipmentLinks<T extends { id: number; assetTag: string }>({ items, path, note, empty }: { items: T[]; path: string; note: (item: T) => string; empty: string }) {
  if (!items.length) return <p>{empty}</p>;
  return (
    <ul className="flex flex-col gap-1">
      {items.map((item) => (
        <li key={item.id}>
          <Link className="inline-flex min-h-touch items-center font-semibold text-brand underline" href={`${path}/${item.id}`}>
            {item.assetTag}
          </Link>
          {note(item)}
        </li>
      ))}
    </ul>
  );
}
