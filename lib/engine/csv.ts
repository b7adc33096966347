import Papa from "papaparse";
// zod/mini: the same validation without loading zod's full API (about 50 ms of every command-line start)
import * as z from "zod/mini";
import type { FaultKinematics, LengthUnit, ParseResult, PickColumns, PlaneFit, RejectedRow } from "./types";
import { DegeneratePlaneError, fitPlane } from "./plane";
import { kinematicRowProblems } from "./kinematics";

import { MAX_REJECTED_LISTED, PickInputError, problemList, summariseProblems } from "./input-error";
import { picksToDepth } from "./time-picks";
import type { VelocityModel } from "./time-depth";

export { MAX_REJECTED_LISTED, PickInputError };
const FEET_TO_M = 0.3048;

export interface ParseOptions {
  units?: LengthUnit;
  /** keep the good rows, still listing the bad ones */
  dropBadRows?: boolean;
  /** picks at the same position in a segment: reject them (default) or average them into one */
  dedupe?: "reject" | "average";
  /** the fault's type: which throws and rakes it can use (default normal, no inversion) */
  kinematics?: FaultKinematics;
  /** converts a file in two-way time (a `twt` column in ms, throw in ms) to depth; required for such a file */
  velocityModel?: VelocityModel | null;
}

const finite = (what: string) => z.number({ error: `${what} must be a number` }).check(z.refine(Number.isFinite, { error: `${what} must be a finite number` }));
const finiteWhere = (what: string, holds: (v: number) => boolean, error: string) => finite(what).check(z.refine(holds, { error }));

export const pickRowSchema = z
  .object({
    x: finite("x"),
    y: finite("y"),
    z: z.optional(finite("z")),
    depth: z.optional(finite("depth")),
    twt: z.optional(finite("twt")),
    // the sign of throw is checked against the fault's type (lib/engine/kinematics.ts): negative only on an inverted fault
    throw: finite("throw"),
    heave: z.optional(finiteWhere("heave", (v) => v >= 0, "heave must be ≥ 0")),
    quality: z.optional(finiteWhere("quality", (v) => v >= 0 && v <= 1, "quality must be between 0 and 1")),
    hw_thickness: z.optional(finite("hw_thickness")),
    fw_thickness: z.optional(finite("fw_thickness")),
    rake: z.optional(finiteWhere("rake", (v) => v >= -180 && v <= 180, "rake must be between −180° and 180°")),
    segment: z.optional(z.string()),
    horizon: z.optional(z.string()),
  })
  .check(z.refine((r) => r.z !== undefined || r.depth !== undefined || r.twt !== undefined, { error: "z or depth is required", path: ["z"] }));

export type PickRow = z.infer<typeof pickRowSchema>;

const NUMERIC = ["x", "y", "z", "depth", "throw", "heave", "quality", "hw_thickness", "fw_thickness", "rake"] as const;
const KNOWN = new Set<string>([...NUMERIC, "segment", "horizon", "twt"]);

function toNumber(raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  const s = raw.trim();
  if (s === "") return undefined;
  return Number(s);
}

/** Parse and validate a pick CSV (header row required, names case-insensitive) into flat columns in metres. */
export function parsePickCsv(text: string, options: ParseOptions = {}): ParseResult {
  const units = options.units ?? "m";
  const scale = units === "ft" ? FEET_TO_M : 1;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const problems = problemList();
  const { rejected, reject } = problems;
  const warnings: string[] = [];
  // clean numeric files take a tight loop over the string; anything it cannot vouch for goes through papaparse + zod
  const table = readRowsFast(body, scale) ?? readRowsGeneral(body, scale, reject);
  const { rows, count, xs, ys, zs, ts, hs, qs, seg, hor, src, segmentNames, horizonNames } = table;
  const cut = <T extends Float64Array | Uint32Array | Int32Array>(a: T): T => (a.length === count ? a : (a.slice(0, count) as T));

  let picks: PickColumns = {
    x: cut(xs),
    y: cut(ys),
    z: cut(zs),
    throwM: cut(ts),
    heaveM: cut(hs),
    quality: cut(qs),
    segment: cut(seg),
    horizon: cut(hor),
    segmentNames,
    horizonNames,
    sourceRow: cut(src),
  };
  if (table.hw && table.fw) picks = { ...picks, hwThicknessM: cut(table.hw), fwThicknessM: cut(table.fw) };
  if (table.rake) picks = { ...picks, rakeDeg: cut(table.rake) };
  let twtColumn = table.twt ? cut(table.twt) : undefined;

  // throws and rakes the fault's type cannot use
  const kinematic = kinematicRowProblems(picks, options.kinematics ?? { sense: "normal" });
  if (kinematic.length) {
    const bad = new Set(kinematic.map((problem) => problem.row));
    for (const problem of kinematic) reject(problem);
    // listed in row order, like the rows the reader rejected
    rejected.sort((a, b) => a.row - b.row);
    const kept: number[] = [];
    for (let i = 0; i < picks.x.length; i++) if (!bad.has(picks.sourceRow[i])) kept.push(i);
    picks = selectPicks(picks, kept);
    if (twtColumn) {
      const times = twtColumn;
      twtColumn = Float64Array.from(kept, (i) => times[i]);
    }
  }
  if (twtColumn) {
    // two-way time: each wall converted to depth on its own (lib/engine/time-picks.ts), once every row is known good
    if (problems.count > 0 && !options.dropBadRows) throw new PickInputError(summarise(rejected, problems.count), rejected, problems.count > rejected.length);
    if (picks.x.length > 0) {
      const converted = picksToDepth(picks, twtColumn, options.velocityModel);
      picks = converted.picks;
      warnings.push(...converted.warnings);
    }
  }

  const dedupe = options.dedupe ?? "reject";
  const dup = handleDuplicates(picks, dedupe, Boolean(options.dropBadRows), reject);
  picks = dup.picks;
  if (dup.merged > 0) warnings.push(`${dup.merged} duplicate picks averaged into the pick at the same position`);

  if (problems.count > 0 && !options.dropBadRows) {
    throw new PickInputError(summarise(rejected, problems.count), rejected, problems.count > rejected.length);
  }

  const segmentProblems: RejectedRow[] = [];
  const perSegment = indicesBySegment(picks);
  // the check fits each segment's plane (unweighted); the fit is handed on, so the analysis does not fit it again
  const planes: (PlaneFit | null)[] = perSegment.map(() => null);
  perSegment.forEach((ids, si) => {
    const name = picks.segmentNames[si];
    if (ids.length < 3) {
      segmentProblems.push({
        row: ids.length ? picks.sourceRow[ids[0]] : 1,
        column: "segment",
        reason: `segment "${name}" has ${ids.length} usable picks; at least 3 are needed`,
      });
      return;
    }
    try {
      planes[si] = fitPlane(picks.x, picks.y, picks.z, ids);
    } catch (e) {
      if (!(e instanceof DegeneratePlaneError)) throw e;
      segmentProblems.push({ row: picks.sourceRow[ids[0]], column: "x,y,z", reason: `segment "${name}": ${e.message}` });
    }
  });
  if (picks.x.length === 0) segmentProblems.push({ row: 2, column: "x", reason: "no usable picks" });
  if (segmentProblems.length) {
    const all = [...rejected, ...segmentProblems].slice(0, MAX_REJECTED_LISTED);
    throw new PickInputError(summarise(segmentProblems, segmentProblems.length), all, problems.count + segmentProblems.length > all.length);
  }

  return { picks, planes, rows, accepted: picks.x.length, rejected, rejectedTruncated: problems.count > rejected.length, warnings };
}

interface RowTable {
  /** data rows after the header (empty lines not counted) */
  rows: number;
  /** accepted rows: the first `count` entries of each column */
  count: number;
  xs: Float64Array;
  ys: Float64Array;
  zs: Float64Array;
  ts: Float64Array;
  hs: Float64Array;
  qs: Float64Array;
  seg: Uint32Array;
  hor: Int32Array;
  src: Uint32Array;
  segmentNames: string[];
  horizonNames: string[];
  /** hanging-wall / footwall interval thickness (m), only when the file has those columns */
  hw?: Float64Array;
  fw?: Float64Array;
  /** rake (degrees), only when the file has that column */
  rake?: Float64Array;
  /** two-way time (ms) of each pick in a time file (z is then NaN and the throw is in ms until converted) */
  twt?: Float64Array;
}

/** The general reader: papaparse for the CSV grammar (quotes, delimiters, line endings), zod for each row. */
function readRowsGeneral(text: string, scale: number, reject: (r: RejectedRow) => void): RowTable {
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true });
  const table = parsed.data;
  if (table.length === 0) throw new PickInputError("the file is empty; a header row with x, y, z (or depth) and throw is required", []);
  const header = table[0].map((h) => h.trim().toLowerCase());
  const col = new Map<string, number>();
  header.forEach((h, i) => {
    if (KNOWN.has(h) && !col.has(h)) col.set(h, i);
  });
  const missing: RejectedRow[] = [];
  for (const need of ["x", "y", "throw"])
    if (!col.has(need)) missing.push({ row: 1, column: need, reason: `required column "${need}" is missing from the header` });
  // a file in two-way time has a twt column (ms) and no z or depth; beside z or depth a twt column is not read
  const timeFile = !col.has("z") && !col.has("depth") && col.has("twt");
  if (!timeFile) col.delete("twt");
  if (!col.has("z") && !col.has("depth") && !timeFile)
    missing.push({ row: 1, column: "z", reason: 'required column "z" (or "depth", or "twt" in ms) is missing from the header' });
  if (missing.length) throw new PickInputError(`header row 1: ${missing.map((m) => m.reason).join("; ")}`, missing);

  const rows = table.length - 1;
  const n = rows;
  const xs = new Float64Array(n),
    ys = new Float64Array(n),
    zs = new Float64Array(n),
    ts = new Float64Array(n);
  const hs = new Float64Array(n),
    qs = new Float64Array(n);
  const thick = col.has("hw_thickness") || col.has("fw_thickness");
  const hw = thick ? new Float64Array(n) : undefined,
    fw = thick ? new Float64Array(n) : undefined;
  const rake = col.has("rake") ? new Float64Array(n) : undefined;
  const seg = new Uint32Array(n),
    hor = new Int32Array(n),
    src = new Uint32Array(n);
  const twt = timeFile ? new Float64Array(n) : undefined;
  const segmentNames: string[] = [];
  const segmentIndex = new Map<string, number>();
  const horizonNames: string[] = [];
  const horizonIndex = new Map<string, number>();
  const idx = (name: string) => col.get(name);
  let count = 0;
  for (let r = 1; r < table.length; r++) {
    const cells = table[r];
    const rowNo = r + 1;
    if (cells.every((c) => c.trim() === "")) continue;
    const candidate: Record<string, unknown> = {};
    for (const name of [...NUMERIC, "twt"]) {
      const i = idx(name);
      if (i === undefined) continue;
      const v = toNumber(cells[i]);
      if (v !== undefined) candidate[name] = v;
    }
    for (const name of ["segment", "horizon"] as const) {
      const i = idx(name);
      if (i === undefined) continue;
      const v = cells[i]?.trim();
      if (v) candidate[name] = v;
    }
    for (const name of ["x", "y", "throw"] as const) {
      const i = idx(name)!;
      if (cells[i] === undefined || cells[i].trim() === "") candidate[name] = undefined;
    }
    const result = pickRowSchema.safeParse(candidate);
    if (!result.success) {
      const seen = new Set<string>();
      for (const issue of result.error.issues) {
        const column = String(issue.path[0] ?? "row");
        if (seen.has(column)) continue;
        seen.add(column);
        const raw = col.has(column) ? cells[col.get(column)!] : undefined;
        const reason = raw === undefined || raw.trim() === "" ? `${column} is missing` : `${issue.message} (got "${raw.trim()}")`;
        reject({ row: rowNo, column, reason });
      }
      continue;
    }
    const row = result.data;
    xs[count] = row.x * scale;
    ys[count] = row.y * scale;
    if (twt) {
      // times and time throws are in ms whatever the length unit
      zs[count] = NaN;
      twt[count] = row.twt as number;
      ts[count] = row.throw;
    } else {
      zs[count] = (row.z !== undefined ? row.z : -(row.depth as number)) * scale;
      ts[count] = row.throw * scale;
    }
    hs[count] = row.heave !== undefined ? row.heave * scale : NaN;
    qs[count] = row.quality ?? NaN;
    if (hw && fw) {
      hw[count] = row.hw_thickness !== undefined ? row.hw_thickness * scale : NaN;
      fw[count] = row.fw_thickness !== undefined ? row.fw_thickness * scale : NaN;
    }
    if (rake) rake[count] = row.rake ?? NaN;
    const segName = row.segment ?? "main";
    let si = segmentIndex.get(segName);
    if (si === undefined) {
      si = segmentNames.length;
      segmentNames.push(segName);
      segmentIndex.set(segName, si);
    }
    seg[count] = si;
    if (row.horizon !== undefined) {
      let hi = horizonIndex.get(row.horizon);
      if (hi === undefined) {
        hi = horizonNames.length;
        horizonNames.push(row.horizon);
        horizonIndex.set(row.horizon, hi);
      }
      hor[count] = hi;
    } else hor[count] = -1;
    src[count] = rowNo;
    count++;
  }

  return { rows, count, xs, ys, zs, ts, hs, qs, seg, hor, src, segmentNames, horizonNames, hw, fw, rake, twt };
}

// ---- fast reader for clean numeric files -------------------------------------------------------------------------

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
const ROLE_IGNORED = -1;
const ROLE_SEGMENT = NUMERIC.length;
const ROLE_HORIZON = NUMERIC.length + 1;

/** where the last cellNumber/skipCell call stopped: the index of the "," or line-end character (or text.length) */
let cellEnd = 0;

const isCellEnd = (c: number) => c === 44 || c === 10 || c === 13;

/** Skip one cell from `from`; sets cellEnd. */
function skipCell(text: string, from: number): void {
  const len = text.length;
  let p = from;
  while (p < len && !isCellEnd(text.charCodeAt(p))) p++;
  cellEnd = p;
}

/**
 * Number(cell.trim()) for the cell starting at `from` (up to the next "," or line end, which it stores in
 * cellEnd), or undefined for a blank cell. Plain decimals of at most 15 significant digits and a power of ten
 * within ±22 are converted as one exact integer times or divided by an exact power of ten — a single correctly
 * rounded operation, so the result is bit-for-bit what Number() gives (Clinger 1990, the "fast path" of
 * decimal-to-binary conversion); every other spelling goes to Number() itself.
 */
function cellNumber(text: string, from: number): number | undefined {
  const len = text.length;
  let p = from;
  let c = text.charCodeAt(p);
  while (c === 32) c = text.charCodeAt(++p);
  let negative = false;
  if (c === 45 || c === 43) {
    negative = c === 45;
    c = text.charCodeAt(++p);
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let fraction = 0;
  let seenDot = false;
  let exponent = 0;
  let exact = true;
  for (;;) {
    if (c >= 48 && c <= 57) {
      digits++;
      if (mantissa !== 0 || c !== 48) significant++;
      mantissa = mantissa * 10 + (c - 48);
      if (seenDot) fraction++;
    } else if (c === 46 && !seenDot) seenDot = true;
    else break;
    c = text.charCodeAt(++p);
  }
  if (digits > 0 && (c === 101 || c === 69)) {
    c = text.charCodeAt(++p);
    let expNegative = false;
    if (c === 45 || c === 43) {
      expNegative = c === 45;
      c = text.charCodeAt(++p);
    }
    let expDigits = 0;
    while (c >= 48 && c <= 57 && exponent < 1000) {
      exponent = exponent * 10 + (c - 48);
      expDigits++;
      c = text.charCodeAt(++p);
    }
    if (expDigits === 0) exact = false;
    if (expNegative) exponent = -exponent;
  }
  while (c === 32) c = text.charCodeAt(++p);
  // c is NaN at the end of the text
  if (p < len && !isCellEnd(c)) {
    exact = false;
    while (p < len && !isCellEnd(text.charCodeAt(p))) p++;
  }
  cellEnd = p;
  const power = exponent - fraction;
  if (!exact || digits === 0 || significant > 15 || power < -22 || power > 22) {
    const cell = text.slice(from, p).trim();
    return cell === "" ? undefined : Number(cell);
  }
  const value = power === 0 ? mantissa : power > 0 ? mantissa * POW10[power] : mantissa / POW10[-power];
  return negative ? -value : value;
}

/**
 * A tight loop over the string for the common case: comma-separated, no quotes, no other delimiter candidates,
 * consistent line endings, and every row valid. Rows are numbered exactly as the general reader numbers them.
 * Returns null whenever the file falls outside that case (or has any bad row), so the general reader produces
 * the messages; the accepted numbers are bit-identical to the general reader's.
 */
function readRowsFast(text: string, scale: number): RowTable | null {
  const len = text.length;
  // characters that make papaparse quote-aware or pick another delimiter
  if (
    text.indexOf('"') >= 0 ||
    text.indexOf("\t") >= 0 ||
    text.indexOf("|") >= 0 ||
    text.indexOf(";") >= 0 ||
    text.indexOf("\x1e") >= 0 ||
    text.indexOf("\x1f") >= 0
  )
    return null;
  const newlines = countOf(text, "\n");
  const returns = countOf(text, "\r");
  // papaparse splits on "\r\n" when every "\r" is followed by "\n"; mixed endings go to the general reader
  const crlf = returns > 0;
  if (crlf && returns !== newlines) return null;
  /** start of the next line after the line-end character at e, or -1 when the ending is not the file's kind */
  const nextLine = (e: number): number => {
    if (e >= len) return len;
    const c = text.charCodeAt(e);
    if (c === 13) return text.charCodeAt(e + 1) === 10 ? e + 2 : -1;
    return crlf ? -1 : e + 1;
  };

  // header: the first non-empty line
  let pos = 0;
  let headerEnd = pos;
  for (;;) {
    headerEnd = pos;
    while (headerEnd < len && text.charCodeAt(headerEnd) !== 10 && text.charCodeAt(headerEnd) !== 13) headerEnd++;
    if (headerEnd > pos || headerEnd >= len) break;
    pos = nextLine(headerEnd);
    if (pos < 0) return null;
  }
  if (headerEnd <= pos) return null;
  const header = text
    .slice(pos, headerEnd)
    .split(",")
    .map((h) => h.trim().toLowerCase());
  const roles = new Int32Array(header.length).fill(ROLE_IGNORED);
  const seen = new Set<string>();
  header.forEach((h, i) => {
    if (!KNOWN.has(h) || seen.has(h)) return;
    seen.add(h);
    roles[i] = h === "segment" ? ROLE_SEGMENT : h === "horizon" ? ROLE_HORIZON : (NUMERIC as readonly string[]).indexOf(h);
  });
  if (!seen.has("x") || !seen.has("y") || !seen.has("throw") || (!seen.has("z") && !seen.has("depth"))) return null;
  // interval thicknesses and rakes: the general reader keeps them
  if (seen.has("hw_thickness") || seen.has("fw_thickness") || seen.has("rake")) return null;
  const [X, Y, Z, DEPTH, THROW, HEAVE, QUALITY] = [0, 1, 2, 3, 4, 5, 6];
  const roleCount = roles.length;

  const capacity = newlines + 1;
  const xs = new Float64Array(capacity),
    ys = new Float64Array(capacity),
    zs = new Float64Array(capacity),
    ts = new Float64Array(capacity);
  const hs = new Float64Array(capacity),
    qs = new Float64Array(capacity);
  const seg = new Uint32Array(capacity),
    hor = new Int32Array(capacity),
    src = new Uint32Array(capacity);
  const segments = new NameTable();
  const horizons = new NameTable();
  const values = new Float64Array(NUMERIC.length);
  const present = new Uint8Array(NUMERIC.length);
  let rowCounter = 1; // papaparse rows so far, header included
  let count = 0;
  pos = nextLine(headerEnd);
  if (pos < 0) return null;
  while (pos < len) {
    const start = pos;
    const first = text.charCodeAt(start);
    if (first === 10 || first === 13) {
      // an empty line is not a row
      pos = nextLine(start);
      if (pos < 0) return null;
      continue;
    }
    rowCounter++;
    for (let k = 0; k < present.length; k++) present[k] = 0;
    let segmentFrom = -1,
      segmentTo = -1,
      horizonFrom = -1,
      horizonTo = -1;
    let p = start;
    for (let c = 0; ; c++) {
      const role = c < roleCount ? roles[c] : ROLE_IGNORED;
      if (role >= 0 && role < ROLE_SEGMENT) {
        const v = cellNumber(text, p);
        if (v !== undefined) {
          values[role] = v;
          present[role] = 1;
        }
      } else {
        skipCell(text, p);
        if (role === ROLE_SEGMENT) {
          segmentFrom = p;
          segmentTo = cellEnd;
        } else if (role === ROLE_HORIZON) {
          horizonFrom = p;
          horizonTo = cellEnd;
        }
      }
      if (cellEnd < len && text.charCodeAt(cellEnd) === 44) p = cellEnd + 1;
      else break;
    }
    const end = cellEnd;
    pos = nextLine(end);
    if (pos < 0) return null;
    if (!present[X] && !present[Y] && !present[THROW]) {
      // a row of blank cells is skipped (but still counted); anything else here is a bad row
      if (!blankRow(text, start, end)) return null;
      continue;
    }
    if (!present[X] || !present[Y] || !present[THROW] || (!present[Z] && !present[DEPTH])) return null;
    for (let k = 0; k < NUMERIC.length; k++) if (present[k] && !Number.isFinite(values[k])) return null;
    if (!(values[THROW] >= 0)) return null;
    if (present[HEAVE] && !(values[HEAVE] >= 0)) return null;
    if (present[QUALITY] && !(values[QUALITY] >= 0 && values[QUALITY] <= 1)) return null;
    xs[count] = values[X] * scale;
    ys[count] = values[Y] * scale;
    zs[count] = (present[Z] ? values[Z] : -values[DEPTH]) * scale;
    ts[count] = values[THROW] * scale;
    hs[count] = present[HEAVE] ? values[HEAVE] * scale : NaN;
    qs[count] = present[QUALITY] ? values[QUALITY] : NaN;
    seg[count] = segmentFrom < 0 ? segments.named("main") : segments.lookup(text, segmentFrom, segmentTo, "main");
    hor[count] = horizonFrom < 0 ? -1 : horizons.lookup(text, horizonFrom, horizonTo, null);
    src[count] = rowCounter;
    count++;
  }
  return { rows: rowCounter - 1, count, xs, ys, zs, ts, hs, qs, seg, hor, src, segmentNames: segments.names, horizonNames: horizons.names };
}

/** occurrences of one character (kept out of readRowsFast so its own loop is optimised on its own) */
function countOf(text: string, ch: string): number {
  let count = 0;
  for (let p = text.indexOf(ch); p >= 0; p = text.indexOf(ch, p + 1)) count++;
  return count;
}

function blankRow(text: string, start: number, end: number): boolean {
  for (let q = start; q < end; q++) {
    const ch = text.charCodeAt(q);
    if (ch !== 44 && ch !== 32) return false;
  }
  return true;
}

/** Segment or horizon names in order of first use; consecutive rows usually repeat a cell verbatim, so compare before slicing. */
class NameTable {
  readonly names: string[] = [];
  private readonly index = new Map<string, number>();
  private lastRaw = "";
  private last = -1;
  private hasLast = false;

  named(name: string): number {
    let found = this.index.get(name);
    if (found === undefined) {
      found = this.names.length;
      this.names.push(name);
      this.index.set(name, found);
    }
    return found;
  }

  /** index of the trimmed cell text[from, to); a blank cell is `blank` (or -1 when that is null) */
  lookup(text: string, from: number, to: number, blank: string | null): number {
    if (this.hasLast && to - from === this.lastRaw.length && text.startsWith(this.lastRaw, from)) return this.last;
    const raw = text.slice(from, to);
    const name = raw.trim() || blank;
    const found = name === null ? -1 : this.named(name);
    this.lastRaw = raw;
    this.last = found;
    this.hasLast = true;
    return found;
  }
}

const summarise = (list: RejectedRow[], total: number) => summariseProblems(list, total, "pick file");

/** The picks `ids` (in that order): every column, optional ones included. */
export function selectPicks(picks: PickColumns, ids: number[]): PickColumns {
  const take = <T extends Float64Array | Uint32Array | Int32Array>(a: T): T => {
    const out = new (a.constructor as new (len: number) => T)(ids.length);
    ids.forEach((id, k) => (out[k] = a[id]));
    return out;
  };
  const out: PickColumns = {
    ...picks,
    x: take(picks.x),
    y: take(picks.y),
    z: take(picks.z),
    throwM: take(picks.throwM),
    heaveM: take(picks.heaveM),
    quality: take(picks.quality),
    segment: take(picks.segment),
    horizon: take(picks.horizon),
    sourceRow: take(picks.sourceRow),
  };
  if (picks.hwThicknessM && picks.fwThicknessM) Object.assign(out, { hwThicknessM: take(picks.hwThicknessM), fwThicknessM: take(picks.fwThicknessM) });
  if (picks.rakeDeg) out.rakeDeg = take(picks.rakeDeg);
  if (picks.twtMs && picks.throwMs) Object.assign(out, { twtMs: take(picks.twtMs), throwMs: take(picks.throwMs) });
  return out;
}

export function indicesBySegment(picks: PickColumns): Uint32Array[] {
  const counts = new Uint32Array(picks.segmentNames.length);
  for (let i = 0; i < picks.segment.length; i++) counts[picks.segment[i]]++;
  const out = Array.from(counts, (c) => new Uint32Array(c));
  const fill = new Uint32Array(counts.length);
  for (let i = 0; i < picks.segment.length; i++) {
    const s = picks.segment[i];
    out[s][fill[s]++] = i;
  }
  return out;
}

function handleDuplicates(
  picks: PickColumns,
  mode: "reject" | "average",
  dropBadRows: boolean,
  reject: (r: RejectedRow) => void,
): { picks: PickColumns; merged: number } {
  const n = picks.x.length;
  // positions hashed from their float bits into an open-addressing table of first occurrences (index + 1);
  // equal hashes are confirmed by exact comparison
  let size = 16;
  while (size < 2 * n) size *= 2;
  const mask = size - 1;
  const table = new Int32Array(size);
  const groupOf = new Int32Array(n).fill(-1);
  const buf = new Float64Array(3);
  const words = new Uint32Array(buf.buffer);
  const { x, y, z, segment } = picks;
  let duplicates = 0;
  for (let i = 0; i < n; i++) {
    buf[0] = x[i];
    buf[1] = y[i];
    buf[2] = z[i];
    let h = Math.imul(2166136261 ^ segment[i], 16777619);
    for (let w = 0; w < 6; w++) h = Math.imul(h ^ words[w], 16777619);
    h ^= h >>> 16;
    let slot = h & mask;
    let first = -1;
    for (let j = table[slot] - 1; j >= 0; slot = (slot + 1) & mask, j = table[slot] - 1) {
      if (x[j] === x[i] && y[j] === y[i] && z[j] === z[i] && segment[j] === segment[i]) {
        first = j;
        break;
      }
    }
    if (first < 0) table[slot] = i + 1;
    else {
      groupOf[i] = first;
      duplicates++;
      if (mode === "reject")
        reject({
          row: picks.sourceRow[i],
          column: "x,y,z",
          reason: `duplicate position of row ${picks.sourceRow[first]} in segment "${picks.segmentNames[picks.segment[i]]}"${dropBadRows ? " (dropped)" : '; choose "average" to merge duplicates'}`,
        });
    }
  }
  if (duplicates === 0) return { picks, merged: 0 };
  const keep = new Uint8Array(n).fill(1);
  const sumT = Float64Array.from(picks.throwM);
  const sumH = new Float64Array(n);
  const cntH = new Float64Array(n);
  const cnt = new Float64Array(n).fill(1);
  for (let i = 0; i < n; i++)
    if (Number.isFinite(picks.heaveM[i])) {
      sumH[i] = picks.heaveM[i];
      cntH[i] = 1;
    }
  for (let i = 0; i < n; i++) {
    const g = groupOf[i];
    if (g < 0) continue;
    keep[i] = 0;
    if (mode === "average") {
      sumT[g] += picks.throwM[i];
      cnt[g]++;
      if (Number.isFinite(picks.heaveM[i])) {
        sumH[g] += picks.heaveM[i];
        cntH[g]++;
      }
    }
  }
  const ids: number[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) ids.push(i);
  const out = selectPicks(picks, ids);
  if (mode === "average") {
    ids.forEach((id, k) => {
      out.throwM[k] = sumT[id] / cnt[id];
      out.heaveM[k] = cntH[id] > 0 ? sumH[id] / cntH[id] : NaN;
    });
  }
  return { picks: out, merged: mode === "average" ? duplicates : 0 };
}
