// Where sign-in may send the browser: only a path on Beadline's own origin.
// source: OWASP Unvalidated Redirects and Forwards Cheat Sheet (validate the destination;
// "//", "/\" and scheme forms as attack forms); WHATWG URL Standard, "URL parsing":
// leading/trailing C0 control or space stripped, ASCII tab and newline removed anywhere,
// "\" read as "/" in special (http/https) URLs, "//" after the scheme starts an authority.
import { describe, expect, it } from "vitest";
import { safeNextPath } from "@/domain/crew/next-path";

const ORIGIN = "https://beadline.larkmoor-gas.example";

describe("safeNextPath", () => {
  const hostile: [string, unknown][] = [
    ["backslash after the slash (the attack run's form, /%5C decoded)", "/\\127.0.0.1:3199/phish"],
    ["tab between the slashes (the attack run's form, /%09 decoded)", "/\t/127.0.0.1:3199/phish"],
    ["newline between the slashes", "/\n/evil.example/"],
    ["carriage return between the slashes", "/\r/evil.example/"],
    ["protocol-relative", "//evil.example/phish"],
    ["protocol-relative with backslashes", "/\\/evil.example"],
    ["two backslashes", "\\\\evil.example"],
    ["absolute http URL", "http://evil.example/"],
    ["absolute https URL on another host", "https://evil.example/sign-in"],
    ["absolute URL on our own origin written as a URL (not a path)", `${ORIGIN}/register`],
    ["javascript: scheme", "javascript:alert(1)"],
    ["data: URL", "data:text/html,<script>alert(1)</script>"],
    ["scheme with a leading space", " https://evil.example"],
    ["dot segment that leaves a path starting with //", "/.//evil.example/"],
    ["dot-dot segment that leaves a path starting with //", "/a/..//evil.example/"],
    ["percent-encoded backslash", "/%5Cevil.example"],
    ["percent-encoded tab", "/%09/evil.example"],
    ["NUL character", "/\u0000/evil.example"],
    ["DEL character", "/\u007f/evil.example"],
    ["C1 control (NEL)", "/\u0085/evil.example"],
    ["user-info form", "/@evil.example"],
    ["no leading slash", "evil.example/phish"],
    ["empty", ""],
    ["not a string (array from a repeated parameter)", ["/trench", "//evil.example"]],
    ["undefined", undefined],
    ["very long", `/${"a".repeat(5000)}`],
  ];
  for (const [what, next] of hostile) {
    it(`refuses ${what}`, () => {
      const result = safeNextPath(next, ORIGIN);
      // "/@evil.example" is a path on our own origin: it may be kept, but never leaves the origin.
      expect(new URL(result, ORIGIN).origin).toBe(ORIGIN);
      expect(result.startsWith("/") && !result.startsWith("//") && !result.includes("\\")).toBe(true);
      if (what !== "user-info form") expect(result).toBe("/");
    });
  }

  const kept: [string, string][] = [
    ["/trench", "/trench"],
    ["/register?outcome=fail&page=2", "/register?outcome=fail&page=2"],
    ["/joints/42#revisions", "/joints/42#revisions"],
    ["/coils/LV-C0001", "/coils/LV-C0001"],
    ["/", "/"],
  ];
  for (const [next, expected] of kept) {
    it(`keeps the same-origin path ${next}`, () => {
      expect(safeNextPath(next, ORIGIN)).toBe(expected);
    });
  }

  it("judges against the origin it is given (the browser's own)", () => {
    expect(safeNextPath("/trench", "http://127.0.0.1:3100")).toBe("/trench");
    expect(safeNextPath("/\\127.0.0.1:3199/phish", "http://127.0.0.1:3100")).toBe("/");
  });
});
