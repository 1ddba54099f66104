"use client";
// The organisation's time zone: every screen, day filter, mail and export uses it.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { organisationSettingsSchema } from "@/domain/dates/zone-schema";
import { setOrganisationTimeZoneAction } from "../actions";
import { SelectField, applyActionResult } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";

type Input = z.input<typeof organisationSettingsSchema>;
type Output = z.output<typeof organisationSettingsSchema>;
const FIELDS = ["timeZone"] as const;

export function OrganisationForm({ timeZone, isChosen, serverZone, choices, example }: { timeZone: string; isChosen: boolean; serverZone: string; choices: string[]; example: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError } = useForm<Input, unknown, Output>({
    resolver: zodResolver(organisationSettingsSchema),
    defaultValues: { timeZone },
  });
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await setOrganisationTimeZoneAction(values);
    if (result.ok) {
      setMessage({ text: `Time zone set to ${result.data.timeZone}. Times, day filters, mail and exports now use it.`, tone: "success" });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <FormFrame label="Organisation time zone" onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Save time zone" busyLabel="Saving …">
      <p className="text-sm text-slate-700">
        People see times in this zone with the offset from UTC (now: {example}); the register&apos;s day filters take its local days, and exports carry the local time beside a UTC column. Records keep their instants in UTC.
        {isChosen ? "" : ` Not chosen yet: the server's zone (${serverZone}) is used.`}
      </p>
      <SelectField id="organisation-time-zone" label="Time zone" hint="A zone of the IANA time zone database, e.g. America/Chicago" {...register("timeZone")} error={formState.errors.timeZone?.message}>
        {choices.map((zone) => (
          <option key={zone} value={zone}>
            {zone}
          </option>
        ))}
      </SelectField>
    </FormFrame>
  );
}
