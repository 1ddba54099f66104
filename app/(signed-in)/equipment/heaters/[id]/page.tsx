import Link from "next/link";
import { notFound } from "next/navigation";
import { Cautions } from "@/components/ui/caution";
import { requireUser } from "@/app/_lib/page-guard";
import { findHeaterWithLastCheck, listHeaterChecks } from "@/database/queries/equipment";
import { listCurrentProcedureVersions } from "@/database/queries/procedures";
import { formatQuantity, formatRange } from "@/domain/units/format";
import { HeaterCheckForm } from "../../_components/heater-check-form";
import { HeaterForm } from "../../_components/heater-form";

export const dynamic = "force-dynamic";

export default async function HeaterPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("manageEquipment");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const heater = await findHeaterWithLastCheck({ id });
  if (!heater) notFound();
  const [checks, procedures] = await Promise.all([listHeaterChecks({ heaterId: id }), listCurrentProcedureVersions()]);
  const units = user.unitSystem;
  const t = (c: number) => formatQuantity(c, "temperature", units);
  return (
    <div className="flex flex-col gap-6">
      <p>
        <Link href="/equipment" className="text-brand underline">
          All equipment
        </Link>
      </p>
      <h1 className="text-2xl font-bold">Heater plate {heater.assetTag}</h1>
      <p role="status" className={heater.problems.length ? "font-semibold text-fail" : "font-semibold text-pass"}>
        {heater.problems.length ? heater.problems.join(" ") : `Last check passed; next check due ${heater.nextDueOn}.`}
      </p>
      <Cautions kinds={["heater"]} />
      {heater.isActive ? (
        <section aria-labelledby="record-check" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="record-check" className="mb-2 text-xl font-bold">
            Record a surface-temperature check
          </h2>
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
        </section>
      ) : null}
      <section aria-labelledby="check-log">
        <h2 id="check-log" className="mb-2 text-xl font-bold">
          Check log
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left text-sm">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">When (UTC)</th>
                <th className="p-2">Who</th>
                <th className="p-2">Instrument</th>
                <th className="p-2">Face A</th>
                <th className="p-2">Face B</th>
                <th className="p-2">Window</th>
                <th className="p-2">Result</th>
                <th className="p-2">Next due</th>
              </tr>
            </thead>
            <tbody>
              {checks.map((c) => (
                <tr key={c.id} className="border-b border-slate-200">
                  <td className="p-2">{c.checkedAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                  <td className="p-2">{c.checkedByName ?? "—"}</td>
                  <td className="p-2">{c.instrument}</td>
                  <td className="p-2">{c.readings.faceA.map(t).join(", ")}</td>
                  <td className="p-2">{c.readings.faceB.map(t).join(", ")}</td>
                  <td className="p-2">{formatRange(c.windowMinC, c.windowMaxC, "temperature", units)}</td>
                  <td className="p-2">{c.passed ? <span className="font-semibold text-pass">Passed</span> : <span className="font-semibold text-fail">Failed</span>}</td>
                  <td className="p-2">{c.nextDueOn}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {checks.length === 0 ? <p className="p-2">No checks recorded yet.</p> : null}
        </div>
      </section>
      <section aria-labelledby="edit-heater" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="edit-heater" className="mb-2 text-xl font-bold">
          Edit heater plate
        </h2>
        <HeaterForm
          key={heater.version}
          heater={{ id: heater.id, version: heater.version, isActive: heater.isActive, values: { assetTag: heater.assetTag, description: heater.description ?? "", checkIntervalDays: String(heater.checkIntervalDays) } }}
        />
      </section>
    </div>
  );
}
