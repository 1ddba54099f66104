// Lot → ground as a spreadsheet: one sheet of joints (place, job, date, fuser, outcome,
// both components) and one of the lot's coils. Built with exceljs.
import "server-only";
import ExcelJS from "exceljs";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { traceLot } from "@/database/queries/trace";
import type { TraceSearch } from "@/domain/coils/schemas";
import { formatZoned } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

type Trace = Awaited<ReturnType<typeof traceLot>>;

/** `timeZone`: the organisation's IANA zone, for the local made-at column (the UTC one stays beside it). */
export async function traceWorkbook(trace: Trace, timeZone: string): Promise<Buffer> {
  const book = new ExcelJS.Workbook();
  book.creator = "Beadline";
  const joints = book.addWorksheet("Joints");
  joints.columns = [
    { header: "Job", key: "job", width: 12 },
    { header: "Job name", key: "jobName", width: 28 },
    { header: "Joint", key: "jointNo", width: 8 },
    // Time columns: local time with its offset in the organisation's zone, then the UTC instant.
    { header: `Made at (${timeZone})`, key: "madeAtLocal", width: 26 },
    { header: "Made at (UTC)", key: "madeAt", width: 20 },
    { header: "Station", key: "station", width: 12 },
    { header: "Latitude", key: "latitude", width: 12 },
    { header: "Longitude", key: "longitude", width: 12 },
    { header: "Fuser", key: "fuser", width: 22 },
    { header: "Outcome", key: "outcome", width: 14 },
    { header: "Review", key: "review", width: 14 },
    { header: "Component A", key: "a", width: 14 },
    { header: "Lot A", key: "lotA", width: 12 },
    { header: "Component B", key: "b", width: 22 },
    { header: "Lot B", key: "lotB", width: 12 },
    { header: "Lot on side", key: "side", width: 10 },
    { header: "Joint id", key: "id", width: 10 },
  ];
  joints.getRow(1).font = { bold: true };
  for (const j of trace.joints) {
    joints.addRow({
      job: j.jobCode,
      jobName: j.jobName,
      jointNo: j.jointNo,
      madeAtLocal: formatZoned(j.madeAt, timeZone, "minute"),
      madeAt: j.madeAt,
      station: j.station ?? "",
      latitude: j.latitude ?? "",
      longitude: j.longitude ?? "",
      fuser: j.fuserName,
      outcome: j.outcome === "within-limits" ? "within limits" : "out of limits",
      review: j.reviewState ?? "",
      a: j.coilACode ?? "",
      lotA: j.coilALot ?? "",
      b: j.coilBCode ?? j.componentBText ?? "",
      lotB: j.coilBLot ?? "",
      side: j.side === "both" ? "A and B" : j.side.toUpperCase(),
      id: j.id,
    });
  }
  joints.getColumn("madeAt").numFmt = "yyyy-mm-dd hh:mm";
  joints.views = [{ state: "frozen", ySplit: 1 }];
  const coils = book.addWorksheet("Coils");
  coils.columns = [
    { header: "Coil id", key: "code", width: 12 },
    { header: "Pipe maker", key: "manufacturer", width: 24 },
    { header: "Lot", key: "lot", width: 12 },
    { header: "Traceability code", key: "trace", width: 20 },
    { header: "Material", key: "material", width: 10 },
    { header: "Size", key: "size", width: 10 },
    { header: "SDR", key: "sdr", width: 8 },
    { header: "Length (m)", key: "length", width: 12 },
    { header: "Left (m)", key: "left", width: 10 },
    { header: "Status", key: "status", width: 12 },
    { header: "Job", key: "job", width: 12 },
  ];
  coils.getRow(1).font = { bold: true };
  for (const c of trace.coils) {
    coils.addRow({ code: c.coilCode, manufacturer: c.manufacturer, lot: c.lot, trace: c.traceCode ?? "", material: c.material, size: `${c.nominalSize} ${c.series.toUpperCase()}`, sdr: c.sdr, length: c.lengthM, left: c.remainingM, status: c.status, job: c.jobCode ?? "" });
  }
  const out = await book.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}

/**
 * The lot-trace export (GET /api/v1/trace/lot/export): the same search as the lot trace,
 * as a workbook with its file name; the export is audited.
 */
export async function exportLotTrace(search: TraceSearch, { user, requestId }: { user: { id: number }; requestId: string }): Promise<{ body: Buffer; name: string }> {
  const trace = await traceLot(search);
  const body = await traceWorkbook(trace, await organisationTimeZone());
  await insertAuditEntry({ actorUserId: user.id, action: "trace-exported", entityType: "lot", entityId: trace.lots.map((l) => l.lot).join(",").slice(0, 64) || null, details: { search, joints: trace.joints.length, coils: trace.coils.length }, requestId });
  const name = `trace-${(trace.lots.map((l) => l.lot).join("-") || "none").replace(/[^A-Za-z0-9-]+/g, "-").slice(0, 60)}.xlsx`;
  return { body, name };
}
