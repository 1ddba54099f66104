// The pressure plan for this pipe on this machine under the job's procedure, in the
// user's units: gauge pressures to set, heater window, minimum bead, heat-soak target,
// maximum changeover, minimum cooling — and where each value comes from.
import type { FusionPlan } from "@/domain/fusion/plan";
import { describeStatus, type Sourced } from "@/domain/sources";
import { formatQuantity, formatRange, type UnitSystem } from "@/domain/units/format";

function Row({ name, value, source }: { name: string; value: string; source?: Sourced | null }) {
  return (
    <div className="flex flex-col border-b border-slate-200 py-2 last:border-0">
      <dt className="text-sm font-semibold text-slate-700">{name}</dt>
      <dd className="text-xl font-bold text-ink">{value}</dd>
      {source ? (
        <dd className="text-xs text-slate-700">
          {source.source} ({describeStatus(source.status)})
        </dd>
      ) : null}
    </div>
  );
}

export function PlanPanel({ plan, system, procedure }: { plan: FusionPlan; system: UnitSystem; procedure: string }) {
  const q = (v: number | null, kind: Parameters<typeof formatQuantity>[1], none: string) => (v === null ? none : formatQuantity(v, kind, system));
  return (
    <section aria-label="Pressure plan" className="rounded-md border-2 border-brand bg-brand-light p-3">
      <h3 className="text-lg font-bold text-brand-dark">Set these on the machine</h3>
      <p className="text-sm text-ink">
        {procedure} · {plan.procedureLabel} · pipe OD {formatQuantity(plan.outsideDiameterMm, "length-mm", system)}, SDR {plan.sdr}, wall {formatQuantity(plan.wallMm, "length-mm", system)} · drag {formatQuantity(plan.dragPressureMpa, "pressure", system)}
      </p>
      <dl>
        <Row name="Bead-up gauge pressure" value={formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system)} source={plan.sources.beadUpPressure} />
        <Row name="Fusion gauge pressure" value={formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system)} source={plan.sources.fusionPressure} />
        {plan.coolingGaugePressureMpa ? <Row name="Cooling gauge pressure" value={formatRange(plan.coolingGaugePressureMpa.min, plan.coolingGaugePressureMpa.max, "pressure", system)} source={plan.sources.coolingPressure} /> : null}
        <Row name="Heater temperature at the face" value={formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system)} source={plan.sources.heaterTemperature} />
        <Row name="Minimum bead" value={q(plan.minBeadMm, "length-mm", "not defined")} source={plan.sources.bead} />
        <Row
          name="Heat soak"
          value={plan.heatSoakTargetS !== null ? `target ${formatQuantity(plan.heatSoakTargetS, "duration", system)}` : plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "ends when the bead reaches size"}
          source={plan.sources.heatSoak}
        />
        <Row name="Maximum changeover" value={q(plan.maxChangeoverS, "duration", "as fast as possible")} source={plan.sources.changeover} />
        <Row name="Minimum cooling under pressure" value={q(plan.minCoolingS, "duration", "not defined")} source={plan.sources.cooling} />
      </dl>
      {plan.notes.length ? (
        <ul className="mt-2 list-disc pl-5 text-sm text-ink">
          {plan.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
