// Receive a coil (with the receipt inspection and the F2897 cross-check): one transaction
// that writes the coil, its first event and the audit entry.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertCoil, type Coil } from "@/database/queries/coils";
import { judgeReceiptInspection, traceCodeDisagreements } from "@/domain/coils/life";
import { RECEIVE_COIL_LABELS, type ReceiveCoil } from "@/domain/coils/schemas";
import { AppError, describeFieldErrors } from "@/domain/result";

export type Actor = { user: { id: number }; requestId: string };

export type ReceivedCoil = { id: number; coilCode: string; status: Coil["status"]; inspectionPassed: boolean; reasons: string[]; traceCodeFlags: { field: string; message: string }[] };

/**
 * Receives a coil: judges the receipt inspection (a failed one quarantines the coil with the
 * reasons), cross-checks the F2897 code against the typed fields (disagreements are kept as
 * flags and shown; the schema lets them through only with a reason, which the audit entry
 * keeps), inserts the coil, its first event and the audit entry in one transaction.
 */
export async function receiveCoil(input: ReceiveCoil, { user, requestId }: Actor): Promise<ReceivedCoil> {
  const verdict = judgeReceiptInspection({
    outsideDiameterMm: input.outsideDiameterMm,
    sdr: input.sdr,
    damageKinds: input.damageKinds,
    gougeDepthMm: input.gougeDepthMm,
    gougeLimitPct: input.gougeLimitPct,
    ovalityPct: input.ovalityPct ?? null,
    ovalityLimitPct: input.ovalityLimitPct,
    endCapsInPlace: input.endCapsInPlace,
  });
  const flags = input.traceCode ? traceCodeDisagreements(input.traceCode, input) : [];
  // The schema refuses disagreements without a reason; a caller that skipped it is refused here too.
  if (flags.length && !input.disagreementReason) {
    const fields = { disagreementReason: ["Say why the coil is saved although its fields disagree with its traceability code."] };
    throw new AppError("invalid", describeFieldErrors(fields, RECEIVE_COIL_LABELS), fields);
  }
  const quarantineReason = verdict.passed ? null : `Failed receipt inspection: ${verdict.reasons.join("; ")}`.slice(0, 300);
  return db().transaction(async (trx) => {
    const inserted = await insertCoil(
      {
        coilCode: input.coilCode,
        manufacturer: input.manufacturer,
        manufacturerCode: input.manufacturerCode ?? null,
        lot: input.lot,
        productionDate: input.productionDate ?? null,
        material: input.material,
        series: input.series,
        nominalSize: input.nominalSize,
        outsideDiameterMm: input.outsideDiameterMm,
        sdr: input.sdr,
        lengthM: input.lengthM,
        printLine: input.printLine ?? null,
        traceCode: input.traceCode ?? null,
        traceCodeFlags: flags,
        damageKinds: input.damageKinds,
        damageNotes: input.damageNotes ?? null,
        gougeDepthMm: input.gougeDepthMm,
        gougeLimitPct: input.gougeLimitPct,
        ovalityPct: input.ovalityPct ?? null,
        ovalityLimitPct: input.ovalityLimitPct,
        endCapsInPlace: input.endCapsInPlace,
        inspectionPassed: verdict.passed,
        quarantineReason,
        receivedBy: user.id,
      },
      trx,
    );
    if (!inserted.ok) throw new AppError("conflict", `Coil id ${input.coilCode} is already on file; choose another id.`, { coilCode: [`Coil id ${input.coilCode} is already on file.`] });
    const id = inserted.id;
    await insertAuditEntry(
      {
        actorUserId: user.id,
        action: "coil-received",
        entityType: "coil",
        entityId: id,
        details: { coilCode: input.coilCode, manufacturer: input.manufacturer, lot: input.lot, lengthM: input.lengthM, inspectionPassed: verdict.passed, reasons: verdict.reasons, traceCodeFlags: flags, ...(flags.length ? { traceCode: input.traceCode, disagreementReason: input.disagreementReason } : {}) },
        requestId,
      },
      trx,
    );
    return { id, coilCode: input.coilCode, status: verdict.passed ? "in-yard" : "quarantined", inspectionPassed: verdict.passed, reasons: verdict.reasons, traceCodeFlags: flags };
  });
}
