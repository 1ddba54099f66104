// GET /api/v1/labels/joints/:id?format=png|svg&stock=<label stock> — one joint tag (joint
// number, job, date, QR to /joints/:id) for the as-built package.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { publicBaseUrl } from "@/app/_server/labels/base-url";
import { jointLabelSvg, stockOrDefault, svgToPng } from "@/app/_server/labels/render";
import { findJointLabelFacts } from "@/database/queries/trace";
import { idParams } from "@/app/_lib/params";
import { labelDownloadSchema, labelFile } from "@/app/_server/labels/download";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "printJointLabels", params: idParams("No such joint."), schema: labelDownloadSchema, input: "query" }, async (input, { params: { id }, request, user }) => {
  const [joint] = await findJointLabelFacts({ jointIds: [id] });
  if (!joint) return errorResponse("not-found", `Joint ${id} is not on file.`);
  const label = jointLabelSvg(joint, { baseUrl: publicBaseUrl(request.headers, new URL(request.url).origin), stock: stockOrDefault(input.stock, user.unitSystem), timeZone: await organisationTimeZone() });
  const body = input.format === "png" ? await svgToPng(label.svg, input.dpi) : label.svg;
  return labelFile(body, input.format, label.name);
});
