"use client";
// The plan's key limits in one line that stays at the top while the fuser scrolls: the
// gauge pressure to set and the heater window first, then the bead, the changeover and
// cooling limits (the line wraps on a narrow phone rather than scroll sideways: a region that
// scrolls needs keyboard access, WCAG 2.1.1).
// Until there is a plan, the one thing still missing; a blocked joint says so here too.
import type { FusionPlan } from "@/domain/fusion/plan";
import { formatQuantity, formatRange, type UnitSystem } from "@/domain/units/format";

export function PlanSummary({ plan, system, problem, blocked }: { plan: FusionPlan | null; system: UnitSystem; problem: string | null; blocked: boolean }) {
  const items: [string, string][] = plan
    ? [
        ["Fusion", formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system)],
        ["Heater", formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system)],
        ...(plan.minBeadMm !== null ? ([["Bead ≥", formatQuantity(plan.minBeadMm, "length-mm", system)]] as [string, string][]) : []),
        ...(plan.maxChangeoverS !== null ? ([["Changeover ≤", formatQuantity(plan.maxChangeoverS, "duration", system)]] as [string, string][]) : []),
        ...(plan.minCoolingS !== null ? ([["Cool ≥", formatQuantity(plan.minCoolingS, "duration", system)]] as [string, string][]) : []),
      ]
    : [];
  return (
    <div role="region" aria-label="Plan at a glance" className="sticky top-0 z-20 -mx-4 border-b-2 border-brand bg-brand-light px-4 py-1.5 text-sm text-brand-dark shadow-md">
      {plan ? (
        <p className="flex flex-wrap gap-x-3 leading-6">
          {items.map(([name, value]) => (
            <span key={name} className="whitespace-nowrap">
              {name} <span className="font-bold">{value}</span>
            </span>
          ))}
        </p>
      ) : (
        <p className="truncate leading-6">Plan: {problem?.split(": ")[0]}</p>
      )}
      {blocked ? <p className="font-bold text-fail">Recording is blocked: see the top of the page.</p> : null}
    </div>
  );
}
