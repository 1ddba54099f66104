// The values recorded for each butt-fusion joint, defined once: what each is called (key
// with its canonical SI unit, database column, words people see), how the Trench asks for
// it, the plausible input bounds, and the joint-check parameter that judges it
// (domain/fusion/check, windows per ASTM F2620-20 / ISO 21307 / DVS 2207-1). The record
// schema, the query mappers, the Register columns, the JSON API, the Trench form, the joint
// page and the review's plan-versus-recorded view all derive from RECORDED_VALUES.
// Adding a value: a migration for its column, one row here, and its rule in the check.
//
// The two visual bead checks — a uniform double roll-back bead, and a V-groove between
// the beads that does not reach below the pipe surface — are one "visual bead" parameter of
// the check (PPI generic butt-fusion procedure, visual acceptance).
import type { JointMeasurements } from '@/domain/fusion/check';
import type { JointParameter } from '@/domain/fusion/parameters';
import type { QuantityKind } from '@/domain/units/format';

/** How the Trench takes a value: typed in, filled by the phase timer (or typed), or a yes/no check. */
export type ValueEntry = 'typed' | 'timed' | 'yes-no';

/** Where the Trench form asks for it: with the machine, in the phase timer, or in step 4 "Record the values". */
export type TrenchStep = 'machine' | 'timer' | 'values';

interface ValueDefinitionBase {
  /** camelCase with the canonical SI unit in the name; also the JSON API's and the check's name. */
  key: string;
  /** Column of `joints`. */
  column: string;
  /** Short id of the value on screens (plan-versus-recorded rows). */
  name: string;
  /** The value's name as people see it (Register header, joint page, review). */
  label: string;
  /** Required in a submission; an optional value may be left out or null. */
  required: boolean;
  /** The joint-check parameter that judges it; null when only recorded (drag is used in the plan). */
  parameter: JointParameter | null;
  step: TrenchStep;
  /** Register / export column. */
  register: { key: string; width: number; inGrid: boolean };
  /** Earlier name of the value in the JSON API, still accepted and answered (deprecated). */
  deprecatedWireName?: string;
}

export interface QuantityValueDefinition extends ValueDefinitionBase {
  type: 'quantity';
  quantity: QuantityKind;
  entry: 'typed' | 'timed';
  /** Plausible input range in canonical SI, enforced by the record schema. */
  bounds: { min: number; max: number };
  /** Words of the schema's messages ("Enter the heater temperature."). */
  inputName: string;
  /** The Trench field's label, and a hint under it. */
  prompt: string;
  hint?: string;
  /** Shown when the value was not recorded (see missingValueText). */
  whenMissing?: string;
  /** The timer phase of a timed value. */
  phase?: 'heatSoak' | 'changeover' | 'cooling';
  /** A missing value is a "not recorded" finding (otherwise it is simply not checked). */
  missingIsFinding: boolean;
}

export interface CheckValueDefinition extends ValueDefinitionBase {
  type: 'check';
  entry: 'yes-no';
  /** The question the fuser answers at the trench. */
  question: string;
}

export type RecordedValueDefinition = QuantityValueDefinition | CheckValueDefinition;

export const RECORDED_VALUES = [
  {
    key: 'heaterTemperatureC', column: 'heater_temperature_c', name: 'heaterTemperature', label: 'Heater temperature', type: 'quantity', quantity: 'temperature', entry: 'typed', step: 'values',
    required: true, bounds: { min: 0, max: 400 }, inputName: 'heater temperature', prompt: 'Heater temperature measured at the face', parameter: 'heaterTemperature', missingIsFinding: true,
    register: { key: 'heaterTemperature', width: 10, inGrid: true },
  },
  {
    // The dial is only a general indicator: the surface is checked with a pyrometer (PPI).
    key: 'heaterSurfaceTemperatureC', column: 'heater_surface_temperature_c', name: 'heaterSurfaceTemperature', label: 'Heater surface (pyrometer)', type: 'quantity', quantity: 'temperature', entry: 'typed', step: 'values',
    required: false, bounds: { min: 0, max: 400 }, inputName: 'heater surface temperature', prompt: 'Heater surface temperature (pyrometer)', hint: 'Read on the heater face with a pyrometer or surface thermometer, not the dial.',
    whenMissing: 'not recorded (optional)', parameter: 'heaterTemperature', missingIsFinding: false,
    register: { key: 'heaterSurfaceTemperature', width: 10, inGrid: true },
  },
  {
    key: 'dragPressureMpa', column: 'drag_pressure_mpa', name: 'dragPressure', label: 'Drag pressure', type: 'quantity', quantity: 'pressure', entry: 'typed', step: 'machine',
    required: true, bounds: { min: 0, max: 20 }, inputName: 'drag pressure', prompt: 'Drag pressure measured', hint: 'The gauge reading just to move the carriage.', parameter: null, missingIsFinding: false,
    register: { key: 'dragPressure', width: 9, inGrid: true },
  },
  {
    key: 'beadUpGaugePressureMpa', column: 'bead_up_gauge_mpa', name: 'beadUpPressure', label: 'Bead-up gauge pressure', type: 'quantity', quantity: 'pressure', entry: 'typed', step: 'values',
    required: false, bounds: { min: 0, max: 40 }, inputName: 'bead-up gauge pressure', prompt: 'Bead-up gauge pressure (if different from fusion)', hint: 'Leave empty when bead-up was at fusion pressure.',
    whenMissing: 'bead-up at fusion pressure', parameter: 'beadUpPressure', missingIsFinding: false,
    register: { key: 'beadUpGauge', width: 9, inGrid: true }, deprecatedWireName: 'beadUpGaugeMpa',
  },
  {
    key: 'fusionGaugePressureMpa', column: 'fusion_gauge_mpa', name: 'fusionPressure', label: 'Fusion gauge pressure', type: 'quantity', quantity: 'pressure', entry: 'typed', step: 'values',
    required: true, bounds: { min: 0, max: 40 }, inputName: 'fusion gauge pressure', prompt: 'Fusion gauge pressure', parameter: 'fusionPressure', missingIsFinding: true,
    register: { key: 'fusionGauge', width: 9, inGrid: true }, deprecatedWireName: 'fusionGaugeMpa',
  },
  {
    key: 'beadMm', column: 'bead_mm', name: 'bead', label: 'Bead size', type: 'quantity', quantity: 'length-mm', entry: 'typed', step: 'values',
    required: true, bounds: { min: 0, max: 100 }, inputName: 'bead size', prompt: 'Bead size', parameter: 'bead', missingIsFinding: true,
    register: { key: 'bead', width: 8, inGrid: true },
  },
  {
    key: 'heatSoakS', column: 'heat_soak_s', name: 'heatSoak', label: 'Heat soak', type: 'quantity', quantity: 'duration', entry: 'timed', phase: 'heatSoak', step: 'timer',
    required: false, bounds: { min: 0, max: 7200 }, inputName: 'heat-soak time', prompt: 'Heat soak time', parameter: 'heatSoak', missingIsFinding: true,
    register: { key: 'heatSoak', width: 8, inGrid: true },
  },
  {
    key: 'heatSoakGaugePressureMpa', column: 'heat_soak_gauge_mpa', name: 'heatSoakPressure', label: 'Heat-soak gauge pressure', type: 'quantity', quantity: 'pressure', entry: 'typed', step: 'values',
    required: false, bounds: { min: 0, max: 40 }, inputName: 'heat-soak gauge pressure', prompt: 'Heat-soak gauge pressure', hint: 'The gauge reading while the ends soak against the heater: drag, or no more than the plan allows.',
    whenMissing: 'not recorded (optional)', parameter: 'heatSoakPressure', missingIsFinding: false,
    register: { key: 'heatSoakGauge', width: 9, inGrid: true },
  },
  {
    key: 'changeoverS', column: 'changeover_s', name: 'changeover', label: 'Changeover', type: 'quantity', quantity: 'duration', entry: 'timed', phase: 'changeover', step: 'timer',
    required: true, bounds: { min: 0, max: 600 }, inputName: 'changeover time', prompt: 'Changeover time', parameter: 'changeover', missingIsFinding: true,
    register: { key: 'changeover', width: 8, inGrid: true },
  },
  {
    key: 'coolingS', column: 'cooling_s', name: 'cooling', label: 'Cooling', type: 'quantity', quantity: 'duration', entry: 'timed', phase: 'cooling', step: 'timer',
    required: true, bounds: { min: 0, max: 36_000 }, inputName: 'cooling time', prompt: 'Cooling time', parameter: 'cooling', missingIsFinding: true,
    register: { key: 'cooling', width: 8, inGrid: true },
  },
  {
    // Outside misalignment at most 10 % of the wall (PE pipe makers' butt-fusion guides).
    key: 'misalignmentMm', column: 'misalignment_mm', name: 'misalignment', label: 'Misalignment (hi-lo)', type: 'quantity', quantity: 'length-mm', entry: 'typed', step: 'values',
    required: false, bounds: { min: 0, max: 100 }, inputName: 'misalignment', prompt: 'Misalignment (hi-lo)', hint: 'The largest step between the outside surfaces of the two ends, measured in the machine.',
    whenMissing: 'not recorded (optional)', parameter: 'alignment', missingIsFinding: false,
    register: { key: 'misalignment', width: 8, inGrid: true },
  },
  {
    key: 'facingOk', column: 'facing_ok', name: 'facing', label: 'Facing complete and square', type: 'check', entry: 'yes-no', step: 'values',
    required: true, question: 'Were both ends faced complete and square?', parameter: 'facing',
    register: { key: 'facingOk', width: 7, inGrid: false },
  },
  {
    key: 'alignmentOk', column: 'alignment_ok', name: 'alignment', label: 'Alignment within limits', type: 'check', entry: 'yes-no', step: 'values',
    required: true, question: 'Did the alignment check pass (high-low within limits)?', parameter: 'alignment',
    register: { key: 'alignmentOk', width: 7, inGrid: false },
  },
  {
    key: 'beadRollbackOk', column: 'bead_rollback_ok', name: 'beadRollback', label: 'Bead rolled back to the pipe', type: 'check', entry: 'yes-no', step: 'values',
    required: true, question: 'Is the bead a uniform double roll-back all round?', parameter: 'visualBead',
    register: { key: 'beadRollbackOk', width: 7, inGrid: false },
  },
  {
    key: 'vGrooveOk', column: 'v_groove_ok', name: 'vGroove', label: 'V-groove above the pipe surface', type: 'check', entry: 'yes-no', step: 'values',
    required: true, question: 'Is the V-groove between the beads not below the pipe surface?', parameter: 'visualBead',
    register: { key: 'vGrooveOk', width: 7, inGrid: false },
  },
] as const satisfies readonly RecordedValueDefinition[];

type Row = (typeof RECORDED_VALUES)[number];
export type RecordedValueKey = Row['key'];
export type QuantityValueKey = Extract<Row, { type: 'quantity' }>['key'];
export type CheckValueKey = Extract<Row, { type: 'check' }>['key'];

/** A joint's recorded values in canonical SI; null when not recorded. */
export type RecordedValues = { [K in QuantityValueKey]: number | null } & { [K in CheckValueKey]: boolean | null };

/** The same values where some may be left out (a form before parsing, a partial fixture). */
export type RecordedValuesInput = { [K in QuantityValueKey]?: number | null } & { [K in CheckValueKey]?: boolean | null };

/** The table with its row types widened, for code that walks it. */
export const RECORDED_VALUE_DEFINITIONS: readonly RecordedValueDefinition[] = RECORDED_VALUES;
export const QUANTITY_VALUES = RECORDED_VALUE_DEFINITIONS.filter((d): d is QuantityValueDefinition => d.type === 'quantity');
export const CHECK_VALUES = RECORDED_VALUE_DEFINITIONS.filter((d): d is CheckValueDefinition => d.type === 'check');

/** What an optional value left unrecorded reads: neutral, not a finding. */
export const NOT_RECORDED_OPTIONAL = 'not recorded (optional)';

/**
 * The words for a value that was not recorded: "not recorded" when it is required (a
 * finding; domain/fusion/check isRequiredValue decides), otherwise "not recorded
 * (optional)", with what leaving it empty means where the Trench says so ("bead-up at
 * fusion pressure").
 */
export function missingValueText(definition: RecordedValueDefinition, required: boolean): string {
  if (required) return 'not recorded';
  const note = definition.type === 'quantity' ? definition.whenMissing : undefined;
  return note && note !== NOT_RECORDED_OPTIONAL ? `${NOT_RECORDED_OPTIONAL}: ${note}` : NOT_RECORDED_OPTIONAL;
}

/** Picks the recorded values out of a larger object (a joint, a form's values); absent keys become null. */
export function pickRecordedValues(source: RecordedValuesInput): RecordedValues {
  const src = source as Record<string, number | boolean | null | undefined>;
  return Object.fromEntries(RECORDED_VALUES.map((d) => [d.key, src[d.key] ?? null])) as RecordedValues;
}

/**
 * Visual bead parameter of the check: passes when the bead is a uniform double roll-back
 * AND the V-groove is not below the pipe surface; null when either was not answered.
 */
export function visualBeadOk(v: RecordedValuesInput): boolean | null {
  const rollback = v.beadRollbackOk ?? null;
  const groove = v.vGrooveOk ?? null;
  return rollback === null || groove === null ? null : rollback && groove;
}

/**
 * Canonical SI values → the check's input (same names). A value whose missing is not a
 * finding (bead-up pressure: "at fusion pressure") is left out when not recorded, so it is
 * not checked; values without a check parameter (drag) are not passed.
 */
export function jointMeasurements(v: RecordedValuesInput): JointMeasurements {
  const out: Record<string, number | boolean | null> = {};
  const src = v as Record<string, number | boolean | null | undefined>;
  for (const d of RECORDED_VALUE_DEFINITIONS) {
    if (d.parameter === null || d.parameter === 'visualBead') continue;
    const value = src[d.key] ?? null;
    if (value === null && d.type === 'quantity' && !d.missingIsFinding) continue;
    out[d.key] = value;
  }
  out.visualBeadOk = visualBeadOk(v);
  return out as unknown as JointMeasurements;
}

/** Every yes/no check answered yes (a joint made by the book; fixtures and demo data). */
export function allChecksPassed(): { [K in CheckValueKey]: boolean } {
  return Object.fromEntries(CHECK_VALUES.map((d) => [d.key, true])) as { [K in CheckValueKey]: boolean };
}

/** Recorded values → the columns of `joints` that hold them (absent values as NULL). */
export function recordedValuesToColumns(v: RecordedValuesInput): Record<string, number | boolean | null> {
  const src = v as Record<string, number | boolean | null | undefined>;
  return Object.fromEntries(RECORDED_VALUES.map((d) => [d.column, src[d.key] ?? null]));
}

/** Deprecated JSON API names → current keys (`fusionGaugeMpa` → `fusionGaugePressureMpa`). */
export const DEPRECATED_WIRE_NAMES: Readonly<Record<string, RecordedValueKey>> = Object.fromEntries(
  RECORDED_VALUE_DEFINITIONS.filter((d) => d.deprecatedWireName).map((d) => [d.deprecatedWireName as string, d.key as RecordedValueKey]),
);
