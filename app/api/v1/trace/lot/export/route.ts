// GET /api/v1/trace/lot/export?… (same search as /api/v1/trace/lot) → .xlsx of the joints and coils.
import { defineRoute } from "@/app/_lib/guard";
import { traceWorkbook } from "@/app/_server/trace/lot-export";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { traceLot } from "@/database/queries/trace";
import { traceSearchSchema } from "@/domain/coil-life/schemas";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ audience: ["clerk", "inspector", "admin"], schema: traceSearchSchema, input: "query" }, async (input, { user, requestId }) => {
  const trace = await traceLot(input);
  const body = await traceWorkbook(trace);
  await insertAuditEntry({ actorUserId: user.id, action: "trace-exported", entityType: "lot", entityId: trace.lots.map((l) => l.lot).join(",").slice(0, 64) || null, details: { search: input, joints: trace.joints.length, coils: trace.coils.length }, requestId });
  const name = `trace-${(trace.lots.map((l) => l.lot).join("-") || "none").replace(/[^A-Za-z0-9-]+/g, "-").slice(0, 60)}.xlsx`;
  return new Response(new Uint8Array(body), {
    headers: {
      "content-type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "no-store",
    },
  });
});
