"use client";
// Add or edit a fusion machine. The total effective piston area of the carriage cylinders
// comes from the machine's data plate or manual; without it the machine cannot be used.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { type FormOutcome } from "@/components/form/form-frame";
import { createMachineSchema } from "@/domain/equipment/schemas";
import { DEFAULT_INSTRUMENT_RESOLUTION } from "@/domain/fusion/instrument";
import { unitLabel, type UnitSystem } from "@/domain/units/format";
import { createMachineAction, updateMachineAction } from "../actions";
import { AssetFields } from "./asset-fields";
import { AssetFormFrame } from "./asset-form-frame";
import { resolutionEditValue } from "./format";
import { applyActionResult } from "@/components/form/controls";

type Input = z.input<typeof createMachineSchema>;
type Output = z.output<typeof createMachineSchema>;
const FIELDS = ["assetTag", "description", "minOd", "maxOd", "pistonArea", "gaugeResolution", "thermometerResolution", "lastServiceOn", "nextServiceDue", "isActive"] as const;

export function MachineForm({ units, machine }: { units: UnitSystem; machine?: { id: number; version: number; isActive: boolean; values: Omit<Input, "units"> } }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const [isActive, setIsActive] = useState(machine?.isActive ?? true);
  // A new machine starts at the common-practice resolutions (domain/fusion/instrument).
  const newDefaults = {
    gaugeResolution: resolutionEditValue(DEFAULT_INSTRUMENT_RESOLUTION.gaugeResolutionMpa, "pressure", units),
    thermometerResolution: resolutionEditValue(DEFAULT_INSTRUMENT_RESOLUTION.thermometerResolutionC, "temperature", units),
  };
  const { register, handleSubmit, formState, setError, reset, getValues } = useForm<Input, unknown, Output>({
    resolver: zodResolver(createMachineSchema),
    defaultValues: { ...(machine?.values ?? newDefaults), units },
  });
  const prefix = machine ? `machine-${machine.id}` : "new-machine";
  const e = formState.errors;
  const length = unitLabel("length-mm", units);
  const area = unitLabel("area", units);
  const pressure = unitLabel("pressure", units);
  const temperature = unitLabel("temperature", units);

  const onSubmit = handleSubmit(async () => {
    setMessage(null);
    // Send what was typed (in the person's units); the server parses the same schema again.
    const typed = getValues();
    const result = machine ? await updateMachineAction({ ...typed, units, id: machine.id, version: machine.version, isActive }) : await createMachineAction({ ...typed, units });
    if (result.ok) {
      setMessage({ text: machine ? "Machine saved." : `Machine ${typed.assetTag} added.`, tone: "success" });
      if (!machine) reset({ ...newDefaults, units });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });

  return (
    <AssetFormFrame noun="machine" shortNoun="machine" isEdit={Boolean(machine)} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} isActive={isActive} onActiveChange={setIsActive}>
      <input type="hidden" {...register("units")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <AssetFields prefix={prefix} tag={register("assetTag")} description={register("description")} errors={{ assetTag: e.assetTag?.message, description: e.description?.message }} />
        <Field id={`${prefix}-min-od`} label="Smallest pipe OD" unit={length} numeric {...register("minOd")} error={e.minOd?.message} />
        <Field id={`${prefix}-max-od`} label="Largest pipe OD" unit={length} numeric {...register("maxOd")} error={e.maxOd?.message} />
        <Field
          id={`${prefix}-piston-area`}
          label="Total effective piston area"
          unit={area}
          numeric
          hint="From the machine's data plate or manual. Leave blank if unknown: the machine cannot be used until it is entered."
          {...register("pistonArea")}
          error={e.pistonArea?.message}
        />
        <div />
        <Field
          id={`${prefix}-gauge-resolution`}
          label="Gauge resolution"
          unit={pressure}
          numeric
          hint="The smallest step the gauge is read to. A pressure within half a step of a limit passes; blank: no tolerance."
          {...register("gaugeResolution")}
          error={e.gaugeResolution?.message}
        />
        <Field
          id={`${prefix}-thermometer-resolution`}
          label="Thermometer resolution"
          unit={temperature}
          numeric
          hint="The smallest step the heater thermometer or pyrometer reads. A temperature within half a step of a limit passes; blank: no tolerance."
          {...register("thermometerResolution")}
          error={e.thermometerResolution?.message}
        />
        <Field id={`${prefix}-last-service`} label="Last service date" type="date" {...register("lastServiceOn")} error={e.lastServiceOn?.message} />
        <Field id={`${prefix}-next-service`} label="Next service due" type="date" {...register("nextServiceDue")} error={e.nextServiceDue?.message} />
      </div>
    </AssetFormFrame>
  );
}
