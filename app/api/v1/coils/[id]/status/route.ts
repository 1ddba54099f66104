// POST /api/v1/coils/:id/status { version, to, reason?, crewId?, jobId? } — move a coil
// (clerk, admin): 422 with per-field messages for a move the coil rules refuse, 409 when
// the version is stale.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { moveCoil } from "@/app/_server/coils/move-coil";
import { moveCoilSchema } from "@/domain/coil-life/schemas";
import { z } from "zod";

export const dynamic = "force-dynamic";

const bodySchema = moveCoilSchema.omit({ coilId: true });

export const POST = defineRoute<typeof bodySchema, { id: string }>({ audience: ["clerk", "admin"], schema: bodySchema, input: "json" }, async (input, { params, user, requestId }) => {
  const id = z.coerce.number().int().positive().safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such coil.");
  const moved = await moveCoil({ ...input, coilId: id.data }, { user, requestId });
  return Response.json({ coil: moved });
});
