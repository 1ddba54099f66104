"use client";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/form/field";
import { TextAreaField } from "@/components/form/controls";
import { decideJointSchema } from "@/domain/review/schemas";
import { decideJointAction } from "../actions";

type In = z.input<typeof decideJointSchema>;
type Out = z.output<typeof decideJointSchema>;

/** Accept (with a note) or cut out (with the reason), sending the revision the inspector saw. */
export function DecisionForm({
  jointId,
  label,
  revisionNo,
  needsAcceptNote,
  onDecided,
  onConflict,
}: {
  jointId: number;
  label: string;
  revisionNo: number;
  needsAcceptNote: boolean;
  onDecided: (message: string) => Promise<void>;
  onConflict: () => Promise<void>;
}) {
  const [message, setMessage] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({ resolver: zodResolver(decideJointSchema), defaultValues: { jointId, expectedRevisionNo: revisionNo, decision: undefined, note: "" } });
  const decision = useWatch({ control, name: "decision" });

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await decideJointAction(values);
    if (result.ok) {
      await onDecided(`${label} ${result.data.reviewState === "accepted" ? "accepted" : "cut out; the fuser has been told to remake it"}.`);
      return;
    }
    for (const [field, list] of Object.entries(result.fields ?? {})) {
      if (field === "note" || field === "decision") setError(field, { message: list[0] });
    }
    setMessage(result.message);
    if (result.status === 409) await onConflict();
  });

  const noteHint =
    decision === "cut-out" ? "Say why it is cut out; the fuser reads this." : needsAcceptNote ? "This joint is out of limits: say why it is accepted." : "Optional for a joint within limits.";

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label={`Decide ${label}`}>
      <input type="hidden" {...register("jointId")} />
      <input type="hidden" {...register("expectedRevisionNo")} />
      <fieldset className="flex flex-col gap-2" aria-describedby={errors.decision ? "decision-error" : undefined}>
        <legend className="text-sm font-semibold">Decision</legend>
        <label className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
          <input type="radio" value="accepted" {...register("decision")} className="h-5 w-5" />
          <span>Accept the joint</span>
        </label>
        <label className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
          <input type="radio" value="cut-out" {...register("decision")} className="h-5 w-5" />
          <span>Cut it out (the fuser must remake it)</span>
        </label>
        {errors.decision ? (
          <p id="decision-error" className="text-sm font-semibold text-fail">
            {errors.decision.message}
          </p>
        ) : null}
      </fieldset>
      <TextAreaField id={`note-${jointId}`} label="Note" hint={noteHint} {...register("note")} error={errors.note?.message} />
      <FormMessage message={message} />
      <div>
        <Button type="submit" disabled={isSubmitting} variant={decision === "cut-out" ? "danger" : "primary"}>
          {isSubmitting ? "Saving decision…" : "Record decision"}
        </Button>
      </div>
    </form>
  );
}
