// GET /api/v1/review/joints/:id/trace — the newest pressure trace of a joint for the chart:
// points (s, MPa), the phases read, and the plan's windows on the trace's time axis.
import { z } from "zod";
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { findLatestJointTrace, findReviewItem } from "@/database/queries/reviews";
import { planWindowsOnTrace } from "@/domain/review/trace-check";

export const dynamic = "force-dynamic";
const idSchema = z.coerce.number().int().positive();

export const GET = defineRoute<z.ZodTypeAny, { id: string }>({ audience: ["inspector", "fuser"], input: "none" }, async (_input, { user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such joint.");
  const item = await findReviewItem({ jointId: id.data });
  // A fuser sees the traces of their own joints; an inspector sees every joint's.
  if (!item || (!user.roles.includes("inspector") && item.fuserId !== user.id)) return errorResponse("not-found", "No such joint.");
  const trace = await findLatestJointTrace({ jointId: id.data });
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
