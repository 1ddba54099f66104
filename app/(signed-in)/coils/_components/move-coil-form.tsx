"use client";
// Move a coil: to a trailer (which crew), into use (which job), back to the yard, used up,
// or into quarantine (with a reason). Only the moves the coil rules allow are offered.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";
import { moveCoilSchema } from "@/domain/coils/schemas";
import { moveCoilAction } from "../actions";
import { FieldShell } from "@/components/form/field-shell";

type Input = z.input<typeof moveCoilSchema>;
type Output = z.output<typeof moveCoilSchema>;

export function MoveCoilForm({
  coil,
  moves,
  crews,
  jobs,
}: {
  coil: { id: number; version: number; status: CoilStatus; crewId: number | null; jobId: number | null };
  moves: CoilStatus[];
  crews: { id: number; name: string; trailer: string | null }[];
  jobs: { id: number; code: string; name: string }[];
}) {
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, formState, setError, control } = useForm<Input, unknown, Output>({
    resolver: zodResolver(moveCoilSchema),
    defaultValues: { coilId: coil.id, version: coil.version, to: moves[0], crewId: coil.crewId ?? undefined, jobId: coil.jobId ?? undefined },
  });
  const to = useWatch({ control, name: "to" }) as CoilStatus | undefined;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const needsReason = to === "quarantined" || coil.status === "quarantined";
  const onSubmit = handleSubmit(async (input) => {
    setMessage(null);
    const result = await moveCoilAction(input);
    if (result.ok) {
      setMessage({ text: `Coil moved: ${COIL_STATUS_LABELS[result.data.status]}.`, tone: "success" });
      router.refresh();
      return;
    }
    setMessage({ text: result.message, tone: "error" });
    for (const [name, messages] of Object.entries(result.fields ?? {})) setError(name as keyof Input, { message: messages[0] });
  });
  if (!moves.length) return <p>No status moves are open for this coil.</p>;
  const selectClass = "min-h-touch rounded-md border-2 border-slate-400 bg-white px-3";
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <input type="hidden" {...register("coilId")} />
      <input type="hidden" {...register("version")} />
      <FieldShell id="move-to" label="New status" error={errors.to?.message}>
        {(control) => (
          <select {...control} className={selectClass} {...register("to")}>
            {moves.map((m) => (
              <option key={m} value={m}>
                {COIL_STATUS_LABELS[m]}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      {to === "on-trailer" || to === "in-use" ? (
        <FieldShell id="move-crew" label="Crew and trailer" error={errors.crewId?.message}>
          {(control) => (
            <select {...control} className={selectClass} {...register("crewId")}>
              <option value="">Choose a crew</option>
              {crews.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                  {c.trailer ? ` — ${c.trailer}` : ""}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
      ) : null}
      {to === "in-use" ? (
        <FieldShell id="move-job" label="Job" error={errors.jobId?.message}>
          {(control) => (
            <select {...control} className={selectClass} {...register("jobId")}>
              <option value="">Choose a job</option>
              {jobs.map((j) => (
                <option key={j.id} value={j.id}>
                  {j.code} — {j.name}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
      ) : null}
      <FieldShell id="move-reason" label={`Reason ${needsReason ? "(required)" : "(optional)"}`} error={errors.reason?.message}>
        {(control) => <input {...control} className={`${selectClass} w-full`} {...register("reason")} />}
      </FieldShell>
      <FormMessage message={message?.text} tone={message?.tone} />
      <Button type="submit" variant={to === "quarantined" ? "danger" : "primary"} disabled={formState.isSubmitting}>
        {to === "quarantined" ? "Quarantine coil" : "Move coil"}
      </Button>
    </form>
  );
}
