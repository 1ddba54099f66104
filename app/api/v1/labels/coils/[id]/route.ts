// GET /api/v1/labels/coils/:id?format=png|svg&stock=<label stock>&dpi=300 — one coil label
// as a file; stamps the coil's label_printed_at.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { publicBaseUrl } from "@/app/(signed-in)/labels/_lib/base-url";
import { coilLabelSvg, stockOrDefault, svgToPng } from "@/app/(signed-in)/labels/_lib/render";
import { markLabelsPrinted } from "@/app/(signed-in)/coils/_lib/use-cases";
import { findCoilById } from "@/database/queries/coils";
import { idParams } from "@/app/_lib/params";
import { labelDownloadSchema, labelFile } from "../../_lib";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "printLabels", params: idParams("No such coil."), schema: labelDownloadSchema, input: "query" }, async (input, { params: { id }, request, user, requestId }) => {
  const coil = await findCoilById({ id });
  if (!coil) return errorResponse("not-found", `Coil ${id} is not on file.`);
  const label = coilLabelSvg(coil, { baseUrl: publicBaseUrl(request.headers, new URL(request.url).origin), stock: stockOrDefault(input.stock, user.unitSystem), system: user.unitSystem });
  const body = input.format === "png" ? await svgToPng(label.svg, input.dpi) : label.svg;
  await markLabelsPrinted([coil.id], input.format, { user, requestId });
  return labelFile(body, input.format, label.name);
});
