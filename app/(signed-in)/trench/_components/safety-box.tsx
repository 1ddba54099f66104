"use client";
// The one safety box of the Trench screen: open until the fuser says they have read it,
// then folded to one line for the rest of the day on this device. Beadline records and
// checks; the operator's qualified procedure and the qualified person decide.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { CAUTIONS } from "@/components/ui/caution";

const KINDS = ["heater", "pinch", "coil", "static", "procedure"] as const;

export function SafetyBox({ readToday, onRead }: { readToday: boolean; onRead: () => void }) {
  // Folded once read today; the fuser may open it again at any time.
  const [openChoice, setOpenChoice] = useState<boolean | null>(null);
  const open = openChoice ?? !readToday;
  return (
    <aside aria-label="Safety" className="rounded-md border-2 border-caution bg-caution-light text-caution">
      <details open={open} onToggle={(e) => setOpenChoice(e.currentTarget.open)}>
        <summary className="flex min-h-12 cursor-pointer list-none items-center justify-between gap-3 px-3 py-2 [&::-webkit-details-marker]:hidden">
          <span className="flex flex-col">
            <span className="font-bold">Safety</span>
            <span className="text-sm">{readToday ? "Read today: hot heater plate, pinch points, coiled pipe, static." : "Hot heater plate, pinch points, coiled pipe, static: read before you start."}</span>
          </span>
          <span aria-hidden="true" className="shrink-0 text-2xl font-bold">
            {open ? "−" : "+"}
          </span>
        </summary>
        <div className="flex flex-col gap-2 px-3 pb-3 text-sm">
          <ul className="list-disc space-y-1 pl-5">
            {KINDS.map((k) => (
              <li key={k}>{CAUTIONS[k]}</li>
            ))}
          </ul>
          {readToday ? null : (
            <Button
              type="button"
              variant="secondary"
              className="min-h-12"
              onClick={() => {
                setOpenChoice(false);
                onRead();
              }}
            >
              I have read these: fold them for today
            </Button>
          )}
        </div>
      </details>
    </aside>
  );
}
