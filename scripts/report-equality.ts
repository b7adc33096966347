// The engine's JSON report for the demo pick sets, as the app makes them (the upload read and packed for storage, then
// the analysis of the stored bytes), written to one file per source tree so two trees can be compared:
//   (cd <tree> && npx tsx --conditions=react-server <this file> --out /tmp/reports-<name>.json)
//   npx tsx scripts/report-equality.ts --compare /tmp/reports-a.json /tmp/reports-b.json
// Imports the modules of the tree it runs in (the working folder), so the same script measures any version.
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

async function reportsOfThisTree(): Promise<Record<string, Json>> {
  const load = (file: string) => import(pathToFileURL(path.join(process.cwd(), file)).href);
  const demo = await load("lib/demo.ts");
  const { parseUploadedFile } = await load("lib/analysis/upload-parse.ts");
  const { computeAnalysis } = await load("lib/analysis/compute.ts");
  const files: { name: string; text: string; velocityModel?: unknown }[] = demo.DEMO_FAULTS.map((fault: { name: string; fileName: string }) => ({
    name: fault.fileName,
    text: demo.demoCsv(fault.name),
  }));
  if (demo.demoCutoffCsv) files.push({ name: demo.DEMO_CUTOFF_FILE, text: demo.demoCutoffCsv(), velocityModel: demo.DEMO_VELOCITY });
  const reports: Record<string, Json> = {};
  for (const file of files) {
    const parsed = parseUploadedFile({
      name: file.name,
      bytes: new TextEncoder().encode(file.text),
      units: "m",
      dropBadRows: false,
      encode: true,
      velocityModel: file.velocityModel ?? null,
    });
    const { report } = computeAnalysis({ picks: parsed.encoded, units: "m", settings: {} });
    reports[file.name] = JSON.parse(JSON.stringify(report, (_key, value) => (typeof value === "number" && !Number.isFinite(value) ? String(value) : value)));
  }
  return reports;
}

/** Every path where the two values differ (numbers compared exactly), at most `limit`. */
function differences(a: Json, b: Json, at: string, out: string[], limit = 40): void {
  if (out.length >= limit) return;
  if (typeof a !== typeof b || Array.isArray(a) !== Array.isArray(b) || (a === null) !== (b === null)) {
    out.push(`${at}: ${JSON.stringify(a)?.slice(0, 80)} ≠ ${JSON.stringify(b)?.slice(0, 80)}`);
    return;
  }
  if (a && typeof a === "object") {
    if (Array.isArray(a)) {
      const bb = b as Json[];
      if (a.length !== bb.length) out.push(`${at}: length ${a.length} ≠ ${bb.length}`);
      for (let i = 0; i < Math.min(a.length, bb.length); i++) differences(a[i], bb[i], `${at}[${i}]`, out, limit);
      return;
    }
    const bo = b as Record<string, Json>;
    for (const key of new Set([...Object.keys(a), ...Object.keys(bo)])) {
      if (!(key in a) || !(key in bo)) out.push(`${at}.${key}: only in ${key in a ? "the first" : "the second"}`);
      else differences(a[key], bo[key], `${at}.${key}`, out, limit);
    }
    return;
  }
  if (a !== b) out.push(`${at}: ${JSON.stringify(a)} ≠ ${JSON.stringify(b)}`);
}

const args = process.argv.slice(2);
if (args[0] === "--compare") {
  const [first, second] = [args[1], args[2]].map((file) => JSON.parse(readFileSync(file, "utf8")) as Record<string, Json>);
  let equal = true;
  for (const name of new Set([...Object.keys(first), ...Object.keys(second)])) {
    const found: string[] = [];
    differences(first[name] ?? null, second[name] ?? null, name, found);
    console.log(found.length === 0 ? `${name}: equal` : `${name}: ${found.length}${found.length >= 40 ? "+" : ""} differences\n  ${found.join("\n  ")}`);
    if (found.length) equal = false;
  }
  process.exit(equal ? 0 : 1);
} else {
  const out = args[args.indexOf("--out") + 1];
  if (!out || args.indexOf("--out") < 0) throw new Error("report-equality: give --out <file> (or --compare <a> <b>)");
  void reportsOfThisTree().then((reports) => {
    writeFileSync(out, JSON.stringify(reports));
    console.log(`report-equality: wrote ${out}`);
  });
}
