// Driver quirks of mysql2 in one place: DECIMAL columns arrive as strings, TINYINT(1) as
// 0/1, JSON columns as text, SET columns as comma-separated text. The query modules read
// rows through these helpers into domain-shaped objects (camelCase, SI numbers, Dates),
// including the recorded values of a joint, whose columns come from domain/joints/values.
import type { Knex } from "knex";
import type { JointParameter } from "@/domain/fusion/parameters";
import { RECORDED_VALUES, recordedValuesToColumns, type RecordedValues } from "@/domain/joints/values";

/** A row as the driver gives it: column name → DECIMAL text, number, 0/1, Date, text or null. */
export type DbRow = Record<string, unknown>;

/** DECIMAL text or number → number; NULL → null. */
export const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

/** TINYINT(1) → boolean; NULL → null. */
export const bool = (v: unknown): boolean | null => (v === null || v === undefined ? null : Boolean(v));

/** Text column → string; NULL → null. */
export const text = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));

/** DATETIME → Date (the driver already gives Dates; NULL → null). */
export const date = (v: unknown): Date | null => (v === null || v === undefined ? null : v instanceof Date ? v : new Date(String(v)));

/** DATE column (a Date at UTC midnight, the driver running with timezone Z, or text) → 'YYYY-MM-DD'; NULL → null. */
export function isoDay(value: Date | string | null | undefined): string | null {
  if (value == null) return null;
  if (typeof value === "string") return value.slice(0, 10);
  return value.toISOString().slice(0, 10);
}

/** NOT NULL DATE column → 'YYYY-MM-DD'. */
export const day = (value: Date | string): string => isoDay(value) ?? "";

/** JSON text → value; the fallback for NULL, empty or unreadable text. */
export function parseJson<T>(value: unknown, fallback: T): T {
  if (typeof value !== "string" || value === "") return fallback;
  try {
    return JSON.parse(value) as T;
  } catch {
    return fallback;
  }
}

/** SET column ("a,b") → list; NULL → []. */
export function setList<T extends string>(value: unknown): T[] {
  return String(value ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean) as T[];
}

/** The recorded value columns of `joints` under a table alias, e.g. "j.heater_temperature_c". */
export function recordedValueColumns(alias: string): string[] {
  return RECORDED_VALUES.map((d) => `${alias}.${d.column}`);
}

/** A joint row's recorded value columns → RecordedValues. */
export function toRecordedValues(row: DbRow): RecordedValues {
  return Object.fromEntries(RECORDED_VALUES.map((d) => [d.key, d.type === "check" ? bool(row[d.column]) : num(row[d.column])])) as RecordedValues;
}

/** RecordedValues → the columns of `joints` for an insert (absent values stored as NULL). */
export const recordedValueRow = recordedValuesToColumns;

/**
 * "The joint has a finding on this parameter", as SQL on `joints` under `alias`: a row of
 * joint_findings, which holds the findings raised when the joint was recorded (a trigger
 * on joints) and those of every pressure trace checked later (insertJointTrace). The
 * review queue filters by this condition; the Register walks the same table by its
 * (parameter, made_at) index.
 */
export function jointHasFinding(alias: string, parameter: JointParameter): { sql: string; bindings: string[] } {
  return { sql: `EXISTS (SELECT 1 FROM joint_findings jf WHERE jf.joint_id = ${alias}.id AND jf.parameter = ?)`, bindings: [parameter] };
}

/** Adds findings to joint_findings (a trace's, after the joint was recorded); one row per parameter. */
export async function addJointFindings({ jointId, parameters }: { jointId: number; parameters: readonly JointParameter[] }, trx: Knex): Promise<void> {
  for (const parameter of new Set(parameters)) {
    await trx.raw("INSERT IGNORE INTO joint_findings (joint_id, parameter, made_at) SELECT id, ?, made_at FROM joints WHERE id = ?", [parameter, jointId]);
  }
}
