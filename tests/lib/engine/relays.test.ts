import { describe, expect, it } from "vitest";
import { analyzePicks } from "@/lib/engine/pipeline";
import type { PickColumns } from "@/lib/engine/types";

// Synthetic relay pairs built here, point by point, independently of the product's generator. Segments A and B strike
// 000 (north), dip 60° east, picks every 50 m along strike and 40 m down dip from 2000 m to 2600 m depth. A runs north
// 0–3000 m, B 2400–5400 m, 200 m further east (across strike) at the same depth: a 600 m overlap. In the overlap A's
// throw falls linearly to zero at its tip while B's rises from zero, so their sum stays 40 m: the coherent transfer of
// an intact relay ramp (Peacock & Sanderson 1994, stage 2).

const DIP = (60 * Math.PI) / 180;
const DEPTHS = Array.from({ length: 16 }, (_, k) => 2000 + k * 40);

interface Builder {
  x: number[];
  y: number[];
  z: number[];
  throwM: number[];
  segment: number[];
  names: string[];
}

function builder(): Builder {
  return { x: [], y: [], z: [], throwM: [], segment: [], names: [] };
}

function add(b: Builder, name: string, x: number, y: number, z: number, throwM: number) {
  let k = b.names.indexOf(name);
  if (k < 0) k = b.names.push(name) - 1;
  b.x.push(x);
  b.y.push(y);
  b.z.push(z);
  b.throwM.push(throwM);
  b.segment.push(k);
}

/** East position of a plane dipping 60° east that crops out (at 2000 m depth) at east = offset. */
const eastAt = (offsetM: number, depthM: number) => offsetM + (depthM - 2000) / Math.tan(DIP);

/** Throw tapered to zero at the top and bottom rows, so each segment has a closed tip line. */
const dipTaper = (depthM: number) => Math.sqrt(Math.max(0, 1 - ((depthM - 2300) / 330) ** 2));

function segmentA(b: Builder) {
  for (let north = 0; north <= 3000; north += 50)
    for (const depth of DEPTHS) {
      const alongTaper = north < 600 ? north / 600 : north > 2400 ? (3000 - north) / 600 : 1;
      add(b, "A", eastAt(0, depth), north, -depth, Math.max(0.5, 40 * alongTaper * dipTaper(depth)));
    }
}

/** B, 200 m east of A; `converge` bends its southern end onto A (the offset shrinks to 0 at its southern tip). */
function segmentB(b: Builder, converge = false) {
  for (let north = 2400; north <= 5400; north += 50)
    for (const depth of DEPTHS) {
      const alongTaper = north < 3000 ? (north - 2400) / 600 : north > 4800 ? (5400 - north) / 600 : 1;
      const offset = converge ? 200 * Math.min(1, (north - 2400) / 600) : 200;
      add(b, "B", eastAt(offset, depth), north, -depth, Math.max(0.5, 40 * alongTaper * dipTaper(depth)));
    }
}

/**
 * C: a fault across the ramp from A's trace at north 2600 m to B's at north 2800 m, picked at every tenth of the way
 * across (`from`–`to` of it, skipping `gap`), throw 15 m throughout.
 */
function connector(b: Builder, from = 0, to = 1, gap: [number, number] | null = null) {
  for (let k = 0; k <= 20; k++) {
    const f = k / 20;
    if (f < from - 1e-9 || f > to + 1e-9 || (gap && f > gap[0] && f < gap[1])) continue;
    for (const depth of DEPTHS) add(b, "C", eastAt(200 * f, depth), 2600 + 200 * f, -depth, 15 * Math.max(0.2, dipTaper(depth)));
  }
}

function columns(b: Builder): PickColumns {
  const n = b.x.length;
  return {
    x: Float64Array.from(b.x),
    y: Float64Array.from(b.y),
    z: Float64Array.from(b.z),
    throwM: Float64Array.from(b.throwM),
    heaveM: new Float64Array(n).fill(NaN),
    quality: new Float64Array(n).fill(NaN),
    segment: Uint32Array.from(b.segment),
    horizon: new Int32Array(n).fill(-1),
    segmentNames: b.names,
    horizonNames: [],
    sourceRow: Uint32Array.from({ length: n }, (_, i) => i + 2),
  };
}

function relayAB(b: Builder) {
  const { report } = analyzePicks(columns(b));
  const relays = report.relays.filter((r) => r.segments.includes("A") && r.segments.includes("B"));
  expect(relays).toHaveLength(1);
  return { relay: relays[0], report };
}

describe("relay linkage from mapped evidence (docs/check-values.md R4: stages after Peacock & Sanderson 1994)", () => {
  it("an intact relay with a smooth summed profile and no connecting structure is soft-linked", () => {
    const b = builder();
    segmentA(b);
    segmentB(b);
    const { relay } = relayAB(b);
    expect(relay.linkage).toBe("soft");
    expect(relay.connection?.kind).toBe("none");
    // the picks of the two segments stay the full 200 m apart across strike (by construction, 200·sin 60° = 173 m
    // normal to the planes); the closest approach is measured normal to the other's surface
    expect(relay.connection!.closestApproachM).toBeGreaterThan(150);
    expect(relay.evidence).toMatch(/^No picks or segment connect the relay ramp; the segments stay at least 173 m apart\./);
    // the sum stays near 40 m·(depth taper) through the overlap: no deficit below 80 %
    expect(relay.summedMinimumFraction!).toBeGreaterThan(0.8);
    expect(relay.evidence).toMatch(/Summed displacement never falls below (9\d|100) % of its peak inside the overlap/);
    expect(relay.basis).toMatch(/Peacock & Sanderson \(1994\)/);
  });

  it("a segment crossing the ramp from one segment to the other, throw continuous, breaches the relay", () => {
    const b = builder();
    segmentA(b);
    segmentB(b);
    connector(b);
    const { relay, report } = relayAB(b);
    expect(relay.linkage).toBe("breached");
    expect(relay.connection).toMatchObject({ kind: "segment", via: 'segment "C"' });
    expect(relay.connection!.pickCount).toBeGreaterThanOrEqual(21 * DEPTHS.length * 0.9);
    expect(relay.connection!.throwRangeM![0]).toBeGreaterThan(0);
    expect(relay.evidence).toMatch(/^Segment "C" crosses the relay ramp inside the overlap, from one segment to the other/);
    // C strikes 45° off A and B: it is the connection, not a relay partner of its own
    expect(report.relays).toHaveLength(1);
  });

  it("a segment that reaches only halfway, or leaves a gap, does not breach the relay", () => {
    for (const [from, to, gap, words] of [
      [0, 0.5, null, "50 % of the way across)"],
      [0, 1, [0.35, 0.65], "100 % of the way across, with gaps or zero throw)"],
    ] as const) {
      const b = builder();
      segmentA(b);
      segmentB(b);
      connector(b, from, to, gap ? [gap[0], gap[1]] : null);
      const { relay } = relayAB(b);
      expect(relay.linkage).toBe("soft");
      expect(relay.evidence).toContain(`Segment "C" reaches into the ramp but does not connect the segments (${words}`);
    }
  });

  it("segments that merge into one surface are hard-linked", () => {
    const b = builder();
    segmentA(b);
    segmentB(b, true);
    const { relay } = relayAB(b);
    expect(relay.linkage).toBe("hard");
    expect(relay.connection?.kind).toBe("merged");
    expect(relay.connection!.closestApproachM).toBeLessThan(5);
    expect(relay.evidence).toMatch(/^The segments merge/);
  });
});
