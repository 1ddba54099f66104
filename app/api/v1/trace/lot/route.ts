// GET /api/v1/trace/lot?manufacturer=&lot=  |  ?code=<coil id | F2897 code | label URL>
// Lot → ground: the lot(s), every coil of them and every joint made with them on either side.
import { defineRoute } from "@/app/_lib/guard";
import { traceLot } from "@/database/queries/trace";
import { traceSearchSchema } from "@/domain/coils/schemas";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "traceLots", schema: traceSearchSchema, input: "query" }, async (input) => {
  const trace = await traceLot(input);
  return Response.json({
    matchedBy: trace.matchedBy,
    lots: trace.lots,
    coils: trace.coils,
    joints: trace.joints,
    jointCount: trace.joints.length,
    truncated: trace.truncated,
  });
});
