"use client";
// Opens the browser's print dialog; for coil labels, first stamps the coils as printed.
import { useState } from "react";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { markLabelsPrintedAction } from "../actions";

export function PrintLabelsButton({ coilIds, count }: { coilIds: number[]; count: number }) {
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const [busy, setBusy] = useState(false);
  async function print() {
    setBusy(true);
    setMessage(null);
    if (coilIds.length) {
      const result = await markLabelsPrintedAction({ coilIds });
      if (!result.ok) {
        setBusy(false);
        setMessage({ text: result.message, tone: "error" });
        return;
      }
      setMessage({ text: `${result.data.count} coil label${result.data.count === 1 ? "" : "s"} marked as printed.`, tone: "success" });
    }
    setBusy(false);
    window.print();
  }
  return (
    <div className="flex flex-col gap-2">
      <Button type="button" onClick={print} disabled={busy || count === 0}>
        {count === 1 ? "Print label" : `Print ${count} labels`}
      </Button>
      <FormMessage message={message?.text} tone={message?.tone} />
    </div>
  );
}
