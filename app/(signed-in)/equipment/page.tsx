import { Cautions } from "@/components/ui/caution";
import { requireUser } from "@/app/_lib/page-guard";
import { listHeatersWithLastCheck, listMachines } from "@/database/queries/equipment";
import { formatRange } from "@/domain/units/format";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { SectionCard } from "@/components/ui/section-card";
import { AssetTagCell } from "./_components/asset-tag-cell";
import { HeaterForm } from "./_components/heater-form";
import { MachineForm } from "./_components/machine-form";
import { pistonArea, shown } from "./_components/format";

export const dynamic = "force-dynamic";

// Equipment (admin): fusion machines with their piston areas, heater plates with their checks.
export default async function EquipmentPage() {
  const user = await requireUser("manageEquipment");
  const timeZone = await organisationTimeZone();
  const units = user.unitSystem;
  const [machines, heaters] = await Promise.all([listMachines(), listHeatersWithLastCheck({ timeZone })]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Equipment</h1>
      <Cautions kinds={["heater", "pinch"]} />
      <SectionCard id="machines" title="Fusion machines">
        <DataTable
          labelledBy="machines"
          rows={machines}
          rowKey={(m) => m.id}
          columns={[
            { header: "Asset tag", cell: (m) => <AssetTagCell href={`/equipment/machines/${m.id}`} assetTag={m.assetTag} description={m.description} /> },
            { header: "Pipe OD range", cell: (m) => (m.minOdMm !== null || m.maxOdMm !== null ? formatRange(m.minOdMm, m.maxOdMm, "length-mm", units) : "—") },
            { header: "Total effective piston area", cell: (m) => pistonArea(m.pistonAreaMm2, units) },
            { header: "Service", className: "text-sm", cell: (m) => `Last ${m.lastServiceOn ?? "—"}, next due ${m.nextServiceDue ?? "—"}` },
            { header: "Can be used", cell: (m) => (m.isUsable ? <span className="font-semibold text-pass">Yes</span> : <span className="font-semibold text-fail">No — {m.problems.join(" ")}</span>) },
          ]}
        />
      </SectionCard>
      <SectionCard id="add-machine" title="Add a machine" tone="card">
        <MachineForm units={units} />
      </SectionCard>
      <SectionCard id="heaters" title="Heater plates">
        <DataTable
          labelledBy="heaters"
          rows={heaters}
          rowKey={(h) => h.id}
          columns={[
            { header: "Asset tag", cell: (h) => <AssetTagCell href={`/equipment/heaters/${h.id}`} assetTag={h.assetTag} description={h.description} /> },
            {
              header: "Last check",
              cell: (h) =>
                h.lastCheck
                  ? `${formatInstant(h.lastCheck.checkedAt, "minute", timeZone)} · ${h.lastCheck.passed ? "passed" : "FAILED"} · ${shown(Math.min(...h.lastCheck.readings.faceA, ...h.lastCheck.readings.faceB), "temperature", units)} to ${shown(Math.max(...h.lastCheck.readings.faceA, ...h.lastCheck.readings.faceB), "temperature", units)}`
                  : "Never checked",
            },
            { header: "Next check due", cell: (h) => h.nextDueOn ?? "now" },
            {
              header: "State",
              cell: (h) =>
                !h.isActive ? "Retired" : h.problems.length ? <span className="font-semibold text-fail">{h.problems.join(" ")}</span> : <span className="font-semibold text-pass">Checked, in use</span>,
            },
          ]}
        />
      </SectionCard>
      <SectionCard id="add-heater" title="Add a heater plate" tone="card">
        <HeaterForm />
      </SectionCard>
    </div>
  );
}
