// GET /api/v1/exports/register/progress?id=<export id>: rows written so far of one of the
// caller's own register exports (the id comes in the export's x-beadline-export-id
// header), so the Register screen can show rows of the total while the file streams.
import { z } from "zod";
import { exportProgress } from "@/app/_server/register/export-register";
import { defineRoute, errorResponse } from "@/app/_lib/guard";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

const schema = z.object({ id: z.coerce.number({ error: "The export id must be a whole number." }).int({ error: "The export id must be a whole number." }).positive({ error: "The export id must be a whole number." }) });

export const GET = defineRoute({ permission: "exportRegister", schema, input: "query" }, async ({ id }, { user }) => {
  const progress = await exportProgress({ exportId: id, user });
  if (!progress) return errorResponse("not-found", `Export ${id} is not one of yours.`);
  return Response.json(progress, { headers: { "cache-control": "no-store" } });
});
