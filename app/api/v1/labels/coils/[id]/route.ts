// GET /api/v1/labels/coils/:id?format=png|svg&stock=<label stock>&dpi=300 — one coil label
// as a file. A GET only renders: printing is recorded by the Labels screen's and the coil
// page's server action (markLabelsPrintedAction), never by fetching a label, so a link on
// another site cannot stamp a coil as printed.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { publicBaseUrl } from "@/app/_server/labels/base-url";
import { coilLabelSvg, stockOrDefault, svgToPng } from "@/app/_server/labels/render";
import { findCoilById } from "@/database/queries/coils";
import { idParams } from "@/app/_lib/params";
import { labelDownloadSchema, labelFile } from "@/app/_server/labels/download";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "printLabels", params: idParams("No such coil.", "int"), schema: labelDownloadSchema, input: "query" }, async (input, { params: { id }, request, user }) => {
  const coil = await findCoilById({ id });
  if (!coil) return errorResponse("not-found", `Coil ${id} is not on file.`);
  const label = coilLabelSvg(coil, { baseUrl: publicBaseUrl(request.headers, new URL(request.url).origin), stock: stockOrDefault(input.stock, user.unitSystem), system: user.unitSystem });
  const body = input.format === "png" ? await svgToPng(label.svg, input.dpi) : label.svg;
  return labelFile(body, input.format, label.name);
});
