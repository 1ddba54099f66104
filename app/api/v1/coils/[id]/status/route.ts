// POST /api/v1/coils/:id/status { version, to, reason?, crewId?, jobId? } — move a coil
// (clerk, admin): 422 with per-field messages for a move the coil rules refuse, 409 when
// the version is stale.
import { defineRoute } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { moveCoil } from "@/app/_server/coils/move-coil";
import { moveCoilSchema } from "@/domain/coils/schemas";

export const dynamic = "force-dynamic";

const bodySchema = moveCoilSchema.omit({ coilId: true });

export const POST = defineRoute({ permission: "moveCoils", params: idParams("No such coil.", "int"), schema: bodySchema, input: "json" }, async (input, { params: { id }, user, requestId }) => {
  const moved = await moveCoil({ ...input, coilId: id }, { user, requestId });
  return Response.json({ coil: moved });
});
