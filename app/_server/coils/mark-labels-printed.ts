// Mark coil labels printed (or downloaded): one transaction with the audit entry.
import "server-only";
import { db } from "@/database/client";
import { markCoilLabelsPrinted } from "@/database/queries/coils";
import type { Actor } from "./receive-coil";

/** Stamps label_printed_at on the coils whose labels were printed or downloaded. */
export async function markLabelsPrinted(coilIds: number[], how: "print" | "png" | "svg", { user, requestId }: Actor): Promise<number> {
  return db().transaction((trx) => markCoilLabelsPrinted({ coilIds, userId: user.id, requestId, how }, trx));
}
