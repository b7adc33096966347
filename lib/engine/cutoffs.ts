// Reading a cut-off line file: for each mapped horizon, the line where it meets the fault on the hanging-wall side
// and on the footwall side, as vertices in a CSV. Checked in the style of the pick CSV (lib/engine/csv.ts): every bad
// row named with its column, the whole file refused unless the user drops the bad rows (and, with them, the lines and
// horizons that cannot be used).
import Papa from "papaparse";
// zod/mini, as the pick reader: the command line bundles this file
import * as z from "zod/mini";
import { MAX_REJECTED_LISTED, PickInputError, problemList, summariseProblems } from "./input-error";
import { DegeneratePlaneError, fitPlane } from "./plane";
import type { LengthUnit, RejectedRow } from "./types";

const FEET_TO_M = 0.3048;

export type Wall = "hw" | "fw";
export const WALLS: readonly Wall[] = ["hw", "fw"];
export const WALL_WORDS: Record<Wall, string> = { hw: "hanging wall", fw: "footwall" };

/** Vertices in flat columns. `vertical` is the elevation z (m, up) for a depth file, the two-way time (ms) for a time file. */
export interface CutoffColumns {
  domain: "depth" | "time";
  x: Float64Array;
  y: Float64Array;
  vertical: Float64Array;
  /** index into horizonNames */
  horizon: Uint32Array;
  /** 0 hanging wall, 1 footwall */
  wall: Uint8Array;
  /** index into segmentNames */
  segment: Uint32Array;
  horizonNames: string[];
  segmentNames: string[];
  sourceRow: Uint32Array;
}

/** One piece of one cut-off line: its vertices (indices into the columns) in order along the line. */
export interface CutoffLine {
  segment: number;
  horizon: number;
  wall: Wall;
  /** the file's `line` id, or "" */
  id: string;
  vertices: Uint32Array;
  firstRow: number;
}

export interface CutoffParseResult {
  columns: CutoffColumns;
  lines: CutoffLine[];
  /** data rows after the header */
  rows: number;
  /** vertices kept */
  accepted: number;
  rejected: RejectedRow[];
  rejectedTruncated: boolean;
  warnings: string[];
}

export interface CutoffParseOptions {
  units?: LengthUnit;
  dropBadRows?: boolean;
  /** order every line's vertices along strike (the file order is then ignored), each reordering stated in a warning */
  orderAlongStrike?: boolean;
}

export class CutoffInputError extends PickInputError {
  constructor(message: string, rejected: RejectedRow[], truncated = false) {
    super(message, rejected, truncated);
    this.name = "CutoffInputError";
  }
}

/** A cut-off file is told apart from a pick file by its `wall` column. */
export function isCutoffCsv(text: string): boolean {
  const start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let end = text.indexOf("\n", start);
  if (end < 0) end = text.length;
  return text
    .slice(start, end)
    .split(/[,;\t]/)
    .some((cell) => cell.trim().replace(/^"|"$/g, "").trim().toLowerCase() === "wall");
}

/** The file's vertical column: z or depth (m), else twt (ms); null when the header has none of them. */
export function verticalColumnOf(text: string): "z" | "depth" | "twt" | null {
  const start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const end = text.indexOf("\n", start);
  const header = Papa.parse<string[]>(text.slice(start, end < 0 ? text.length : end), { preview: 1 }).data[0] ?? [];
  const names = header.map((h) => h.trim().toLowerCase());
  return (["z", "depth", "twt"] as const).find((name) => names.includes(name)) ?? null;
}

const finite = (what: string) => z.number({ error: `${what} must be a number` }).check(z.refine(Number.isFinite, { error: `${what} must be a finite number` }));

const cutoffRowSchema = z.object({
  x: finite("x"),
  y: finite("y"),
  vertical: finite("the vertical value"),
  horizon: z.string({ error: "horizon is missing" }).check(z.minLength(1, { error: "horizon is missing" })),
  wall: z.enum(["hw", "fw"], { error: 'wall must be "hw" (hanging wall) or "fw" (footwall)' }),
  line: z.optional(z.string()),
  segment: z.optional(z.string()),
});

const WALL_SPELLINGS: Record<string, Wall> = {
  hw: "hw",
  fw: "fw",
  "hanging wall": "hw",
  "hanging-wall": "hw",
  hangingwall: "hw",
  footwall: "fw",
  "foot wall": "fw",
  "foot-wall": "fw",
};
const KNOWN = new Set(["x", "y", "z", "depth", "twt", "horizon", "wall", "line", "segment"]);

const summarise = (list: RejectedRow[], total: number) => summariseProblems(list, total, "cut-off file");

/** Parse and check a cut-off line file (header row required, names case-insensitive). Lengths in metres. */
export function parseCutoffCsv(text: string, options: CutoffParseOptions = {}): CutoffParseResult {
  const scale = options.units === "ft" ? FEET_TO_M : 1;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const problems = problemList();
  const { rejected, reject } = problems;
  const warnings: string[] = [];

  const table = Papa.parse<string[]>(body, { skipEmptyLines: true }).data;
  if (table.length === 0) throw new CutoffInputError("the file is empty; a header row with x, y, z (or depth, or twt), horizon and wall is required", []);
  const header = table[0].map((h) => h.trim().toLowerCase());
  const col = new Map<string, number>();
  header.forEach((h, i) => {
    if (KNOWN.has(h) && !col.has(h)) col.set(h, i);
  });
  const missing: RejectedRow[] = [];
  for (const need of ["x", "y", "horizon", "wall"])
    if (!col.has(need)) missing.push({ row: 1, column: need, reason: `required column "${need}" is missing from the header` });
  const verticals = (["z", "depth", "twt"] as const).filter((name) => col.has(name));
  if (verticals.length === 0) missing.push({ row: 1, column: "z", reason: 'required column "z" (or "depth" in m, or "twt" in ms) is missing from the header' });
  if (verticals.length > 1) missing.push({ row: 1, column: verticals.join(","), reason: `give one vertical column, not ${verticals.join(" and ")}` });
  if (missing.length) throw new CutoffInputError(`header row 1: ${missing.map((m) => m.reason).join("; ")}`, missing);
  const verticalName = verticals[0];
  const domain = verticalName === "twt" ? "time" : "depth";

  const n = table.length - 1;
  const xs = new Float64Array(n),
    ys = new Float64Array(n),
    vs = new Float64Array(n);
  const hor = new Uint32Array(n),
    wall = new Uint8Array(n),
    seg = new Uint32Array(n),
    src = new Uint32Array(n);
  const lineKeys: string[] = new Array(n);
  const horizonNames: string[] = [];
  const segmentNames: string[] = [];
  const indexOf = (names: string[], name: string) => {
    let at = names.indexOf(name);
    if (at < 0) {
      at = names.length;
      names.push(name);
    }
    return at;
  };
  let count = 0;
  for (let r = 1; r < table.length; r++) {
    const cells = table[r];
    const rowNo = r + 1;
    if (cells.every((c) => c.trim() === "")) continue;
    const cell = (name: string) => {
      const i = col.get(name);
      const v = i === undefined ? undefined : cells[i]?.trim();
      return v === "" ? undefined : v;
    };
    const number = (name: string) => {
      const v = cell(name);
      return v === undefined ? undefined : Number(v);
    };
    const wallText = cell("wall")?.toLowerCase();
    const candidate = {
      x: number("x"),
      y: number("y"),
      vertical: number(verticalName),
      horizon: cell("horizon") ?? "",
      wall: wallText === undefined ? undefined : (WALL_SPELLINGS[wallText] ?? wallText),
      line: cell("line"),
      segment: cell("segment"),
    };
    const result = cutoffRowSchema.safeParse(candidate);
    if (!result.success) {
      const seen = new Set<string>();
      for (const issue of result.error.issues) {
        const key = String(issue.path[0] ?? "row");
        const column = key === "vertical" ? verticalName : key;
        if (seen.has(column)) continue;
        seen.add(column);
        const raw = cell(column);
        const reason = raw === undefined ? `${column} is missing` : `${issue.message.replace("the vertical value", column)} (got "${raw}")`;
        reject({ row: rowNo, column, reason });
      }
      continue;
    }
    const row = result.data;
    if (domain === "depth") vs[count] = (verticalName === "z" ? row.vertical : -row.vertical) * scale;
    else vs[count] = row.vertical;
    xs[count] = row.x * scale;
    ys[count] = row.y * scale;
    hor[count] = indexOf(horizonNames, row.horizon);
    wall[count] = row.wall === "hw" ? 0 : 1;
    seg[count] = indexOf(segmentNames, row.segment ?? "main");
    lineKeys[count] = row.line ?? "";
    src[count] = rowNo;
    count++;
  }
  const columns: CutoffColumns = {
    domain,
    x: xs.slice(0, count),
    y: ys.slice(0, count),
    vertical: vs.slice(0, count),
    horizon: hor.slice(0, count),
    wall: wall.slice(0, count),
    segment: seg.slice(0, count),
    horizonNames,
    segmentNames,
    sourceRow: src.slice(0, count),
  };
  if (problems.count > 0 && !options.dropBadRows) throw new CutoffInputError(summarise(rejected, problems.count), rejected, problems.count > rejected.length);

  // lines: the vertices of one (segment, horizon, wall, line id) in file order
  const groups = new Map<string, number[]>();
  for (let i = 0; i < count; i++) {
    const key = `${columns.segment[i]}\u0000${columns.horizon[i]}\u0000${columns.wall[i]}\u0000${lineKeys[i]}`;
    let list = groups.get(key);
    if (!list) groups.set(key, (list = []));
    list.push(i);
  }
  const lineProblems: RejectedRow[] = [];
  const lines: CutoffLine[] = [];
  /** walls whose lines were refused: their horizon is not reported again as lacking that wall */
  const refusedWalls = new Set<string>();
  const axes = columns.segmentNames.map((_, s) => strikeAxisOf(columns, s));
  for (const indices of groups.values()) {
    const first = indices[0];
    const line: CutoffLine = {
      segment: columns.segment[first],
      horizon: columns.horizon[first],
      wall: columns.wall[first] === 0 ? "hw" : "fw",
      id: lineKeys[first],
      vertices: Uint32Array.from(indices),
      firstRow: columns.sourceRow[first],
    };
    const checked = checkLine(columns, line, axes[line.segment], Boolean(options.orderAlongStrike));
    if ("problem" in checked) {
      lineProblems.push(checked.problem);
      refusedWalls.add(`${line.segment}\u0000${line.horizon}\u0000${line.wall}`);
    } else {
      if (checked.warning) warnings.push(checked.warning);
      lines.push(checked.line);
    }
  }

  // a horizon needs both walls, in each segment it appears in
  const horizonProblems: RejectedRow[] = [];
  const usable = new Set<string>();
  const byHorizon = new Map<string, { walls: Set<Wall>; firstRow: number }>();
  for (const line of lines) {
    const key = `${line.segment}\u0000${line.horizon}`;
    const entry = byHorizon.get(key) ?? { walls: new Set<Wall>(), firstRow: line.firstRow };
    entry.walls.add(line.wall);
    entry.firstRow = Math.min(entry.firstRow, line.firstRow);
    byHorizon.set(key, entry);
  }
  for (const [key, entry] of byHorizon) {
    const [segment, horizon] = key.split("\u0000").map(Number);
    if (entry.walls.size === 2) {
      usable.add(key);
      continue;
    }
    const present = [...entry.walls][0];
    const absent: Wall = present === "hw" ? "fw" : "hw";
    if (refusedWalls.has(`${key}\u0000${absent}`)) continue;
    horizonProblems.push({
      row: entry.firstRow,
      column: "wall",
      reason: `horizon "${columns.horizonNames[horizon]}"${segmentWords(columns, segment)} has a ${WALL_WORDS[present]} cut-off but no ${WALL_WORDS[absent]} cut-off; a throw needs both walls`,
    });
  }
  const unusable = [...lineProblems, ...horizonProblems].sort((a, b) => a.row - b.row);
  if (unusable.length && !options.dropBadRows) {
    const all = [...rejected, ...unusable].slice(0, MAX_REJECTED_LISTED);
    throw new CutoffInputError(summarise(unusable, unusable.length), all, problems.count + unusable.length > all.length);
  }
  for (const problem of unusable) reject({ ...problem, reason: `${problem.reason} (dropped)` });
  const kept = lines.filter((line) => usable.has(`${line.segment}\u0000${line.horizon}`));
  if (kept.length === 0) {
    const none = { row: 2, column: "horizon", reason: "no horizon has usable cut-off lines on both walls" };
    throw new CutoffInputError(summarise([none], 1), [...rejected, none].slice(0, MAX_REJECTED_LISTED));
  }
  let accepted = 0;
  for (const line of kept) accepted += line.vertices.length;
  return { columns, lines: kept, rows: n, accepted, rejected, rejectedTruncated: problems.count > rejected.length, warnings };
}

const segmentWords = (columns: CutoffColumns, segment: number) =>
  columns.segmentNames.length > 1 || columns.segmentNames[segment] !== "main" ? ` in segment "${columns.segmentNames[segment]}"` : "";

/** A line in words for messages: 'the footwall cut-off of "H2" (line 3) in segment "north"'. */
export function lineWords(columns: CutoffColumns, line: Pick<CutoffLine, "segment" | "horizon" | "wall" | "id">): string {
  return `the ${WALL_WORDS[line.wall]} cut-off of "${columns.horizonNames[line.horizon]}"${line.id ? ` (line ${line.id})` : ""}${segmentWords(columns, line.segment)}`;
}

/**
 * The along-strike axis of a segment's vertices in map view, before any depth conversion: the strike of the plane
 * fitted to (x, y, vertical value) — a plane in time has the same strike as in depth, its level lines being the
 * same — or, where that plane is nearly flat or undetermined, the principal axis of the horizontal positions (a
 * fault's cut-off lines spread far along strike and little across it). Used to check vertex order and to read
 * shallower horizons at a vertex's place; the stations use the plane fitted to the vertices in depth.
 */
export function strikeAxisOf(columns: CutoffColumns, segment: number): { cx: number; cy: number; ux: number; uy: number } {
  const ids: number[] = [];
  for (let i = 0; i < columns.x.length; i++) if (columns.segment[i] === segment) ids.push(i);
  let cx = 0,
    cy = 0;
  for (const i of ids) {
    cx += columns.x[i];
    cy += columns.y[i];
  }
  cx /= ids.length || 1;
  cy /= ids.length || 1;
  try {
    const plane = fitPlane(columns.x, columns.y, columns.vertical, ids);
    if (plane.dipDeg > 5) {
      const length = Math.hypot(plane.strikeVector[0], plane.strikeVector[1]);
      return { cx, cy, ux: plane.strikeVector[0] / length, uy: plane.strikeVector[1] / length };
    }
  } catch (error) {
    if (!(error instanceof DegeneratePlaneError)) throw error;
  }
  let xx = 0,
    xy = 0,
    yy = 0;
  for (const i of ids) {
    const dx = columns.x[i] - cx;
    const dy = columns.y[i] - cy;
    xx += dx * dx;
    xy += dx * dy;
    yy += dy * dy;
  }
  // principal direction of the 2×2 scatter matrix
  const angle = 0.5 * Math.atan2(2 * xy, xx - yy);
  return { cx, cy, ux: Math.cos(angle), uy: Math.sin(angle) };
}

type LineCheck = { line: CutoffLine; warning: string | null } | { problem: RejectedRow };

/**
 * Checks one line in a vertical section along strike (u along the segment's strike axis, v the vertical value):
 * vertices repeated in a row are dropped; a line with one vertex, no length or no extent along strike is refused; a
 * line that crosses itself is refused naming the rows of the two pieces that cross; a line whose vertices go back and
 * forth along strike without crossing is ordered along strike, with a warning. The line comes back ordered by u.
 */
function checkLine(columns: CutoffColumns, line: CutoffLine, axis: ReturnType<typeof strikeAxisOf>, orderAlongStrike: boolean): LineCheck {
  const words = lineWords(columns, line);
  const u = (i: number) => (columns.x[i] - axis.cx) * axis.ux + (columns.y[i] - axis.cy) * axis.uy;
  const v = (i: number) => columns.vertical[i];
  const distinct: number[] = [];
  for (const i of line.vertices) {
    const last = distinct[distinct.length - 1];
    if (last !== undefined && columns.x[last] === columns.x[i] && columns.y[last] === columns.y[i] && columns.vertical[last] === columns.vertical[i]) continue;
    distinct.push(i);
  }
  const dropped = line.vertices.length - distinct.length;
  const where = { row: line.firstRow, column: "x,y" };
  if (line.vertices.length < 2) return { problem: { ...where, reason: `${words} has one vertex; a cut-off line needs at least two` } };
  if (distinct.length < 2) return { problem: { ...where, reason: `${words} has zero length: all its vertices are at the same place` } };
  let uMin = Infinity,
    uMax = -Infinity;
  for (const i of distinct) {
    uMin = Math.min(uMin, u(i));
    uMax = Math.max(uMax, u(i));
  }
  const extent = uMax - uMin;
  if (!(extent > 1e-6)) return { problem: { ...where, reason: `${words} has no length along strike: its vertices are all at one place in map view` } };

  const tolerance = 1e-9 * Math.max(1, extent);
  let forward = 0,
    backward = 0;
  for (let k = 1; k < distinct.length; k++) {
    const du = u(distinct[k]) - u(distinct[k - 1]);
    if (du > tolerance) forward++;
    else if (du < -tolerance) backward++;
  }
  const inOrder = forward === 0 || backward === 0;
  let ordered = distinct;
  let warning: string | null = dropped > 0 ? `${words}: ${dropped} repeated vertex${dropped === 1 ? "" : "es"} dropped` : null;
  const sortAlong = () => [...distinct].sort((a, b) => u(a) - u(b));
  if (!inOrder && orderAlongStrike) {
    ordered = sortAlong();
    warning = `${words} (from row ${line.firstRow}) was not in order along the line; its vertices were ordered along strike as asked`;
  } else if (!inOrder) {
    const crossing = selfCrossing(distinct.map(u), distinct.map(v));
    if (crossing) {
      const [a, b] = crossing;
      const rowOf = (k: number) => columns.sourceRow[distinct[k]];
      return {
        problem: {
          row: rowOf(b),
          column: "x,y",
          reason: `${words} crosses itself: the piece from row ${rowOf(a)} to row ${rowOf(a + 1)} crosses the piece from row ${rowOf(b)} to row ${rowOf(b + 1)}; put the vertices in order along the line (or choose to have them ordered along strike)`,
        },
      };
    }
    ordered = sortAlong();
    warning = `${words} (from row ${line.firstRow}) goes back and forth along strike; its vertices were ordered along strike`;
  } else if (backward > 0) ordered = [...distinct].reverse();
  return { line: { ...line, vertices: Uint32Array.from(ordered) }, warning };
}

/**
 * The first pair of pieces (k, m), k < m, of a polyline (u[k], v[k]) that cross or touch, ignoring neighbouring pieces
 * meeting at their shared vertex and pieces that lie along one another (a line doubling back over its own path is out
 * of order, not crossing); null when there is none. Pieces are swept in order of their lowest u, so a line that runs
 * mostly along strike costs little more than linear time.
 */
export function selfCrossing(u: ArrayLike<number>, v: ArrayLike<number>): [number, number] | null {
  const pieces = u.length - 1;
  const order = Array.from({ length: pieces }, (_, k) => k).sort((a, b) => Math.min(u[a], u[a + 1]) - Math.min(u[b], u[b + 1]));
  let found: [number, number] | null = null;
  for (let p = 0; p < order.length; p++) {
    const k = order[p];
    const kMax = Math.max(u[k], u[k + 1]);
    for (let q = p + 1; q < order.length; q++) {
      const m = order[q];
      if (Math.min(u[m], u[m + 1]) > kMax) break;
      const [first, second] = k < m ? [k, m] : [m, k];
      if (second === first + 1) continue;
      if (piecesCross(u, v, first, second)) {
        if (!found || first < found[0] || (first === found[0] && second < found[1])) found = [first, second];
      }
    }
  }
  return found;
}

const cross = (ax: number, ay: number, bx: number, by: number, cx: number, cy: number) => (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);

function onPiece(ax: number, ay: number, bx: number, by: number, px: number, py: number) {
  return Math.min(ax, bx) <= px && px <= Math.max(ax, bx) && Math.min(ay, by) <= py && py <= Math.max(ay, by);
}

/** Pieces k and m cross, or one ends on the other, and they are not along one straight line. */
function piecesCross(u: ArrayLike<number>, v: ArrayLike<number>, k: number, m: number): boolean {
  const [ax, ay, bx, by] = [u[k], v[k], u[k + 1], v[k + 1]];
  const [cx, cy, dx, dy] = [u[m], v[m], u[m + 1], v[m + 1]];
  const d1 = cross(cx, cy, dx, dy, ax, ay);
  const d2 = cross(cx, cy, dx, dy, bx, by);
  const d3 = cross(ax, ay, bx, by, cx, cy);
  const d4 = cross(ax, ay, bx, by, dx, dy);
  if (d1 === 0 && d2 === 0) return false;
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) return true;
  return (
    (d1 === 0 && onPiece(cx, cy, dx, dy, ax, ay)) ||
    (d2 === 0 && onPiece(cx, cy, dx, dy, bx, by)) ||
    (d3 === 0 && onPiece(ax, ay, bx, by, cx, cy)) ||
    (d4 === 0 && onPiece(ax, ay, bx, by, dx, dy))
  );
}
