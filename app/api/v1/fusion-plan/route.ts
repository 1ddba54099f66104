// /api/v1/fusion-plan — the pressure plan for a pipe (a coil, or OD + SDR) on a machine
// under a job's current procedure version, with the measured drag pressure.
import { fusionPlanFor } from "@/app/_server/fusion/fusion-plan";
import { defineRoute } from "@/app/_lib/guard";
import { fusionPlanQuerySchema } from "@/domain/joints/schemas";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "signed-in", schema: fusionPlanQuerySchema, input: "query" }, async (q, { user }) => Response.json(await fusionPlanFor(q, user)));
