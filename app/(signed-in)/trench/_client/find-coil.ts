// Finding a scanned or typed coil among the coils the page brought to the device, so a
// scan works without signal. The choice is the domain's resolver (domain/coils/
// scanned-coil.ts), the same one the server applies when the joint is recorded, so the
// preview shows the coil that will be recorded.
import { resolveScannedCoil } from "@/domain/coils/scanned-coil";
import type { TrenchCoil } from "@/app/_server/trench/setup-types";

export function findLocalCoil(coils: TrenchCoil[], text: string, preferCrewId: number | null = null): TrenchCoil | null {
  return resolveScannedCoil(text, coils, { preferCrewId });
}
