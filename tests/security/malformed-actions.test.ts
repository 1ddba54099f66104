// Malformed server-action requests: input that is not the form's fields at all (text, a
// number, a list) is a 400 from the action wrapper, logged once without a stack; a body Next.js
// itself cannot decode never reaches the wrapper, and instrumentation's onRequestError logs it
// in one line, without a stack trace.
// source: OWASP Logging Cheat Sheet (log security events once, with context; keep stack
// traces and request bodies out of routine logs) and RFC 9110 §15.5.1 (400 Bad Request).
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { recordJointAction } from "@/app/(signed-in)/trench/actions";
import { moveCoilAction } from "@/app/(signed-in)/coils/actions";
import { captureLogs } from "@/app/_lib/log";
import { onRequestError } from "@/instrumentation";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";

describe("malformed server-action input", () => {
  let capture: ReturnType<typeof captureLogs>;
  beforeEach(async () => {
    await resetDatabase();
    capture = captureLogs("info");
  });
  afterEach(() => capture.stop());

  it.each([["text", "garbage"], ["a number", 42], ["a list", [1, 2]], ["null", null]])("%s instead of the fields is a 400, logged once without a stack, nothing written", async (_what, value) => {
    const fuser = await makeUser({ roles: ["fuser", "clerk"] });
    await actAs(fuser);
    const joints = Number((await ownerDb()("joints").count({ n: "*" }).first())?.n);
    for (const action of [recordJointAction, moveCoilAction] as ((raw: unknown) => Promise<{ ok: boolean; status?: number; code?: string }>)[]) {
      const result = await action(value);
      expect(result).toMatchObject({ ok: false, status: 400, code: "bad-request" });
    }
    const lines = capture.records().filter((r) => r.msg === "malformed server action input");
    expect(lines).toHaveLength(2); // one per request
    expect(capture.lines.join("\n")).not.toMatch(/"stack"|\n\s+at /);
    expect(Number((await ownerDb()("joints").count({ n: "*" }).first())?.n)).toBe(joints);
  });

  it("a wrong field is still a 422 naming it (not a 400)", async () => {
    await actAs(await makeUser({ roles: ["clerk"] }));
    const result = await moveCoilAction({ coilId: "1e309" } as never);
    expect(result).toMatchObject({ ok: false, status: 422 });
  });
});

describe("errors Next.js catches before our wrappers (onRequestError)", () => {
  const runtime = process.env.NEXT_RUNTIME;
  let capture: ReturnType<typeof captureLogs>;
  beforeEach(() => {
    process.env.NEXT_RUNTIME = "nodejs";
    capture = captureLogs("info");
  });
  afterEach(() => {
    capture.stop();
    if (runtime === undefined) delete process.env.NEXT_RUNTIME;
    else process.env.NEXT_RUNTIME = runtime;
  });

  it("logs a server-action body React cannot decode once, with the message and no stack or body", async () => {
    const error = new SyntaxError("Unexpected token 'g', \"garbage-body\" is not valid JSON\n    at JSON.parse (<anonymous>)");
    await onRequestError(error, { path: "/trench?x=1", method: "POST", headers: { "next-action": "7f00aa", "x-request-id": "req-12345678", cookie: "beadline_session=Fe26.2*secret" } }, { routerKind: "App Router", routePath: "/trench", routeType: "action" });
    const records = capture.records();
    expect(records).toHaveLength(1);
    expect(records[0]).toMatchObject({ kind: "action", route: "/trench", method: "POST", path: "/trench", requestId: "req-12345678", msg: "server action request failed before reaching the action" });
    expect((records[0].error as { message: string }).message).toBe("Unexpected token 'g', \"garbage-body\" is not valid JSON");
    expect(capture.lines.join("\n")).not.toMatch(/stack|at JSON\.parse|Fe26|beadline_session/);
  });
});
