"use client";
// Downloads a coil's label file and records the download as a print, through the server
// action (a POST): fetching the label file itself (GET) records nothing.
import { useState } from "react";
import { FormMessage } from "@/components/form/field";
import { markLabelsPrintedAction } from "../../labels/actions";

export function LabelDownloadButton({ coilId, format }: { coilId: number; format: "png" | "svg" }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function download() {
    setBusy(true);
    setError(null);
    const result = await markLabelsPrintedAction({ coilIds: [coilId], how: format });
    setBusy(false);
    if (!result.ok) {
      setError(result.message);
      return;
    }
    const link = document.createElement("a");
    link.href = `/api/v1/labels/coils/${coilId}?format=${format}`;
    link.download = "";
    document.body.append(link);
    link.click();
    link.remove();
  }
  return (
    <div className="flex flex-col gap-1">
      <button type="button" onClick={download} disabled={busy} className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand disabled:opacity-60">
        Download label as {format.toUpperCase()}
      </button>
      <FormMessage message={error ?? undefined} tone="error" />
    </div>
  );
}
