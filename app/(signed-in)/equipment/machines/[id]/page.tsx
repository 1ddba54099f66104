import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { findMachineById } from "@/database/queries/equipment";
import { MachineForm } from "../../_components/machine-form";
import { editValue, pistonArea, resolutionEditValue, resolutionShown } from "../../_components/format";
import { SectionCard } from "@/components/ui/section-card";

export const dynamic = "force-dynamic";

export default async function MachinePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("manageEquipment");
  const id = await requirePageId(params);
  const machine = await findMachineById({ id });
  if (!machine) notFound();
  const units = user.unitSystem;
  return (
    <div className="flex flex-col gap-6">
      <PageHeader backHref="/equipment" backText="All equipment" title={`Machine ${machine.assetTag}`} />
      <p>
        Total effective piston area: <strong>{pistonArea(machine.pistonAreaMm2, units)}</strong>.{" "}
        {machine.isUsable ? "The machine can be used for joints." : machine.problems.join(" ")} Gauge read to{" "}
        <strong>{resolutionShown(machine.gaugeResolutionMpa, "pressure", units)}</strong>, thermometer to{" "}
        <strong>{resolutionShown(machine.thermometerResolutionC, "temperature", units)}</strong>.
      </p>
      <SectionCard id="edit-machine" title="Edit machine" tone="card">
        <MachineForm
          key={`${machine.version}-${units}`}
          units={units}
          machine={{
            id: machine.id,
            version: machine.version,
            isActive: machine.isActive,
            values: {
              assetTag: machine.assetTag,
              description: machine.description ?? "",
              minOd: editValue(machine.minOdMm, "length-mm", units),
              maxOd: editValue(machine.maxOdMm, "length-mm", units),
              pistonArea: editValue(machine.pistonAreaMm2, "area", units),
              gaugeResolution: resolutionEditValue(machine.gaugeResolutionMpa, "pressure", units),
              thermometerResolution: resolutionEditValue(machine.thermometerResolutionC, "temperature", units),
              lastServiceOn: machine.lastServiceOn ?? "",
              nextServiceDue: machine.nextServiceDue ?? "",
            },
          }}
        />
      </SectionCard>
    </div>
  );
}
