"use client";
// Close a job (it then takes no new joints) or reopen it.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { setJobStatusAction } from "../actions";

export function JobStatusButton({ job }: { job: { id: number; version: number; code: string; status: "open" | "closed" } }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const next = job.status === "open" ? "closed" : "open";
  return (
    <div className="flex flex-col gap-2">
      <div>
        <Button
          type="button"
          variant={next === "closed" ? "danger" : "secondary"}
          disabled={busy}
          onClick={async () => {
            setBusy(true);
            setMessage(null);
            const result = await setJobStatusAction({ id: job.id, version: job.version, status: next });
            setBusy(false);
            if (result.ok) router.refresh();
            else setMessage(result.message);
          }}
        >
          {next === "closed" ? `Close job ${job.code}` : `Reopen job ${job.code}`}
        </Button>
      </div>
      <FormMessage message={message} />
    </div>
  );
}
