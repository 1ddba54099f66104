// GET /api/v1/trace/joints/:id → joint → origins: both components with lots and receipt
// inspections, machine and piston area, heater plate and its last check before the joint,
// the fuser and their qualification on that date, the procedure version.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { traceJointOrigins } from "@/app/_server/trace/origins";
import { z } from "zod";

export const dynamic = "force-dynamic";

export const GET = defineRoute<z.ZodObject, { id: string }>({ audience: ["clerk", "inspector", "admin"] }, async (_input, { params }) => {
  const id = z.coerce.number().int().positive().safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such joint.");
  const origins = await traceJointOrigins(id.data);
  if (!origins) return errorResponse("not-found", `Joint ${id.data} is not on file.`);
  return Response.json(origins);
});
