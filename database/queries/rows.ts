// Driver quirks of mysql2 in one place: DECIMAL columns arrive as strings, TINYINT(1) as
// 0/1, JSON columns as text, SET columns as comma-separated text. The query modules read
// rows through these helpers into domain-shaped objects (camelCase, SI numbers, Dates),
// including the recorded values of a joint, whose columns come from domain/joints/values.
import type { Knex } from "knex";
import type { JointParameter } from "@/domain/fusion/check";
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
 * "The joint has a finding on this parameter", as a condition on `joints` under `alias`:
 * the finding was raised when the joint was recorded, or by a pressure trace checked
 * later (joint_traces). The review queue and the Register filter by the same condition.
 */
export function whereJointHasFinding<Q extends Knex.QueryBuilder>(q: Q, alias: string, parameter: JointParameter): Q {
  q.where((w) => {
    w.whereRaw(`FIND_IN_SET(?, ${alias}.finding_parameters) > 0`, [parameter]).orWhereExists(function () {
      this.select(1).from("joint_traces as jt").whereRaw(`jt.joint_id = ${alias}.id`).whereRaw("FIND_IN_SET(?, jt.finding_parameters) > 0", [parameter]);
    });
  });
  return q;
}

/** The same condition as SQL text for the Register's hand-written queries. */
export function jointHasFindingSql(alias: string, parameter: JointParameter): { text: string; bindings: string[] } {
  return {
    text: `(FIND_IN_SET(?, ${alias}.finding_parameters) > 0 OR EXISTS (SELECT 1 FROM joint_traces jt WHERE jt.joint_id = ${alias}.id AND FIND_IN_SET(?, jt.finding_parameters) > 0))`,
    bindings: [parameter, parameter],
  };
}
