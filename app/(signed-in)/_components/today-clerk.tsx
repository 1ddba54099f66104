// Today for a records clerk: coils received but not labelled, exports still running.
import { listCoilsAwaitingLabel, listRunningExports } from "@/database/queries/today";
import { TimeDisplay } from "@/components/ui/time-display";
import { TodayPanel } from "./today-panel";

export async function TodayClerk({ userId }: { userId: number }) {
  const [coils, exports] = await Promise.all([listCoilsAwaitingLabel(), listRunningExports({ userId })]);
  return (
    <>
      <TodayPanel id="today-labels" title="Coils waiting for a label" href="/coils" linkText="Open Coils" tone={coils.count ? "attention" : "plain"}>
        <p>
          <span className="text-2xl font-bold">{coils.count}</span> coil{coils.count === 1 ? "" : "s"} received but not labelled.
        </p>
        {coils.coils.length ? (
          <ul className="list-disc pl-5">
            {coils.coils.map((c) => (
              <li key={c.id}>
                {c.coilCode} · lot {c.lot} · {c.nominalSize}&quot; · received <TimeDisplay at={c.receivedAt} precision="date" />
              </li>
            ))}
          </ul>
        ) : null}
      </TodayPanel>
      <TodayPanel id="today-exports" title="Your exports in progress" href="/register" linkText="Open the Register">
        {exports.count ? (
          <ul className="list-disc pl-5">
            {exports.exports.map((e) => (
              <li key={e.id}>
                {e.format.toUpperCase()} export started <TimeDisplay at={e.startedAt} />: still running
              </li>
            ))}
          </ul>
        ) : (
          <p>No exports waiting.</p>
        )}
      </TodayPanel>
    </>
  );
}
