// A person chooses SI or US customary units for screens, labels, exports and mail.
import "server-only";
import { updateUnitSystem } from "@/database/queries/users";
import type { UnitSystem } from "@/domain/units/format";

export async function setUnitSystem({ unitSystem }: { unitSystem: UnitSystem }, { user }: { user: { id: number } }): Promise<{ unitSystem: UnitSystem }> {
  await updateUnitSystem({ id: user.id, unitSystem });
  return { unitSystem };
}
