"use client";
// What the device needs to judge a typed value as the server will: the user's units for
// the words and, once the ambient temperature is typed, the joint's conditions (a procedure
// may lengthen the minimum cooling time in warm weather; domain/procedures/weather).
import { useMemo } from "react";
import { useWatch } from "react-hook-form";
import type { CheckJointOptions } from "@/domain/fusion/check";
import type { UnitSystem } from "@/domain/units/format";
import type { TrenchForm } from "./use-trench-draft";

export function useJudgeOptions(form: TrenchForm, system: UnitSystem): CheckJointOptions {
  const [ambientC, shelter] = useWatch({ control: form.control, name: ["ambientC", "shelter"] });
  return useMemo(
    () => ({ system, conditions: typeof ambientC === "number" && Number.isFinite(ambientC) ? { ambientC, shelter: shelter ?? null } : undefined }),
    [system, ambientC, shelter],
  );
}
