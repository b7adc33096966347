import { rmSync } from "node:fs";
import { request as httpRequest } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, DEMO_PASSWORD, ensureBuild, startServer, type RunningServer } from "../../scripts/hardening/server";

/** Security properties observed on the real production server over HTTP. */
let server: RunningServer;
beforeAll(async () => {
  ensureBuild();
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
  if (server) rmSync(server.dataDir, { recursive: true, force: true });
});

async function sessionCookieLine(headers: Record<string, string>) {
  const csrf = await fetch(`${server.url}/api/auth/csrf`, { headers });
  const csrfCookie = (csrf.headers.getSetCookie?.() ?? []).map((line) => line.split(";")[0]).join("; ");
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${server.url}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { ...headers, cookie: csrfCookie, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ csrfToken, email: "viewer@quillon.test", password: DEMO_PASSWORD }).toString(),
  });
  return (response.headers.getSetCookie?.() ?? []).find((line) => /authjs\.session-token=/.test(line)) ?? "";
}

describe("the production server", () => {
  it("sends the security headers on pages and API answers", async () => {
    for (const path of ["/sign-in", "/api/health"]) {
      const response = await fetch(server.url + path);
      const csp = response.headers.get("content-security-policy") ?? "";
      expect(csp).toMatch(/frame-ancestors 'none'/);
      expect(csp).not.toContain("unsafe-eval");
      expect(response.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(response.headers.get("x-powered-by")).toBeNull();
    }
  });

  it("session cookie: HttpOnly and SameSite=Lax; Secure with the __Secure- prefix when served over https", async () => {
    const plain = await sessionCookieLine({});
    expect(plain).toMatch(/^authjs\.session-token=/);
    expect(plain).toMatch(/HttpOnly/i);
    expect(plain).toMatch(/SameSite=Lax/i);
    const secure = await sessionCookieLine({ "x-forwarded-proto": "https" });
    expect(secure).toMatch(/^__Secure-authjs\.session-token=/);
    expect(secure).toMatch(/;\s*Secure/i);
    expect(secure).toMatch(/HttpOnly/i);
  });

  it("refuses a cross-origin mutation carrying a valid session", async () => {
    const client = new Client(server.url);
    await client.signIn("owner@quillon.test", DEMO_PASSWORD);
    const refused = await client.request("/api/studies", {
      method: "POST",
      headers: { origin: "https://attacker.example", "content-type": "application/json" },
      body: JSON.stringify({ name: "Planted" }),
    });
    expect(refused.status).toBe(403);
    const accepted = await client.json("/api/studies", "POST", { name: "Same origin study" });
    expect(accepted.status).toBe(201);
  });

  it("limits sign-in attempts per address", async () => {
    for (let attempt = 0; attempt < 8; attempt++) {
      await expect(new Client(server.url).signIn("reviewer@quillon.test", "not-the-password-1")).rejects.toThrow(/sign-in/);
    }
    await expect(new Client(server.url).signIn("reviewer@quillon.test", DEMO_PASSWORD)).rejects.toThrow(/sign-in/);
  });

  it("answers an upload over the 100 MB limit with 413 long before the body has been sent", async () => {
    const client = new Client(server.url);
    await client.signIn("interpreter@quillon.test", DEMO_PASSWORD);
    const { studies } = (await (await client.request("/api/studies")).json()) as { studies: { id: string }[] };
    const { faults } = (await (await client.request(`/api/studies/${studies[0].id}/faults`)).json()) as { faults: { id: string }[] };
    for (const chunked of [false, true]) {
      const result = await new Promise<{ status: number; sentBytes: number }>((resolve, reject) => {
        let sentBytes = 0;
        let answered = false;
        const url = new URL(`${server.url}/api/faults/${faults[0].id}/pick-sets?step=preview`);
        const headers: Record<string, string> = { cookie: client.cookieHeader, origin: server.url, "content-type": "multipart/form-data; boundary=xyz" };
        if (!chunked) headers["content-length"] = String(300 * 1048576);
        const req = httpRequest({ host: url.hostname, port: url.port, path: url.pathname + url.search, method: "POST", headers }, (response) => {
          answered = true;
          response.resume();
          resolve({ status: response.statusCode ?? 0, sentBytes });
        });
        req.on("error", (error) => (answered ? undefined : reject(error)));
        const chunk = Buffer.alloc(1048576, 0x31);
        const head = Buffer.from('--xyz\r\ncontent-disposition: form-data; name="file"; filename="huge.csv"\r\n\r\n');
        req.write(head);
        const pump = () => {
          while (!answered && sentBytes < 300 * 1048576) {
            sentBytes += chunk.length;
            if (!req.write(chunk)) return void req.once("drain", pump);
          }
          if (!answered) req.end();
        };
        pump();
      });
      expect(result.status).toBe(413);
      // refused by the declared length at once, or by the streaming cap just past 100 MB: never the whole 300 MB
      expect(result.sentBytes).toBeLessThan(chunked ? 200 * 1048576 : 150 * 1048576);
    }
  });
});
