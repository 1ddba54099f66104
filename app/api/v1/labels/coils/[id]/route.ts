// GET /api/v1/labels/coils/:id?format=png|svg&stock=<label stock>&dpi=300 — one coil label
// as a file; stamps the coil's label_printed_at.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { publicBaseUrl } from "@/app/_server/labels/base-url";
import { coilLabelSvg, stockOrDefault, svgToPng } from "@/app/_server/labels/render";
import { markLabelsPrinted } from "@/app/_server/coils/mark-labels-printed";
import { findCoilById } from "@/database/queries/coils";
import { idParam, labelDownloadSchema, labelFile } from "@/app/_server/labels/download";

export const dynamic = "force-dynamic";

export const GET = defineRoute<typeof labelDownloadSchema, { id: string }>({ audience: ["clerk", "admin"], schema: labelDownloadSchema, input: "query" }, async (input, { params, request, user, requestId }) => {
  const id = idParam.safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such coil.");
  const coil = await findCoilById({ id: id.data });
  if (!coil) return errorResponse("not-found", `Coil ${id.data} is not on file.`);
  const label = coilLabelSvg(coil, { baseUrl: publicBaseUrl(request.headers, new URL(request.url).origin), stock: stockOrDefault(input.stock, user.unitSystem), system: user.unitSystem });
  const body = input.format === "png" ? await svgToPng(label.svg, input.dpi) : label.svg;
  await markLabelsPrinted([coil.id], input.format, { user, requestId });
  return labelFile(body, input.format, label.name);
});
