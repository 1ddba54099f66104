// Lot → ground as a file: a workbook (exceljs) with one sheet of joints (place, job, date,
// fuser, outcome, review state, whether the joint is still in the ground and what replaced
// it, both components) and one of the lot's coils; or the joints alone as CSV (RFC 4180).
// Both files take their columns from traceJointColumns, so they say the same in words.
import "server-only";
import ExcelJS from "exceljs";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { traceLot, type TracedJoint } from "@/database/queries/trace";
import { csvCell } from "@/app/_server/register/export-files";
import { COIL_STATUS_LABELS } from "@/domain/coils/statuses";
import type { TraceSearch } from "@/domain/coils/schemas";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { formatJointReference } from "@/domain/joints/reference";
import { REVIEW_STATE_LABELS } from "@/domain/joints/review-states";
import { JOINT_KIND_LABELS } from "@/domain/joints/schemas";
import { describeSize } from "@/domain/labels/label";
import { formatZoned, localTimeHeader } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

type Trace = Awaited<ReturnType<typeof traceLot>>;
type Cell = string | number | Date | null;

/** Whether the joint is still in the ground: a cut-out joint is not. */
export function inTheGroundText(j: Pick<TracedJoint, "reviewState" | "replacedBy">): string {
  if (j.reviewState !== "cut-out") return "Yes";
  return j.replacedBy ? "No: cut out and replaced" : "No: cut out, not remade yet";
}

type TraceColumn = { header: string; key: string; width: number; numFmt?: string; value: (j: TracedJoint) => Cell };

/**
 * The joint sheet's (and the CSV's) columns, in order. `timeZone`: the organisation's IANA
 * zone, for the local made-at column (local time with its offset); the UTC one stays beside it.
 */
export function traceJointColumns(timeZone: string): readonly TraceColumn[] {
  const local: TraceColumn = { header: localTimeHeader("Made at", timeZone), key: "madeAtLocal", width: 26, value: (j) => formatZoned(j.madeAt, timeZone, "minute") };
  const at = TRACE_JOINT_COLUMNS.findIndex((c) => c.key === "madeAt");
  return [...TRACE_JOINT_COLUMNS.slice(0, at), local, ...TRACE_JOINT_COLUMNS.slice(at)];
}

const TRACE_JOINT_COLUMNS: readonly TraceColumn[] = [
  { header: "Job", key: "job", width: 12, value: (j) => j.jobCode },
  { header: "Job name", key: "jobName", width: 28, value: (j) => j.jobName },
  { header: "Joint", key: "jointNo", width: 8, value: (j) => j.jointNo },
  { header: "Joint reference", key: "reference", width: 20, value: (j) => formatJointReference(j) },
  { header: "Made at (UTC)", key: "madeAt", width: 20, numFmt: "yyyy-mm-dd hh:mm", value: (j) => j.madeAt },
  { header: "Station", key: "station", width: 12, value: (j) => j.station },
  { header: "Latitude", key: "latitude", width: 12, value: (j) => j.latitude },
  { header: "Longitude", key: "longitude", width: 12, value: (j) => j.longitude },
  { header: "Kind", key: "kind", width: 16, value: (j) => JOINT_KIND_LABELS[j.kind] },
  { header: "Fuser", key: "fuser", width: 22, value: (j) => j.fuserName },
  { header: "Outcome", key: "outcome", width: 14, value: (j) => OUTCOME_LABELS[j.outcome] },
  { header: "Review state", key: "review", width: 14, value: (j) => REVIEW_STATE_LABELS[j.reviewState] },
  { header: "In the ground", key: "inGround", width: 26, value: (j) => inTheGroundText(j) },
  { header: "Replaced by", key: "replacedBy", width: 20, value: (j) => (j.replacedBy ? formatJointReference(j.replacedBy) : null) },
  { header: "Remakes", key: "replaces", width: 20, value: (j) => (j.replaces ? formatJointReference(j.replaces) : null) },
  { header: "Component A", key: "a", width: 14, value: (j) => j.coilACode },
  { header: "Lot A", key: "lotA", width: 12, value: (j) => j.coilALot },
  { header: "Component B", key: "b", width: 22, value: (j) => j.coilBCode ?? j.componentBText },
  { header: "Lot B", key: "lotB", width: 12, value: (j) => j.coilBLot },
  { header: "Lot on side", key: "side", width: 10, value: (j) => (j.side === "both" ? "A and B" : j.side.toUpperCase()) },
  { header: "Joint id", key: "id", width: 10, value: (j) => j.id },
];

/** `timeZone`: the organisation's IANA zone, for the local made-at column (the UTC one stays beside it). */
export async function traceWorkbook(trace: Trace, timeZone = "UTC"): Promise<Buffer> {
  const columns = traceJointColumns(timeZone);
  const book = new ExcelJS.Workbook();
  book.creator = "Beadline";
  const joints = book.addWorksheet("Joints");
  joints.columns = columns.map((c) => ({ header: c.header, key: c.key, width: c.width, ...(c.numFmt ? { style: { numFmt: c.numFmt } } : {}) }));
  joints.getRow(1).font = { bold: true };
  for (const j of trace.joints) joints.addRow(columns.map((c) => c.value(j) ?? ""));
  joints.views = [{ state: "frozen", ySplit: 1 }];
  const coils = book.addWorksheet("Coils");
  coils.columns = [
    { header: "Coil id", key: "code", width: 12 },
    { header: "Pipe maker", key: "manufacturer", width: 24 },
    { header: "Lot", key: "lot", width: 12 },
    { header: "Traceability code", key: "trace", width: 20 },
    { header: "Material", key: "material", width: 10 },
    { header: "Size", key: "size", width: 18 },
    { header: "SDR", key: "sdr", width: 8 },
    { header: "Length (m)", key: "length", width: 12 },
    { header: "Left (m)", key: "left", width: 10 },
    { header: "Status", key: "status", width: 12 },
    { header: "Job", key: "job", width: 12 },
  ];
  coils.getRow(1).font = { bold: true };
  for (const c of trace.coils) {
    coils.addRow({ code: c.coilCode, manufacturer: c.manufacturer, lot: c.lot, trace: c.traceCode ?? "", material: c.material, size: describeSize(c), sdr: c.sdr, length: c.lengthM, left: c.remainingM, status: COIL_STATUS_LABELS[c.status], job: c.jobCode ?? "" });
  }
  const out = await book.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}

/** The joints as CSV: UTF-8 with a byte-order mark, CRLF line ends (RFC 4180), times ISO 8601 UTC. */
export function traceCsv(trace: Trace, timeZone = "UTC"): string {
  const columns = traceJointColumns(timeZone);
  const lines = [columns.map((c) => csvCell(c.header)).join(","), ...trace.joints.map((j) => columns.map((c) => csvCell(c.value(j))).join(","))];
  return `\uFEFF${lines.join("\r\n")}\r\n`;
}

export type TraceExportFormat = "xlsx" | "csv";

/**
 * The lot-trace export (GET /api/v1/trace/lot/export, …/csv): the same search as the lot
 * trace, as a workbook or CSV with its file name; the export is audited.
 */
export async function exportLotTrace(search: TraceSearch, { user, requestId, format = "xlsx" }: { user: { id: number }; requestId: string; format?: TraceExportFormat }): Promise<{ body: Buffer; name: string }> {
  const trace = await traceLot(search);
  const timeZone = await organisationTimeZone();
  const body = format === "csv" ? Buffer.from(traceCsv(trace, timeZone), "utf8") : await traceWorkbook(trace, timeZone);
  await insertAuditEntry({ actorUserId: user.id, action: "trace-exported", entityType: "lot", entityId: trace.lots.map((l) => l.lot).join(",").slice(0, 64) || null, details: { search, format, joints: trace.joints.length, coils: trace.coils.length }, requestId });
  const name = `trace-${(trace.lots.map((l) => l.lot).join("-") || "none").replace(/[^A-Za-z0-9-]+/g, "-").slice(0, 60)}.${format}`;
  return { body, name };
}
