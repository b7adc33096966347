import { describe, expect, it } from "vitest";
import { placeLabels, type LabelPlacement, type Rect } from "@/lib/views/labels";

// Exact geometry on tiny cases (common practice for scatter labels, no source).
const bounds: Rect = { x0: 0, y0: 0, x1: 400, y1: 300 };
const overlap = (a: Rect, b: Rect) => Math.min(a.x1, b.x1) > Math.max(a.x0, b.x0) && Math.min(a.y1, b.y1) > Math.max(a.y0, b.y0);
const inside = (box: Rect) => box.x0 >= bounds.x0 && box.x1 <= bounds.x1 && box.y0 >= bounds.y0 && box.y1 <= bounds.y1;

describe("label placement", () => {
  it("a lone point gets its label right above it, centred, with the gap", () => {
    const [only] = placeLabels([{ x: 200, y: 150, width: 40, height: 14 }], bounds, { radius: 5, gap: 3 });
    expect(only).toMatchObject({ x: 200, y: 150 - 5 - 3 - 7, anchor: "middle", leader: false, overlaps: false });
    expect(only.box).toEqual({ x0: 180, y0: 128, x1: 220, y1: 142 });
  });

  it("two points at almost the same place get labels that do not overlap each other or either point", () => {
    const placed = placeLabels(
      [
        { x: 200, y: 150, width: 40, height: 14 },
        { x: 204, y: 152, width: 40, height: 14 },
      ],
      bounds,
    );
    expect(overlap(placed[0].box, placed[1].box)).toBe(false);
    const markers = [
      [200, 150],
      [204, 152],
    ].map(([x, y]) => ({ x0: x - 5, y0: y - 5, x1: x + 5, y1: y + 5 }));
    for (const label of placed) for (const marker of markers) expect(overlap(label.box, marker)).toBe(false);
    expect(placed.every((label) => !label.overlaps)).toBe(true);
  });

  it("a point at the top right corner gets its label inside the plot", () => {
    const [corner] = placeLabels([{ x: 395, y: 5, width: 60, height: 14 }], bounds);
    expect(inside(corner.box)).toBe(true);
    expect(corner.anchor).toBe("end");
  });

  it("a crowded cluster: every label stays clear of the others, some with leader lines", () => {
    const requests = Array.from({ length: 9 }, (_, k) => ({ x: 200 + (k % 3) * 6, y: 150 + Math.floor(k / 3) * 6, width: 36, height: 14 }));
    const placed: LabelPlacement[] = placeLabels(requests, bounds);
    for (let i = 0; i < placed.length; i++) for (let j = i + 1; j < placed.length; j++) expect(overlap(placed[i].box, placed[j].box), `${i}–${j}`).toBe(false);
    expect(placed.some((label) => label.leader)).toBe(true);
  });

  it("tries the preferred side first and keeps clear of obstacles", () => {
    const [right] = placeLabels([{ x: 200, y: 150, width: 40, height: 14, prefer: "right", radius: 9 }], bounds, { gap: 3 });
    expect(right).toMatchObject({ x: 200 + 9 + 3, y: 150, anchor: "start" });
    const blocked = placeLabels([{ x: 200, y: 150, width: 40, height: 14, prefer: "right" }], bounds, { obstacles: [{ x0: 205, y0: 100, x1: 300, y1: 200 }] });
    expect(blocked[0].anchor).not.toBe("start");
    expect(overlap(blocked[0].box, { x0: 205, y0: 100, x1: 300, y1: 200 })).toBe(false);
  });
});
