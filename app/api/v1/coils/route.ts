// /api/v1/coils
//   GET ?code=<coil id | F2897 code | label URL>  → the coil it names (any signed-in person:
//        the trench scans labels); without code → the list (clerk, admin; ?status=&q=).
//   POST (clerk, admin) → receive a coil (same schema as the Receive form).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { receiveCoil } from "@/app/_server/coils/receive-coil";
import { findCoilByCodeOrTrace, listCoils } from "@/database/queries/coils";
import { COIL_STATUSES } from "@/domain/coils/statuses";
import { RECEIVE_COIL_LABELS, receiveCoilSchema } from "@/domain/coils/schemas";
import { can } from "@/domain/roles";
import { optionalNumber } from "@/domain/form-fields";
import { z } from "zod";

export const dynamic = "force-dynamic";

const lookupSchema = z.object({
  code: z.string().trim().max(300, { error: "Code is too long." }).optional(),
  status: z.enum(["all", ...COIL_STATUSES], { error: "Unknown status." }).default("all"),
  q: z.string().trim().max(100).optional(),
  limit: optionalNumber("limit", { integer: true, min: 1, max: 1000 }).transform((v) => v ?? 200),
});

export const GET = defineRoute({ permission: "signed-in", schema: lookupSchema, input: "query" }, async (input, { user }) => {
  if (input.code) {
    const coil = await findCoilByCodeOrTrace({ code: input.code, preferCrewId: user.crewId });
    if (!coil) return errorResponse("not-found", `No coil matches "${input.code}".`, { code: [`No coil matches "${input.code}".`] });
    return Response.json({ coil });
  }
  if (!can(user, "listCoils")) return errorResponse("forbidden", "Your role does not allow listing coils; look one up by its code.");
  const coils = await listCoils({ status: input.status, search: input.q, limit: input.limit });
  return Response.json({ coils });
});

export const POST = defineRoute({ permission: "receiveCoils", schema: receiveCoilSchema, input: "json", labels: RECEIVE_COIL_LABELS }, async (input, ctx) => {
  const received = await receiveCoil(input, ctx);
  return Response.json({ coil: received }, { status: 201 });
});
