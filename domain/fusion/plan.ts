// Pressure plan for one butt-fusion joint: a pipe (OD, SDR) on a machine (total effective
// piston area, measured drag pressure) under a procedure. Gauge pressure to set =
// interfacial pressure × fusion area ÷ total effective piston area + drag pressure
// (PPI generic butt-fusion procedure as reproduced in a pipe maker's manual, §6.2.5;
// PPI TR-33; CONFIRMED-2nd for the method, exact geometry for the areas).

import type { InstrumentResolution } from '@/domain/fusion/instrument';
import { DomainError } from '@/domain/errors';
import { pipeGeometry } from '@/domain/pipe/geometry';
import type { PipeSeries } from '@/domain/pipe/catalogue';
import {
  sizeForOutsideDiameter,
  tableWall,
  tableWallForOutsideDiameter,
  type WallSource,
} from '@/domain/pipe/walls';
import type { Sourced } from '@/domain/sources';
import { formatQuantity } from '@/domain/units/format';
import {
  builtInProcedure,
  evaluateSizeRule,
  ruleBasis,
  type FusionStandard,
  type ProcedureDefinition,
  type SizeBasis,
  type SizeRule,
  type Window,
  type WeatherRules,
  weatherRulesOf,
} from '@/domain/procedures';

export interface PlanButtFusionInput {
  /** A built-in published procedure … */
  standard?: FusionStandard;
  /** … or an operator's procedure version (exactly one of the two). */
  procedure?: ProcedureDefinition;
  outsideDiameterMm: number;
  sdr: number;
  /**
   * A wall the caller knows (e.g. measured); without it the wall is looked up in the published
   * tables by `size` or, failing that, by the OD, and is OD / SDR only when no table lists it.
   */
  wallMm?: number;
  /** The catalogue size, when known; `wallIn` names a fixed wall (IPS 0.090 in, CTS walls). */
  size?: { series: PipeSeries; nominal: string; wallIn?: number };
  /** Total effective piston area of the machine's carriage cylinders, mm². */
  pistonAreaMm2: number;
  /** Gauge pressure measured just to move the carriage, MPa. */
  dragPressureMpa: number;
}

export interface NullableWindow {
  min: number | null;
  max: number | null;
}

/** Which plan values came from where (null when the procedure does not define it). */
export interface PlanSources {
  heaterTemperature: Sourced;
  beadUpPressure: Sourced;
  fusionPressure: Sourced;
  coolingPressure: Sourced | null;
  /** Absent in plans stored before the heat-soak pressure was checked. */
  heatSoakPressure?: Sourced | null;
  bead: Sourced | null;
  heatSoak: Sourced | null;
  changeover: Sourced | null;
  pressureBuildUp: Sourced | null;
  cooling: Sourced | null;
}

/**
 * The plan. Pressures in MPa (interfacial and gauge), temperatures °C, lengths mm, areas
 * mm², times s. Pressures, bead and areas are not rounded; times are rounded to the whole
 * second (stopwatch and logger resolution; ±0.5 s is far inside these rules' accuracy).
 * A value the procedure does not define at this size is null.
 */
export interface FusionPlan {
  standard: FusionStandard;
  procedureLabel: string;
  outsideDiameterMm: number;
  sdr: number;
  wallMm: number;
  /** Where `wallMm` came from: a published table (named), the caller, or OD / SDR. */
  wallSource: WallSource;
  fusionAreaMm2: number;
  pistonAreaMm2: number;
  dragPressureMpa: number;
  heaterTemperatureC: Window;
  /** Fusion (joining) interfacial pressure window. */
  interfacialPressureMpa: Window;
  beadUpInterfacialPressureMpa: Window;
  beadUpGaugePressureMpa: Window;
  fusionGaugePressureMpa: Window;
  /** Reduced cooling pressure (ISO 21307 dual low-pressure); null elsewhere. */
  coolingInterfacialPressureMpa: Window | null;
  coolingGaugePressureMpa: Window | null;
  /**
   * Highest gauge pressure during heat soak, MPa: drag + the procedure's heat-soak
   * interfacial maximum × fusion area ÷ piston area (F2620 / ISO 21307: at drag; DVS 2207-1:
   * drag + 0.02 N/mm² converted). Absent (undefined) in plans stored before it was checked.
   */
  maxHeatSoakGaugePressureMpa?: number | null;
  maxHeatSoakInterfacialPressureMpa?: number | null;
  minBeadMm: number | null;
  /** Whether the bead minimum depends on the pipe's OD or its wall (for messages). */
  minBeadBasis: SizeBasis | null;
  heatSoakTargetS: number | null;
  heatSoakS: NullableWindow | null;
  maxChangeoverS: number | null;
  pressureBuildUpS: number | null;
  minCoolingS: number | null;
  sources: PlanSources;
  /** The machine's gauge and thermometer resolution (domain/fusion/instrument); absent in plans stored before it, and then no reading tolerance. */
  instrument?: InstrumentResolution;
  /**
   * The procedure's weather rules (ambient range, shelter, cooling adjustment), with their
   * sources; checked against the joint's recorded ambient and shelter. Absent in plans
   * stored before they were modelled (then nothing is checked).
   */
  weather?: WeatherRules | null;
  /** Plain-language notes: the procedure's notes and any value left undefined at this size. */
  notes: string[];
}

function assertPositive(value: number, label: string, unit: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new DomainError('invalid-input', `${label} must be more than 0 ${unit} (got ${String(value)})`);
  }
}

/**
 * Gauge pressure (MPa) that produces an interfacial pressure on a pipe end:
 * IFP × fusion area ÷ piston area + drag. MPa × mm² = N, N ÷ mm² = MPa. Not rounded.
 * Source: PPI generic procedure gauge method (PPI TR-33, as reproduced in a pipe maker's manual §6.2.5).
 */
export function gaugePressureForInterfacialPressure(input: {
  interfacialPressureMpa: number;
  fusionAreaMm2: number;
  pistonAreaMm2: number;
  dragPressureMpa: number;
}): number {
  assertPositive(input.pistonAreaMm2, 'Piston area', 'mm²');
  return (input.interfacialPressureMpa * input.fusionAreaMm2) / input.pistonAreaMm2 + input.dragPressureMpa;
}

/**
 * Interfacial pressure (MPa) a logged gauge reading implies: (gauge − drag) × piston area
 * ÷ fusion area. Not rounded; negative when the gauge reads below drag (no force on the
 * pipe ends), which callers treat as "no fusion pressure". Source: PPI TR-33 gauge method, inverted.
 */
export function interfacialPressureFromGauge(input: {
  gaugePressureMpa: number;
  dragPressureMpa: number;
  pistonAreaMm2: number;
  fusionAreaMm2: number;
}): number {
  assertPositive(input.pistonAreaMm2, 'Piston area', 'mm²');
  assertPositive(input.fusionAreaMm2, 'Fusion area', 'mm²');
  return ((input.gaugePressureMpa - input.dragPressureMpa) * input.pistonAreaMm2) / input.fusionAreaMm2;
}

function resolveProcedure(input: PlanButtFusionInput): ProcedureDefinition {
  if (input.procedure && input.standard) {
    throw new DomainError('invalid-input', 'Give either a standard or a procedure, not both');
  }
  if (input.procedure) return input.procedure;
  if (input.standard) return builtInProcedure(input.standard);
  throw new DomainError('invalid-input', 'A standard or a procedure is required');
}

// Round half up to the whole second; the 1e-6 s pre-rounding keeps 397.4999999 (a binary
// artefact of 397.5) from rounding down, so a minimum on a half second rounds up.
/**
 * The plan's wall: the caller's, else the published table wall found by the given catalogue
 * size or by matching the OD to a catalogued size (within 0.06 mm), else undefined (OD / SDR).
 * Throws DomainError when a given size does not have the given OD.
 */
function resolveWall(input: PlanButtFusionInput): { wallMm: number | undefined; wallSource: WallSource } {
  if (input.wallMm !== undefined) return { wallMm: input.wallMm, wallSource: { kind: 'given' } };
  if (input.size) {
    const size = sizeForOutsideDiameter(input.outsideDiameterMm, input.size.series);
    const table = tableWall({ ...input.size, sdr: input.sdr });
    if (!size || (table && size.nominal !== table.nominal)) {
      throw new DomainError('invalid-input', `The ${input.outsideDiameterMm} mm outside diameter is not ${input.size.series.toUpperCase()} size "${input.size.nominal}"`);
    }
    if (table) return { wallMm: table.wallMm, wallSource: table.source };
    return { wallMm: undefined, wallSource: { kind: 'od-over-sdr' } };
  }
  const table = Number.isFinite(input.outsideDiameterMm) && Number.isFinite(input.sdr) && input.sdr > 2
    ? tableWallForOutsideDiameter(input.outsideDiameterMm, input.sdr)
    : null;
  return table ? { wallMm: table.wallMm, wallSource: table.source } : { wallMm: undefined, wallSource: { kind: 'od-over-sdr' } };
}

const roundSeconds = (value: number | null): number | null =>
  value === null ? null : Math.round(Math.round(value * 1e6) / 1e6);

const roundTenths = (value: number | null): number | null =>
  value === null ? null : Math.round(Math.round(value * 1e7) / 1e6) / 10;

/**
 * Plan a butt-fusion joint. The wall is the published table wall when the OD (or the given
 * `size`) is a catalogued size whose SDR a table lists (ISO 4427-2 Table 2 / ISO 4437-2,
 * ASTM D3035 / D2513, ASTM F2897-23a Table 6), else OD / SDR; `wallSource` says which.
 * Inputs in SI: OD mm, SDR, optional known wall mm, piston area
 * mm², drag MPa; either a built-in `standard` or an operator's `procedure`.
 * Throws DomainError for impossible input (OD ≤ 0, SDR ≤ 2, piston area ≤ 0, negative
 * drag) and for a pipe outside the procedure's wall or OD range.
 * Sources: see each procedure value's `source`; gauge method PPI TR-33 (pipe maker's manual §6.2.5).
 */
export function planButtFusion(input: PlanButtFusionInput): FusionPlan {
  const procedure = resolveProcedure(input);
  const wall = resolveWall(input);
  const geometry = pipeGeometry({ outsideDiameterMm: input.outsideDiameterMm, sdr: input.sdr, wallMm: wall.wallMm });
  assertPositive(input.pistonAreaMm2, 'Piston area', 'mm²');
  if (typeof input.dragPressureMpa !== 'number' || !Number.isFinite(input.dragPressureMpa) || input.dragPressureMpa < 0) {
    throw new DomainError('invalid-input', `Drag pressure must be 0 MPa or more (got ${String(input.dragPressureMpa)})`);
  }
  const w = procedure.windows;
  const pipe = { wallMm: geometry.wallMm, outsideDiameterMm: input.outsideDiameterMm };
  const mm = (value: number) => formatQuantity(value, 'length-mm', 'si');

  const checkRange = (range: { min: number | null; max: number | null } | null, value: number, what: string) => {
    if (!range) return;
    if ((range.min !== null && value < range.min) || (range.max !== null && value > range.max)) {
      const span = range.min !== null && range.max !== null
        ? `from ${mm(range.min)} to ${mm(range.max)}`
        : range.min !== null ? `of ${mm(range.min)} and more` : `up to ${mm(range.max as number)}`;
      throw new DomainError('outside-procedure-range', `${procedure.label} applies to ${what}s ${span}; this pipe's ${what} is ${mm(value)}`);
    }
  };
  checkRange(w.wallRangeMm, geometry.wallMm, 'wall');
  checkRange(w.outsideDiameterRangeMm, input.outsideDiameterMm, 'outside diameter');

  const gauge = (window: Window): Window => ({
    min: gaugePressureForInterfacialPressure({ interfacialPressureMpa: window.min, fusionAreaMm2: geometry.fusionAreaMm2, pistonAreaMm2: input.pistonAreaMm2, dragPressureMpa: input.dragPressureMpa }),
    max: gaugePressureForInterfacialPressure({ interfacialPressureMpa: window.max, fusionAreaMm2: geometry.fusionAreaMm2, pistonAreaMm2: input.pistonAreaMm2, dragPressureMpa: input.dragPressureMpa }),
  });
  const windowOf = (sourced: Window): Window => ({ min: sourced.min, max: sourced.max });
  // A version stored before the soak pressure was modelled takes its base standard's value.
  const soak = w.heatSoakInterfacialPressureMpa !== undefined ? w.heatSoakInterfacialPressureMpa : (builtInProcedure(procedure.standard).windows.heatSoakInterfacialPressureMpa ?? null);
  const maxHeatSoakGaugePressureMpa = soak
    ? gaugePressureForInterfacialPressure({ interfacialPressureMpa: soak.max, fusionAreaMm2: geometry.fusionAreaMm2, pistonAreaMm2: input.pistonAreaMm2, dragPressureMpa: input.dragPressureMpa })
    : null;

  const notes = [...procedure.notes];
  const evaluate = (rule: SizeRule | null, what: string): number | null => {
    if (!rule) return null;
    const value = evaluateSizeRule(rule, pipe);
    if (value === null) {
      const basis = ruleBasis(rule);
      const size = basis === 'outside-diameter-mm' ? `a ${mm(input.outsideDiameterMm)} OD` : `a ${mm(geometry.wallMm)} wall`;
      notes.push(`${procedure.label} gives no ${what} for ${size}.`);
    }
    return value;
  };

  const minBeadMm = evaluate(w.minBeadMm?.rule ?? null, 'minimum bead size');
  const heatSoakTargetS = roundSeconds(evaluate(w.heatSoakS?.target ?? null, 'heat-soak time'));
  const heatSoakMin = roundSeconds(evaluate(w.heatSoakS?.min ?? null, 'heat-soak minimum'));
  const heatSoakMax = roundSeconds(evaluate(w.heatSoakS?.max ?? null, 'heat-soak maximum'));
  // Where the table gives no changeover limit (F2620 walls under 0.17 in), the operator's
  // value applies, so a changeover is never unlimited for a wall the procedure covers.
  const changeoverFromRule = w.maxChangeoverS ? evaluateSizeRule(w.maxChangeoverS.rule, pipe) : null;
  // A version stored before the operator value existed takes its base standard's.
  const whereNone = w.maxChangeoverS?.whereNone !== undefined ? w.maxChangeoverS.whereNone : (builtInProcedure(procedure.standard).windows.maxChangeoverS?.whereNone ?? null);
  const changeoverFallback = w.maxChangeoverS && changeoverFromRule === null ? whereNone : null;
  const maxChangeoverS = roundSeconds(changeoverFallback ? changeoverFallback.value : evaluate(w.maxChangeoverS?.rule ?? null, 'maximum changeover time'));
  if (changeoverFallback) notes.push(`Maximum changeover ${changeoverFallback.value} s is the operator's value: ${changeoverFallback.source}.`);
  // Build-up limits are short (ISO 21307: 3 + 0.03·d_n s, e.g. 6.3 s at d_n 110), so they
  // keep a tenth of a second rather than the whole second.
  const pressureBuildUpS = roundTenths(evaluate(w.maxPressureBuildUpS?.rule ?? null, 'pressure build-up time'));
  const minCoolingS = roundSeconds(evaluate(w.minCoolingS?.rule ?? null, 'minimum cooling time'));

  const sourceOf = (value: Sourced | null): Sourced | null => (value ? { source: value.source, status: value.status } : null);

  return {
    standard: procedure.standard,
    procedureLabel: procedure.label,
    outsideDiameterMm: input.outsideDiameterMm,
    sdr: input.sdr,
    wallMm: geometry.wallMm,
    wallSource: wall.wallSource,
    fusionAreaMm2: geometry.fusionAreaMm2,
    pistonAreaMm2: input.pistonAreaMm2,
    dragPressureMpa: input.dragPressureMpa,
    heaterTemperatureC: windowOf(w.heaterTemperatureC),
    interfacialPressureMpa: windowOf(w.fusionInterfacialPressureMpa),
    beadUpInterfacialPressureMpa: windowOf(w.beadUpInterfacialPressureMpa),
    beadUpGaugePressureMpa: gauge(w.beadUpInterfacialPressureMpa),
    fusionGaugePressureMpa: gauge(w.fusionInterfacialPressureMpa),
    coolingInterfacialPressureMpa: w.coolingInterfacialPressureMpa ? windowOf(w.coolingInterfacialPressureMpa) : null,
    coolingGaugePressureMpa: w.coolingInterfacialPressureMpa ? gauge(w.coolingInterfacialPressureMpa) : null,
    maxHeatSoakGaugePressureMpa,
    maxHeatSoakInterfacialPressureMpa: soak ? soak.max : null,
    minBeadMm,
    minBeadBasis: w.minBeadMm ? ruleBasis(w.minBeadMm.rule) : null,
    heatSoakTargetS,
    heatSoakS: w.heatSoakS && (heatSoakMin !== null || heatSoakMax !== null) ? { min: heatSoakMin, max: heatSoakMax } : null,
    maxChangeoverS,
    pressureBuildUpS,
    minCoolingS,
    sources: {
      heaterTemperature: sourceOf(w.heaterTemperatureC) as Sourced,
      beadUpPressure: sourceOf(w.beadUpInterfacialPressureMpa) as Sourced,
      fusionPressure: sourceOf(w.fusionInterfacialPressureMpa) as Sourced,
      coolingPressure: sourceOf(w.coolingInterfacialPressureMpa),
      heatSoakPressure: sourceOf(soak),
      bead: sourceOf(w.minBeadMm),
      heatSoak: sourceOf(w.heatSoakS),
      changeover: sourceOf(changeoverFallback ?? w.maxChangeoverS),
      pressureBuildUp: sourceOf(w.maxPressureBuildUpS),
      cooling: sourceOf(w.minCoolingS),
    },
    weather: weatherRulesOf(procedure),
    notes,
  };
}
