// Joint → origins: the records of findJointOrigins plus what they meant on the day the
// joint was made — the fuser's qualification status (49 CFR 192.285 via domain
// qualificationStatus) and whether the heater plate's last check was still in date.
import "server-only";
import { findJointOrigins, type JointOrigins } from "@/database/queries/trace";
import { qualificationStatus, type QualificationStatus } from "@/domain/qualifications/status";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

export type TracedOrigins = JointOrigins & {
  madeOn: string;
  qualification: QualificationStatus | { qualified: false; state: "unknown"; reason: string };
  heaterCheckInDate: boolean | null;
};

export async function traceJointOrigins(jointId: number): Promise<TracedOrigins | null> {
  const origins = await findJointOrigins({ jointId });
  if (!origins) return null;
  // The local day the joint was made (the crew's day, in the organisation's zone).
  const madeOn = isoDateIn(origins.joint.madeAt, await organisationTimeZone());
  let qualification: TracedOrigins["qualification"];
  try {
    qualification = qualificationStatus({ qualifiedOn: origins.fuser.qualifiedOn, failedTestsOn: origins.fuser.failedTestsOn, on: madeOn });
  } catch (error) {
    qualification = { qualified: false, state: "unknown", reason: (error as Error).message };
  }
  const check = origins.heater.lastCheck;
  return { ...origins, madeOn, qualification, heaterCheckInDate: check ? check.passed && check.nextDueOn >= madeOn : null };
}
