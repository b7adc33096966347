import Papa from "papaparse";
import { z } from "zod";
import type { LengthUnit, ParseResult, PickColumns, RejectedRow } from "./types";
import { DegeneratePlaneError, fitPlane } from "./plane";

export const MAX_REJECTED_LISTED = 200;
const FEET_TO_M = 0.3048;

export class PickInputError extends Error {
  readonly rejected: RejectedRow[];
  readonly truncated: boolean;
  constructor(message: string, rejected: RejectedRow[], truncated = false) {
    super(message);
    this.name = "PickInputError";
    this.rejected = rejected;
    this.truncated = truncated;
  }
}

export interface ParseOptions {
  units?: LengthUnit;
  /** keep the good rows, still listing the bad ones */
  dropBadRows?: boolean;
  /** picks at the same position in a segment: reject them (default) or average them into one */
  dedupe?: "reject" | "average";
}

const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be a finite number` });

export const pickRowSchema = z
  .object({
    x: finite("x"),
    y: finite("y"),
    z: finite("z").optional(),
    depth: finite("depth").optional(),
    throw: finite("throw").refine((v) => v >= 0, { message: "throw must be ≥ 0" }),
    heave: finite("heave").refine((v) => v >= 0, { message: "heave must be ≥ 0" }).optional(),
    quality: finite("quality").refine((v) => v >= 0 && v <= 1, { message: "quality must be between 0 and 1" }).optional(),
    hw_thickness: finite("hw_thickness").optional(),
    fw_thickness: finite("fw_thickness").optional(),
    segment: z.string().optional(),
    horizon: z.string().optional(),
  })
  .refine((r) => r.z !== undefined || r.depth !== undefined, { message: "z or depth is required", path: ["z"] });

export type PickRow = z.infer<typeof pickRowSchema>;

const NUMERIC = ["x", "y", "z", "depth", "throw", "heave", "quality", "hw_thickness", "fw_thickness"] as const;
const KNOWN = new Set<string>([...NUMERIC, "segment", "horizon"]);

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
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { skipEmptyLines: true });
  const table = parsed.data;
  if (table.length === 0) throw new PickInputError("the file is empty; a header row with x, y, z (or depth) and throw is required", []);
  const header = table[0].map((h) => h.trim().toLowerCase());
  const col = new Map<string, number>();
  header.forEach((h, i) => {
    if (KNOWN.has(h) && !col.has(h)) col.set(h, i);
  });
  const missing: RejectedRow[] = [];
  for (const need of ["x", "y", "throw"]) if (!col.has(need)) missing.push({ row: 1, column: need, reason: `required column "${need}" is missing from the header` });
  if (!col.has("z") && !col.has("depth")) missing.push({ row: 1, column: "z", reason: 'required column "z" (or "depth") is missing from the header' });
  if (missing.length) throw new PickInputError(`header row 1: ${missing.map((m) => m.reason).join("; ")}`, missing);

  const rejected: RejectedRow[] = [];
  let rejectedCount = 0;
  const reject = (r: RejectedRow) => {
    rejectedCount++;
    if (rejected.length < MAX_REJECTED_LISTED) rejected.push(r);
  };
  const warnings: string[] = [];
  const rows = table.length - 1;
  const n = rows;
  const xs = new Float64Array(n), ys = new Float64Array(n), zs = new Float64Array(n), ts = new Float64Array(n);
  const hs = new Float64Array(n), qs = new Float64Array(n);
  const seg = new Uint32Array(n), hor = new Int32Array(n), src = new Uint32Array(n);
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
    for (const name of NUMERIC) {
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
    zs[count] = (row.z !== undefined ? row.z : -(row.depth as number)) * scale;
    ts[count] = row.throw * scale;
    hs[count] = row.heave !== undefined ? row.heave * scale : NaN;
    qs[count] = row.quality ?? NaN;
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

  let picks: PickColumns = {
    x: xs.slice(0, count), y: ys.slice(0, count), z: zs.slice(0, count), throwM: ts.slice(0, count),
    heaveM: hs.slice(0, count), quality: qs.slice(0, count), segment: seg.slice(0, count), horizon: hor.slice(0, count),
    segmentNames, horizonNames, sourceRow: src.slice(0, count),
  };

  const dedupe = options.dedupe ?? "reject";
  const dup = handleDuplicates(picks, dedupe, Boolean(options.dropBadRows), reject);
  picks = dup.picks;
  if (dup.merged > 0) warnings.push(`${dup.merged} duplicate picks averaged into the pick at the same position`);

  if (rejectedCount > 0 && !options.dropBadRows) {
    throw new PickInputError(summarise(rejected, rejectedCount), rejected, rejectedCount > rejected.length);
  }

  const segmentProblems: RejectedRow[] = [];
  const perSegment = indicesBySegment(picks);
  perSegment.forEach((ids, si) => {
    const name = picks.segmentNames[si];
    if (ids.length < 3) {
      segmentProblems.push({ row: ids.length ? picks.sourceRow[ids[0]] : 1, column: "segment", reason: `segment "${name}" has ${ids.length} usable picks; at least 3 are needed` });
      return;
    }
    try {
      fitPlane(picks.x, picks.y, picks.z, ids);
    } catch (e) {
      if (!(e instanceof DegeneratePlaneError)) throw e;
      segmentProblems.push({ row: picks.sourceRow[ids[0]], column: "x,y,z", reason: `segment "${name}": ${e.message}` });
    }
  });
  if (picks.x.length === 0) segmentProblems.push({ row: 2, column: "x", reason: "no usable picks" });
  if (segmentProblems.length) {
    const all = [...rejected, ...segmentProblems].slice(0, MAX_REJECTED_LISTED);
    throw new PickInputError(summarise(segmentProblems, segmentProblems.length), all, rejectedCount + segmentProblems.length > all.length);
  }

  return { picks, rows, accepted: picks.x.length, rejected, rejectedTruncated: rejectedCount > rejected.length, warnings };
}

function summarise(list: RejectedRow[], total: number): string {
  const shown = list.slice(0, 10).map((r) => `row ${r.row}, column ${r.column}: ${r.reason}`);
  const more = total > shown.length ? `; and ${total - shown.length} more` : "";
  return `${total} problem${total === 1 ? "" : "s"} in the pick file: ${shown.join("; ")}${more}`;
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
  // positions hashed from their float bits; equal hashes are confirmed by exact comparison
  const buckets = new Map<number, number[]>();
  const groupOf = new Int32Array(n).fill(-1);
  const buf = new Float64Array(3);
  const words = new Uint32Array(buf.buffer);
  let duplicates = 0;
  for (let i = 0; i < n; i++) {
    buf[0] = picks.x[i];
    buf[1] = picks.y[i];
    buf[2] = picks.z[i];
    let h = Math.imul(2166136261 ^ picks.segment[i], 16777619);
    for (let w = 0; w < 6; w++) h = Math.imul(h ^ words[w], 16777619);
    const list = buckets.get(h);
    let first = -1;
    if (list) {
      for (const j of list) {
        if (picks.x[j] === picks.x[i] && picks.y[j] === picks.y[i] && picks.z[j] === picks.z[i] && picks.segment[j] === picks.segment[i]) {
          first = j;
          break;
        }
      }
    }
    if (first < 0) {
      if (list) list.push(i);
      else buckets.set(h, [i]);
    } else {
      groupOf[i] = first;
      duplicates++;
      if (mode === "reject") reject({ row: picks.sourceRow[i], column: "x,y,z", reason: `duplicate position of row ${picks.sourceRow[first]} in segment "${picks.segmentNames[picks.segment[i]]}"${dropBadRows ? " (dropped)" : '; choose "average" to merge duplicates'}` });
    }
  }
  if (duplicates === 0) return { picks, merged: 0 };
  const keep = new Uint8Array(n).fill(1);
  const sumT = Float64Array.from(picks.throwM);
  const sumH = new Float64Array(n);
  const cntH = new Float64Array(n);
  const cnt = new Float64Array(n).fill(1);
  for (let i = 0; i < n; i++) if (Number.isFinite(picks.heaveM[i])) { sumH[i] = picks.heaveM[i]; cntH[i] = 1; }
  for (let i = 0; i < n; i++) {
    const g = groupOf[i];
    if (g < 0) continue;
    keep[i] = 0;
    if (mode === "average") {
      sumT[g] += picks.throwM[i];
      cnt[g]++;
      if (Number.isFinite(picks.heaveM[i])) { sumH[g] += picks.heaveM[i]; cntH[g]++; }
    }
  }
  const ids: number[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) ids.push(i);
  const take = <T extends Float64Array | Uint32Array | Int32Array>(a: T): T => {
    const out = new (a.constructor as new (len: number) => T)(ids.length);
    ids.forEach((id, k) => (out[k] = a[id]));
    return out;
  };
  const out: PickColumns = { ...picks, x: take(picks.x), y: take(picks.y), z: take(picks.z), throwM: take(picks.throwM), heaveM: take(picks.heaveM), quality: take(picks.quality), segment: take(picks.segment), horizon: take(picks.horizon), sourceRow: take(picks.sourceRow) };
  if (mode === "average") {
    ids.forEach((id, k) => {
      out.throwM[k] = sumT[id] / cnt[id];
      out.heaveM[k] = cntH[id] > 0 ? sumH[id] / cntH[id] : NaN;
    });
  }
  return { picks: out, merged: mode === "average" ? duplicates : 0 };
}
