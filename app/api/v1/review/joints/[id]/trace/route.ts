// GET /api/v1/review/joints/:id/trace — the newest pressure trace of a joint for the chart:
// points (s, MPa), the phases read, and the plan's windows on the trace's time axis.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { findLatestJointTrace, findReviewItem } from "@/database/queries/reviews";
import { planWindowsOnTrace } from "@/domain/pressure-trace/check";
import { canViewTraceOf } from "@/domain/roles";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "viewTrace", params: idParams("No such joint."), input: "none" }, async (_input, { user, params: { id } }) => {
  const item = await findReviewItem({ jointId: id });
  // A fuser sees the traces of their own joints; an inspector sees every joint's.
  if (!item || !canViewTraceOf(user, item)) return errorResponse("not-found", "No such joint.");
  const trace = await findLatestJointTrace({ jointId: id });
  if (!trace) return errorResponse("not-found", "This joint has no pressure trace.");
  return Response.json(
    {
      points: trace.chart,
      phases: trace.reading.phases,
      reading: trace.reading,
      windows: item.plan ? planWindowsOnTrace(item.plan, trace.reading) : { bands: [], markers: [], zones: [] },
      pressureUnit: trace.pressureUnit,
    },
    { headers: { "cache-control": "no-store" } },
  );
});
