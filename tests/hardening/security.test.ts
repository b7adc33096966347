import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import * as studiesRoute from "@/app/api/studies/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import { passwordSchema } from "@/lib/auth/password";
import { checkCredentials, createUser } from "@/lib/auth/users";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";

async function productionHeaders() {
  vi.stubEnv("NODE_ENV", "production");
  vi.resetModules();
  const config = (await import("@/next.config")).default;
  const rules = await config.headers!();
  return Object.fromEntries(rules.find((rule) => rule.source === "/:path*")!.headers.map((header) => [header.key.toLowerCase(), header.value]));
}

describe("security headers in production (next.config.ts)", () => {
  afterEach(() => {
    vi.unstubAllEnvs();
    vi.resetModules();
  });

  it("CSP without unsafe-eval, no framing, strict referrer policy, no sniffing", async () => {
    const headers = await productionHeaders();
    const csp = headers["content-security-policy"];
    expect(csp).not.toContain("unsafe-eval");
    expect(csp).toMatch(/frame-ancestors 'none'/);
    expect(csp).toMatch(/default-src 'self'/);
    expect(csp).toMatch(/form-action 'self'/);
    expect(csp).toMatch(/base-uri 'self'/);
    expect(headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
    expect(headers["x-frame-options"]).toBe("DENY");
    expect(headers["x-content-type-options"]).toBe("nosniff");
  });
});

describe("CSRF: mutations from another origin are refused", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  const send = (handler: typeof studiesRoute.POST, method: string, origin: string | null, body: unknown, params = {}) => {
    const headers: Record<string, string> = { host: "localhost:3000", "content-type": "application/json" };
    if (origin) headers.origin = origin;
    return handler(new Request("http://localhost:3000/api/x", { method, headers, body: JSON.stringify(body) }), { params: Promise.resolve(params) });
  };

  it("a cross-origin POST / PATCH with a valid session is refused with 403 and changes nothing", async () => {
    signInAs(fixture.people.owner);
    const post = await send(studiesRoute.POST, "POST", "https://attacker.example", { name: "Planted study" });
    expect(post.status).toBe(403);
    expect(((await post.json()) as { error: string }).error).toMatch(/Cross-site/);
    const patch = await send(
      faultRoute.PATCH as typeof studiesRoute.POST,
      "PATCH",
      "http://localhost:3001",
      { description: "x" },
      { faultId: fixture.fault.id },
    );
    expect(patch.status).toBe(403);
    expect(await send(studiesRoute.POST, "POST", "null", { name: "Sandboxed frame" }).then((r) => r.status)).toBe(403);
  });

  it("the same origin is accepted (and a request without Origin, as from curl, relies on SameSite=Lax cookies)", async () => {
    signInAs(fixture.people.owner);
    expect((await send(studiesRoute.POST, "POST", "http://localhost:3000", { name: "Same origin" })).status).toBe(201);
    expect((await send(studiesRoute.POST, "POST", null, { name: "No origin" })).status).toBe(201);
  });
});

describe("password policy and sign-in rate limit", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it.each([
    ["short1", /at least 10/],
    ["onlyletters-no-digits", /digit/],
    ["1234567890123", /letter/],
    ["x".repeat(199) + "12", /at most 200/],
  ])("refuses %s", (password, reason) => {
    const result = passwordSchema.safeParse(password);
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((issue) => issue.message).join(" ")).toMatch(reason);
  });

  it("accepts a password that meets the policy", () => {
    expect(passwordSchema.safeParse("granite-fault-42").success).toBe(true);
  });

  it("after 8 failed attempts on one address even the right password is refused for the window", async () => {
    expect((await createUser({ name: "Rate", email: "rate@example.test", password: "granite-fault-42" })).ok).toBe(true);
    for (let attempt = 0; attempt < 8; attempt++) expect((await checkCredentials({ email: "rate@example.test", password: "wrong-pass-123" })).ok).toBe(false);
    expect(await checkCredentials({ email: "rate@example.test", password: "granite-fault-42" })).toEqual({ ok: false, reason: "rate-limited" });
    expect(await checkCredentials({ email: "RATE@example.test", password: "granite-fault-42" })).toEqual({ ok: false, reason: "rate-limited" });
  });
});
