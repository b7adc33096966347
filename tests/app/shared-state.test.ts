import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import { and, eq, sql } from "drizzle-orm";
import { getDb, type DatabaseHandle } from "@/db/client";
import { publish, startListening } from "@/db/notifications";
import { memberships, rateLimitWindows } from "@/db/schema";
import { requireFaultRole } from "@/lib/access";
import { databaseWindow } from "@/lib/rate-limit";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";

// basis: common practice, no source (a sliding-window limit; a cache dropped when told of a change)

describe("state that several processes must agree on", () => {
  let handle: DatabaseHandle;
  beforeAll(async () => {
    handle = await useFreshDatabase();
    expect(await startListening()).toBe(true);
  });

  it("the limit in the database counts attempts from any number of callers at once, per key, within its window", async () => {
    const limiter = databaseWindow({ scope: "test", limit: 8, windowMs: 5 * 60_000 });
    const results = await Promise.all(Array.from({ length: 20 }, () => limiter.attempt("someone@example.test")));
    expect(results.filter(Boolean)).toHaveLength(8);
    expect(await limiter.attempt("someone@example.test")).toBe(false);
    expect(await limiter.attempt("other@example.test")).toBe(true);
    // attempts older than the window no longer count (moved back in time instead of waiting five minutes)
    const db = await getDb();
    await db
      .update(rateLimitWindows)
      .set({ hits: sql`array(select hit - interval '6 minutes' from unnest(${rateLimitWindows.hits}) as hit)` })
      .where(and(eq(rateLimitWindows.scope, "test"), eq(rateLimitWindows.key, "someone@example.test")));
    expect(await limiter.attempt("someone@example.test")).toBe(true);
    // a reset (a successful sign-in) forgets the key
    for (let attempt = 0; attempt < 8; attempt++) await limiter.attempt("third@example.test");
    expect(await limiter.attempt("third@example.test")).toBe(false);
    await limiter.reset("third@example.test");
    expect(await limiter.attempt("third@example.test")).toBe(true);
  });

  it("a remembered role is forgotten when any process announces a role change", async () => {
    const f = await studyWithEveryRole();
    signInAs(f.people.reviewer);
    expect((await requireFaultRole(f.fault.id, "view")).role).toBe("reviewer");
    // another process removes the member (behind this process's back) and announces it, as changingRoles does
    await (await getDb()).delete(memberships).where(and(eq(memberships.studyId, f.study.id), eq(memberships.userId, f.people.reviewer.id)));
    await expect(requireFaultRole(f.fault.id, "view")).resolves.toMatchObject({ role: "reviewer" }); // remembered until told
    if (handle.kind === "postgres") {
      // a NOTIFY from another connection, as another web process sends it
      const { Client } = await import("pg");
      const other = new Client({ connectionString: handle.url });
      await other.connect();
      await other.query("select pg_notify('slipfield_roles', '')");
      await other.end();
      for (let waits = 0; waits < 100; waits++) {
        const outcome = await requireFaultRole(f.fault.id, "view").then(
          () => "remembered",
          () => "refused",
        );
        if (outcome === "refused") break;
        await new Promise((resolve) => setTimeout(resolve, 20));
      }
    } else {
      await publish("slipfield_roles");
    }
    await expect(requireFaultRole(f.fault.id, "view")).rejects.toMatchObject({ status: 404 });
  });
});
