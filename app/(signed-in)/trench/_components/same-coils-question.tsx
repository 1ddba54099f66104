"use client";
// Asked before the same two coils are joined again: a coil's end meets the next coil's start
// once, so a second joint between them is a remake of a cut-out joint or a mistake.
import { useEffect, useRef } from "react";
import { Button } from "@/components/ui/button";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { describePairJoint } from "@/domain/joints/same-coils";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";
import type { SameCoilsQuestion as Question } from "./hooks/use-record-joint";

export function SameCoilsQuestion({ question, onAnswer }: { question: Question; onAnswer: (answer: "remake" | "anyway" | "change") => void }) {
  const heading = useRef<HTMLHeadingElement>(null);
  const timeZone = useTimeZone();
  useEffect(() => {
    heading.current?.focus();
    heading.current?.scrollIntoView({ block: "center" });
  }, [question]);
  const { earlier, whyNotRemake } = question;
  const named = describePairJoint(earlier);
  const outcome = earlier.outcome ? OUTCOME_LABELS[earlier.outcome].toLowerCase() : null;
  return (
    <section role="alertdialog" aria-labelledby="same-coils-heading" aria-describedby="same-coils-details" className="flex flex-col gap-3 rounded-md border-4 border-caution bg-caution-light p-4 text-ink">
      <h2 id="same-coils-heading" ref={heading} tabIndex={-1} className="text-xl font-bold">
        These two coils were already joined in {named}. Is this a remake of that joint, or a mistake?
      </h2>
      <p id="same-coils-details">
        {earlier.coilACode} + {earlier.coilBCode}: {named}, made {formatInstant(earlier.madeAt, "minute", timeZone)}
        {outcome ? `, ${outcome}` : ""}
        {earlier.reviewState === "cut-out" ? ", cut out" : ""}.
      </p>
      {whyNotRemake ? <p className="text-sm font-semibold">{whyNotRemake}</p> : null}
      <div className="flex flex-col gap-2">
        {earlier.jointNo !== null && !whyNotRemake ? (
          <Button type="button" className="min-h-12" onClick={() => onAnswer("remake")}>
            Record as the remake of joint {earlier.jointNo}
          </Button>
        ) : null}
        <Button type="button" variant="secondary" className="min-h-12" onClick={() => onAnswer("change")}>
          Change the coils
        </Button>
        <Button type="button" variant="secondary" className="min-h-12" onClick={() => onAnswer("anyway")}>
          Record anyway
        </Button>
      </div>
    </section>
  );
}
