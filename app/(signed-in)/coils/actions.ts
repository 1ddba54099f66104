"use server";
// Coils screen actions: receive a coil, move it to another status. Session, role and
// input are checked by the wrapper; the use cases live in _lib/use-cases.ts.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { RECEIVE_COIL_LABELS, moveCoilSchema, receiveCoilSchema } from "@/domain/coils/schemas";
import { moveCoil } from "@/app/_server/coils/move-coil";
import { receiveCoil } from "@/app/_server/coils/receive-coil";

export const receiveCoilAction = defineAction({ permission: "receiveCoils", schema: receiveCoilSchema, labels: RECEIVE_COIL_LABELS }, async (input, ctx) => {
  const received = await receiveCoil(input, ctx);
  revalidatePath("/coils");
  return received;
});

export const moveCoilAction = defineAction({ permission: "moveCoils", schema: moveCoilSchema }, async (input, ctx) => {
  const moved = await moveCoil(input, ctx);
  revalidatePath(`/coils/${encodeURIComponent(moved.coilCode)}`);
  revalidatePath("/coils");
  return moved;
});
