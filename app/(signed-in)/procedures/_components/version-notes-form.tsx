"use client";
// Correct the notes of a version no joint has used yet.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { editVersionNotesSchema } from "@/domain/procedures/schemas";
import { editVersionNotesAction } from "../actions";
import { TextAreaField, applyActionResult } from "@/components/form/controls";

type Input = z.input<typeof editVersionNotesSchema>;
type Output = z.output<typeof editVersionNotesSchema>;

export function VersionNotesForm({ versionId, versionNo, notes }: { versionId: number; versionNo: number; notes: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<Input, unknown, Output>({ resolver: zodResolver(editVersionNotesSchema), defaultValues: { versionId, notes } });
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await editVersionNotesAction(values);
    if (result.ok) {
      setMessage({ text: "Notes saved.", tone: "success" });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, ["notes"]) ?? result.message, tone: "error" });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-2" aria-label={`Correct the notes of version ${versionNo}`}>
      <input type="hidden" {...register("versionId")} />
      <TextAreaField id={`notes-${versionId}`} label={`Notes of version ${versionNo}`} {...register("notes")} error={formState.errors.notes?.message} />
      <FormMessage message={message?.text} tone={message?.tone} />
      <div>
        <Button type="submit" variant="secondary" disabled={formState.isSubmitting}>
          Save notes of version {versionNo}
        </Button>
      </div>
    </form>
  );
}
