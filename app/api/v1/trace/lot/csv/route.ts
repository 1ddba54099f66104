// GET /api/v1/trace/lot/csv?… (same search as /api/v1/trace/lot) → CSV of the joints made with the lot.
import { defineRoute } from "@/app/_lib/guard";
import { exportLotTrace } from "@/app/_server/trace/lot-export";
import { traceSearchSchema } from "@/domain/coils/schemas";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "traceLots", schema: traceSearchSchema, input: "query", recordsOnGet: true }, async (input, { user, requestId }) => {
  const { body, name } = await exportLotTrace(input, { user, requestId, format: "csv" });
  return new Response(new Uint8Array(body), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "no-store",
    },
  });
});
