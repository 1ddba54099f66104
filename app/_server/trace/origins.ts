// Joint → origins: the records of findJointOrigins plus what they meant on the day the
// joint was made — the fuser's qualification status (49 CFR 192.285 via domain
// qualificationStatus) and whether the heater plate's last check was still in date.
import "server-only";
import { findJointOrigins, type JointOrigins } from "@/database/queries/trace";
import { qualificationStatus, type QualificationStatus } from "@/domain/qualifications/status";
import { formatInstant } from "@/components/ui/display-format";

export type TracedOrigins = JointOrigins & {
  madeOn: string;
  qualification: QualificationStatus | { qualified: false; state: "unknown"; reason: string };
  heaterCheckInDate: boolean | null;
};

export async function traceJointOrigins(jointId: number): Promise<TracedOrigins | null> {
  const origins = await findJointOrigins({ jointId });
  if (!origins) return null;
  const madeOn = formatInstant(origins.joint.madeAt, "date");
  let qualification: TracedOrigins["qualification"];
  try {
    qualification = qualificationStatus({ qualifiedOn: origins.fuser.qualifiedOn, failedTestsOn: origins.fuser.failedTestsOn, on: madeOn });
  } catch (error) {
    qualification = { qualified: false, state: "unknown", reason: (error as Error).message };
  }
  const check = origins.heater.lastCheck;
  return { ...origins, madeOn, qualification, heaterCheckInDate: check ? check.passed && check.nextDueOn >= madeOn : null };
}
