// Edit a heater plate under optimistic locking, with the audit entry.
import "server-only";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findHeaterWithLastCheck, updateHeater } from "@/database/queries/equipment";
import type { UpdateHeaterInput } from "@/domain/equipment/schemas";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/edit-conflict";
import { inAssetTransaction } from "./equipment-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function editHeater(input: UpdateHeaterInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  return inAssetTransaction(input.assetTag, async (trx) => {
    const before = await findHeaterWithLastCheck({ id: input.id, forUpdate: true }, trx);
    if (!before) throw new AppError("not-found", "That heater plate does not exist.");
    if (!(await updateHeater(input, trx))) throw new AppError("conflict", CONFLICT_MESSAGE(`Heater plate ${before.assetTag}`));
    await insertAuditEntry(
      {
        actorUserId: ctx.user.id,
        action: before.isActive && !input.isActive ? "heater-retired" : "heater-updated",
        entityType: "heater-plate",
        entityId: input.id,
        details: { before: { assetTag: before.assetTag, checkIntervalDays: before.checkIntervalDays, isActive: before.isActive }, after: { assetTag: input.assetTag, checkIntervalDays: input.checkIntervalDays, isActive: input.isActive } },
        requestId: ctx.requestId,
      },
      trx,
    );
    return { id: input.id, version: input.version + 1 };
  });
}
