// What the Procedures screen shows: the tightening form's fields with each window's
// present value in the person's units, and the standard names for the add form.
import { describeRule, FUSION_STANDARDS, builtInProcedure, weatherRulesOf, type ProcedureDefinition } from "@/domain/procedures";
import { SHELTER_RULE_FIELDS, TIGHTENING_FIELDS, type TighteningFormField } from "@/domain/procedures/schemas";
import { SHELTER_LABELS, type Shelter } from "@/domain/joints/shelters";
import { formatQuantity, formatRange, unitLabel, type UnitSystem } from "@/domain/units/format";
import type { ShelterRuleView, TighteningFieldView } from "../_components/tighten-form";

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
  const weather = weatherRulesOf(definition);
  const ambient = weather?.ambientRangeC;
  const ambientNow = ambient ? formatRange(ambient.min, ambient.max, "temperature", units) : "no limit";
  add("ambientMin", t, ambientNow);
  add("ambientMax", t, ambientNow);
  add("coldShelterBelow", t, weather?.coldShelter ? formatQuantity(weather.coldShelter.belowC, "temperature", units) : "not set");
  return views;
}

/** The weather rule's shelter choices, with what the version asks for now. */
export function shelterRuleViews(definition: ProcedureDefinition): ShelterRuleView[] {
  const weather = weatherRulesOf(definition);
  const now = (s: { shelter: Shelter } | null | undefined) => (s ? SHELTER_LABELS[s.shelter] : "not set");
  return [
    { key: "shelterAlways", label: SHELTER_RULE_FIELDS.shelterAlways.label, current: now(weather?.shelterAlways) },
    { key: "coldShelter", label: SHELTER_RULE_FIELDS.coldShelter.label, current: now(weather?.coldShelter) },
  ];
}
