// The pressure plan for this pipe on this machine under the job's procedure, in the
// user's units: gauge pressures to set, heater window, minimum bead, heat-soak target,
// maximum changeover, minimum cooling — and where each value comes from.
import type { FusionPlan } from "@/domain/fusion/plan";
import { HANDLING_WAIT_MINUTES, HANDLING_WAIT_NOTE, HANDLING_WAIT_SOURCE } from "@/domain/procedures/handling";
import { describeStatus, type Sourced } from "@/domain/sources";
import { SHELTER_PHRASES } from "@/domain/joints/shelters";
import { adjustedMinCoolingS } from "@/domain/procedures/weather";
import { describeWallSource } from "@/domain/pipe/walls";
import { formatQuantity, formatRange, type UnitSystem } from "@/domain/units/format";

/** Where the value's source and status are shown: beside it (inspectors, admins) or in one details line at the bottom (the fuser's phone screen). */
export type PlanSourcesPlacement = "inline" | "details";


interface Limit {
  name: string;
  value: string;
  source?: Sourced | null;
}

function Row({ name, value, source, inline }: Limit & { inline: boolean }) {
  return (
    <div className="flex flex-col border-b border-slate-200 py-2 last:border-0">
      <dt className="text-sm font-semibold text-slate-700">{name}</dt>
      <dd className="text-xl font-bold text-ink">{value}</dd>
      {inline && source ? (
        <dd className="text-xs text-slate-700">
          {source.source} ({describeStatus(source.status)})
        </dd>
      ) : null}
    </div>
  );
}

export function PlanPanel({ plan, system, procedure, sources = "inline" }: { plan: FusionPlan; system: UnitSystem; procedure: string; sources?: PlanSourcesPlacement }) {
  const q = (v: number | null, kind: Parameters<typeof formatQuantity>[1], none: string) => (v === null ? none : formatQuantity(v, kind, system));
  const limits: Limit[] = [
    { name: "Bead-up gauge pressure", value: formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system), source: plan.sources.beadUpPressure },
    { name: "Fusion gauge pressure", value: formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system), source: plan.sources.fusionPressure },
  ];
  if (plan.coolingGaugePressureMpa) {
    limits.push({ name: "Cooling gauge pressure", value: formatRange(plan.coolingGaugePressureMpa.min, plan.coolingGaugePressureMpa.max, "pressure", system), source: plan.sources.coolingPressure });
  }
  // Plans stored before the heat-soak pressure was checked have no such field (undefined).
  if (plan.maxHeatSoakGaugePressureMpa !== undefined && plan.maxHeatSoakGaugePressureMpa !== null) {
    limits.push({ name: "Heat-soak gauge pressure", value: `at drag, at most ${formatQuantity(plan.maxHeatSoakGaugePressureMpa, "pressure", system)}`, source: plan.sources.heatSoakPressure });
  }
  limits.push(
    { name: "Heater temperature at the face", value: formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system), source: plan.sources.heaterTemperature },
    { name: "Minimum bead", value: q(plan.minBeadMm, "length-mm", "not defined"), source: plan.sources.bead },
    {
      name: "Heat soak",
      value: plan.heatSoakTargetS !== null ? `target ${formatQuantity(plan.heatSoakTargetS, "duration", system)}` : plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "ends when the bead reaches size",
      source: plan.sources.heatSoak,
    },
    { name: "Maximum changeover", value: q(plan.maxChangeoverS, "duration", "as fast as possible"), source: plan.sources.changeover },
  );
  if (plan.pressureBuildUpS !== null) {
    limits.push({ name: "Maximum pressure build-up", value: formatQuantity(plan.pressureBuildUpS, "duration", system), source: plan.sources.pressureBuildUp });
  }
  limits.push(
    { name: "Minimum cooling under pressure", value: q(plan.minCoolingS, "duration", "not defined"), source: plan.sources.cooling },
    { name: "Handling after cooling", value: `no pulling or rough handling for ${HANDLING_WAIT_MINUTES} minutes after removal from the machine`, source: HANDLING_WAIT_SOURCE },
  );
  const weather = plan.weather;
  if (weather?.ambientRangeC) {
    limits.push({ name: "Ambient temperature", value: formatRange(weather.ambientRangeC.min, weather.ambientRangeC.max, "temperature", system), source: weather.ambientRangeC });
  }
  if (weather?.shelterAlways) limits.push({ name: "Shelter", value: `at least ${SHELTER_PHRASES[weather.shelterAlways.shelter]}`, source: weather.shelterAlways });
  if (weather?.coldShelter) {
    limits.push({ name: "Shelter in the cold", value: `at least ${SHELTER_PHRASES[weather.coldShelter.shelter]} below ${formatQuantity(weather.coldShelter.belowC, "temperature", system)}`, source: weather.coldShelter });
  }
  if (weather?.coolingAdjustment && plan.minCoolingS !== null) {
    const a = weather.coolingAdjustment;
    const warm = adjustedMinCoolingS(plan.minCoolingS, weather, a.referenceC + 10);
    limits.push({
      name: "Cooling in warm weather",
      value: `longer above ${formatQuantity(a.referenceC, "temperature", system)}: at ${formatQuantity(a.referenceC + 10, "temperature", system)}, ${formatQuantity(warm ?? plan.minCoolingS, "duration", system)}`,
      source: a,
    });
  }
  limits.push({ name: "Wall used for the plan", value: formatQuantity(plan.wallMm, "length-mm", system), source: plan.wallSource?.kind === "table" ? plan.wallSource : { source: describeWallSource(plan.wallSource), status: "operator" } });
  const inline = sources === "inline";
  // The handling wait is a row of its own above; a procedure note saying the same is not repeated.
  const notes = plan.notes.filter((n) => n !== HANDLING_WAIT_NOTE);
  return (
    <section aria-label="Pressure plan" className="rounded-md border-2 border-brand bg-brand-light p-3">
      <h3 className="text-lg font-bold text-brand-dark">Set these on the machine</h3>
      <p className="text-sm text-ink">
        {procedure} · {plan.procedureLabel} · pipe OD {formatQuantity(plan.outsideDiameterMm, "length-mm", system)}, SDR {plan.sdr}, wall {formatQuantity(plan.wallMm, "length-mm", system)} · drag {formatQuantity(plan.dragPressureMpa, "pressure", system)}
      </p>
      <dl>
        {limits.map((l) => (
          <Row key={l.name} {...l} inline={inline} />
        ))}
      </dl>
      {notes.length ? (
        <ul className="mt-2 list-disc pl-5 text-sm text-ink">
          {notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      ) : null}
      {inline ? null : (
        <details className="mt-2 text-sm text-ink">
          <summary className="min-h-touch cursor-pointer py-3 font-semibold text-brand-dark">Where these limits come from</summary>
          <ul className="mt-1 list-disc pl-5">
            {limits.map((l) => (
              <li key={l.name}>
                {l.name}: {l.source ? `${l.source.source} (${describeStatus(l.source.status)})` : "no source recorded"}
              </li>
            ))}
          </ul>
        </details>
      )}
    </section>
  );
}
