// Label placement for point charts: each label goes to the first of a fixed list of spots around its point where it
// overlaps no label placed before it, no other point and stays inside the plot; failing that, to a spot further out with
// a leader line, and only as a last resort to the spot that overlaps least. Greedy, in the order given (common
// practice for scatter-plot labels, no single source). Pure: pixel geometry in, positions out.

export interface Rect {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

export interface LabelRequest {
  /** the point, in pixels */
  x: number;
  y: number;
  /** the label's size, in pixels */
  width: number;
  height: number;
  /** this point's marker radius, if not the common one */
  radius?: number;
  /** the side to try first */
  prefer?: "above" | "right" | "below" | "left";
}

export interface LabelPlacement {
  /** the text's anchor, in pixels: its left edge, centre or right edge (`anchor`), vertically its middle */
  x: number;
  y: number;
  anchor: "start" | "middle" | "end";
  /** drawn away from its point: connect them with a line */
  leader: boolean;
  /** no free spot was found; this one overlaps least */
  overlaps: boolean;
  box: Rect;
}

type Side = [dx: -1 | 0 | 1, dy: -1 | 0 | 1];
// above, right, below, left, then the four diagonals
const SIDES: Side[] = [
  [0, -1],
  [1, 0],
  [0, 1],
  [-1, 0],
  [1, -1],
  [-1, -1],
  [1, 1],
  [-1, 1],
];
const PREFERRED: Record<NonNullable<LabelRequest["prefer"]>, Side> = { above: [0, -1], right: [1, 0], below: [0, 1], left: [-1, 0] };

function sidesFor(request: LabelRequest): Side[] {
  if (!request.prefer) return SIDES;
  const first = PREFERRED[request.prefer];
  return [first, ...SIDES.filter((side) => side !== first)];
}

function overlapArea(a: Rect, b: Rect): number {
  const w = Math.min(a.x1, b.x1) - Math.max(a.x0, b.x0);
  const h = Math.min(a.y1, b.y1) - Math.max(a.y0, b.y0);
  return w > 0 && h > 0 ? w * h : 0;
}

function outside(box: Rect, bounds: Rect): number {
  const inside = overlapArea(box, bounds);
  return (box.x1 - box.x0) * (box.y1 - box.y0) - inside;
}

/** The label box on side `side` of a point, `distance` pixels clear of the point's marker of radius `radius`. */
function candidate(request: LabelRequest, [dx, dy]: Side, radius: number, distance: number): LabelPlacement {
  const reach = radius + distance;
  const { width, height } = request;
  const cx = request.x + dx * (reach + (dx === 0 ? 0 : width / 2));
  const cy = request.y + dy * (reach + height / 2);
  const box = { x0: cx - width / 2, y0: cy - height / 2, x1: cx + width / 2, y1: cy + height / 2 };
  const anchor = dx === 0 ? "middle" : dx > 0 ? "start" : "end";
  const x = anchor === "middle" ? cx : anchor === "start" ? box.x0 : box.x1;
  return { x, y: cy, anchor, leader: false, overlaps: false, box };
}

/**
 * Places one label per request. `radius` is the points' marker radius; `bounds` the plotting area labels must stay in;
 * `obstacles` other things on the picture that labels must not cover.
 */
export function placeLabels(requests: LabelRequest[], bounds: Rect, options: { radius?: number; gap?: number; obstacles?: Rect[] } = {}): LabelPlacement[] {
  const gap = options.gap ?? 3;
  const radiusOf = (request: LabelRequest) => request.radius ?? options.radius ?? 5;
  const markers: Rect[] = [
    ...requests.map((r) => ({ x0: r.x - radiusOf(r), y0: r.y - radiusOf(r), x1: r.x + radiusOf(r), y1: r.y + radiusOf(r) })),
    ...(options.obstacles ?? []),
  ];
  const placed: Rect[] = [];
  const cost = (box: Rect) =>
    placed.reduce((sum, other) => sum + overlapArea(box, other), 0) +
    markers.reduce((sum, marker) => sum + overlapArea(box, marker), 0) +
    4 * outside(box, bounds);
  return requests.map((request) => {
    let best: LabelPlacement | null = null;
    let bestCost = Infinity;
    // close spots first; then further out, joined to the point by a leader line
    for (const distance of [gap, gap + request.height * 1.5, gap + request.height * 3]) {
      for (const side of sidesFor(request)) {
        const spot = candidate(request, side, radiusOf(request), distance);
        const spotCost = cost(spot.box);
        if (spotCost === 0) {
          best = { ...spot, leader: distance > gap };
          bestCost = 0;
          break;
        }
        if (spotCost < bestCost) {
          best = { ...spot, leader: distance > gap };
          bestCost = spotCost;
        }
      }
      if (bestCost === 0) break;
    }
    const chosen = { ...best!, overlaps: bestCost > 0 };
    placed.push(chosen.box);
    return chosen;
  });
}

/** Rough width in pixels of a text line in the app's sans at `fontPx` (about 0.62 em per character, bold). */
export function textWidthPx(text: string, fontPx: number): number {
  return Math.ceil(text.length * fontPx * 0.62);
}
