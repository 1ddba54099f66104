import { notFound } from "next/navigation";
import { Cautions } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { findHeaterWithLastCheck, listHeaterChecks } from "@/database/queries/equipment";
import { listCurrentProcedureVersions } from "@/database/queries/procedures";
import { formatQuantity, formatRange } from "@/domain/units/format";
import { DataTable } from "@/components/ui/data-table";
import { SectionCard } from "@/components/ui/section-card";
import { TimeDisplay } from "@/components/ui/time-display";
import { HeaterCheckForm } from "../../_components/heater-check-form";
import { HeaterForm } from "../../_components/heater-form";

export const dynamic = "force-dynamic";

export default async function HeaterPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("manageEquipment");
  const id = await requirePageId(params);
  const heater = await findHeaterWithLastCheck({ id, timeZone: await organisationTimeZone() });
  if (!heater) notFound();
  const [checks, procedures] = await Promise.all([listHeaterChecks({ heaterId: id }), listCurrentProcedureVersions()]);
  const units = user.unitSystem;
  const t = (c: number) => formatQuantity(c, "temperature", units);
  return (
    <div className="flex flex-col gap-6">
      <PageHeader backHref="/equipment" backText="All equipment" title={`Heater plate ${heater.assetTag}`} />
      <p role="status" className={heater.problems.length ? "font-semibold text-fail" : "font-semibold text-pass"}>
        {heater.problems.length ? heater.problems.join(" ") : `Last check passed; next check due ${heater.nextDueOn}.`}
      </p>
      <Cautions kinds={["heater"]} />
      {heater.isActive ? (
        <SectionCard id="record-check" title="Record a surface-temperature check" tone="card">
          <p className="mb-3 text-sm">Check the heater faces with a pyrometer or other surface thermometer before the first joint of the day and periodically; the built-in dial is only a general indicator.</p>
          <HeaterCheckForm
            heater={{ id: heater.id, assetTag: heater.assetTag }}
            units={units}
            procedures={procedures.map((p) => ({
              id: p.procedureId,
              label: `${p.procedureCode} version ${p.versionNo}`,
              minC: p.definition.windows.heaterTemperatureC.min,
              maxC: p.definition.windows.heaterTemperatureC.max,
            }))}
          />
        </SectionCard>
      ) : null}
      <SectionCard id="check-log" title="Check log">
        <DataTable
          labelledBy="check-log"
          isDense
          rows={checks}
          rowKey={(c) => c.id}
          empty="No checks recorded yet."
          columns={[
            { header: "When", cell: (c) => <TimeDisplay at={c.checkedAt} /> },
            { header: "Who", cell: (c) => c.checkedByName ?? "—" },
            { header: "Instrument", cell: (c) => c.instrument },
            { header: "Face A", cell: (c) => c.readings.faceA.map(t).join(", ") },
            { header: "Face B", cell: (c) => c.readings.faceB.map(t).join(", ") },
            { header: "Window", cell: (c) => formatRange(c.windowMinC, c.windowMaxC, "temperature", units) },
            { header: "Result", cell: (c) => (c.passed ? <span className="font-semibold text-pass">Passed</span> : <span className="font-semibold text-fail">Failed</span>) },
            { header: "Next due", cell: (c) => c.nextDueOn },
          ]}
        />
      </SectionCard>
      <SectionCard id="edit-heater" title="Edit heater plate" tone="card">
        <HeaterForm
          key={heater.version}
          heater={{ id: heater.id, version: heater.version, isActive: heater.isActive, values: { assetTag: heater.assetTag, description: heater.description ?? "", checkIntervalDays: String(heater.checkIntervalDays) } }}
        />
      </SectionCard>
    </div>
  );
}
