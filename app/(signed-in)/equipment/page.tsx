import Link from "next/link";
import { Cautions } from "@/components/ui/caution";
import { requireUser } from "@/app/_lib/page-guard";
import { listHeatersWithLastCheck, listMachines } from "@/database/queries/equipment";
import { formatRange } from "@/domain/units/format";
import { HeaterForm } from "./_components/heater-form";
import { MachineForm } from "./_components/machine-form";
import { pistonArea, shown } from "./_components/format";

export const dynamic = "force-dynamic";

// Equipment (admin): fusion machines with their piston areas, heater plates with their checks.
export default async function EquipmentPage() {
  const user = await requireUser("manageEquipment");
  const units = user.unitSystem;
  const [machines, heaters] = await Promise.all([listMachines(), listHeatersWithLastCheck()]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Equipment</h1>
      <Cautions kinds={["heater", "pinch"]} />
      <section aria-labelledby="machines">
        <h2 id="machines" className="mb-2 text-xl font-bold">
          Fusion machines
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">Asset tag</th>
                <th className="p-2">Pipe OD range</th>
                <th className="p-2">Total effective piston area</th>
                <th className="p-2">Service</th>
                <th className="p-2">Can be used</th>
              </tr>
            </thead>
            <tbody>
              {machines.map((m) => (
                <tr key={m.id} className="border-b border-slate-200">
                  <td className="p-2 font-semibold">
                    <Link className="text-brand underline" href={`/equipment/machines/${m.id}`}>
                      {m.assetTag}
                    </Link>
                    {m.description ? <div className="text-sm font-normal text-slate-700">{m.description}</div> : null}
                  </td>
                  <td className="p-2">{m.minOdMm !== null || m.maxOdMm !== null ? formatRange(m.minOdMm, m.maxOdMm, "length-mm", units) : "—"}</td>
                  <td className="p-2">{pistonArea(m.pistonAreaMm2, units)}</td>
                  <td className="p-2 text-sm">
                    Last {m.lastServiceOn ?? "—"}, next due {m.nextServiceDue ?? "—"}
                  </td>
                  <td className="p-2">{m.isUsable ? <span className="font-semibold text-pass">Yes</span> : <span className="font-semibold text-fail">No — {m.problems.join(" ")}</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
      <section aria-labelledby="add-machine" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="add-machine" className="mb-2 text-xl font-bold">
          Add a machine
        </h2>
        <MachineForm units={units} />
      </section>
      <section aria-labelledby="heaters">
        <h2 id="heaters" className="mb-2 text-xl font-bold">
          Heater plates
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">Asset tag</th>
                <th className="p-2">Last check</th>
                <th className="p-2">Next check due</th>
                <th className="p-2">State</th>
              </tr>
            </thead>
            <tbody>
              {heaters.map((h) => (
                <tr key={h.id} className="border-b border-slate-200">
                  <td className="p-2 font-semibold">
                    <Link className="text-brand underline" href={`/equipment/heaters/${h.id}`}>
                      {h.assetTag}
                    </Link>
                    {h.description ? <div className="text-sm font-normal text-slate-700">{h.description}</div> : null}
                  </td>
                  <td className="p-2">
                    {h.lastCheck
                      ? `${h.lastCheck.checkedAt.toISOString().slice(0, 16).replace("T", " ")} UTC · ${h.lastCheck.passed ? "passed" : "FAILED"} · ${shown(Math.min(...h.lastCheck.readings.faceA, ...h.lastCheck.readings.faceB), "temperature", units)} to ${shown(Math.max(...h.lastCheck.readings.faceA, ...h.lastCheck.readings.faceB), "temperature", units)}`
                      : "Never checked"}
                  </td>
                  <td className="p-2">{h.nextDueOn ?? "now"}</td>
                  <td className="p-2">
                    {!h.isActive ? "Retired" : h.problems.length ? <span className="font-semibold text-fail">{h.problems.join(" ")}</span> : <span className="font-semibold text-pass">Checked, in use</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
      <section aria-labelledby="add-heater" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="add-heater" className="mb-2 text-xl font-bold">
          Add a heater plate
        </h2>
        <HeaterForm />
      </section>
    </div>
  );
}
