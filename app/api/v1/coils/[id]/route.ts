// GET /api/v1/coils/:id → the coil with its history (receipt, moves, pulls).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { findCoilById, listCoilEvents } from "@/database/queries/coils";
import { idParams } from "@/app/_lib/params";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "signed-in", params: idParams("No such coil.", "int") }, async (_input, { params: { id } }) => {
  const coil = await findCoilById({ id });
  if (!coil) return errorResponse("not-found", `Coil ${id} is not on file.`);
  return Response.json({ coil, events: await listCoilEvents({ coilId: coil.id }) });
});
