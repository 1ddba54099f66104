// GET /api/v1/trace/joints/:id → joint → origins: both components with lots and receipt
// inspections, machine and piston area, heater plate and its last check before the joint,
// the fuser and their qualification on that date, the procedure version.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { traceJointOrigins } from "@/app/_server/trace/origins";
import { idParams } from "@/app/_lib/params";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "traceLots", params: idParams("No such joint.") }, async (_input, { params: { id } }) => {
  const origins = await traceJointOrigins(id);
  if (!origins) return errorResponse("not-found", `Joint ${id} is not on file.`);
  return Response.json(origins);
});
