import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { openDatabase, type DatabaseHandle } from "@/db/client";
import { ThreadedPGlite } from "@/db/pglite-thread";
import { auditLog, studies, users } from "@/db/schema";

// basis: common practice, no source (PGlite on its own thread must behave exactly like PGlite in the server's thread)
describe("PGlite on its own thread", () => {
  let threaded: DatabaseHandle;
  let inProcess: DatabaseHandle;
  beforeAll(async () => {
    [threaded, inProcess] = await Promise.all([openDatabase({ memory: true, thread: true }), openDatabase({ memory: true, thread: false })]);
  });
  afterAll(async () => {
    await Promise.all([threaded.close(), inProcess.close()]);
  });

  it("runs on its thread and gives the same rows, types included, as in-process PGlite", async () => {
    expect(threaded.threaded).toBe(true);
    expect(inProcess.threaded).toBe(false);
    const results = [];
    for (const { db } of [threaded, inProcess]) {
      const [user] = await db
        .insert(users)
        .values({ id: "11111111-1111-4111-8111-111111111111", email: "t@example.test", name: "T", passwordHash: "h" })
        .returning();
      const createdAt = new Date("2026-01-02T03:04:05.678Z");
      await db.insert(studies).values({ id: "22222222-2222-4222-8222-222222222222", name: "S", createdBy: user.id, createdAt });
      await db.insert(auditLog).values({ userId: user.id, action: "test", details: { nested: { list: [1, 2.5, "x"] }, flag: true }, createdAt });
      const study = await db.query.studies.findFirst({ where: eq(studies.id, "22222222-2222-4222-8222-222222222222") });
      const [audit] = await db.select({ details: auditLog.details, createdAt: auditLog.createdAt }).from(auditLog);
      const raw = await db.execute(sql`select ${createdAt.toISOString()}::timestamptz as at, 1.5::real as real, true as yes, 'x'::bytea as bytes`);
      results.push({ study, audit, rows: (raw as unknown as { rows: unknown[] }).rows });
    }
    expect(results[0].study?.createdAt).toBeInstanceOf(Date);
    expect(results[0].study?.createdAt.toISOString()).toBe("2026-01-02T03:04:05.678Z");
    expect(results[0].audit.details).toEqual({ nested: { list: [1, 2.5, "x"] }, flag: true });
    expect(results[0]).toEqual(results[1]);
  });

  it("commits a transaction that succeeds and rolls back one that throws, savepoints included", async () => {
    const { db } = threaded;
    await db.transaction(async (tx) => {
      await tx.insert(auditLog).values({ action: "committed" });
      await tx
        .transaction(async (inner) => {
          await inner.insert(auditLog).values({ action: "inner rolled back" });
          throw new Error("inner fails");
        })
        .catch(() => undefined);
    });
    await expect(
      db.transaction(async (tx) => {
        await tx.insert(auditLog).values({ action: "rolled back" });
        throw new Error("the work failed");
      }),
    ).rejects.toThrow("the work failed");
    const actions = (await db.select({ action: auditLog.action }).from(auditLog)).map((row) => row.action);
    expect(actions).toContain("committed");
    expect(actions).not.toContain("rolled back");
    expect(actions).not.toContain("inner rolled back");
  });

  it("makes a query from outside wait for the open transaction, and then see its work", async () => {
    const { db } = threaded;
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    let entered!: () => void;
    const inside = new Promise<void>((resolve) => (entered = resolve));
    const transaction = db.transaction(async (tx) => {
      await tx.insert(auditLog).values({ action: "while others wait" });
      entered();
      await held;
    });
    await inside;
    let outsideDone = false;
    const outside = db
      .select({ action: auditLog.action })
      .from(auditLog)
      .where(eq(auditLog.action, "while others wait"))
      .then((rows) => {
        outsideDone = true;
        return rows;
      });
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect(outsideDone).toBe(false);
    release();
    await transaction;
    expect(await outside).toHaveLength(1);
  });

  it("passes PostgreSQL's error fields across the thread", async () => {
    const { db } = threaded;
    await db.insert(users).values({ email: "dup@example.test", name: "D", passwordHash: "h" });
    const failure = await db
      .insert(users)
      .values({ email: "dup@example.test", name: "D", passwordHash: "h" })
      .then(
        () => null,
        (error: unknown) => error as { cause?: { code?: string; constraint?: string; message?: string } },
      );
    expect(failure?.cause?.code).toBe("23505"); // unique_violation
    expect(failure?.cause?.message).toMatch(/duplicate key/);
  });

  it("refuses queries with a clear message once the thread has stopped", async () => {
    const client = await ThreadedPGlite.open();
    expect((await client.query<{ one: number }>("select 1 as one")).rows).toEqual([{ one: 1 }]);
    await client.close();
    await expect(client.query("select 1")).rejects.toThrow(/database thread stopped/);
  });

  it("fails the requests in flight, and every later one, when the thread dies", async () => {
    const folder = mkdtempSync(path.join(os.tmpdir(), "slipfield-thread-"));
    const dyingWorker = path.join(folder, "dies.mjs");
    writeFileSync(
      dyingWorker,
      `import { parentPort } from "node:worker_threads"; parentPort.postMessage({ ready: true }); parentPort.once("message", () => process.exit(3));`,
    );
    const errors: unknown[] = [];
    const original = console.error;
    console.error = (...args: unknown[]) => errors.push(args.join(" "));
    try {
      const client = await ThreadedPGlite.open(undefined, dyingWorker);
      await expect(client.query("select 1")).rejects.toThrow("the database thread stopped (exit code 3)");
      await expect(client.query("select 1")).rejects.toThrow("the database thread stopped (exit code 3)");
      expect(errors.join("\n")).toMatch(/database requests fail until the server is restarted/);
    } finally {
      console.error = original;
      rmSync(folder, { recursive: true, force: true });
    }
  });

  it("reports why a data folder cannot be opened", async () => {
    const folder = mkdtempSync(path.join(os.tmpdir(), "slipfield-thread-"));
    const notAFolder = path.join(folder, "file");
    writeFileSync(notAFolder, "not a database");
    try {
      await expect(ThreadedPGlite.open(notAFolder)).rejects.toThrow();
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
