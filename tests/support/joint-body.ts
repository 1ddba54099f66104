// What the bench, the load run and the outage test share: a valid joint submission of the
// demo fuser (demo scenario: coils LV-C0001/LV-C0002, 2" IPS SDR 11 on FM-201 with HP-31),
// waiting for a started `next start` to answer, and signing in through the JSON API.
import type { ChildProcess } from "node:child_process";
import { allChecksPassed, type RecordedValues } from "../../domain/joints/values";

/**
 * Values of a joint inside the demo procedure's plan for the demo pipe (canonical SI,
 * names of domain/joints/values): 218 °C inside the ASTM F2620 400–450 °F heater window.
 */
export const DEMO_JOINT_VALUES: RecordedValues = {
  dragPressureMpa: 0.05,
  heaterTemperatureC: 218,
  beadUpGaugePressureMpa: 0.53,
  fusionGaugePressureMpa: 0.53,
  beadMm: 3,
  heatSoakS: 90,
  heatSoakGaugePressureMpa: null,
  heaterSurfaceTemperatureC: null,
  misalignmentMm: null,
  changeoverS: 5,
  coolingS: 600,
  ...allChecksPassed(),
};

/** A POST /api/v1/joints body of the demo fuser, made a minute ago. */
export function demoJointBody({ clientId, jobId, machineId, heaterId, station }: { clientId: string; jobId: number; machineId: number; heaterId: number; station: string }): Record<string, unknown> {
  return {
    clientId,
    jobId,
    kind: "coil-to-coil",
    coilA: "LV-C0001",
    coilB: "LV-C0002",
    machineId,
    heaterId,
    ...DEMO_JOINT_VALUES,
    timedFields: [],
    station,
    ambientC: 12,
    shelter: "none",
    madeAt: new Date(Date.now() - 60_000).toISOString(),
    photoIds: [],
  };
}

/** Polls `url` until it answers below 500; fails when `child` exits or after `timeoutMs`. */
export async function waitForServer(url: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`next start exited with code ${child.exitCode}`);
    try {
      const res = await fetch(url, { redirect: "manual" });
      await res.arrayBuffer();
      if (res.status < 500) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

/** Signs in through POST /api/v1/session; the session cookie ("beadline_session=…"). */
export async function signInCookie(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/v1/session`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email, password }) });
  if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}: ${await res.text()}`);
  const cookie = (res.headers.getSetCookie?.() ?? [res.headers.get("set-cookie") ?? ""]).map((c) => c.split(";")[0]).find((c) => c.startsWith("beadline_session="));
  if (!cookie) throw new Error("sign-in gave no session cookie");
  return cookie;
}
