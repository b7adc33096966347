// Reading an uploaded pick file: pure (no I/O), so it runs in the analysis worker pool, off the web server's thread
// (a 10⁵-pick file took 0.1–0.3 s of that thread, a 10⁶-pick one about a second).
import { parsePickCsv } from "@/lib/engine/csv";
import { isCutoffCsv, parseCutoffCsv, verticalColumnOf, type CutoffParseResult } from "@/lib/engine/cutoffs";
import { deriveChecked } from "@/lib/engine/cutoff-pipeline";
import type { CutoffSummary } from "@/lib/engine/cutoff-stations";
import type { VelocityModel } from "@/lib/engine/time-depth";
import type { FaultKinematics, ParseResult, RejectedRow } from "@/lib/engine/types";
import { packColumns, packPicks } from "@/lib/picks/codec";

export const MAX_UPLOAD_BYTES = 100 * 1024 * 1024;
export const MAX_ROWS = 2_000_000;

export interface UploadParseJob {
  output: "parse";
  name: string;
  bytes: Uint8Array;
  units: "m" | "ft";
  dropBadRows: boolean;
  /** also return the picks packed for storage (lib/picks/codec.ts) */
  encode: boolean;
  /** the fault's type: which throws and rakes it can use */
  kinematics?: FaultKinematics;
  /** converts a file in two-way time to depth */
  velocityModel?: VelocityModel | null;
  /** how a cut-off file's walls are paired */
  cutoffs?: { stationSpacingM?: number; rakeDeg?: number; orderAlongStrike?: boolean; sense?: "normal" | "reverse" };
}

/** A whole multipart upload body, taken apart off the web server's thread (a 10⁵-pick form cost it ~0.25 s). */
export interface MultipartJob {
  output: "multipart";
  body: Uint8Array;
  contentType: string;
}

export interface MultipartOutput {
  /** the form's `file` field, or null when it has none */
  file: { name: string; size: number; bytes: Uint8Array } | null;
  /** the form's text fields */
  fields: Record<string, string>;
}

export const NOT_A_FORM = "Send the picks as a multipart form with a 'file' field.";

export async function readMultipart(job: MultipartJob): Promise<MultipartOutput> {
  let form: FormData;
  try {
    form = await new Response(job.body as Uint8Array<ArrayBuffer>, { headers: { "content-type": job.contentType } }).formData();
  } catch {
    throw new UploadProblem(400, NOT_A_FORM);
  }
  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") fields[key] = value;
  const file = form.get("file");
  if (!(file instanceof File)) return { file: null, fields };
  return { file: { name: file.name, size: file.size, bytes: new Uint8Array(await file.arrayBuffer()) }, fields };
}

export interface UploadParseOutput {
  /** a pick file, or a cut-off line file whose derived picks are `parsed` */
  kind: "picks" | "cutoffs";
  domain: "depth" | "time";
  parsed: ParseResult;
  encoded: Uint8Array | null;
  cutoffs?: { summary: CutoffSummary; vertexCount: number; rows: number; encodedVertices: Uint8Array | null };
}

export interface UploadProblemDetails {
  rejected: RejectedRow[];
  /** the file is in two-way time and no velocity model was given: the form asks for one */
  needsVelocityModel?: boolean;
  kind?: "picks" | "cutoffs";
  horizons?: string[];
}

/** A file that cannot be used, with the HTTP status and details the upload answers with. */
export class UploadProblem extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly details?: UploadProblemDetails,
  ) {
    super(message);
  }
}

function decodeText(name: string, bytes: Uint8Array): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes).replace(/^\uFEFF/, "");
  } catch {
    throw new UploadProblem(400, `${name} is not a UTF-8 text file. Save it as CSV (UTF-8) and try again.`);
  }
}

function countRows(text: string) {
  let rows = 0;
  for (let index = 0; index < text.length; index++) if (text.charCodeAt(index) === 10) rows++;
  return rows;
}

/** Size limits that need no reading: checked on the web server's thread before any work is handed on. */
export function checkUploadSize(name: string, bytes: Uint8Array) {
  if (bytes.byteLength === 0) throw new UploadProblem(400, `${name} is empty.`);
  if (bytes.byteLength > MAX_UPLOAD_BYTES) throw new UploadProblem(413, `${name} is larger than the 100 MB limit.`);
}

export function parseUploadedFile(job: UploadParseJob): UploadParseOutput {
  checkUploadSize(job.name, job.bytes);
  const text = decodeText(job.name, job.bytes);
  if (countRows(text) > MAX_ROWS + 1)
    throw new UploadProblem(413, `${job.name} has more than ${MAX_ROWS.toLocaleString("en")} rows, the limit for one pick set.`);
  const domain = verticalColumnOf(text) === "twt" ? "time" : "depth";
  if (isCutoffCsv(text)) return parseCutoffUpload(job, text, domain);
  let parsed: ParseResult;
  try {
    if (domain === "time" && !job.velocityModel) throw needsVelocityModel(job.name, "picks", horizonsOfTimePicks(text));
    parsed = parsePickCsv(text, { units: job.units, dropBadRows: job.dropBadRows, velocityModel: job.velocityModel, kinematics: job.kinematics });
  } catch (error) {
    throw asUploadProblem(error, "The picks cannot be used.");
  }
  return { kind: "picks", domain, parsed, encoded: job.encode ? packPicks(parsed.picks, parsed.planes) : null };
}

function asUploadProblem(error: unknown, fallback: string): unknown {
  if (error instanceof UploadProblem) return error;
  const rejected = (error as { rejected?: RejectedRow[] }).rejected;
  if (Array.isArray(rejected) || error instanceof Error)
    return new UploadProblem(422, error instanceof Error ? error.message : fallback, { rejected: rejected ?? [] });
  return error;
}

function needsVelocityModel(name: string, kind: "picks" | "cutoffs", horizons: string[]) {
  const what = kind === "cutoffs" ? "its cut-offs" : "its picks";
  return new UploadProblem(
    422,
    `${name} is in two-way time (twt, ms). Give a velocity model to convert ${what} to depth: throws, heaves and every metric are computed in depth only.`,
    {
      rejected: [],
      needsVelocityModel: true,
      kind,
      horizons,
    },
  );
}

/** The horizons named in a pick file in time (for the interval-velocity table), read with the bad rows set aside. */
function horizonsOfTimePicks(text: string): string[] {
  try {
    return parsePickCsv(text, { dropBadRows: true, velocityModel: { kind: "linear", v0MPerS: 2000, kPerS: 0 } }).picks.horizonNames;
  } catch {
    return [];
  }
}

/** A cut-off line file: checked, converted, its walls paired into the derived pick set that will be stored and analysed. */
function parseCutoffUpload(job: UploadParseJob, text: string, domain: "depth" | "time"): UploadParseOutput {
  let lines: CutoffParseResult;
  try {
    lines = parseCutoffCsv(text, { units: job.units, dropBadRows: job.dropBadRows, orderAlongStrike: job.cutoffs?.orderAlongStrike });
    if (domain === "time" && !job.velocityModel) throw needsVelocityModel(job.name, "cutoffs", lines.columns.horizonNames);
    const { derivation } = deriveChecked(lines, { ...job.cutoffs, velocityModel: job.velocityModel });
    const parsed: ParseResult = {
      picks: derivation.picks,
      rows: lines.rows,
      accepted: derivation.picks.x.length,
      rejected: lines.rejected,
      rejectedTruncated: lines.rejectedTruncated,
      warnings: derivation.summary.warnings,
    };
    return {
      kind: "cutoffs",
      domain,
      parsed,
      encoded: job.encode ? packPicks(derivation.picks) : null,
      cutoffs: { summary: derivation.summary, vertexCount: lines.accepted, rows: lines.rows, encodedVertices: job.encode ? packColumns(lines.columns) : null },
    };
  } catch (error) {
    throw asUploadProblem(error, "The cut-off lines cannot be used.");
  }
}
