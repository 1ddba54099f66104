// GET /api/v1/coils/:id → the coil with its history (receipt, moves, pulls).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { findCoilById, listCoilEvents } from "@/database/queries/coils";
import { z } from "zod";

export const dynamic = "force-dynamic";

export const GET = defineRoute<z.ZodObject, { id: string }>({ audience: "signed-in" }, async (_input, { params }) => {
  const id = z.coerce.number().int().positive().safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such coil.");
  const coil = await findCoilById({ id: id.data });
  if (!coil) return errorResponse("not-found", `Coil ${id.data} is not on file.`);
  return Response.json({ coil, events: await listCoilEvents({ coilId: coil.id }) });
});
