// Password rules: minimum length, the common-password list and bcrypt cost.
import bcrypt from "bcryptjs";
import { beforeEach, describe, expect, it } from "vitest";
import { BCRYPT_COST, hashPassword } from "@/app/_lib/auth";
import { assertPasswordAllowed, commonPasswords } from "@/app/_lib/common-passwords";
import { isCommonPassword, passwordProblem } from "@/domain/crew/password-policy";
import { addPersonSchema, MIN_PASSWORD_LENGTH, resetPasswordSchema } from "@/domain/crew/schemas";
import { AppError } from "@/domain/result";
import { addPersonAction, resetPasswordAction } from "@/app/(signed-in)/crew/actions";
import { ownerDb, resetDatabase, seedDemo } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";

describe("password length", () => {
  // source: NIST SP 800-63B §5.1.1.2 (at least 8 characters); 12 is our own stricter floor.
  it("requires at least 8 characters, and Beadline requires 12", () => {
    expect(MIN_PASSWORD_LENGTH).toBeGreaterThanOrEqual(8);
    expect(MIN_PASSWORD_LENGTH).toBe(12);
  });

  it.each([
    [addPersonSchema, { name: "Pat Example", email: "pat@test.example", roles: ["fuser"] }],
    [resetPasswordSchema, { id: 1 }],
  ])("the input schema refuses 11 characters and accepts 12 (%#)", (schema, rest) => {
    const short = schema.safeParse({ ...rest, password: "a".repeat(MIN_PASSWORD_LENGTH - 1) });
    expect(short.success).toBe(false);
    if (!short.success) expect(short.error.issues.map((i) => i.path.join("."))).toContain("password");
    expect(schema.safeParse({ ...rest, password: "river-gravel-lantern" }).success).toBe(true);
  });

  it("counts characters, not UTF-16 units, and says how many are needed", () => {
    expect(passwordProblem("ü".repeat(11), { commonPasswords: [] })).toMatch(/at least 12 characters/);
    expect(passwordProblem("😀".repeat(6), { commonPasswords: [] })).toMatch(/at least 12/); // 12 UTF-16 units, 6 characters
  });
});

describe("common-password list", () => {
  // source: NIST SP 800-63B §5.1.1.2 — compare new secrets against "passwords obtained from
  // previous breach corpuses" and "dictionary words"; the list ships in @zxcvbn-ts/language-common.
  it("loads the registry package's list (tens of thousands of entries, the well-known top ones included)", () => {
    const list = commonPasswords();
    expect(list.size).toBeGreaterThan(10_000);
    // source: every published breach-corpus ranking puts these at the top (e.g. the list's own first entries)
    for (const p of ["123456", "password", "qwerty", "12345678", "iloveyou"]) expect(list.has(p)).toBe(true);
  });

  it("refuses listed passwords of 12+ characters, case-insensitively and with padding", () => {
    const list = commonPasswords();
    const long = [...list].filter((p) => p.length >= MIN_PASSWORD_LENGTH).slice(0, 50);
    expect(long.length).toBeGreaterThan(10); // the list has long entries too, so the check matters at 12+
    for (const p of long) expect(isCommonPassword(p.toUpperCase(), list)).toBe(true);
    // common practice (no published source): guessing tools append digits and symbols first
    expect(isCommonPassword("password1234", list)).toBe(true);
    expect(isCommonPassword("Qwerty!!2026", list)).toBe(true);
    expect(isCommonPassword("monkeymonkey", list)).toBe(true);
    expect(isCommonPassword("abcabcabcabc", list)).toBe(true);
  });

  it("accepts a long passphrase of the person's own", () => {
    const list = commonPasswords();
    expect(isCommonPassword("heat-soak-at-the-trench-2026", list)).toBe(false);
    expect(passwordProblem("heat-soak-at-the-trench-2026", { commonPasswords: list })).toBeNull();
  });

  it("refuses the person's own name or e-mail as the password and names the field", () => {
    expect(() => assertPasswordAllowed("robin.ashdown.example", { name: "Robin Ashdown", email: "robin.ashdown.example@test.example" })).toThrow(AppError);
    try {
      assertPasswordAllowed("password12345", { field: "newPassword", label: "New password" });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(AppError);
      expect((error as AppError).code).toBe("invalid");
      expect(Object.keys((error as AppError).fields ?? {})).toEqual(["newPassword"]);
      // Named as the form shows it, never by its internal name.
      expect((error as AppError).message).toMatch(/^Check New password: /);
      expect((error as AppError).message).not.toMatch(/newPassword/);
    }
  });
});

describe("the Crew screen applies the policy", () => {
  beforeEach(resetDatabase);

  it("adding a person or resetting a password with a common password is refused, naming the field, and nothing is written", async () => {
    const admin = await makeUser({ roles: ["admin"] });
    const person = await makeUser({ roles: ["fuser"] });
    await actAs(admin);
    const before = Number((await ownerDb()("users").count({ n: "*" }).first())?.n);
    const hashBefore = (await ownerDb()("users").where({ id: person.id }).first("password_hash")).password_hash;
    const added = await addPersonAction({ name: "Pat Example", email: "pat@test.example", roles: ["fuser"], password: "password1234" });
    expect(added).toMatchObject({ ok: false, status: 422, fields: { password: [expect.stringMatching(/commonly used/)] } });
    const reset = await resetPasswordAction({ id: person.id, password: "qwertyuiop123" });
    expect(reset).toMatchObject({ ok: false, status: 422, fields: { password: [expect.any(String)] } });
    expect(Number((await ownerDb()("users").count({ n: "*" }).first())?.n)).toBe(before);
    expect((await ownerDb()("users").where({ id: person.id }).first("password_hash")).password_hash).toBe(hashBefore);
    const ok = await addPersonAction({ name: "Pat Example", email: "pat@test.example", roles: ["fuser"], password: "gravel-lantern-heater-41" });
    expect(ok.ok).toBe(true);
  });
});

describe("bcrypt", () => {
  // source: OWASP Password Storage Cheat Sheet — bcrypt with a work factor of 10 or more.
  it("hashes with cost ≥ 10 (12 in Beadline), salted, and verifies", async () => {
    expect(BCRYPT_COST).toBeGreaterThanOrEqual(10);
    const a = await hashPassword("river-gravel-lantern");
    expect(bcrypt.getRounds(a)).toBe(BCRYPT_COST);
    expect(a).toMatch(/^\$2[aby]\$12\$/);
    expect(await bcrypt.compare("river-gravel-lanterN", a)).toBe(false);
    // a fresh salt each time: the same password hashed at cost 4 twice differs (same code path, cheap)
    expect(bcrypt.hashSync("river-gravel-lantern", 4)).not.toBe(bcrypt.hashSync("river-gravel-lantern", 4));
  });
});

describe("demo accounts", () => {
  // source: OWASP Password Storage Cheat Sheet — one work factor for every stored password;
  // a seeded account with a cheaper hash is the easiest one to crack offline.
  it("are hashed with the same bcrypt cost as real passwords", async () => {
    await resetDatabase();
    await seedDemo();
    const hashes = (await ownerDb()("users").select("password_hash")).map((r: { password_hash: string }) => r.password_hash);
    expect(hashes.length).toBeGreaterThan(0);
    for (const hash of hashes) expect(bcrypt.getRounds(hash)).toBe(BCRYPT_COST);
  }, 60_000);
});

// Sign-in throttling: tests/security/sign-in-throttle.test.ts.
