"use client";
// Step 4 of the Trench form: the values measured and checked at the joint, the place
// (station, and the device's location when the fuser allows it) and the bead photos.
// With the plan known, each value says beside its field whether it is inside the plan as
// it is typed (recorded-value-field); the server's check on recording is the record.
import dynamic from "next/dynamic";
import { useState } from "react";
import { Controller, useWatch, type UseFormReturn } from "react-hook-form";
import { Button } from "@/components/ui/button";
import type { RecordJointFormInput, RecordJointFormValues } from "@/domain/joints/schemas";
import { SHELTER_LABELS, SHELTERS } from "@/domain/joints/shelters";
import { CHECK_VALUES, type CheckValueKey } from "@/domain/joints/values";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import type { FusionPlan } from "@/domain/fusion/plan";
import type { PhotoRef } from "../_client/device-store";
import { useJudgeOptions } from "./hooks/use-judge-options";
import { SelectField } from "@/components/form/controls";
import { UnitController } from "./unit-controller";
import { quantitiesAskedIn, RecordedValueField } from "./recorded-value-field";
import { Field } from "@/components/form/field";
import { YesNo } from "./yes-no";

// The photo picker (scaling, previews) loads after the page, not with it.
const PhotoPicker = dynamic(
  () =>
    import("./photo-picker").then(
      (m) => m.PhotoPicker,
      () =>
        function PhotoPickerUnavailable() {
          return <p className="font-semibold text-caution">Photos of the bead: the photo picker could not be loaded (no signal). Reload the page when the signal is back to add photos.</p>;
        },
    ),
  { ssr: false, loading: () => <p className="text-sm text-ink">Photos of the bead: getting the photo picker ready …</p> },
);

/** What step 4 asks: the typed values and yes/no checks of domain/joints/values (drag is asked with the machine, durations by the timer). */
const TYPED = quantitiesAskedIn("values");
const CHECKS = CHECK_VALUES.filter((d) => d.step === "values");

export function ValuesSection({
  form,
  system,
  photos,
  onPhotos,
  plan = null,
}: {
  form: UseFormReturn<RecordJointFormInput, unknown, RecordJointFormValues>;
  system: UnitSystem;
  photos: PhotoRef[];
  onPhotos: (photos: PhotoRef[]) => void;
  /** The plan the values are judged against as they are typed; null until it is known. */
  plan?: FusionPlan | null;
}) {
  const { control, register, setValue, formState } = form;
  const judgeOptions = useJudgeOptions(form, system);
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const [latitude, longitude] = useWatch({ control, name: ["latitude", "longitude"] });
  const [geoMessage, setGeoMessage] = useState<string | null>(null);

  const locate = () => {
    setGeoMessage(null);
    if (!navigator.geolocation) return setGeoMessage("This device cannot give its location; type the station instead.");
    navigator.geolocation.getCurrentPosition(
      (pos) => {
        setValue("latitude", Math.round(pos.coords.latitude * 1e6) / 1e6, { shouldDirty: true });
        setValue("longitude", Math.round(pos.coords.longitude * 1e6) / 1e6, { shouldDirty: true });
        setGeoMessage(`Location added (within about ${formatQuantity(pos.coords.accuracy, "length-m", system)}).`);
      },
      () => setGeoMessage("Location not available (permission refused or no fix); the station text is enough."),
      { enableHighAccuracy: true, timeout: 15_000, maximumAge: 60_000 },
    );
  };

  return (
    <fieldset className="flex flex-col gap-4">
      <legend className="mb-2 text-xl font-bold">4. Record the values</legend>
      <p className="text-sm text-ink">
        {plan
          ? "Each value shows against the plan as you type it. When you record the joint, Beadline's server checks it again; the server's verdict is the one kept."
          : "Once the plan is complete (job, machine, coil A and drag pressure), each value shows against it as you type."}
      </p>
      {TYPED.map((d) => (
        <RecordedValueField key={d.key} definition={d} control={control} system={system} error={err(d.key)} plan={plan} judgeOptions={judgeOptions} />
      ))}
      <UnitController control={control} name="ambientC" label="Ambient temperature" kind="temperature" system={system} error={err("ambientC")} allowNegative />
      <SelectField id="shelter" label="Weather shelter" error={err("shelter")} {...register("shelter", { setValueAs: (v) => (v === "" ? undefined : v) })}>
        <option value="">Choose …</option>
        {SHELTERS.map((s) => (
          <option key={s} value={s}>
            {SHELTER_LABELS[s]}
          </option>
        ))}
      </SelectField>
      {CHECKS.map(({ key, question }) => {
        const name = key as CheckValueKey;
        return <Controller key={name} control={control} name={name} render={({ field }) => <YesNo name={name} question={question} value={field.value as boolean | undefined} onChange={field.onChange} error={err(name)} />} />;
      })}
      <Field id="station" label="Station (place along the job)" autoComplete="off" {...register("station")} />
      <div className="flex flex-col gap-1">
        <Button type="button" variant="secondary" onClick={locate}>
          {typeof latitude === "number" ? "Update my location" : "Add my location"}
        </Button>
        {typeof latitude === "number" && typeof longitude === "number" ? (
          <p className="text-sm text-ink">
            Location: {latitude.toFixed(6)}, {longitude.toFixed(6)}{" "}
            <button
              type="button"
              className="min-h-touch px-2 font-semibold text-brand underline"
              onClick={() => {
                setValue("latitude", null);
                setValue("longitude", null);
              }}
            >
              Remove location
            </button>
          </p>
        ) : null}
        {geoMessage ? <p className="text-sm text-ink">{geoMessage}</p> : null}
      </div>
      <PhotoPicker photos={photos} onChange={onPhotos} />
    </fieldset>
  );
}
