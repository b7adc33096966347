import { describe, expect, it, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { check as checkGeoJson } from "@placemarkio/check-geojson";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, syntheticRelayOptions, toCsv } from "@/lib/engine/synthetic";
import { faultGeoJson } from "@/lib/views/geojson";
import { gridCsv } from "@/lib/views/grid-csv";
import { createRequire } from "node:module";
import { LISTRIC, curvedFaultPicks } from "./curved-faults";

const root = path.resolve(__dirname, "../../..");
// the command as people run it: the bin entry, which runs the bundled dist/slipfield-cli.cjs
const bin = path.join(root, "bin/slipfield.cjs");
const run = (...args: string[]) => spawnSync(process.execPath, [bin, "analyze", ...args], { encoding: "utf8", cwd: root });
const runIn = (cwd: string, input: string | undefined, ...args: string[]) =>
  spawnSync(process.execPath, [bin, "analyze", ...args], { encoding: "utf8", cwd, input });

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-cli-"));
});

describe("analyze command line", () => {
  it("prints exactly one JSON object whose numbers are the picks' own: plane, maximum, contour levels, counts, no relay", () => {
    const file = path.join(dir, "good.csv");
    const { picks, truth } = generateSyntheticPicks({ seed: 4, pickCount: 600 });
    writeFileSync(file, toCsv(picks));
    const r = run(file, "--json", "--interval", "10");
    expect(r.status).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.input).toMatchObject({ rows: picks.x.length, accepted: picks.x.length, rejected: [], units: "m" });
    expect(report.segments).toHaveLength(1);
    const seg = report.segments[0];
    for (const key of ["id", "plane", "max", "mappedLimit", "tipLine", "gradients", "scaling", "contours"]) expect(seg).toHaveProperty(key);
    // the synthetic picks lie exactly on a plane striking 030 and dipping 60° (lib/engine/synthetic.ts places them so);
    // the CSV keeps millimetres, which moves the fit by far less than 0.01°
    expect(Math.abs(seg.plane.strikeDeg - truth[0].strikeDeg)).toBeLessThan(0.01);
    expect(Math.abs(seg.plane.dipDeg - truth[0].dipDeg)).toBeLessThan(0.01);
    expect(seg.plane.rmsM).toBeLessThan(0.01);
    // Dmax is the largest pick displacement, throw / sin(dip) (Groshong 2006), computed here from the CSV's throws; the
    // local dip of the surface read from millimetre-rounded positions differs from the plane's by under 1e-4°
    const csvThrows = toCsv(picks)
      .trim()
      .split("\n")
      .slice(1)
      .map((line) => Number(line.split(",")[3]));
    expect(seg.max.displacementM).toBeCloseTo(Math.max(...csvThrows) / Math.sin((seg.plane.dipDeg * Math.PI) / 180), 4);
    // the surface is the plane: it stays within a centimetre of it
    expect(seg.surface.maxOffsetM).toBeLessThan(0.01);
    expect(seg.surface.matters).toBe(false);
    expect(seg.max.throwM).toBe(Math.max(...csvThrows));
    // --interval 10: every level is a multiple of 10 m below Dmax, none missing
    const levels = seg.contours.map((c: { levelM: number }) => c.levelM);
    expect(levels).toEqual(Array.from({ length: Math.ceil(seg.max.displacementM / 10) - 1 }, (_, k) => 10 * (k + 1)));
    expect(seg.tipLine.lengthM).toBeGreaterThan(seg.mappedLimit.lengthM);
    // one segment: no relay
    expect(report.relays).toEqual([]);
    expect(report.quality.picksBelowOne).toBe(0);
  });

  it("the readable report prints a strike due north as 0.0°, never 360.0°", () => {
    const file = path.join(dir, "north.csv");
    writeFileSync(file, toCsv(generateSyntheticPicks({ seed: 5, pickCount: 400, strikeDeg: 0 }).picks));
    const r = run(file);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/plane: strike 0\.0°, dip 60\.0° toward 90\.0°/);
    expect(r.stdout).not.toContain("360.0°");
  });

  it("two overlapping segments 120 m apart with nothing mapped between them are reported as one soft-linked relay", () => {
    const file = path.join(dir, "relay.csv");
    writeFileSync(file, toCsv(generateSyntheticPicks(syntheticRelayOptions({ seed: 3, halfLengthM: 1200, pickCount: 900 }, 500, 120)).picks));
    const report = JSON.parse(run(file, "--json").stdout);
    expect(report.relays).toHaveLength(1);
    expect(report.relays[0]).toMatchObject({ segments: ["F1", "F2"], linkage: "soft" });
    // separation is measured between the two planes' traces; the generator offsets them by exactly 120 m across strike
    expect(report.relays[0].separationM).toBeCloseTo(120, 3);
  });

  it("bad rows (non-number, negative throw, infinite, missing value, duplicate) exit 2 naming row and column", () => {
    const file = path.join(dir, "bad.csv");
    writeFileSync(file, ["x,y,z,throw", "0,0,0,10", "oops,0,0,10", "1,2,3,-4", "5,6,7,Infinity", "8,9,,3", "0,0,0,12", "0,100,-20,8"].join("\n"));
    const r = run(file, "--json");
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    for (const where of ["row 3, column x", "row 4, column throw", "row 5, column throw", "row 6, column z", "row 7, column x,y,z"])
      expect(r.stderr).toContain(where);
  });

  it("too few picks in a segment and collinear picks exit 2 naming the segment", () => {
    const file = path.join(dir, "degenerate.csv");
    writeFileSync(file, ["x,y,z,throw,segment", "0,0,0,1,A", "1,0,0,1,A", "0,0,0,1,B", "1,1,-1,1,B", "2,2,-2,1,B"].join("\n"));
    const r = run(file);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('segment "A" has 2 usable picks');
    expect(r.stderr).toContain('segment "B": the points are collinear');
  });

  it("writes the same report as the engine: --json, and through npm run analyze", () => {
    const file = path.join(dir, "same.csv");
    const text = toCsv(generateSyntheticPicks({ seed: 11, pickCount: 500 }).picks);
    writeFileSync(file, text);
    const expected = JSON.parse(JSON.stringify(analyzeCsv(text).report));
    const r = run(file, "--json");
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.trim().split("\n")).toHaveLength(1);
    expect(JSON.parse(r.stdout)).toEqual(expected);
    const npm = spawnSync("npm", ["run", "--silent", "analyze", "--", file, "--json"], { encoding: "utf8", cwd: root });
    expect(npm.status, npm.stderr).toBe(0);
    expect(JSON.parse(npm.stdout)).toEqual(expected);
    // with the tip-line fits on the helper thread (the bundle started as a worker), the same report
    const threaded = spawnSync(process.execPath, [bin, "analyze", file, "--json"], {
      encoding: "utf8",
      cwd: root,
      env: { ...process.env, SLIPFIELD_TIPLINE_THREAD: "on" },
    });
    expect(threaded.status, threaded.stderr).toBe(0);
    expect(threaded.stderr).toBe(""); // it says so when the helper could not be used
    expect(JSON.parse(threaded.stdout)).toEqual(expected);
  });

  it("reads standard input with -, and writes the grid as CSV and the lines as GeoJSON", () => {
    const text = toCsv(generateSyntheticPicks({ seed: 12, pickCount: 400 }).picks);
    const result = analyzeCsv(text);
    const csv = runIn(dir, text, "-", "--format", "csv");
    expect(csv.status, csv.stderr).toBe(0);
    expect(csv.stdout).toBe(`${gridCsv(result).trimEnd()}\n`);
    expect(csv.stdout.split("\n")[0]).toBe("segment,s,t,x,y,z,displacement,throw,offset,local_dip,local_strike");
    const geojson = runIn(dir, text, "-", "--format=geojson");
    expect(geojson.status, geojson.stderr).toBe(0);
    const collection = JSON.parse(geojson.stdout);
    expect(collection).toEqual(JSON.parse(JSON.stringify(faultGeoJson("stdin", result.report))));
    expect(() => checkGeoJson(geojson.stdout)).not.toThrow();
    expect(collection.features.map((feature: { properties: { kind: string } }) => feature.properties.kind)).toEqual(
      expect.arrayContaining(["contour", "tip-line", "mapped-limit"]),
    );
  });

  it("several files or a glob: one JSON object per line, each naming its file; a bad file is reported and the rest still run", () => {
    const folder = path.join(dir, "batch");
    mkdirSync(folder, { recursive: true });
    for (const seed of [21, 22, 23]) writeFileSync(path.join(folder, `f${seed}.csv`), toCsv(generateSyntheticPicks({ seed, pickCount: 300 }).picks));
    writeFileSync(path.join(folder, "g-bad.csv"), "x,y,z,throw\n1,2,3,oops\n");
    writeFileSync(path.join(folder, "notes.txt"), "not a pick file");
    const globbed = runIn(dir, undefined, "batch/f*.csv", "--json");
    expect(globbed.status, globbed.stderr).toBe(0);
    const lines = globbed.stdout
      .trim()
      .split("\n")
      .map((line) => JSON.parse(line));
    expect(lines.map((line) => line.file)).toEqual(["batch/f21.csv", "batch/f22.csv", "batch/f23.csv"]);
    for (const line of lines) {
      const alone = JSON.parse(JSON.stringify(analyzeCsv(readFileSync(path.join(dir, line.file), "utf8")).report));
      const { file, ...report } = line;
      expect(file).toMatch(/^batch\//);
      expect(report).toEqual(alone);
    }
    const mixed = runIn(dir, undefined, "batch/*.csv", "--json");
    expect(mixed.status).toBe(2);
    const mixedLines = mixed.stdout
      .trim()
      .split("\n")
      .map((line) => JSON.parse(line));
    expect(mixedLines.map((line) => line.file)).toEqual(["batch/f21.csv", "batch/f22.csv", "batch/f23.csv", "batch/g-bad.csv"]);
    expect(mixedLines[3]).toMatchObject({ error: "the pick file cannot be used", problems: [{ row: 2, column: "throw" }] });
    expect(mixed.stderr).toContain("batch/g-bad.csv cannot be used");
    const csv = runIn(dir, undefined, "batch/f21.csv", "batch/f22.csv", "--format", "csv");
    expect(csv.status, csv.stderr).toBe(0);
    const rows = csv.stdout.trim().split("\n");
    expect(rows[0]).toBe("file,segment,s,t,x,y,z,displacement,throw,offset,local_dip,local_strike");
    expect(new Set(rows.slice(1).map((row) => row.split(",")[0]))).toEqual(new Set(["batch/f21.csv", "batch/f22.csv"]));
  });

  it("refuses unknown options, formats and missing files with exit 2 and a message", () => {
    expect(run("--format", "xml", "a.csv").stderr).toContain('--format must be one of text, json, csv, geojson, gltf, got "xml"');
    expect(run("--json", "--format", "csv", "a.csv").stderr).toContain("choose one output format");
    expect(run("--frobnicate", "a.csv").status).toBe(2);
    const missing = run(path.join(dir, "no-such.csv"));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain("cannot read");
    expect(runIn(dir, undefined, "nothing-*.csv").stderr).toContain('no file matches "nothing-*.csv"');
    const help = run("--help");
    expect(help.status).toBe(0);
    expect(help.stdout).toContain("--format F");
  });

  it("the true surface per segment in the JSON, --format gltf passes the Khronos validator, --crs is stated in csv, geojson and gltf", async () => {
    const file = path.join(dir, "listric.csv");
    const { picks } = curvedFaultPicks(LISTRIC);
    writeFileSync(file, toCsv(picks));
    const json = run(file, "--json");
    expect(json.status, json.stderr).toBe(0);
    const [segment] = JSON.parse(json.stdout).segments;
    // the names outside checks read: surface offsets, tip-line size along the surface, asymmetry from local-dip displacement
    expect(segment.surface.maxOffsetM).toBeGreaterThan(40);
    expect(segment.surface.rmsOffsetM).toBeGreaterThan(10);
    expect(Math.abs(segment.tipLine.lengthM / (2 * LISTRIC.a) - 1)).toBeLessThan(0.03);
    expect(Math.abs(segment.tipLine.heightM / (2 * LISTRIC.b) - 1)).toBeLessThan(0.03);
    expect(Math.abs(segment.asymmetry.downDip)).toBeLessThan(0.2);

    // the full-resolution model is over a megabyte: room for it on the pipe
    const model = spawnSync(process.execPath, [bin, "analyze", file, "--format", "gltf", "--crs", "EPSG:32631+5714"], {
      cwd: root,
      maxBuffer: 64 * 1024 * 1024,
    });
    expect(model.status, model.stderr.toString()).toBe(0);
    const bytes = new Uint8Array(model.stdout);
    const validator = createRequire(import.meta.url)("gltf-validator") as { validateBytes(data: Uint8Array): Promise<{ issues: { numErrors: number } }> };
    expect((await validator.validateBytes(bytes)).issues.numErrors).toBe(0);
    const jsonLength = new DataView(bytes.buffer, bytes.byteOffset).getUint32(12, true);
    const gltf = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
    expect(gltf.asset.extras.coordinateReference.horizontal).toBe("EPSG:32631");

    const csv = run(file, "--format", "csv", "--crs", "EPSG:32631+5714");
    expect(csv.stdout.split("\n")[0]).toBe(
      "# coordinate reference: EPSG:32631 (WGS 84 / UTM zone 31N), metres; z elevation above EPSG:5714 (MSL height), metres, positive up",
    );
    const geojson = JSON.parse(run(file, "--format", "geojson", "--crs", "EPSG:32631").stdout);
    expect(geojson.crs.properties.name).toBe("urn:ogc:def:crs:EPSG::32631");
    expect(checkGeoJson(JSON.stringify(geojson)).type).toBe("FeatureCollection");

    const feet = run(file, "--format", "csv", "--crs", "EPSG:2277");
    expect(feet.status).toBe(2);
    expect(feet.stderr).toContain("measures in US survey foot");
    expect(run(file, "--format", "gltf", file).stderr).toContain("--format gltf writes one model");
  });

  it("fault types: --sense reverse and oblique --rake, refusals near strike-slip and of negative throw without --inversion", () => {
    const file = path.join(dir, "plane.csv");
    const { picks } = generateSyntheticPicks({ seed: 5, pickCount: 600, dipDeg: 40 });
    writeFileSync(file, toCsv(picks));
    const normal = JSON.parse(run(file, "--json").stdout);
    const oblique = JSON.parse(run(file, "--json", "--sense", "oblique", "--rake", "-30").stdout);
    expect(oblique.kinematics).toMatchObject({ sense: "oblique", rakeDeg: -30, hangingWall: "down" });
    // D = T / (sin δ · |sin r|): at r = −30° every displacement doubles
    expect(oblique.segments[0].max.displacementM / normal.segments[0].max.displacementM).toBeCloseTo(2, 9);
    expect(JSON.parse(run(file, "--json", "--sense", "reverse").stdout).kinematics.hangingWall).toBe("up");
    const strikeSlip = run(file, "--sense", "oblique", "--rake", "175");
    expect(strikeSlip.status).toBe(2);
    expect(strikeSlip.stderr).toContain("--rake: rake 175° is within 20° of pure strike-slip");
    expect(run(file, "--rake", "-45").stderr).toContain("for a fault whose slip is oblique add --sense oblique");
    const pairingRake = run(file, "--rake", "45");
    expect(pairingRake.status).toBe(2);
    expect(pairingRake.stderr).toContain("--rake without --sense oblique is a cut-off file's pairing rake, and this is a pick file");
    const negative = path.join(dir, "negative.csv");
    writeFileSync(negative, toCsv(picks).replace(/,(\d+\.\d+),main\n/, ",-$1,main\n"));
    const refused = run(negative, "--json");
    expect(refused.status).toBe(2);
    expect(refused.stderr).toContain("negative throw is offset opposite to the fault's normal sense");
    const inverted = run(negative, "--json", "--inversion");
    expect(inverted.status, inverted.stderr).toBe(0);
    expect(JSON.parse(inverted.stdout).kinematics.oppositeSensePicks).toBe(1);
  });
});
