// Typed values against the attached pressure trace: a value the fuser typed (read off the
// machine's gauge, the heater thermometer, the phase timer) and the same value the trace
// gives must agree within what the two instruments can tell apart. Further apart, the
// record and the trace disagree: a finding ("Heater temperature: typed 457 °F; trace 426 °F"),
// counted in the trace check's outcome like its other findings (domain/pressure-trace/check).
//
// The allowances, each with its source:
// - Gauge pressure: the machine's gauge is taken as ASME B40.100 accuracy grade A — ±1 % of
//   span in the middle half of the scale, ±2 % of span in the first and last quarters (from
//   memory) — on a 0–3000 psi fusion-machine gauge (common practice; the span
//   domain/fusion/instrument assumes for its default resolution), plus half the gauge's
//   resolution step for reading it (domain/fusion/instrument).
// - Heater temperature: the trace's heater probe is taken as a type K thermocouple to
//   ASTM E230 standard limits of error — the greater of 2.2 °C and 0.75 % of the reading in
//   °C (from memory) — plus half the thermometer's resolution step for the typed reading.
// - Times: 5 s (common practice: a hand-started timer is about a second late at each end,
//   the trace's phase edges are read to about a second, and a hand timer may or may not
//   include the few seconds of pressure build-up).
// A trace that ends before the pressure is released gives only a lower bound for cooling:
// then only a typed cooling time shorter than the trace's is a disagreement.
import type { JointFinding } from '@/domain/fusion/check';
import type { JointParameter } from '@/domain/fusion/parameters';
import { readingTolerance } from '@/domain/fusion/instrument';
import type { FusionPlan } from '@/domain/fusion/plan';
import type { RecordedValues } from '@/domain/joints/values';
import type { PressureTraceReading } from '@/domain/pressure-trace/read';
import { psiToMpa } from '@/domain/units/conversions';
import { formatDifference, formatQuantity, type UnitSystem } from '@/domain/units/format';

/** ASME B40.100 grade A accuracy, % of span (from memory): middle half of the scale, and its first and last quarters. */
export const GAUGE_GRADE_A_PERCENT_OF_SPAN = { middleHalf: 1, outerQuarters: 2 } as const;
/** Span of a fusion machine's hydraulic gauge, MPa: 0–3000 psi (common practice). */
export const FUSION_GAUGE_SPAN_MPA = psiToMpa(3000);
/** ASTM E230 type K standard limits of error (from memory): the greater of 2.2 °C and 0.75 % of the reading in °C. */
export const TYPE_K_STANDARD_LIMITS = { minimumC: 2.2, percentOfReading: 0.75 } as const;
/** Typed phase times against the trace's, s (common practice). */
export const TIMING_AGREEMENT_S = 5;

type Plan = Pick<FusionPlan, 'instrument'>;

/** How far a typed gauge reading and the trace's pressure may be apart, MPa; `gaugeMpa` places the reading on the gauge's scale. */
export function pressureAgreementMpa(plan: Plan, gaugeMpa: number): number {
  const quarter = FUSION_GAUGE_SPAN_MPA / 4;
  const inMiddleHalf = gaugeMpa >= quarter && gaugeMpa <= 3 * quarter;
  const percent = inMiddleHalf ? GAUGE_GRADE_A_PERCENT_OF_SPAN.middleHalf : GAUGE_GRADE_A_PERCENT_OF_SPAN.outerQuarters;
  return (percent / 100) * FUSION_GAUGE_SPAN_MPA + readingTolerance(plan.instrument?.gaugeResolutionMpa);
}

/** How far a typed heater temperature and the trace's may be apart, °C; `traceC` is the probe's reading. */
export function temperatureAgreementC(plan: Plan, traceC: number): number {
  const probe = Math.max(TYPE_K_STANDARD_LIMITS.minimumC, (TYPE_K_STANDARD_LIMITS.percentOfReading / 100) * Math.abs(traceC));
  return probe + readingTolerance(plan.instrument?.thermometerResolutionC);
}

export type TraceAgreementRow = {
  key: string;
  parameter: JointParameter;
  label: string;
  kind: 'duration' | 'pressure' | 'temperature';
  /** Typed (canonical SI); null when not typed. */
  typed: number | null;
  /** From the trace (canonical SI); null when the trace does not give it. */
  trace: number | null;
  /** How far apart the two may be (canonical SI); null when there is nothing to compare. */
  allowance: number | null;
  /** True when both are known and further apart than the allowance. */
  disagrees: boolean;
};

/** Typed value next to the trace's value, per value the trace gives, with the allowance and whether they disagree. */
export function traceAgreement(plan: Plan, reading: PressureTraceReading, recorded: RecordedValues): TraceAgreementRow[] {
  const rows: TraceAgreementRow[] = [];
  const add = (key: string, parameter: JointParameter, label: string, kind: TraceAgreementRow['kind'], typed: number | null, trace: number | null, allowance: (typed: number, trace: number) => number, lowerBound = false) => {
    const both = typed !== null && trace !== null;
    const slack = both ? allowance(typed, trace) : null;
    // 1e-9: binary fractions must not turn "exactly the allowance" into "just over".
    const disagrees = both && slack !== null && (lowerBound ? trace - typed > slack + 1e-9 : Math.abs(typed - trace) > slack + 1e-9);
    rows.push({ key, parameter, label, kind, typed, trace, allowance: slack, disagrees });
  };
  if (reading.heaterTemperatureC !== null) add('heaterTemperature', 'heaterTemperature', 'Heater temperature', 'temperature', recorded.heaterTemperatureC, reading.heaterTemperatureC, (_typed, trace) => temperatureAgreementC(plan, trace));
  const time = () => TIMING_AGREEMENT_S;
  add('heatSoak', 'heatSoak', 'Heat soak', 'duration', recorded.heatSoakS, reading.heatSoakS, time);
  add('changeover', 'changeover', 'Changeover', 'duration', recorded.changeoverS, reading.changeoverS, time);
  rows.push({ key: 'pressureBuildUp', parameter: 'pressureBuildUp', label: 'Pressure build-up', kind: 'duration', typed: null, trace: reading.pressureBuildUpS, allowance: null, disagrees: false });
  add('cooling', 'cooling', 'Cooling under pressure', 'duration', recorded.coolingS, reading.coolingS, time, !reading.released);
  const gauge = (typed: number) => pressureAgreementMpa(plan, typed);
  add('beadUpPressure', 'beadUpPressure', 'Bead-up gauge pressure', 'pressure', recorded.beadUpGaugePressureMpa, reading.beadUpGaugePressureMpa, gauge);
  add('fusionPressure', 'fusionPressure', 'Fusion gauge pressure', 'pressure', recorded.fusionGaugePressureMpa, reading.fusionGaugePressureMpa, gauge);
  add('heatSoakPressure', 'heatSoakPressure', 'Heat-soak gauge pressure', 'pressure', recorded.heatSoakGaugePressureMpa, reading.heatSoakGaugePressureMpa, gauge);
  return rows;
}

/** The disagreements as findings, worded in `system` units: "Heater temperature: typed 457 °F; trace 426 °F …". */
export function traceDisagreements(plan: Plan, reading: PressureTraceReading, recorded: RecordedValues, system: UnitSystem = 'si'): JointFinding[] {
  return traceAgreement(plan, reading, recorded)
    .filter((r) => r.disagrees)
    .map((r) => {
      const typed = r.typed as number;
      const trace = r.trace as number;
      const bound = r.key === 'cooling' && !reading.released ? ' or more (the trace ends before the release)' : '';
      return {
        parameter: r.parameter,
        kind: 'disagrees-with-trace' as const,
        measured: typed,
        limit: null,
        message: `${r.label}: typed ${formatQuantity(typed, r.kind, system)}; trace ${formatQuantity(trace, r.kind, system)}${bound} — further apart than the ${formatDifference(r.allowance as number, r.kind, system)} the instruments allow`,
      };
    });
}
