// POST /api/v1/traces — multipart form with `jointId` and `file` (a pressure-trace CSV:
// `seconds,gauge_pressure_mpa[,heater_temperature_c]` or `gauge_pressure_psi`). 422 with
// the failing line numbers when the file cannot be read.
import { readFormLimited } from "@/app/_lib/body";
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { attachTraceSchema, MAX_TRACE_FILE_BYTES } from "@/domain/review/schemas";
import { describeFieldErrors, fieldErrorsFromIssues } from "@/domain/result";
import { attachTrace } from "@/app/_server/review/attach-trace";

/** Multipart framing around the file (boundaries, part headers, the jointId field). */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

export const POST = defineRoute({ permission: "attachTrace", input: "raw" }, async (_input, { user, requestId, request }) => {
  // Counted while it arrives: refused (413) the moment it passes the trace's limit plus the form's framing.
  const form = await readFormLimited(request, { max: MAX_TRACE_FILE_BYTES + MULTIPART_OVERHEAD_BYTES, what: "trace file", field: "file", limitText: `${MAX_TRACE_FILE_BYTES / 1e6} MB` }, { message: "Send the trace as a multipart form with the fields jointId and file.", fields: { file: ["Choose a CSV file"] } });
  const parsed = attachTraceSchema.safeParse({ jointId: form.get("jointId") });
  const file = form.get("file");
  const fields = parsed.success ? {} : fieldErrorsFromIssues(parsed.error.issues);
  if (!(file instanceof Blob)) fields.file = ["Choose a CSV file"];
  if (!parsed.success || !(file instanceof Blob)) return errorResponse("invalid", describeFieldErrors(fields), fields);
  const bytes = new Uint8Array(await file.arrayBuffer());
  const name = file instanceof File ? file.name : null;
  const result = await attachTrace({ jointId: parsed.data.jointId, fileName: name, bytes }, { user, requestId });
  return Response.json(result, { status: 201 });
});
