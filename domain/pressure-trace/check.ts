// Checking a pressure trace like typed values: the durations and pressures the trace
// reader finds (domain/pressure-trace) go through the same joint check (domain/fusion)
// against the joint's own plan, and the plan's windows are laid out on the trace's time
// axis for the chart.
import { checkJoint, type JointFinding, type JointMeasurements } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointParameter } from "@/domain/fusion/parameters";
import type { FusionPlan } from "@/domain/fusion/plan";
import type { PressureSample } from "@/domain/pressure-trace/parse";
import { measurementsFromTraceReading, type PressureTraceReading } from "@/domain/pressure-trace/read";
import type { UnitSystem } from "@/domain/units/format";
import { jointMeasurements, type RecordedValues } from "@/domain/joints/values";
import { traceAgreement, traceDisagreements, type TraceAgreementRow } from "@/domain/pressure-trace/agreement";

/** The joint's typed values as the joint check takes them (the trench's own mapping). */
export function measurementsFromRecorded(recorded: RecordedValues): JointMeasurements {
  return jointMeasurements(recorded);
}

export type TraceCheck = {
  outcome: JointOutcome;
  /** Findings on the values the trace gives (its durations, pressures and, when logged, heater temperature). */
  findings: JointFinding[];
  /** Parameters the trace was checked on. */
  parameters: JointParameter[];
};

/**
 * Check a trace reading against the joint's plan. The trace's values replace the typed
 * ones for the parameters it measures; bead size and the visual checks cannot come from a
 * trace, so only findings on trace parameters are returned. Heater temperature is checked
 * only when the file had that column. A typed value further from the trace's than the
 * instruments allow (domain/pressure-trace/agreement) is a finding too. Messages in
 * `system` units.
 */
export function checkTraceReading(plan: FusionPlan, reading: PressureTraceReading, recorded: RecordedValues, system: UnitSystem = "si"): TraceCheck {
  const fromTrace = measurementsFromTraceReading(reading);
  const merged: JointMeasurements = { ...measurementsFromRecorded(recorded), ...fromTrace };
  const parameters: JointParameter[] = ["beadUpPressure", "heatSoak", "heatSoakPressure", "changeover", "pressureBuildUp", "fusionPressure", "cooling", "coolingPressure"];
  if (reading.heaterTemperatureC !== null) parameters.unshift("heaterTemperature");
  const check = checkJoint(plan, merged, { system });
  const findings = [...check.findings.filter((f) => parameters.includes(f.parameter)), ...traceDisagreements(plan, reading, recorded, system)];
  return { outcome: findings.length ? "out-of-limits" : "within-limits", findings, parameters };
}

export type TraceValueRow = TraceAgreementRow;

/** Typed value next to the trace's value, per value the trace gives (canonical SI), with whether they disagree. */
export function traceVersusTyped(plan: Pick<FusionPlan, "instrument">, reading: PressureTraceReading, recorded: RecordedValues): TraceValueRow[] {
  return traceAgreement(plan, reading, recorded);
}

export type ChartPoint = { t: number; p: number; c?: number };

/**
 * At most `maxPoints` chart points from a trace: the samples are cut into equal buckets and
 * each bucket keeps its lowest and highest pressure in time order, so steps and spikes stay
 * visible (a plain "every n-th sample" would drop them). Times s, pressure MPa.
 */
export function downsampleTrace(samples: readonly PressureSample[], maxPoints = 1200): ChartPoint[] {
  const point = (s: PressureSample): ChartPoint => (s.heaterTemperatureC === undefined ? { t: s.seconds, p: s.gaugePressureMpa } : { t: s.seconds, p: s.gaugePressureMpa, c: s.heaterTemperatureC });
  if (samples.length <= maxPoints) return samples.map(point);
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const size = samples.length / buckets;
  const out: ChartPoint[] = [];
  for (let b = 0; b < buckets; b += 1) {
    const slice = samples.slice(Math.floor(b * size), Math.floor((b + 1) * size));
    if (slice.length === 0) continue;
    let lo = slice[0]!;
    let hi = slice[0]!;
    for (const s of slice) {
      if (s.gaugePressureMpa < lo.gaugePressureMpa) lo = s;
      if (s.gaugePressureMpa > hi.gaugePressureMpa) hi = s;
    }
    const pair = lo.seconds <= hi.seconds ? [lo, hi] : [hi, lo];
    out.push(point(pair[0]!));
    if (pair[1] !== pair[0]) out.push(point(pair[1]!));
  }
  return out;
}

export type ChartBand = { key: string; label: string; x1: number; x2: number; y1: number; y2: number };
export type ChartMarker = { key: string; label: string; x: number };
export type ChartTimeZone = { key: string; label: string; x1: number; x2: number };

/**
 * The plan's windows on the trace's time axis (s, MPa): pressure windows as bands over the
 * phase they govern, time limits as markers measured from the phase start the trace shows
 * (heat-soak window from the end of bead-up, changeover limit from the start of
 * changeover, cooling minimum from the end of the build-up).
 */
export function planWindowsOnTrace(plan: FusionPlan, reading: PressureTraceReading): { bands: ChartBand[]; markers: ChartMarker[]; zones: ChartTimeZone[] } {
  const { beadUp, heatSoak, changeover, fusion } = reading.phases;
  const buildUpEnd = fusion.startS + reading.pressureBuildUpS;
  const bands: ChartBand[] = [
    { key: "beadUp", label: "Bead-up pressure window", x1: beadUp.startS, x2: beadUp.endS, y1: plan.beadUpGaugePressureMpa.min, y2: plan.beadUpGaugePressureMpa.max },
    { key: "fusion", label: "Fusion pressure window", x1: buildUpEnd, x2: fusion.endS, y1: plan.fusionGaugePressureMpa.min, y2: plan.fusionGaugePressureMpa.max },
  ];
  const markers: ChartMarker[] = [];
  const zones: ChartTimeZone[] = [];
  if (plan.heatSoakS && plan.heatSoakS.min !== null && plan.heatSoakS.max !== null) {
    zones.push({ key: "heatSoak", label: "Heat soak window", x1: heatSoak.startS + plan.heatSoakS.min, x2: heatSoak.startS + plan.heatSoakS.max });
  } else if (plan.heatSoakS?.min != null) {
    markers.push({ key: "heatSoakMin", label: "Heat soak minimum", x: heatSoak.startS + plan.heatSoakS.min });
  }
  if (plan.maxChangeoverS !== null) markers.push({ key: "changeoverMax", label: "Changeover limit", x: changeover.startS + plan.maxChangeoverS });
  if (plan.minCoolingS !== null) markers.push({ key: "coolingMin", label: "Cooling minimum", x: buildUpEnd + plan.minCoolingS });
  return { bands, markers, zones };
}
