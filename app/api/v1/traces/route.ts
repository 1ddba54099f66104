// POST /api/v1/traces — multipart form with `jointId` and `file` (a pressure-trace CSV:
// `seconds,gauge_pressure_mpa[,heater_temperature_c]` or `gauge_pressure_psi`). 422 with
// the failing line numbers when the file cannot be read.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { attachTraceSchema, MAX_TRACE_FILE_BYTES } from "@/domain/review/schemas";
import { describeFieldErrors, fieldErrorsFromIssues } from "@/domain/result";
import { attachTrace } from "@/app/_server/review/attach-trace";

export const POST = defineRoute({ permission: "attachTrace", input: "raw" }, async (_input, { user, requestId, request }) => {
  const length = Number(request.headers.get("content-length") ?? 0);
  if (length > MAX_TRACE_FILE_BYTES + 100_000) return errorResponse("too-large", `The trace file is too large; at most ${MAX_TRACE_FILE_BYTES / 1e6} MB is accepted.`, { file: ["The file is too large"] });
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    return errorResponse("bad-request", "Send the trace as a multipart form with the fields jointId and file.", { file: ["Choose a CSV file"] });
  }
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
