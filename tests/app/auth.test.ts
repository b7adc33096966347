import { beforeAll, describe, expect, it } from "vitest";
import { checkCredentials, createUser } from "@/lib/auth/users";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { memoryWindow } from "@/lib/rate-limit";
import { useFreshDatabase } from "../support/database";

describe("accounts and sign-in", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it("hashes passwords (bcrypt) and never stores them in clear", async () => {
    const hash = await hashPassword("correct-horse-9");
    expect(hash).not.toContain("correct-horse-9");
    expect(hash).toMatch(/^\$2[aby]\$/);
    expect(await verifyPassword("correct-horse-9", hash)).toBe(true);
    expect(await verifyPassword("correct-horse-8", hash)).toBe(false);
  });

  it("applies the password policy and names each bad field on sign-up", async () => {
    const result = await createUser({ name: "", email: "nope", password: "short" });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(Object.keys(result.fieldErrors).sort()).toEqual(["email", "name", "password"]);
    expect(result.fieldErrors.password?.join(" ")).toMatch(/at least 10 characters/);
  });

  it("refuses a second account with the same e-mail, case-insensitively", async () => {
    expect((await createUser({ name: "A", email: "dup@example.test", password: "long-enough-1" })).ok).toBe(true);
    const again = await createUser({ name: "B", email: "DUP@example.test", password: "long-enough-1" });
    expect(again.ok).toBe(false);
  });

  it("rate-limits sign-in attempts per address, and a success clears the count", async () => {
    await createUser({ name: "C", email: "limited@example.test", password: "long-enough-2" });
    for (let attempt = 0; attempt < 8; attempt++) {
      const result = await checkCredentials({ email: "limited@example.test", password: "wrong-password-0" });
      expect(result).toEqual({ ok: false, reason: "invalid" });
    }
    expect(await checkCredentials({ email: "limited@example.test", password: "long-enough-2" })).toEqual({ ok: false, reason: "rate-limited" });
    expect((await checkCredentials({ email: "other@example.test", password: "x" })).ok).toBe(false);
  });

  it("the limiter forgets attempts outside its window", () => {
    const limiter = memoryWindow({ limit: 2, windowMs: 1000 });
    expect(limiter.attempt("k", 0)).toBe(true);
    expect(limiter.attempt("k", 10)).toBe(true);
    expect(limiter.attempt("k", 20)).toBe(false);
    expect(limiter.attempt("k", 1015)).toBe(true);
  });
});
