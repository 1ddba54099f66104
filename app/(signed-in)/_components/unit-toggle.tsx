"use client";
import { useTransition } from "react";
import { setUnitSystemAction } from "../actions";
import type { UnitSystem } from "@/domain/units/format";

/** Switches the person's unit preference between SI and US customary. */
export function UnitToggle({ unitSystem }: { unitSystem: UnitSystem }) {
  const [pending, start] = useTransition();
  const next = unitSystem === "si" ? "us" : "si";
  return (
    <button
      type="button"
      disabled={pending}
      onClick={() => start(async () => {
        await setUnitSystemAction({ unitSystem: next });
        window.location.reload();
      })}
      className="min-h-touch rounded-md border-2 border-white px-3 font-semibold hover:bg-brand-dark"
      aria-label={`Units: ${unitSystem === "si" ? "SI" : "US customary"}. Switch to ${next === "si" ? "SI" : "US customary"}`}
    >
      Units: {unitSystem === "si" ? "SI" : "US"}
    </button>
  );
}
