// Equipment: fusion machines (total effective piston area, mm²) and heater plates with
// their surface-temperature check log. Machines and plates are never deleted — they are
// retired (is_active = false) because joints refer to them. Edits use optimistic locking.
import { heaterProblems, isHeaterCheckOverdue, isHeaterFlagged, isMachineUsable, machineProblems, type HeaterReadings } from "@/domain/equipment/rules";
import { isoDateIn, UTC_ZONE } from "@/domain/dates/zone";
import { roundTo } from "@/domain/units/format";
import { conn, type Db } from "../client";
import type { FusionMachineRow, HeaterCheckRow, HeaterPlateRow } from "../tables";
import { day, isoDay, num } from "./rows";

export type MachineRecord = {
  id: number;
  assetTag: string;
  description: string | null;
  minOdMm: number | null;
  maxOdMm: number | null;
  /** Total effective piston area of the carriage cylinders, mm²; null = unknown (machine unusable). */
  pistonAreaMm2: number | null;
  /** Gauge and thermometer reading resolution (MPa, °C), copied into plans; null = unknown. */
  gaugeResolutionMpa: number | null;
  thermometerResolutionC: number | null;
  lastServiceOn: string | null;
  nextServiceDue: string | null;
  isActive: boolean;
  version: number;
  createdAt: Date;
  /** Active and piston area known (domain/equipment isMachineUsable). */
  isUsable: boolean;
  problems: string[];
};

function toMachine(r: FusionMachineRow): MachineRecord {
  const base = {
    id: r.id,
    assetTag: r.asset_tag,
    description: r.description ?? null,
    minOdMm: num(r.min_od_mm),
    maxOdMm: num(r.max_od_mm),
    pistonAreaMm2: num(r.piston_area_mm2),
    gaugeResolutionMpa: num(r.gauge_resolution_mpa),
    thermometerResolutionC: num(r.thermometer_resolution_c),
    lastServiceOn: isoDay(r.last_service_on),
    nextServiceDue: isoDay(r.next_service_due),
    isActive: Boolean(r.is_active),
    version: r.version,
    createdAt: r.created_at,
  };
  return { ...base, isUsable: isMachineUsable(base), problems: machineProblems(base) };
}

export async function findMachineById({ id, forUpdate = false }: { id: number; forUpdate?: boolean }, trx?: Db): Promise<MachineRecord | null> {
  const q = conn(trx)("fusion_machines").where({ id });
  if (forUpdate) q.forUpdate();
  const row = (await q.first()) as FusionMachineRow | undefined;
  return row ? toMachine(row) : null;
}

export async function listMachines({ activeOnly = false }: { activeOnly?: boolean } = {}, trx?: Db): Promise<MachineRecord[]> {
  const q = conn(trx)("fusion_machines").orderBy([{ column: "is_active", order: "desc" }, { column: "asset_tag" }]);
  if (activeOnly) q.where("is_active", true);
  return ((await q) as FusionMachineRow[]).map(toMachine);
}

/** Active machines with no piston area on record (they cannot be used for a joint). */
export async function listMachinesWithoutPistonArea(_: Record<string, never> = {}, trx?: Db): Promise<MachineRecord[]> {
  const rows = await conn(trx)("fusion_machines").where("is_active", true).where((w) => w.whereNull("piston_area_mm2").orWhere("piston_area_mm2", "<=", 0)).orderBy("asset_tag");
  return (rows as FusionMachineRow[]).map(toMachine);
}

export type MachineFields = {
  assetTag: string;
  description?: string | null;
  minOdMm: number | null;
  maxOdMm: number | null;
  pistonAreaMm2: number | null;
  gaugeResolutionMpa?: number | null;
  thermometerResolutionC?: number | null;
  lastServiceOn?: string | null;
  nextServiceDue?: string | null;
};

function machineColumns(m: MachineFields) {
  return {
    asset_tag: m.assetTag,
    description: m.description ?? null,
    // DECIMAL(…,2) columns: round half up here (the driver would pass 60.325 as 60.32499…).
    min_od_mm: m.minOdMm === null ? null : roundTo(m.minOdMm, 2),
    max_od_mm: m.maxOdMm === null ? null : roundTo(m.maxOdMm, 2),
    // A hundredth of a mm² is far below any data plate's precision.
    piston_area_mm2: m.pistonAreaMm2 === null ? null : roundTo(m.pistonAreaMm2, 2),
    // Left out (undefined) keeps the column's default on insert and the stored value on update.
    gauge_resolution_mpa: m.gaugeResolutionMpa === undefined ? undefined : m.gaugeResolutionMpa === null ? null : roundTo(m.gaugeResolutionMpa, 4),
    thermometer_resolution_c: m.thermometerResolutionC === undefined ? undefined : m.thermometerResolutionC === null ? null : roundTo(m.thermometerResolutionC, 3),
    last_service_on: m.lastServiceOn ?? null,
    next_service_due: m.nextServiceDue ?? null,
  };
}

export async function insertMachine(input: MachineFields, trx?: Db): Promise<number> {
  const [id] = await conn(trx)("fusion_machines").insert(machineColumns(input));
  return Number(id);
}

/** Optimistic update: false when `version` is stale. */
export async function updateMachine(input: MachineFields & { id: number; version: number; isActive: boolean }, trx?: Db): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("fusion_machines")
    .where({ id: input.id, version: input.version })
    .update({ ...machineColumns(input), is_active: input.isActive, version: k.raw("version + 1") });
  return changed === 1;
}

export async function isAssetTagTaken({ table, assetTag, exceptId }: { table: "fusion_machines" | "heater_plates"; assetTag: string; exceptId?: number }, trx?: Db): Promise<boolean> {
  const q = conn(trx)(table).where({ asset_tag: assetTag });
  if (exceptId) q.whereNot({ id: exceptId });
  return Boolean(await q.first("id"));
}

// ---------------------------------------------------------------------------------------
// Heater plates

export type HeaterCheckRecord = {
  id: number;
  heaterId: number;
  checkedAt: Date;
  checkedBy: number | null;
  checkedByName: string | null;
  instrument: string;
  /** °C at several points of each face. */
  readings: HeaterReadings;
  windowMinC: number;
  windowMaxC: number;
  passed: boolean;
  nextDueOn: string;
  notes: string | null;
  procedureVersionId: number | null;
};

export type HeaterRecord = {
  id: number;
  assetTag: string;
  description: string | null;
  checkIntervalDays: number;
  isActive: boolean;
  version: number;
  createdAt: Date;
  lastCheck: HeaterCheckRecord | null;
  /** Next check due (from the last check), null when never checked. */
  nextDueOn: string | null;
  /** Never checked, or due on/before the day asked about. */
  isCheckOverdue: boolean;
  /** The last check was outside the window; stays until a passing check. */
  isFlagged: boolean;
  /** Reasons the plate cannot be used on the day asked about (empty = usable). */
  problems: string[];
};

/** A heater_checks row with the name of who made the check (checksQuery). */
type CheckRow = HeaterCheckRow & { checked_by_name: string | null };

function toCheck(r: CheckRow): HeaterCheckRecord {
  return {
    id: Number(r.id),
    heaterId: r.heater_id,
    checkedAt: r.checked_at,
    checkedBy: r.checked_by ?? null,
    checkedByName: r.checked_by_name ?? null,
    instrument: r.instrument,
    readings: JSON.parse(r.readings) as HeaterReadings,
    windowMinC: Number(r.window_min_c),
    windowMaxC: Number(r.window_max_c),
    passed: Boolean(r.passed),
    nextDueOn: day(r.next_due_on),
    notes: r.notes ?? null,
    procedureVersionId: r.procedure_version_id ?? null,
  };
}

function toHeater(r: HeaterPlateRow, lastCheck: HeaterCheckRecord | null, on: string): HeaterRecord {
  const state = { isActive: Boolean(r.is_active), lastCheck: lastCheck ? { passed: lastCheck.passed, nextDueOn: lastCheck.nextDueOn } : null };
  return {
    id: r.id,
    assetTag: r.asset_tag,
    description: r.description ?? null,
    checkIntervalDays: r.check_interval_days,
    isActive: state.isActive,
    version: r.version,
    createdAt: r.created_at,
    lastCheck,
    nextDueOn: lastCheck?.nextDueOn ?? null,
    isCheckOverdue: isHeaterCheckOverdue(state, on),
    isFlagged: isHeaterFlagged(state),
    problems: heaterProblems({ ...state, assetTag: r.asset_tag }, on),
  };
}

function checksQuery(trx?: Db) {
  return conn(trx)("heater_checks").leftJoin("users", "users.id", "heater_checks.checked_by").select("heater_checks.*", "users.name as checked_by_name");
}

async function lastChecks(heaterIds: number[], trx?: Db): Promise<Map<number, HeaterCheckRecord>> {
  if (!heaterIds.length) return new Map();
  const k = conn(trx);
  const latest = k("heater_checks").whereIn("heater_id", heaterIds).groupBy("heater_id").select("heater_id").max({ max_id: "id" });
  const rows = (await checksQuery(trx).whereIn("heater_checks.id", k.from(latest.as("l")).select("max_id"))) as CheckRow[];
  return new Map(rows.map((r) => [r.heater_id, toCheck(r)]));
}

/**
 * A heater plate with its latest check and whether it is overdue / flagged on `now`'s
 * local calendar day in `timeZone` (the organisation's). "Latest" is the check recorded last (highest id).
 */
export async function findHeaterWithLastCheck(
  { id, now = new Date(), timeZone = UTC_ZONE, forUpdate = false }: { id: number; now?: Date; timeZone?: string; forUpdate?: boolean },
  trx?: Db,
): Promise<HeaterRecord | null> {
  const q = conn(trx)("heater_plates").where({ id });
  if (forUpdate) q.forUpdate();
  const row = (await q.first()) as HeaterPlateRow | undefined;
  if (!row) return null;
  const last = (await lastChecks([id], trx)).get(id) ?? null;
  return toHeater(row, last, isoDateIn(now, timeZone));
}

export async function listHeatersWithLastCheck(
  { now = new Date(), timeZone = UTC_ZONE, activeOnly = false }: { now?: Date; timeZone?: string; activeOnly?: boolean } = {},
  trx?: Db,
): Promise<HeaterRecord[]> {
  const q = conn(trx)("heater_plates").orderBy([{ column: "is_active", order: "desc" }, { column: "asset_tag" }]);
  if (activeOnly) q.where("is_active", true);
  const rows = (await q) as HeaterPlateRow[];
  const last = await lastChecks(rows.map((r) => r.id), trx);
  const on = isoDateIn(now, timeZone);
  return rows.map((r) => toHeater(r, last.get(r.id) ?? null, on));
}

/** Active plates that need a check now: overdue, never checked, or flagged by a failed check. */
export async function listHeatersNeedingCheck({ now = new Date(), timeZone = UTC_ZONE }: { now?: Date; timeZone?: string } = {}, trx?: Db): Promise<HeaterRecord[]> {
  return (await listHeatersWithLastCheck({ now, timeZone, activeOnly: true }, trx)).filter((h) => h.isCheckOverdue || h.isFlagged);
}

export async function listHeaterChecks({ heaterId, limit = 50 }: { heaterId: number; limit?: number }, trx?: Db): Promise<HeaterCheckRecord[]> {
  const rows = await checksQuery(trx).where("heater_checks.heater_id", heaterId).orderBy("heater_checks.id", "desc").limit(limit);
  return (rows as CheckRow[]).map(toCheck);
}

export type HeaterFields = { assetTag: string; description?: string | null; checkIntervalDays: number };

export async function insertHeater(input: HeaterFields, trx?: Db): Promise<number> {
  const [id] = await conn(trx)("heater_plates").insert({ asset_tag: input.assetTag, description: input.description ?? null, check_interval_days: input.checkIntervalDays });
  return Number(id);
}

/** Optimistic update: false when `version` is stale. */
export async function updateHeater(input: HeaterFields & { id: number; version: number; isActive: boolean }, trx?: Db): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("heater_plates")
    .where({ id: input.id, version: input.version })
    .update({ asset_tag: input.assetTag, description: input.description ?? null, check_interval_days: input.checkIntervalDays, is_active: input.isActive, version: k.raw("version + 1") });
  return changed === 1;
}

export async function insertHeaterCheck(
  input: {
    heaterId: number;
    checkedAt: Date;
    checkedBy: number;
    instrument: string;
    readings: HeaterReadings;
    windowMinC: number;
    windowMaxC: number;
    passed: boolean;
    nextDueOn: string;
    notes?: string | null;
    procedureVersionId: number | null;
  },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("heater_checks").insert({
    heater_id: input.heaterId,
    checked_at: input.checkedAt,
    checked_by: input.checkedBy,
    instrument: input.instrument,
    readings: JSON.stringify(input.readings),
    window_min_c: roundTo(input.windowMinC, 2),
    window_max_c: roundTo(input.windowMaxC, 2),
    passed: input.passed,
    next_due_on: input.nextDueOn,
    notes: input.notes ?? null,
    procedure_version_id: input.procedureVersionId,
  });
  return Number(id);
}
