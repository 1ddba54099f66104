// What the Procedures screen shows: the tightening form's fields with each window's
// present value in the person's units, and the standard names for the add form.
import { describeRule, FUSION_STANDARDS, builtInProcedure, type ProcedureDefinition } from "@/domain/procedures";
import { TIGHTENING_FIELDS, type TighteningFormField } from "@/domain/procedures/schemas";
import { formatQuantity, formatRange, unitLabel, type UnitSystem } from "@/domain/units/format";
import type { TighteningFieldView } from "../_components/tighten-form";

export function standardOptions(): { id: string; label: string }[] {
  return FUSION_STANDARDS.map((id) => ({ id, label: builtInProcedure(id).label }));
}

/** The tightening fields that apply to this definition, with their present values. */
export function tighteningFieldViews(definition: ProcedureDefinition, units: UnitSystem): TighteningFieldView[] {
  const w = definition.windows;
  const views: TighteningFieldView[] = [];
  const add = (key: TighteningFormField, unit: string, current: string) => views.push({ key, label: TIGHTENING_FIELDS[key].label, unit, current });
  const t = unitLabel("temperature", units);
  const p = unitLabel("pressure", units);
  add("heaterMin", t, formatQuantity(w.heaterTemperatureC.min, "temperature", units, { decimals: 1 }));
  add("heaterMax", t, formatQuantity(w.heaterTemperatureC.max, "temperature", units, { decimals: 1 }));
  add("beadUpPressureMin", p, formatQuantity(w.beadUpInterfacialPressureMpa.min, "pressure", units, { decimals: units === "us" ? 1 : 3 }));
  add("beadUpPressureMax", p, formatQuantity(w.beadUpInterfacialPressureMpa.max, "pressure", units, { decimals: units === "us" ? 1 : 3 }));
  add("fusionPressureMin", p, formatQuantity(w.fusionInterfacialPressureMpa.min, "pressure", units, { decimals: units === "us" ? 1 : 3 }));
  add("fusionPressureMax", p, formatQuantity(w.fusionInterfacialPressureMpa.max, "pressure", units, { decimals: units === "us" ? 1 : 3 }));
  add("minBeadAtLeast", unitLabel("length-mm", units), w.minBeadMm ? describeRule(w.minBeadMm.rule, "length-mm", units)[0] : "not set");
  add("maxChangeoverAtMost", "s", w.maxChangeoverS ? describeRule(w.maxChangeoverS.rule, "duration", units)[0] : "not set");
  if (w.minCoolingS) add("minCoolingFactor", "×", describeRule(w.minCoolingS.rule, "duration", units)[0]);
  add("minCoolingAtLeastMin", "min", w.minCoolingS ? describeRule(w.minCoolingS.rule, "duration", units)[0] : "not set");
  const od = w.outsideDiameterRangeMm;
  const odNow = od ? formatRange(od.min, od.max, "length-mm", units) : "any OD";
  add("odMin", unitLabel("length-mm", units), odNow);
  add("odMax", unitLabel("length-mm", units), odNow);
  return views;
}
