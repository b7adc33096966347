import type { AnalysisReport } from "@/lib/contracts/report";
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, auditLog, faults, memberships, outbox, pickSets, pinReplies, pins, studies, users, viewpointLinks, viewpoints } from "@/db/schema";
import { decodePicks, decodePickSet, encodePicks, packPicks } from "@/lib/picks/codec";
import type { PickColumns } from "@/lib/engine/types";
import { base64Bytes } from "@/db/schema";
import { parsePickCsv } from "@/lib/engine/csv";
import { demoCsv } from "@/lib/demo";
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
      .values({
        faultId: fault.id,
        version: 1,
        fileName: "p.csv",
        checksum: "abc",
        sizeBytes: 10,
        rowCount: 3,
        units: "m",
        segmentNames: picks.segmentNames,
        horizonNames: picks.horizonNames,
        picks: encodePicks(picks),
      })
      .returning();
    const [analysis] = await db
      .insert(analyses)
      .values({ pickSetId: pickSet.id, result: { segments: [] } as unknown as AnalysisReport })
      .returning();
    const [pin] = await db
      .insert(pins)
      .values({ faultId: fault.id, pickSetId: pickSet.id, authorId: user.id, x: 1, y: 2, z: 3, s: 4, t: 5, body: "Here" })
      .returning();
    await db.insert(pinReplies).values({ pinId: pin.id, authorId: user.id, body: "Reply" });
    const [viewpoint] = await db
      .insert(viewpoints)
      .values({
        faultId: fault.id,
        title: "V",
        camera: { position: [1, 2, 3], target: [0, 0, 0], up: [0, 0, 1], fov: 40 },
        settings: { layers: { picks: true }, colourMode: "displacement", exaggeration: 1 },
      })
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

  it("stores picks packed (deflated) and reads both packed and earlier plain pick sets back exactly", async () => {
    const db = await getDb();
    const [fault] = await db
      .insert(faults)
      .values({ studyId: (await db.insert(studies).values({ name: "Packed" }).returning())[0].id, name: "F" })
      .returning();
    const picks = tinyPicks();
    const common = {
      faultId: fault.id,
      fileName: "p.csv",
      checksum: "abc",
      sizeBytes: 10,
      rowCount: 3,
      units: "m" as const,
      segmentNames: picks.segmentNames,
      horizonNames: picks.horizonNames,
    };
    const [packed] = await db
      .insert(pickSets)
      .values({ ...common, version: 1, picks: packPicks(picks) })
      .returning({ id: pickSets.id });
    const [plain] = await db
      .insert(pickSets)
      .values({ ...common, version: 2, picks: encodePicks(picks) })
      .returning({ id: pickSets.id });
    for (const id of [packed.id, plain.id]) {
      const [row] = await db
        .select({ picks: base64Bytes(pickSets.picks) })
        .from(pickSets)
        .where(eq(pickSets.id, id));
      const decoded = decodePicks(row.picks);
      expect(Array.from(decoded.x)).toEqual(Array.from(picks.x));
      expect(Array.from(decoded.sourceRow)).toEqual([2, 3, 4]);
      expect(Number.isNaN(decoded.quality[2])).toBe(true);
      expect(decoded.horizonNames).toEqual(["H1"]);
    }
    // a pick set stored before the one codec (layout "SLP2", written here as that version wrote it) still reads
    const legacy = legacyEncodedPicks(picks);
    const fromLegacy = decodePickSet(legacy);
    expect(Array.from(fromLegacy.picks.x)).toEqual(Array.from(picks.x));
    expect(fromLegacy.picks.segmentNames).toEqual(picks.segmentNames);
    expect(fromLegacy.planes).toBeNull();
    // basis: common practice, no source (float columns of real pick sets deflate to about a third)
    const { picks: many } = parsePickCsv(demoCsv("QG-1"));
    expect(packPicks(many).byteLength).toBeLessThan(encodePicks(many).byteLength / 2);
  });

  it("cascades a study's deletion to its faults, pick sets and memberships", async () => {
    const db = await getDb();
    const [study] = await db.insert(studies).values({ name: "Gone" }).returning();
    const [fault] = await db.insert(faults).values({ studyId: study.id, name: "F" }).returning();
    await db.delete(studies).where(eq(studies.id, study.id));
    expect(await db.query.faults.findFirst({ where: eq(faults.id, fault.id) })).toBeUndefined();
  });
});

/** The layout pick sets had before the one codec: magic "SLP2", a JSON header of columns, 8-byte-aligned columns. */
function legacyEncodedPicks(picks: ReturnType<typeof tinyPicks>): Uint8Array {
  const header: { columns: { key: string; type: string; length: number }[]; plain: Record<string, unknown> } = { columns: [], plain: {} };
  const bodies: ArrayBufferView[] = [];
  for (const [key, value] of Object.entries(picks)) {
    if (ArrayBuffer.isView(value)) {
      header.columns.push({ key, type: value.constructor.name, length: (value as Float64Array).length });
      bodies.push(value);
    } else header.plain[key] = value;
  }
  const headerBytes = new TextEncoder().encode(JSON.stringify(header));
  const align = (n: number) => Math.ceil(n / 8) * 8;
  let total = align(8 + headerBytes.length);
  for (const body of bodies) total += align(body.byteLength);
  const bytes = new Uint8Array(total);
  new DataView(bytes.buffer).setUint32(0, 0x534c5032, true);
  new DataView(bytes.buffer).setUint32(4, headerBytes.length, true);
  bytes.set(headerBytes, 8);
  let offset = align(8 + headerBytes.length);
  for (const body of bodies) {
    bytes.set(new Uint8Array(body.buffer, body.byteOffset, body.byteLength), offset);
    offset += align(body.byteLength);
  }
  return bytes;
}
