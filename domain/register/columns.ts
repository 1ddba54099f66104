// The Register's columns, shared by the grid and the spreadsheet/CSV export so both show
// the same values: headers carry the unit in the reader's system (SI or US customary),
// values are converted from canonical SI at this edge (domain/units, NIST SP 811 factors).
import type { JointParameter } from '@/domain/fusion/parameters';
import { FINDING_PARAMETER_LABELS } from '@/domain/fusion/parameters';
import { OUTCOME_LABELS } from '@/domain/joints/outcomes';
import { REVIEW_STATE_LABELS, type ReviewState } from '@/domain/joints/review-states';
import { formatJointReference } from '@/domain/joints/reference';
import type { RegisterOutcome, RegisterSort } from '@/domain/register/filter';
import { CHECK_VALUES, QUANTITY_VALUES, type CheckValueDefinition, type QuantityValueDefinition, type RecordedValues } from '@/domain/joints/values';
import { displayDecimals, roundTo, toDisplay, unitLabel, type QuantityKind, type UnitSystem } from '@/domain/units/format';
import { formatZoned, formatUtcInstant, localTimeHeader } from '@/domain/dates/zone';

/** One joint as the Register shows it (canonical SI, as stored). */
export type RegisterRow = RecordedValues & RegisterJoint;

/** What the Register shows of a joint besides its recorded values. */
export interface RegisterJoint {
  id: number;
  jobId: number;
  jobCode: string;
  jointNo: number;
  kind: 'coil-to-coil' | 'tie-in' | 'fitting';
  madeAt: Date;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
  fuserId: number;
  fuserName: string;
  machineId: number;
  machineTag: string;
  heaterTag: string;
  coilACode: string | null;
  coilALot: string | null;
  coilBCode: string | null;
  coilBLot: string | null;
  componentBText: string | null;
  /** Nominal size and series of coil A (e.g. "2", "ips"), when side A is a coil. */
  nominalSize: string | null;
  series: string | null;
  outsideDiameterMm: number;
  sdr: number;
  procedureVersionId: number;
  procedureCode: string;
  procedureVersionNo: number;
  outcome: RegisterOutcome;
  reviewState: ReviewState;
  findingParameters: JointParameter[];
  ambientC: number | null;
  // ── Audit trail (the decision, remakes, overrides) ──
  /** The inspector's decision the review state rests on; null while pending review. */
  decisionState: 'accepted' | 'cut-out' | null;
  decidedByName: string | null;
  decidedAt: Date | null;
  decisionNote: string | null;
  /** The cut-out joint this one remakes. */
  replaces: RegisterJointRef | null;
  /** The remake that replaced this cut-out joint. */
  replacedBy: RegisterJointRef | null;
  /** Clearances of blocking warnings the joint was recorded under, oldest first. */
  overridesUsed: RegisterOverrideUse[];
  // ── end audit trail ──
}

/** Another joint named by job code and joint number. */
export interface RegisterJointRef {
  jobCode: string;
  jointNo: number;
}

/** One clearance a joint was recorded under: what it cleared (in words), who granted it and why. */
export interface RegisterOverrideUse {
  message: string;
  grantedByName: string;
  reason: string;
}

/** The same row as the JSON API sends it (dates as ISO 8601 text). */
export type RegisterRowJson = Omit<RegisterRow, 'madeAt' | 'decidedAt'> & { madeAt: string; decidedAt: string | null };

export function registerRowFromJson(row: RegisterRowJson): RegisterRow {
  return { ...row, madeAt: new Date(row.madeAt), decidedAt: row.decidedAt === null ? null : new Date(row.decidedAt) };
}

export type CellValue = string | number | Date | null;
export type ColumnType = 'text' | 'integer' | 'number' | 'date' | 'quantity' | 'local-time';

export interface RegisterColumn {
  key: string;
  /** Header without the unit. */
  title: string;
  type: ColumnType;
  quantity?: QuantityKind;
  /** The server-side sort this column's header sorts by. */
  sort?: RegisterSort;
  /** Shown in the grid (the export has every column). */
  inGrid: boolean;
  /** Approximate width in characters (grid and spreadsheet). */
  width: number;
  /** `timeZone`: the organisation's IANA zone (only the local-time column reads it). */
  value: (row: RegisterRow, system: UnitSystem, timeZone: string) => CellValue;
}

/**
 * Decimals kept in the export per kind and system: one more than the screen shows where
 * the stored value has it, so the spreadsheet loses no recorded precision that matters
 * (°C and s are stored to 0.1, MPa to 0.0001, mm to 0.01).
 */
const EXPORT_DECIMALS: Record<QuantityKind, Record<UnitSystem, number>> = {
  'length-mm': { si: 2, us: 3 },
  'length-m': { si: 2, us: 1 },
  pressure: { si: 4, us: 1 },
  temperature: { si: 1, us: 1 },
  area: { si: 0, us: 2 },
  duration: { si: 1, us: 1 },
};

export function exportDecimals(kind: QuantityKind, system: UnitSystem): number {
  return EXPORT_DECIMALS[kind][system];
}

const quantity = (value: number | null, kind: QuantityKind, system: UnitSystem): number | null =>
  value === null || value === undefined ? null : roundTo(toDisplay(value, kind, system), exportDecimals(kind, system));

const check = (value: boolean | null): string | null => (value === null || value === undefined ? null : value ? 'yes' : 'no');

const SERIES_LABEL: Record<string, string> = { ips: 'IPS', cts: 'CTS', metric: 'mm' };

/** "2 IPS SDR 11", or "60.3 mm SDR 11" when side A is not a coil with a nominal size. */
export function pipeSizeText(row: Pick<RegisterRow, 'nominalSize' | 'series' | 'outsideDiameterMm' | 'sdr'>, system: UnitSystem): string {
  const sdr = `SDR ${roundTo(row.sdr, 2)}`;
  if (row.nominalSize && row.series) return `${row.nominalSize} ${SERIES_LABEL[row.series] ?? row.series.toUpperCase()} ${sdr}`;
  const od = roundTo(toDisplay(row.outsideDiameterMm, 'length-mm', system), displayDecimals('length-mm', system));
  return `${od} ${unitLabel('length-mm', system)} OD ${sdr}`;
}

export function placeText(row: Pick<RegisterRow, 'station' | 'latitude' | 'longitude'>): string | null {
  const coords = row.latitude !== null && row.longitude !== null ? `${row.latitude.toFixed(5)}, ${row.longitude.toFixed(5)}` : null;
  if (row.station && coords) return `${row.station} (${coords})`;
  return row.station ?? coords;
}

export const KIND_LABELS: Record<RegisterRow['kind'], string> = {
  'coil-to-coil': 'Coil to coil',
  'tie-in': 'Tie-in',
  fitting: 'Fitting',
};

/** A recorded value's column (domain/joints/values): quantities converted, checks as yes/no. */
function valueColumn(d: QuantityValueDefinition | CheckValueDefinition): RegisterColumn {
  const read = (row: RegisterRow) => (row as unknown as Record<string, number | boolean | null>)[d.key] ?? null;
  const base = { key: d.register.key, title: d.label, inGrid: d.register.inGrid, width: d.register.width };
  if (d.type === 'check') return { ...base, type: 'text', value: (r) => check(read(r) as boolean | null) };
  const sort = SORT_OF_VALUE[d.key];
  return { ...base, type: 'quantity', quantity: d.quantity, ...(sort ? { sort } : {}), value: (r, s) => quantity(read(r) as number | null, d.quantity, s) };
}

/** The server-side sorts on a recorded value (database/queries/register.ts SORT_KEYS). */
const SORT_OF_VALUE: Partial<Record<string, RegisterSort>> = { heaterTemperatureC: 'heaterTemperature' };

/** "Heater plate HP-31's check is overdue — cleared by Dana Hollis: spare plate checked on site". */
export function overrideUseText(use: RegisterOverrideUse): string {
  return `${use.message} — cleared by ${use.grantedByName}: ${use.reason}`;
}

/**
 * The audit trail of a joint, for the export (not in the grid): the decision in words, who
 * decided and when, the note, the joints it remakes or was remade by (as Beadline prints a
 * joint: "WO-24152 joint 10"), the clearances it was recorded under, the procedure's code
 * and version.
 */
const AUDIT_COLUMNS: readonly RegisterColumn[] = [
  { key: 'decision', title: 'Decision', type: 'text', inGrid: false, width: 12, value: (r) => (r.decisionState ? REVIEW_STATE_LABELS[r.decisionState] : null) },
  { key: 'inspector', title: 'Inspector', type: 'text', inGrid: false, width: 18, value: (r) => r.decidedByName },
  { key: 'decidedAt', title: 'Decided at (UTC)', type: 'date', inGrid: false, width: 18, value: (r) => r.decidedAt },
  { key: 'decisionNote', title: 'Decision note', type: 'text', inGrid: false, width: 36, value: (r) => r.decisionNote },
  { key: 'replaces', title: 'Replaces', type: 'text', inGrid: false, width: 18, value: (r) => (r.replaces ? formatJointReference(r.replaces) : null) },
  { key: 'replacedBy', title: 'Replaced by', type: 'text', inGrid: false, width: 18, value: (r) => (r.replacedBy ? formatJointReference(r.replacedBy) : null) },
  { key: 'overrides', title: 'Overrides used', type: 'text', inGrid: false, width: 48, value: (r) => (r.overridesUsed.length ? r.overridesUsed.map(overrideUseText).join('; ') : null) },
  { key: 'procedureCode', title: 'Procedure code', type: 'text', inGrid: false, width: 14, value: (r) => r.procedureCode },
  { key: 'procedureVersion', title: 'Procedure version', type: 'integer', inGrid: false, width: 9, value: (r) => r.procedureVersionNo },
];

export const REGISTER_COLUMNS: readonly RegisterColumn[] = [
  { key: 'jointNo', title: 'Joint', type: 'integer', sort: 'number', inGrid: true, width: 8, value: (r) => r.jointNo },
  { key: 'job', title: 'Job', type: 'text', inGrid: true, width: 12, value: (r) => r.jobCode },
  // Time columns: the local time in the organisation's zone with its offset (grid and export), then the UTC instant (export).
  { key: 'madeAtLocal', title: 'Made at', type: 'local-time', sort: 'madeAt', inGrid: true, width: 26, value: (r, _s, zone) => formatZoned(r.madeAt, zone, 'second') },
  { key: 'madeAt', title: 'Made at (UTC)', type: 'date', inGrid: false, width: 20, value: (r) => r.madeAt },
  { key: 'place', title: 'Place', type: 'text', inGrid: true, width: 24, value: (r) => placeText(r) },
  { key: 'station', title: 'Station', type: 'text', inGrid: false, width: 14, value: (r) => r.station },
  { key: 'latitude', title: 'Latitude', type: 'number', inGrid: false, width: 11, value: (r) => r.latitude },
  { key: 'longitude', title: 'Longitude', type: 'number', inGrid: false, width: 11, value: (r) => r.longitude },
  { key: 'kind', title: 'Kind', type: 'text', inGrid: true, width: 12, value: (r) => KIND_LABELS[r.kind] ?? r.kind },
  { key: 'fuser', title: 'Fuser', type: 'text', inGrid: true, width: 18, value: (r) => r.fuserName },
  { key: 'machine', title: 'Machine', type: 'text', inGrid: true, width: 10, value: (r) => r.machineTag },
  { key: 'heater', title: 'Heater plate', type: 'text', inGrid: true, width: 10, value: (r) => r.heaterTag },
  { key: 'coilA', title: 'Coil A', type: 'text', inGrid: true, width: 11, value: (r) => r.coilACode },
  { key: 'lotA', title: 'Lot A', type: 'text', inGrid: true, width: 10, value: (r) => r.coilALot },
  { key: 'coilB', title: 'Coil B or side B', type: 'text', inGrid: true, width: 16, value: (r) => r.coilBCode ?? r.componentBText },
  { key: 'lotB', title: 'Lot B', type: 'text', inGrid: true, width: 10, value: (r) => r.coilBLot },
  { key: 'pipeSize', title: 'Pipe size', type: 'text', sort: 'pipeSize', inGrid: true, width: 14, value: (r, s) => pipeSizeText(r, s) },
  { key: 'outsideDiameter', title: 'Outside diameter', type: 'quantity', quantity: 'length-mm', inGrid: false, width: 10, value: (r, s) => quantity(r.outsideDiameterMm, 'length-mm', s) },
  { key: 'sdr', title: 'SDR', type: 'number', inGrid: false, width: 6, value: (r) => r.sdr },
  { key: 'procedure', title: 'Procedure', type: 'text', inGrid: true, width: 14, value: (r) => `${r.procedureCode} v${r.procedureVersionNo}` },
  { key: 'outcome', title: 'Outcome', type: 'text', inGrid: true, width: 13, value: (r) => OUTCOME_LABELS[r.outcome] ?? r.outcome },
  { key: 'reviewState', title: 'Review state', type: 'text', inGrid: true, width: 13, value: (r) => REVIEW_STATE_LABELS[r.reviewState] ?? r.reviewState },
  {
    key: 'findings',
    title: 'Findings',
    type: 'text',
    inGrid: true,
    width: 22,
    value: (r) => (r.findingParameters.length ? r.findingParameters.map((p) => FINDING_PARAMETER_LABELS[p] ?? p).join(', ') : null),
  },
  ...QUANTITY_VALUES.map(valueColumn),
  { key: 'ambient', title: 'Ambient temperature', type: 'quantity', quantity: 'temperature', inGrid: true, width: 8, value: (r, s) => quantity(r.ambientC, 'temperature', s) },
  ...CHECK_VALUES.map(valueColumn),
  ...AUDIT_COLUMNS,
];

/** The column's unit in the reader's system, or null (text, dates, plain numbers). */
export function columnUnit(column: RegisterColumn, system: UnitSystem): string | null {
  return column.quantity ? unitLabel(column.quantity, system) : null;
}

/** Header with the unit, e.g. "Heater temperature (°F)"; the local-time column names the zone, "Made at (America/Chicago)". */
export function columnHeader(column: RegisterColumn, system: UnitSystem, timeZone: string, context: 'grid' | 'export' = 'grid'): string {
  // In a file the UTC instant column sits beside the local one, so a UTC organisation's
  // local column says "(local, UTC)"; the grid has no UTC column.
  if (column.type === 'local-time') return context === 'export' ? localTimeHeader(column.title, timeZone) : `${column.title} (${timeZone})`;
  const unit = columnUnit(column, system);
  return unit ? `${column.title} (${unit})` : column.title;
}

/** Spreadsheet number format for a column (dates as dates, quantities to their decimals). */
export function columnNumberFormat(column: RegisterColumn, system: UnitSystem): string | undefined {
  if (column.type === 'date') return 'yyyy-mm-dd hh:mm:ss';
  if (column.type === 'integer') return '0';
  if (column.type === 'quantity' && column.quantity) {
    const d = exportDecimals(column.quantity, system);
    return d > 0 ? `0.${'0'.repeat(d)}` : '0';
  }
  return undefined;
}

// ---- Time formatting (organisation time zone; domain/dates/zone) ----

/** Date as "2026-11-02 14:05:09" in UTC (the UTC column; see its header). */
export function formatUtc(date: Date, withSeconds = false): string {
  return formatUtcInstant(date, withSeconds ? 'second' : 'minute');
}

/** A cell as text for the screen: quantities to the screen's decimals, local times to the minute with their offset. */
export function formatCell(column: RegisterColumn, row: RegisterRow, system: UnitSystem, timeZone: string): string {
  if (column.type === 'local-time') return formatZoned(row.madeAt, timeZone, 'minute');
  const value = column.value(row, system, timeZone);
  if (value === null || value === undefined) return '';
  if (value instanceof Date) return formatUtc(value);
  if (typeof value === 'number' && column.type === 'quantity' && column.quantity) {
    return roundTo(value, displayDecimals(column.quantity, system)).toFixed(displayDecimals(column.quantity, system));
  }
  return String(value);
}
