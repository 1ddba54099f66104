// Procedure versions on the office side: turning the Procedures form (values in the
// person's units) into the domain's ProcedureTightening (canonical SI), mapping the
// domain's refusals back to form fields (a stored definition is read back with
// parseProcedureDefinition, domain/fusion/schemas).
// The tightening rules themselves (only narrowing, never loosening) are deriveProcedure's.
import {
  deriveProcedure,
  type DeriveProcedureResult,
  type ProcedureDefinition,
  type ProcedureTightening,
} from '@/domain/procedures';
import { fromDisplay, type UnitSystem } from '@/domain/units/format';
import {
  SHELTER_RULE_FIELDS,
  SHELTER_RULE_FORM_FIELDS,
  TIGHTENING_FIELDS,
  TIGHTENING_FORM_FIELDS,
  type ShelterRuleField,
  type TighteningFormField,
  type TightenProcedureInput,
} from '@/domain/procedures/schemas';

/** Form values (person's units) → ProcedureTightening in °C, MPa, mm, s. */
export function tighteningFromForm(input: Pick<TightenProcedureInput, TighteningFormField | ShelterRuleField | 'units'>): ProcedureTightening {
  const out: Record<string, Record<string, number>> = {};
  for (const key of TIGHTENING_FORM_FIELDS) {
    const raw = input[key];
    if (raw === undefined || raw === null) continue;
    const value = raw as number;
    const field = TIGHTENING_FIELDS[key];
    const [group, part] = field.path.split('.') as [string, string];
    let si: number;
    switch (field.kind) {
      case 'factor':
        si = value;
        break;
      case 'minutes':
        si = value * 60;
        break;
      default:
        si = fromDisplay(value, field.kind, input.units as UnitSystem);
    }
    (out[group] ??= {})[part] = si;
  }
  const shelters = out as unknown as Record<string, Record<string, string>>;
  for (const key of SHELTER_RULE_FORM_FIELDS) {
    const value = input[key];
    if (value === undefined) continue;
    const [group, part] = SHELTER_RULE_FIELDS[key].path.split('.') as [string, string];
    (shelters[group] ??= {})[part] = value;
  }
  return out as ProcedureTightening;
}

/** The form field a domain refusal belongs to ('heaterTemperatureC.min' → 'heaterMin'); '_form' otherwise. */
export function formFieldForTighteningError(domainField: string): TighteningFormField | ShelterRuleField | '_form' {
  for (const key of TIGHTENING_FORM_FIELDS) {
    const path = TIGHTENING_FIELDS[key].path;
    if (path === domainField) return key;
  }
  for (const key of SHELTER_RULE_FORM_FIELDS) {
    if (SHELTER_RULE_FIELDS[key].path === domainField) return key;
  }
  // Whole-window errors ("minimum above maximum") are shown on the window's minimum field.
  for (const key of TIGHTENING_FORM_FIELDS) {
    if (TIGHTENING_FIELDS[key].path.split('.')[0] === domainField) return key;
  }
  return '_form';
}

/** The standard's own label under earlier operator suffixes ("… — LVG-BF-01 version 2", "… (tightened)"). */
function baseLabel(label: string): string {
  return label.replace(/ \(tightened\)$/, '').replace(/ — \S+ version \d+$/, '');
}

export type TightenOutcome =
  | { ok: true; definition: ProcedureDefinition }
  | { ok: false; fields: Record<string, string[]> };

/**
 * Tighten `base` with the form's values through deriveProcedure (which refuses any
 * loosening); refusals come back per form field, in the person's units.
 */
export function tightenFromForm(
  base: ProcedureDefinition,
  input: TightenProcedureInput,
  context: { procedureCode: string; versionNo: number },
): TightenOutcome {
  const result: DeriveProcedureResult = deriveProcedure(base, tighteningFromForm(input), {
    label: input.label ?? `${baseLabel(base.label)} — ${context.procedureCode} version ${context.versionNo}`,
    notes: [input.note],
    system: input.units,
    source: `Operator procedure ${context.procedureCode} version ${context.versionNo}`,
  });
  if (result.ok) return { ok: true, definition: result.procedure };
  const fields: Record<string, string[]> = {};
  for (const error of result.errors) (fields[formFieldForTighteningError(error.field)] ??= []).push(error.message);
  return { ok: false, fields };
}
