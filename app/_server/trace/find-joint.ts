// Joint → origins search: what a person typed or scanned (a job code and joint number, a
// joint tag's address, or a joint id) read by domain/joints/reference, then looked up. A
// miss says how the text was read, so a typing slip is easy to see.
import "server-only";
import { findJointIdByReference } from "@/database/queries/trace";
import { formatJointReference, JOINT_REFERENCE_EXAMPLE, parseJointReference } from "@/domain/joints/reference";

export type FoundJoint = { ok: true; jointId: number } | { ok: false; message: string };

export async function findJointForTrace(text: string): Promise<FoundJoint> {
  const parsed = parseJointReference(text);
  if (!parsed.ok) return parsed;
  const reference = parsed.reference;
  const { jointId, isJobOnFile } = await findJointIdByReference({ reference });
  if (jointId) return { ok: true, jointId };
  if (reference.kind === "job-joint") {
    const read = formatJointReference(reference);
    return {
      ok: false,
      message: isJobOnFile
        ? `No joint matches "${text.trim()}" (read as ${read}): job ${reference.jobCode} has no joint ${reference.jointNo}.`
        : `No joint matches "${text.trim()}" (read as ${read}): there is no job ${reference.jobCode}. Give the job code and joint number, e.g. ${JOINT_REFERENCE_EXAMPLE}.`,
    };
  }
  if (reference.kind === "joint-id") return { ok: false, message: `No joint has the id ${reference.jointId} that this tag's address ends in.` };
  return { ok: false, message: `No joint has the id ${reference.value}. To name a joint by its number, give the job code too, e.g. ${JOINT_REFERENCE_EXAMPLE}.` };
}
