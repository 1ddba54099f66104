// GET /api/v1/exports/register?format=xlsx|csv&<register filter and sort>: the rows of
// that Register view as a spreadsheet or CSV, streamed as it is written. Clerks,
// inspectors and admins; audited (who, filter, rows).
import { exportRegister } from "@/app/_server/register/export-register";
import { defineRoute } from "@/app/_lib/guard";
import { registerExportQuerySchema } from "@/domain/register";

export const dynamic = "force-dynamic";
export const runtime = "nodejs";

export const GET = defineRoute({ permission: "exportRegister", schema: registerExportQuerySchema, input: "query", recordsOnGet: true }, async (query, { user, requestId }) =>
  exportRegister({ query, user, requestId }),
);
