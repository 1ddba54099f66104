// Label rendering at the edge: the QR module matrix from the qrcode package, the SVG from
// domain/labels, and PNG through sharp (librsvg) at print resolution. Used by the print
// page and by the single-label downloads (app/api/v1/labels/**).
import "server-only";
import QRCode from "qrcode";
import type { Coil } from "@/database/queries/coils";
import { coilLabelText, coilLabelUrl, jointLabelText, jointLabelUrl, renderLabelSvg, type QrMatrix } from "@/domain/labels/label";
import { findLabelStock, labelPaperFor, LABEL_STOCKS, type LabelStock } from "@/domain/labels/sheets";
import type { UnitSystem } from "@/domain/units/format";
import { formatInstant } from "@/components/ui/display-format";

/** QR with error correction level M (about 15 % of the symbol may be damaged and still read). */
export function qrMatrix(text: string): QrMatrix {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  return { size: qr.modules.size, data: qr.modules.data };
}

/** The stock named, or the first one sold on the organisation's label paper (domain/labels labelPaperFor). */
export function stockOrDefault(id: string | null | undefined, system: UnitSystem): LabelStock {
  const paper = labelPaperFor({ unitSystem: system });
  return (id ? findLabelStock(id) : undefined) ?? LABEL_STOCKS.find((stock) => stock.usualSheet === paper) ?? (LABEL_STOCKS[0] as LabelStock);
}

type CoilForLabel = Pick<Coil, "coilCode" | "series" | "nominalSize" | "sdr" | "material" | "manufacturer" | "lot" | "lengthM" | "traceCode" | "status">;

export function coilLabelSvg(coil: CoilForLabel, { baseUrl, stock, system, standalone = true }: { baseUrl: string; stock: LabelStock; system: UnitSystem; standalone?: boolean }): { svg: string; url: string; name: string } {
  const url = coilLabelUrl(baseUrl, coil.coilCode);
  const text = coilLabelText(coil, system);
  return { svg: renderLabelSvg({ widthMm: stock.widthMm, heightMm: stock.heightMm, qr: qrMatrix(url), text, url, standalone }), url, name: text.name };
}

export function jointLabelSvg(
  joint: { id: number; jointNo: number; jobCode: string; jobName: string | null; madeAt: Date; station: string | null },
  { baseUrl, stock, timeZone, standalone = true }: { baseUrl: string; stock: LabelStock; timeZone: string; standalone?: boolean },
): { svg: string; url: string; name: string } {
  const url = jointLabelUrl(baseUrl, joint.id);
  const text = jointLabelText({ id: joint.id, jointNo: joint.jointNo, jobCode: joint.jobCode, jobName: joint.jobName, madeOn: formatInstant(joint.madeAt, "date", timeZone), station: joint.station });
  return { svg: renderLabelSvg({ widthMm: stock.widthMm, heightMm: stock.heightMm, qr: qrMatrix(url), text, url, standalone }), url, name: text.name };
}

/** SVG → PNG at `dpi` (default 300, a label printer's resolution). */
export async function svgToPng(svg: string, dpi = 300): Promise<Buffer> {
  const { default: sharp } = await import("sharp");
  return sharp(Buffer.from(svg), { density: dpi }).flatten({ background: "#ffffff" }).png().toBuffer();
}
