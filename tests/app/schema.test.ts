import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, auditLog, faults, memberships, outbox, pickSets, pinReplies, pins, studies, users, viewpointLinks, viewpoints } from "@/db/schema";
import { decodePicks, encodePicks } from "@/lib/picks/codec";
import type { PickColumns } from "@/lib/engine/types";
import { useFreshDatabase } from "../support/database";

function tinyPicks(): PickColumns {
  return {
    x: Float64Array.from([450000.5, 450010.25, 450020]),
    y: Float64Array.from([6700000, 6700100, 6700200]),
    z: Float64Array.from([-2000, -2010, -2020]),
    throwM: Float64Array.from([10, 20, 15]),
    heaveM: Float64Array.from([NaN, 4, NaN]),
    quality: Float64Array.from([1, 0.5, NaN]),
    segment: Uint32Array.from([0, 0, 1]),
    horizon: Int32Array.from([-1, 0, 0]),
    segmentNames: ["north", "south"],
    horizonNames: ["H1"],
    sourceRow: Uint32Array.from([2, 3, 4]),
  };
}

describe("schema round trip", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it("stores and reads back every table, with picks as compact binary", async () => {
    const db = await getDb();
    const [user] = await db.insert(users).values({ email: "a@example.test", name: "A", passwordHash: "x" }).returning();
    const [study] = await db.insert(studies).values({ name: "S", createdBy: user.id }).returning();
    await db.insert(memberships).values({ studyId: study.id, userId: user.id, role: "owner" });
    const [fault] = await db.insert(faults).values({ studyId: study.id, name: "F" }).returning();
    const picks = tinyPicks();
    const [pickSet] = await db
      .insert(pickSets)
      .values({ faultId: fault.id, version: 1, fileName: "p.csv", checksum: "abc", sizeBytes: 10, rowCount: 3, units: "m", segmentNames: picks.segmentNames, horizonNames: picks.horizonNames, picks: encodePicks(picks) })
      .returning();
    const [analysis] = await db.insert(analyses).values({ pickSetId: pickSet.id, result: { segments: [] } }).returning();
    const [pin] = await db.insert(pins).values({ faultId: fault.id, pickSetId: pickSet.id, authorId: user.id, x: 1, y: 2, z: 3, s: 4, t: 5, body: "Here" }).returning();
    await db.insert(pinReplies).values({ pinId: pin.id, authorId: user.id, body: "Reply" });
    const [viewpoint] = await db
      .insert(viewpoints)
      .values({ faultId: fault.id, title: "V", camera: { position: [1, 2, 3], target: [0, 0, 0], up: [0, 0, 1], fov: 40 }, settings: { layers: { picks: true }, colourMode: "displacement", exaggeration: 1 } })
      .returning();
    await db.insert(viewpointLinks).values({ viewpointId: viewpoint.id, token: "t".repeat(43) });
    await db.insert(outbox).values({ to: "a@example.test", subject: "S", text: "T", kind: "invitation" });
    await db.insert(auditLog).values({ action: "x", details: { a: 1 } });

    const storedPickSet = await db.query.pickSets.findFirst({ where: eq(pickSets.id, pickSet.id) });
    const decoded = decodePicks(storedPickSet!.picks);
    expect(Array.from(decoded.x)).toEqual(Array.from(picks.x));
    expect(Number.isNaN(decoded.heaveM[0])).toBe(true);
    expect(decoded.heaveM[1]).toBe(4);
    expect(Array.from(decoded.horizon)).toEqual([-1, 0, 0]);
    expect(decoded.segmentNames).toEqual(["north", "south"]);
    expect((await db.query.analyses.findFirst({ where: eq(analyses.id, analysis.id) }))!.status).toBe("queued");
    const storedViewpoint = await db.query.viewpoints.findFirst({ where: eq(viewpoints.id, viewpoint.id) });
    expect(storedViewpoint!.camera.position).toEqual([1, 2, 3]);
    expect((await db.query.pins.findFirst({ where: eq(pins.id, pin.id) }))!.state).toBe("open");
  });

  it("cascades a study's deletion to its faults, pick sets and memberships", async () => {
    const db = await getDb();
    const [study] = await db.insert(studies).values({ name: "Gone" }).returning();
    const [fault] = await db.insert(faults).values({ studyId: study.id, name: "F" }).returning();
    await db.delete(studies).where(eq(studies.id, study.id));
    expect(await db.query.faults.findFirst({ where: eq(faults.id, fault.id) })).toBeUndefined();
  });
});
