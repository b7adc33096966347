// Command-line analysis of a pick CSV: npm run --silent analyze -- <file.csv> [--json] [--units m|ft] [--interval M] [--cell M]
import { readFileSync } from "node:fs";
import { analyzeCsv } from "../lib/engine/pipeline";
import { PickInputError } from "../lib/engine/csv";
import { formatAzimuth } from "../lib/engine/plane";
import type { AnalysisReport } from "../lib/engine/types";

class UsageError extends Error {}

function parseArgs(argv: string[]) {
  const out: { file?: string; json: boolean; units: "m" | "ft"; intervalM?: number; cellM?: number; dropBadRows: boolean } = { json: false, units: "m", dropBadRows: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined) throw new UsageError(`${a} needs a value`);
      return v;
    };
    const positive = (name: string, v: string) => {
      const n = Number(v);
      if (!(n > 0) || !Number.isFinite(n)) throw new UsageError(`${name} must be a positive number of metres, got "${v}"`);
      return n;
    };
    if (a === "--json") out.json = true;
    else if (a === "--drop-bad-rows") out.dropBadRows = true;
    else if (a === "--units") {
      const v = value();
      if (v !== "m" && v !== "ft") throw new UsageError(`--units must be m or ft, got "${v}"`);
      out.units = v;
    } else if (a === "--interval") out.intervalM = positive("--interval", value());
    else if (a === "--cell") out.cellM = positive("--cell", value());
    else if (a.startsWith("--")) throw new UsageError(`unknown option ${a}`);
    else if (out.file) throw new UsageError(`only one input file is accepted (got "${out.file}" and "${a}")`);
    else out.file = a;
  }
  if (!out.file) throw new UsageError("usage: analyze <file.csv> [--json] [--units m|ft] [--interval M] [--cell M] [--drop-bad-rows]");
  return out;
}

const f = (v: number, digits = 1) => (Number.isFinite(v) ? v.toFixed(digits) : "n/a");

function readable(report: AnalysisReport): string {
  const lines: string[] = [];
  lines.push(`Slipfield analysis (engine ${report.engineVersion})`);
  lines.push(`Input: ${report.input.rows} rows, ${report.input.accepted} picks accepted, ${report.input.rejected.length} rejected (units ${report.input.units}).`);
  for (const r of report.input.rejected.slice(0, 20)) lines.push(`  row ${r.row}, column ${r.column}: ${r.reason}`);
  for (const s of report.segments) {
    const tl = s.tipLine;
    lines.push("");
    lines.push(`Segment ${s.id} (${s.pickCount} picks)`);
    lines.push(`  plane: strike ${formatAzimuth(s.plane.strikeDeg)}°, dip ${f(s.plane.dipDeg)}° toward ${formatAzimuth(s.plane.dipDirectionDeg)}°, RMS misfit ${f(s.plane.rmsM, 2)} m`);
    lines.push(`  maximum: displacement ${f(s.max.displacementM)} m, throw ${f(s.max.throwM)} m at s ${f(s.max.s, 0)} m, t ${f(s.max.t, 0)} m`);
    lines.push(`  mapped limit: length ${f(s.mappedLimit.lengthM, 0)} m, height ${f(s.mappedLimit.heightM, 0)} m`);
    lines.push(`  inferred tip line: length ${f(tl.lengthM, 0)} m, height ${f(tl.heightM, 0)} m (± ${f(tl.uncertaintyM, 0)} m), aspect ${f(tl.aspectRatio, 2)}, area ${(tl.areaM2 / 1e6).toFixed(3)} km²`);
    lines.push(`    ${tl.method}`);
    lines.push(`  gradients: mean ${f(s.gradients.meanPerM, 4)}, max ${f(s.gradients.maxPerM, 4)}; near tips: strike start ${f(s.gradients.tips.strikeStartPerM, 4)}, strike end ${f(s.gradients.tips.strikeEndPerM, 4)}, up dip ${f(s.gradients.tips.upDipPerM, 4)}, down dip ${f(s.gradients.tips.downDipPerM, 4)}`);
    lines.push(`  asymmetry of Dmax: along strike ${f(s.asymmetry.alongStrike, 2)}, down dip ${f(s.asymmetry.downDip, 2)} (fraction of the semi-axis)`);
    lines.push(`  scaling: ${s.scaling.note}`);
    lines.push(`  contours: every ${s.contourIntervalM} m, ${s.contours.length} levels`);
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

function main(): number {
  let args;
  try {
    args = parseArgs(process.argv.slice(2));
  } catch (e) {
    process.stderr.write(`analyze: ${(e as Error).message}\n`);
    return 2;
  }
  let text: string;
  try {
    text = readFileSync(args.file!, "utf8");
  } catch (e) {
    process.stderr.write(`analyze: cannot read ${args.file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}\n`);
    return 2;
  }
  try {
    const { report } = analyzeCsv(text, { units: args.units, intervalM: args.intervalM, cellM: args.cellM, dropBadRows: args.dropBadRows });
    process.stdout.write(args.json ? JSON.stringify(report) + "\n" : readable(report) + "\n");
    return 0;
  } catch (e) {
    if (e instanceof PickInputError) {
      const lines = [`analyze: the pick file cannot be used (${e.rejected.length}${e.truncated ? "+" : ""} problem${e.rejected.length === 1 ? "" : "s"}):`];
      for (const r of e.rejected.slice(0, 50)) lines.push(`  row ${r.row}, column ${r.column}: ${r.reason}`);
      if (e.rejected.length > 50 || e.truncated) lines.push("  … more problems not shown");
      process.stderr.write(lines.join("\n") + "\n");
      return 2;
    }
    process.stderr.write(`analyze: unexpected failure: ${String((e as Error)?.message ?? e).split("\n")[0]}\n`);
    return 1;
  }
}

process.exitCode = main();
