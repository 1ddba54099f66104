"use client";
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { grantOverrideSchema } from "@/domain/joints/schemas";
import { grantOverrideAction } from "../../actions";
import { SelectField } from "@/components/form/controls";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";

type In = z.input<typeof grantOverrideSchema>;
type Out = z.output<typeof grantOverrideSchema>;
type Option = { id: number; label: string };

const toNumber = (v: unknown) => (v === "" || v == null ? undefined : Number(v));

export function GrantOverrideForm({ jobs, heaters, coils, userName }: { jobs: Option[]; heaters: Option[]; coils: Option[]; userName: string }) {
  const timeZone = useTimeZone();
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, control, formState, setError, reset } = useForm<In, unknown, Out>({ resolver: zodResolver(grantOverrideSchema), defaultValues: { subject: "heater", hours: 12 } });
  const subject = useWatch({ control, name: "subject" });
  const options = subject === "coil" ? coils : heaters;
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const r = await grantOverrideAction(values);
    if (r.ok) {
      setMessage({ tone: "success", text: `Cleared ${r.data.subjectLabel} on ${r.data.jobCode} until ${formatInstant(r.data.expiresAt, "minute", timeZone)}, recorded as ${userName}.` });
      reset({ subject: values.subject, hours: 12 });
      router.refresh();
    } else {
      for (const [k, v] of Object.entries(r.fields ?? {})) if (k !== "_form") setError(k as keyof In, { message: v[0] });
      setMessage({ tone: "error", text: r.message });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Clear a blocking warning">
      <SelectField id="jobId" label="Job" error={e.jobId?.message} {...register("jobId", { setValueAs: toNumber })}>
        <option value="">Choose the job …</option>
        {jobs.map((j) => (
          <option key={j.id} value={j.id}>
            {j.label}
          </option>
        ))}
      </SelectField>
      <SelectField id="subject" label="What to clear" error={e.subject?.message} {...register("subject")}>
        <option value="heater">A heater plate (check overdue or failed)</option>
        <option value="coil">A coil (quarantined, used up, or on another crew&apos;s job)</option>
      </SelectField>
      <SelectField id="subjectId" label={subject === "coil" ? "Coil" : "Heater plate"} error={e.subjectId?.message} {...register("subjectId", { setValueAs: toNumber })}>
        <option value="">{options.length ? "Choose …" : "Nothing is blocked right now"}</option>
        {options.map((o) => (
          <option key={o.id} value={o.id}>
            {o.label}
          </option>
        ))}
      </SelectField>
      <Field id="reason" label="Why it is safe to go on" error={e.reason?.message} {...register("reason")} />
      <Field id="hours" label="For how long" unit="hours" numeric error={e.hours?.message} {...register("hours", { setValueAs: toNumber })} />
      <FormMessage message={message?.text} tone={message?.tone} />
      <Button type="submit" disabled={formState.isSubmitting}>
        Clear it for this job
      </Button>
    </form>
  );
}
