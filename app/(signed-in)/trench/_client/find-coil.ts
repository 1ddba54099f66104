// Finding a scanned or typed coil among the coils the page brought to the device, so a
// scan works without signal. The text is read the way the coil labels are written
// (domain/coil-life readScannedCoilText): the label QR's /coils/<id> address, our coil
// id, or the manufacturer's F2897 code (case-sensitive).
import { readScannedCoilText } from "@/domain/coil-life/rules";
import type { TrenchCoil } from "./types";

export function findLocalCoil(coils: TrenchCoil[], text: string): TrenchCoil | null {
  const scanned = readScannedCoilText(text);
  if (scanned.kind === "empty") return null;
  const byCode = coils.find((c) => c.code.toLowerCase() === scanned.code.toLowerCase()) ?? null;
  if (scanned.kind === "trace-code") return coils.find((c) => c.traceCode === scanned.code) ?? byCode;
  return byCode;
}
