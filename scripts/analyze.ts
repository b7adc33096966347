// The command line: `slipfield analyze <file.csv | - | glob>… [--json | --format text|json|csv|geojson] [options]`.
// Bundled by scripts/build-cli.mjs into dist/slipfield-cli.cjs (bin/slipfield.cjs runs it; `npm run analyze` too), so it
// starts without a TypeScript runner. The same file, started as a worker thread, is the helper that fits tip lines
// while the main thread grids and contours (lib/analysis/tipline-thread.ts).
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { isMainThread, workerData } from "node:worker_threads";
import { serveTipLineFits, threadedTipLineFitter } from "../lib/analysis/tipline-thread";
import { analyzeCsv, type PipelineResult } from "../lib/engine/pipeline";
import { PickInputError } from "../lib/engine/csv";
import { isCutoffCsv, verticalColumnOf } from "../lib/engine/cutoffs";
import { analyzeCutoffCsv, cutoffReport, depthConversionReport } from "../lib/engine/cutoff-pipeline";
import type { CutoffSummary } from "../lib/engine/cutoff-stations";
import { DEPTH_CONVERSION_CAUTION, describeVelocityModel, parseVelocityText, type VelocityModel } from "../lib/engine/time-depth";
import { formatAzimuth } from "../lib/engine/plane";
import type { AnalysisReport, FaultKinematics, FaultSense, PickColumns, ProfileModel, TipEndSide } from "../lib/engine/types";
import type { CoordinateReference } from "../lib/crs";
import { kinematicsProblems } from "../lib/engine/kinematics";
import { parseCrsText, type CoordinateReferenceInput } from "../lib/crs-text";
import { AUTOMATIC_CANDIDATES } from "../lib/engine/profiles";
import { faultGeoJson } from "../lib/views/geojson";
import { coordinateComments, gridCsv } from "../lib/views/grid-csv";
import { config } from "../lib/config";

class UsageError extends Error {}

type Format = "text" | "json" | "csv" | "geojson" | "gltf";
const FORMATS: Format[] = ["text", "json", "csv", "geojson", "gltf"];

const USAGE = `usage: slipfield analyze <file.csv | - | 'folder/*.csv'>... [options]

  -                    read the pick CSV from standard input
  --json               the analysis report as one JSON object (one per line for several files)
  --format F           text (default), json, csv (every grid node: segment, s, t, x, y, z, displacement, throw)
                       or geojson (contours, inferred tip lines and mapped limits as 3D lines in map metres),
                       or gltf (the displacement surface and tip lines as a glTF 2.0 binary model; one file only)
  --crs EPSG:C[+V]     the coordinate reference of x, y (a projected EPSG code in metres) and of z (a vertical
                       one, optional), e.g. EPSG:32631+5714: stated in csv, geojson and gltf output
  --units m|ft         units of the file (default m; feet are converted)
  --interval M         contour interval in metres (default: about 8-12 levels)
  --cell M             grid cell size in metres (default: from the pick spacing)
  --cutoff M           resolution cut-off as a throw in metres (default: estimated from the picks)
  --profile P          tip-line profile: auto (default) or one of ${AUTOMATIC_CANDIDATES.join(", ")}
  --end SIDE=STATUS    an end's status, open or inferred (SIDE: strike-start, strike-end, up-dip, down-dip); repeatable
  --sense S            the fault's type: normal (default), reverse or oblique (reverse: hanging wall up)
  --rake DEG           with --sense oblique: the fault's rake from the strike (negative normal-oblique, positive
                       reverse-oblique; at least 20° from strike-slip; a rake column overrides it per pick), whose
                       magnitude also pairs a cut-off file's walls; without it: a cut-off file's pairing rake (below)
  --inversion          negative throw is expected (the fault was inverted): kept as offset of the opposite sense
  --drop-bad-rows      analyse the good rows of a file that has bad ones (default: refuse the file)
  --velocity MODEL     velocity model for a file in two-way time (twt column, ms): "v0=1800,k=0.6" for
                       v(z) = v0 + k·z (v0 in m/s, k in 1/s), or interval velocities by horizon, shallow to deep,
                       "H1=2000,H2=2400" (m/s above each horizon)
  --spacing M          cut-off files: station spacing along strike in metres (default: from the vertex spacing)
  --rake DEG           cut-off files: rake of the slip in the fault plane, from strike, 0-180 (default 90, dip slip)
  --order-along-strike cut-off files: order each line's vertices along strike instead of taking the file's order
  -h, --help           this text

A file with a "wall" column is a cut-off line file (x, y, z or depth or twt, horizon, wall hw/fw, optional line and
segment): its hanging-wall and footwall cut-offs are paired at stations along strike into throw picks, which are then
analysed; the JSON adds "cutoffs" (per horizon: stations, maxThrowM, meanThrowM; missingStations).

Several files (or a glob) are analysed one after another; json and geojson then write one object per line with the
file's name, csv adds a leading file column. Exit status: 0 done, 2 a file could not be used or bad options, 1 failure.`;

interface Options {
  inputs: string[];
  format: Format;
  units: "m" | "ft";
  intervalM?: number;
  cellM?: number;
  throwCutoffM?: number;
  profiles?: ProfileModel[];
  ends: Partial<Record<TipEndSide, "open" | "inferred">>;
  kinematics: FaultKinematics;
  crs?: CoordinateReferenceInput;
  dropBadRows: boolean;
  velocity?: VelocityModel;
  stationSpacingM?: number;
  rakeDeg?: number;
  orderAlongStrike: boolean;
  /** --sense was given (a cut-off file's sense is otherwise the commoner one among its stations) */
  senseGiven: boolean;
  help: boolean;
}

export function parseArgs(argv: string[]): Options {
  const args = argv[0] === "analyze" ? argv.slice(1) : argv;
  const out: Options = {
    inputs: [],
    format: "text",
    units: "m",
    ends: {},
    kinematics: { sense: "normal" },
    dropBadRows: false,
    orderAlongStrike: false,
    senseGiven: false,
    help: false,
  };
  let formatGiven: string | null = null;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    const value = () => {
      const v = args[++i];
      if (v === undefined) throw new UsageError(`${a} needs a value`);
      return v;
    };
    const positive = (name: string, v: string) => {
      const n = Number(v);
      if (!(n > 0) || !Number.isFinite(n)) throw new UsageError(`${name} must be a positive number of metres, got "${v}"`);
      return n;
    };
    const setFormat = (name: string, format: string) => {
      if (!FORMATS.includes(format as Format)) throw new UsageError(`--format must be one of ${FORMATS.join(", ")}, got "${format}"`);
      if (formatGiven && formatGiven !== format) throw new UsageError(`choose one output format (got ${formatGiven} and ${format})`);
      formatGiven = format;
      out.format = format as Format;
      void name;
    };
    if (a === "--json") setFormat(a, "json");
    else if (a === "--format") setFormat(a, value());
    else if (a.startsWith("--format=")) setFormat("--format", a.slice("--format=".length));
    else if (a === "--drop-bad-rows") out.dropBadRows = true;
    else if (a === "--order-along-strike") out.orderAlongStrike = true;
    else if (a === "--velocity") {
      const v = value();
      try {
        out.velocity = parseVelocityText(v);
      } catch (e) {
        throw new UsageError(`--velocity: ${(e as Error).message}`);
      }
    } else if (a === "--spacing") out.stationSpacingM = positive("--spacing", value());
    else if (a === "--rake") {
      const v = value();
      const rake = Number(v);
      if (!Number.isFinite(rake)) throw new UsageError(`--rake must be a number of degrees, got "${v}"`);
      out.rakeDeg = rake;
    } else if (a === "-h" || a === "--help") out.help = true;
    else if (a === "--units") {
      const v = value();
      if (v !== "m" && v !== "ft") throw new UsageError(`--units must be m or ft, got "${v}"`);
      out.units = v;
    } else if (a === "--interval") out.intervalM = positive("--interval", value());
    else if (a === "--cell") out.cellM = positive("--cell", value());
    else if (a === "--cutoff") out.throwCutoffM = positive("--cutoff", value());
    else if (a === "--profile") {
      const v = value();
      if (v !== "auto" && !AUTOMATIC_CANDIDATES.includes(v as ProfileModel))
        throw new UsageError(`--profile must be auto or one of ${AUTOMATIC_CANDIDATES.join(", ")}, got "${v}"`);
      out.profiles = v === "auto" ? undefined : [v as ProfileModel];
    } else if (a === "--end") {
      const [side, status] = value().split("=");
      if (!["strike-start", "strike-end", "up-dip", "down-dip"].includes(side) || (status !== "open" && status !== "inferred"))
        throw new UsageError(`--end takes SIDE=open or SIDE=inferred, SIDE one of strike-start, strike-end, up-dip, down-dip`);
      out.ends[side as TipEndSide] = status;
    } else if (a === "--sense") {
      const v = value();
      if (v !== "normal" && v !== "reverse" && v !== "oblique") throw new UsageError(`--sense must be normal, reverse or oblique, got "${v}"`);
      out.kinematics.sense = v as FaultSense;
      out.senseGiven = true;
    } else if (a === "--inversion") out.kinematics.inversion = true;
    else if (a === "--crs") {
      const v = value();
      const parsed = parseCrsText(v);
      if (!parsed) throw new UsageError(`--crs takes EPSG codes as EPSG:32631 or EPSG:32631+5714 (horizontal+vertical), got "${v}"`);
      out.crs = parsed;
    } else if (a.startsWith("-") && a !== "-") throw new UsageError(`unknown option ${a}`);
    else out.inputs.push(a);
  }
  // --rake: an oblique fault's rake (Aki & Richards 1980, signed), else a cut-off file's pairing rake (0–180°, 90 dip slip)
  if (out.kinematics.sense === "oblique") {
    if (out.rakeDeg !== undefined) out.kinematics.rakeDeg = out.rakeDeg;
  } else if (out.rakeDeg !== undefined && !(out.rakeDeg > 0 && out.rakeDeg < 180)) {
    throw new UsageError(
      `--rake without --sense oblique is a cut-off file's pairing rake, between 0 and 180 degrees (90 is dip slip), got "${out.rakeDeg}"; for a fault whose slip is oblique add --sense oblique (normal is −90°, reverse +90°)`,
    );
  }
  const typeProblems = kinematicsProblems(out.kinematics);
  if (typeProblems.length) throw new UsageError(typeProblems.map((problem) => problem.replace(/^rake: /, "--rake: ")).join("; "));
  if (!out.help && out.inputs.length === 0) throw new UsageError("name a pick CSV to analyse (or - for standard input)");
  if (out.inputs.filter((input) => input === "-").length > 1) throw new UsageError("standard input (-) can be read only once");
  return out;
}

/** A cut-off file's pairing rake: an oblique fault's own rake (its magnitude: the slip line's angle from the strike), else --rake. */
function cutoffRakeOf(options: Options): number | undefined {
  if (options.kinematics.sense === "oblique") return options.kinematics.rakeDeg !== undefined ? Math.abs(options.kinematics.rakeDeg) : undefined;
  return options.rakeDeg;
}

/** A cut-off file's sense when --sense says it: reverse for reverse faults and reverse-oblique ones (positive rake). */
function cutoffSenseOf(options: Options): "normal" | "reverse" | undefined {
  if (!options.senseGiven) return undefined;
  const { sense, rakeDeg } = options.kinematics;
  return sense === "reverse" || (sense === "oblique" && (rakeDeg ?? -90) > 0) ? "reverse" : "normal";
}

/** A pattern's files, sorted: `*` and `?` in the last path part (for shells that pass globs through, and quoted globs). */
function expandGlob(pattern: string): string[] {
  const folder = path.dirname(pattern);
  const namePattern = path.basename(pattern);
  if (/[*?[]/.test(folder)) throw new UsageError(`wildcards are only understood in the file name, not in the folder: "${pattern}"`);
  const expression = new RegExp(
    `^${namePattern
      .replace(/[.+^${}()|\\]/g, "\\$&")
      .replace(/\*/g, "[^/]*")
      .replace(/\?/g, "[^/]")}$`,
  );
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    throw new UsageError(`cannot read the folder of "${pattern}"`);
  }
  return names
    .filter((name) => expression.test(name))
    .map((name) => (folder === "." && !pattern.startsWith("./") ? name : path.join(folder, name)))
    .filter((file) => statSync(file).isFile())
    .sort();
}

function inputList(inputs: string[]): string[] {
  return inputs.flatMap((input) => {
    if (input === "-" || !/[*?[]/.test(input)) return [input];
    try {
      if (statSync(input).isFile()) return [input];
    } catch {
      // not a file of that name: a pattern
    }
    const files = expandGlob(input);
    if (files.length === 0) throw new UsageError(`no file matches "${input}"`);
    return files;
  });
}

const f = (v: number, digits = 1) => (Number.isFinite(v) ? v.toFixed(digits) : "n/a");

interface Extras {
  cutoffs?: CutoffSummary;
  velocity?: VelocityModel;
}

function readable(report: AnalysisReport, extras: Extras = {}): string {
  const lines: string[] = [];
  lines.push(`Slipfield analysis (engine ${report.engineVersion})`);
  const derived = extras.cutoffs ? `${report.input.accepted} throw picks derived from cut-off lines` : `${report.input.accepted} picks accepted`;
  lines.push(`Input: ${report.input.rows} rows, ${derived}, ${report.input.rejected.length} rejected (units ${report.input.units}).`);
  if (extras.velocity) {
    lines.push(`Depth-converted from two-way time with ${describeVelocityModel(extras.velocity)}.`);
    lines.push(`Caution: ${DEPTH_CONVERSION_CAUTION}`);
  }
  if (extras.cutoffs) {
    const c = extras.cutoffs;
    lines.push(
      `Cut-offs: stations every ${c.stationSpacingM} m along strike (${c.stationSpacingSource === "set" ? "set" : "from the vertex spacing"}), rake ${c.rakeDeg}°${c.rakeDeg === 90 ? " (dip slip)" : ""}; ${c.missingStations} station${c.missingStations === 1 ? "" : "s"} with one wall only (reported, not filled in).`,
    );
    for (const h of c.horizons)
      lines.push(
        `  ${h.name}: ${h.stations} stations, throw max ${f(h.maxThrowM)} m, mean ${f(h.meanThrowM)} m${h.missingStations ? `, ${h.missingStations} with one wall only` : ""}`,
      );
  }
  for (const r of report.input.rejected.slice(0, 20)) lines.push(`  row ${r.row}, column ${r.column}: ${r.reason}`);
  for (const s of report.segments) {
    const tl = s.tipLine;
    lines.push("");
    lines.push(`Segment ${s.id} (${s.pickCount} picks)`);
    lines.push(
      `  plane: strike ${formatAzimuth(s.plane.strikeDeg)}°, dip ${f(s.plane.dipDeg)}° toward ${formatAzimuth(s.plane.dipDirectionDeg)}°, RMS misfit ${f(s.plane.rmsM, 2)} m`,
    );
    lines.push(
      `  maximum: displacement ${f(s.max.displacementM)} m observed (fitted ${f(s.max.fittedDisplacementM)} m, 5–95 % ${f(s.max.fittedDisplacementRangeM[0])}–${f(s.max.fittedDisplacementRangeM[1])} m), throw ${f(s.max.throwM)} m at s ${f(s.max.s, 0)} m, t ${f(s.max.t, 0)} m`,
    );
    if (s.surface)
      lines.push(
        `  surface: up to ${f(s.surface.maxOffsetM)} m from the plane (RMS ${f(s.surface.rmsOffsetM)} m), local dip ${f(s.surface.localDipRangeDeg[0])}–${f(s.surface.localDipRangeDeg[1])}° (5–95 %); ${s.surface.note}`,
      );
    lines.push(`  mapped limit (along the surface): length ${f(s.mappedLimit.lengthM, 0)} m, height ${f(s.mappedLimit.heightM, 0)} m`);
    const range = ([low, high]: [number, number | null]) => (high === null ? `from ${f(low, 0)} m, open above` : `${f(low, 0)}–${f(high, 0)} m`);
    lines.push(
      `  inferred tip line (along the surface): length ${tl.lengthIsMinimum ? "at least " : ""}${f(tl.lengthM, 0)} m (5–95 % ${range(tl.lengthRangeM)}), height ${tl.heightIsMinimum ? "at least " : ""}${f(tl.heightM, 0)} m (5–95 % ${range(tl.heightRangeM)}), aspect ${f(tl.aspectRatio, 2)}, area ${(tl.areaM2 / 1e6).toFixed(3)} km²`,
    );
    lines.push(
      `    ends: ${tl.ends.map((end) => `${end.side} ${end.status}`).join(", ")}; cut-off ${f(tl.cutoff.displacementM)} m displacement (${tl.cutoff.source})`,
    );
    lines.push(`    ${tl.method}`);
    lines.push(`    ${tl.selection}`);
    lines.push(
      `  gradients (m/m): mean ${f(s.gradients.meanPerM, 4)}, max ${f(s.gradients.maxPerM, 4)}; near tips: strike start ${f(s.gradients.tips.strikeStartPerM, 4)}, strike end ${f(s.gradients.tips.strikeEndPerM, 4)}, up dip ${f(s.gradients.tips.upDipPerM, 4)}, down dip ${f(s.gradients.tips.downDipPerM, 4)}`,
    );
    lines.push(`  asymmetry of Dmax: along strike ${f(s.asymmetry.alongStrike, 2)}, down dip ${f(s.asymmetry.downDip, 2)} (fraction of the semi-axis)`);
    lines.push(`  scaling: ${s.scaling.note}`);
    lines.push(`  contours: every ${s.contourIntervalM} m, ${s.contours.length} levels`);
  }
  if (report.kinematics) {
    lines.push("");
    lines.push(`Fault type: ${report.kinematics.note}`);
  }
  if (report.quality) {
    lines.push("");
    lines.push(`Pick quality: ${report.quality.note}`);
  }
  for (const r of report.relays) {
    lines.push("");
    lines.push(`Relay ${r.segments[0]}–${r.segments[1]}: overlap ${f(r.overlapM, 0)} m, separation ${f(r.separationM, 0)} m, ${r.linkage}-linked`);
    lines.push(`  ${r.evidence}`);
    lines.push(`  ${r.comparison}`);
  }
  if (report.warnings.length) {
    lines.push("");
    lines.push("Warnings:");
    for (const w of report.warnings) lines.push(`  - ${w}`);
  }
  return lines.join("\n");
}

/** The name a fault gets in the GeoJSON: the file's name without its extension. */
const faultNameOf = (input: string) => (input === "-" ? "stdin" : path.basename(input).replace(/\.[^.]+$/, ""));

/**
 * One input's output in the chosen format. Several inputs: json and geojson carry the file's name, csv gets a file
 * column and its header only before the first file's rows.
 */
function render(
  result: PipelineResult,
  input: string,
  format: Exclude<Format, "gltf">,
  several: boolean,
  first: boolean,
  reference: CoordinateReference | null,
  extras: Extras = {},
): string {
  switch (format) {
    case "json": {
      const report = {
        ...result.report,
        ...(extras.velocity ? { depthConversion: depthConversionReport(extras.velocity) } : {}),
        ...(extras.cutoffs ? { cutoffs: cutoffReport(extras.cutoffs) } : {}),
      };
      return JSON.stringify(several ? { file: input, ...report } : report);
    }
    case "geojson": {
      const collection = faultGeoJson(faultNameOf(input), result.report, reference);
      return JSON.stringify(several ? { ...collection, file: input } : collection);
    }
    case "csv": {
      const comments = coordinateComments(reference ? describeReference(reference) : null);
      return several ? withFileColumn(gridCsv(result, first ? comments : []), input, first) : gridCsv(result, comments).trimEnd();
    }
    case "text":
      return several ? `== ${input}\n${readable(result.report, extras)}\n` : readable(result.report, extras);
  }
}

/** A file column before every row of a CSV (header "file", kept only when `withHeader`); quoted when the name needs it. */
function withFileColumn(csv: string, input: string, withHeader: boolean): string {
  const cell = /[",\n\r]/.test(input) ? `"${input.replace(/"/g, '""')}"` : input;
  const all = csv.trimEnd().split("\n");
  const comments = all.filter((line) => line.startsWith("#"));
  const lines = all.filter((line) => !line.startsWith("#"));
  const rows = lines.slice(1).map((line) => `${cell},${line}`);
  return (withHeader ? [...comments, `file,${lines[0]}`, ...rows] : rows).join("\n");
}

function problemText(input: string, error: PickInputError): string {
  const lines = [
    `analyze: ${input === "-" ? "the pick data on standard input" : input} cannot be used (${error.rejected.length}${error.truncated ? "+" : ""} problem${error.rejected.length === 1 ? "" : "s"}):`,
  ];
  for (const r of error.rejected.slice(0, 50)) lines.push(`  row ${r.row}, column ${r.column}: ${r.reason}`);
  if (error.rejected.length > 50 || error.truncated) lines.push("  … more problems not shown");
  return lines.join("\n");
}

/** This script's own file (the CommonJS bundle, or the source under tsx), which is also the helper thread's entry. */
function thisFile(): string {
  return __filename;
}

function readInput(input: string): string {
  // bytes first, then one decode: a little quicker in Node 20 than asking readFileSync for text
  return readFileSync(input === "-" ? 0 : input).toString("utf8");
}

let describeReference: (reference: CoordinateReference) => string = () => "";
let longitudeLatitude: (x: number, y: number) => [number, number] = () => [NaN, NaN];

/** Binary output (a glTF model) to stdout. */
function writeBytes(bytes: Uint8Array) {
  process.stdout.write(bytes);
}

/** Writes everything to stdout; a closed pipe (`| head`) ends the run quietly. */
function write(text: string) {
  if (text === "") return;
  process.stdout.write(text.endsWith("\n") ? text : `${text}\n`);
}

export async function main(argv: string[]): Promise<number> {
  let options: Options;
  let inputs: string[];
  try {
    options = parseArgs(argv);
    if (options.help) {
      write(USAGE);
      return 0;
    }
    inputs = inputList(options.inputs);
  } catch (e) {
    process.stderr.write(`analyze: ${(e as Error).message}\n${e instanceof UsageError ? "(slipfield analyze --help lists the options)\n" : ""}`);
    return 2;
  }
  const several = inputs.length > 1;
  if (several && options.format === "gltf") {
    process.stderr.write("analyze: --format gltf writes one model: name one pick file\n");
    return 2;
  }
  // the coordinate reference and the glTF writer load only when asked for (they weigh on every start otherwise)
  let reference: CoordinateReference | null = null;
  if (options.crs) {
    const crs = await import("../lib/crs");
    try {
      reference = crs.checkCoordinateReference(options.crs);
    } catch (e) {
      if (!(e instanceof crs.CoordinateReferenceError)) throw e;
      process.stderr.write(`analyze: --crs: ${e.message}\n`);
      return 2;
    }
    describeReference = crs.describeCoordinateReference;
    longitudeLatitude = (x, y) => crs.toLongitudeLatitude(reference!, x, y);
  }
  // SLIPFIELD_TIPLINE_THREAD=on: a helper thread fits the tip lines while this thread grids and contours (started now,
  // while this thread reads and parses). Off by default: in a fresh process the helper's own start-up and colder code
  // cost as much as the overlap saves, on 2,000 and on 100,000 picks alike (bench/cli.ts; the server's warm worker gains).
  const helper = config().SLIPFIELD_TIPLINE_THREAD === "on" ? threadedTipLineFitter(thisFile()) : null;
  helper?.warm();
  let status = 0;
  let written = 0;
  try {
    for (const input of inputs) {
      let text: string;
      try {
        text = readInput(input);
      } catch (e) {
        process.stderr.write(`analyze: cannot read ${input}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}\n`);
        if (several && (options.format === "json" || options.format === "geojson")) write(JSON.stringify({ file: input, error: "cannot read the file" }));
        status = 2;
        continue;
      }
      try {
        const settings = {
          units: options.units,
          intervalM: options.intervalM,
          cellM: options.cellM,
          throwCutoffM: options.throwCutoffM,
          profiles: options.profiles,
          ends: options.ends,
          kinematics: options.kinematics,
          dropBadRows: options.dropBadRows,
          velocityModel: options.velocity,
          tipLineFitter: helper?.fitter,
        };
        const inTime = verticalColumnOf(text) === "twt";
        const extras: Extras = { velocity: inTime ? options.velocity : undefined };
        let result: PipelineResult & { picks: PickColumns };
        if (isCutoffCsv(text)) {
          const analysed = analyzeCutoffCsv(text, {
            ...settings,
            stationSpacingM: options.stationSpacingM,
            rakeDeg: cutoffRakeOf(options),
            sense: cutoffSenseOf(options),
            orderAlongStrike: options.orderAlongStrike,
          });
          result = analysed;
          extras.cutoffs = analysed.cutoffs;
        } else if (options.rakeDeg !== undefined && options.kinematics.sense !== "oblique") {
          process.stderr.write(
            `analyze: ${input}: --rake without --sense oblique is a cut-off file's pairing rake, and this is a pick file; for a fault whose slip is oblique add --sense oblique (normal is −90°, reverse +90°)\n`,
          );
          status = 2;
          continue;
        } else result = analyzeCsv(text, settings);
        if (options.format === "gltf") {
          const [{ buildFaultDisplay }, { faultGltf }] = await Promise.all([import("../lib/display/build"), import("../lib/views/gltf")]);
          // the full-resolution grid (at most 512 nodes a side), as the grid CSV has it
          const display = buildFaultDisplay({ ...result, maxCells: 512, maxPicks: 0 });
          writeBytes(
            faultGltf(display, {
              faultName: faultNameOf(input),
              coordinateReference: reference,
              originLongitudeLatitude: reference ? longitudeLatitude(display.origin[0], display.origin[1]) : null,
            }),
          );
          written++;
        } else write(render(result, input, options.format, several, written++ === 0, reference, extras));
      } catch (e) {
        if (!(e instanceof PickInputError)) throw e;
        process.stderr.write(`${problemText(input, e)}\n`);
        if (several && (options.format === "json" || options.format === "geojson")) {
          write(JSON.stringify({ file: input, error: "the pick file cannot be used", problems: e.rejected.slice(0, 50) }));
        }
        status = 2;
      }
    }
  } catch (e) {
    process.stderr.write(`analyze: unexpected failure: ${String((e as Error)?.message ?? e).split("\n")[0]}\n`);
    return 1;
  } finally {
    const counts = helper?.counts();
    if (helper && counts && counts.inThisThread > 0)
      process.stderr.write(`analyze: the tip-line helper thread could not be used; ${counts.inThisThread} fit(s) ran in the main thread\n`);
    void helper?.close();
  }
  return status;
}

process.stdout.on("error", (error: NodeJS.ErrnoException) => {
  if (error.code === "EPIPE") process.exit(process.exitCode ?? 0);
  throw error;
});

if (isMainThread) {
  void main(process.argv.slice(2)).then((status) => {
    process.exitCode = status;
  });
} else {
  serveTipLineFits(workerData);
}
