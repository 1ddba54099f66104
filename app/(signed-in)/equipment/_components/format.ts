// Display helpers for the Equipment screen (values stored in SI, shown in the person's units).
import { formatQuantity, roundTo, toDisplay, type QuantityKind, type UnitSystem } from "@/domain/units/format";

/** A value for an edit field in the person's units, with enough decimals not to drift on re-save. */
export function editValue(valueSi: number | null, kind: QuantityKind, units: UnitSystem): string {
  if (valueSi === null) return "";
  const decimals = kind === "area" ? (units === "us" ? 4 : 2) : kind === "length-mm" ? (units === "us" ? 4 : 2) : 2;
  return String(roundTo(toDisplay(valueSi, kind, units), decimals));
}

export function shown(valueSi: number | null, kind: QuantityKind, units: UnitSystem): string {
  return valueSi === null ? "—" : formatQuantity(valueSi, kind, units);
}

/** Piston areas need more decimals in in² than the default display. */
export function pistonArea(valueSi: number | null, units: UnitSystem): string {
  return valueSi === null ? "not on record" : formatQuantity(valueSi, "area", units, { decimals: units === "us" ? 3 : 1 });
}
