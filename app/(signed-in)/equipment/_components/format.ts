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

/** An instrument's resolution for an edit field: a gauge step (MPa → psi) or a temperature step (°C → °F, no offset). */
export function resolutionEditValue(valueSi: number | null, kind: "pressure" | "temperature", units: UnitSystem): string {
  if (valueSi === null) return "";
  if (kind === "pressure") return String(roundTo(toDisplay(valueSi, "pressure", units), units === "us" ? 2 : 4));
  return String(roundTo(units === "us" ? (valueSi * 9) / 5 : valueSi, 2));
}

/** An instrument's resolution as read: "0.05 MPa", "1 °C"; "not set" (no tolerance) when unknown. */
export function resolutionShown(valueSi: number | null, kind: "pressure" | "temperature", units: UnitSystem): string {
  if (valueSi === null) return "not set";
  return `${resolutionEditValue(valueSi, kind, units)} ${kind === "pressure" ? (units === "us" ? "psi" : "MPa") : units === "us" ? "°F" : "°C"}`;
}

/** Piston areas need more decimals in in² than the default display. */
export function pistonArea(valueSi: number | null, units: UnitSystem): string {
  return valueSi === null ? "not on record" : formatQuantity(valueSi, "area", units, { decimals: units === "us" ? 3 : 1 });
}
