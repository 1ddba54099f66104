// Edit a fusion machine under optimistic locking, with the audit entry.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findMachineById, updateMachine } from "@/database/queries/equipment";
import type { UpdateMachineInput } from "@/domain/equipment/schemas";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/edit-conflict";
import { inAssetTransaction, machineFields } from "./equipment-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function editMachine(input: UpdateMachineInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  const edited = await inAssetTransaction(input.assetTag, async (trx) => {
    const before = await findMachineById({ id: input.id, forUpdate: true }, trx);
    if (!before) throw new AppError("not-found", "That machine does not exist.");
    const fields = machineFields(input);
    if (!(await updateMachine({ ...fields, id: input.id, version: input.version, isActive: input.isActive }, trx))) {
      throw new AppError("conflict", CONFLICT_MESSAGE(`Machine ${before.assetTag}`));
    }
    await insertAuditEntry(
      {
        actorUserId: ctx.user.id,
        action: before.isActive && !input.isActive ? "machine-retired" : "machine-updated",
        entityType: "fusion-machine",
        entityId: input.id,
        details: { before: { pistonAreaMm2: before.pistonAreaMm2, isActive: before.isActive, assetTag: before.assetTag }, after: { ...fields, isActive: input.isActive }, enteredIn: input.units },
        requestId: ctx.requestId,
      },
      trx,
    );
    return { id: input.id, version: input.version + 1 };
  });
  registerFilterOptionsChanged();
  return edited;
}
