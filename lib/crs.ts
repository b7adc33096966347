// A study's coordinate reference: the projected CRS of the pick files' x and y (an EPSG code), and what z is measured
// from (a vertical CRS by EPSG code, or a datum named in words). Codes are checked against the EPSG index shipped by
// the `epsg-index` package and the projection is parsed and run by `proj4`, so a code that does not exist, is not a
// projected CRS, or measures in feet is refused with a message that says which. Slipfield keeps every length in
// metres, so only metre CRSs are taken. Server and command line only (reads the index's files).
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import proj4 from "proj4";

export interface CoordinateReference {
  horizontal: { epsg: number; name: string; unit: "metre"; proj4: string; area: string };
  vertical: { epsg: number | null; name: string; unit: "metre" };
}

interface EpsgEntry {
  code: string;
  kind: string;
  name: string;
  wkt: string;
  proj4: string;
  unit: string;
  area: string;
}

export type { CoordinateReferenceInput } from "./crs-text";
import type { CoordinateReferenceInput } from "./crs-text";

export class CoordinateReferenceError extends Error {
  constructor(
    readonly field: "epsg" | "verticalEpsg",
    message: string,
  ) {
    super(message);
  }
}

/** The folder of the EPSG index's one-file-per-code JSON (resolved from the project, or from this module). */
function epsgFolder(): string | null {
  const bases = [path.join(process.cwd(), "package.json")];
  if (typeof __filename === "string") bases.push(__filename);
  for (const base of bases) {
    try {
      return path.join(path.dirname(createRequire(base).resolve("epsg-index/package.json")), "s");
    } catch {
      // not resolvable from there
    }
  }
  return null;
}

function epsgEntry(code: number): EpsgEntry | null {
  const folder = epsgFolder();
  if (!folder) throw new Error("The EPSG index (the epsg-index package) is not installed.");
  try {
    return JSON.parse(readFileSync(path.join(folder, `${code}.json`), "utf8")) as EpsgEntry;
  } catch {
    return null;
  }
}

const isMetre = (unit: string) => /^metre\b/i.test(unit.trim());

/**
 * Checks the codes and returns the reference as stored: the horizontal CRS must be a projected one in metres that proj4
 * can run (a round trip through longitude/latitude of its own false origin region); a vertical CRS, when given, must
 * be a height (z up) in metres.
 */
export function checkCoordinateReference(input: CoordinateReferenceInput): CoordinateReference {
  const entry = epsgEntry(input.epsg);
  if (!entry) throw new CoordinateReferenceError("epsg", `EPSG:${input.epsg} is not in the EPSG index; check the code (e.g. 32631 is WGS 84 / UTM zone 31N).`);
  if (entry.kind !== "CRS-PROJCRS") {
    const kind =
      entry.kind === "CRS-GEOGCRS"
        ? "a geographic (longitude/latitude) system"
        : entry.kind === "CRS-VERTCRS"
          ? "a vertical system"
          : `not a projected system (${entry.kind})`;
    throw new CoordinateReferenceError(
      "epsg",
      `EPSG:${input.epsg} (${entry.name}) is ${kind}; pick files hold projected map coordinates in metres, so give the projected CRS they are in.`,
    );
  }
  if (!isMetre(entry.unit)) {
    throw new CoordinateReferenceError(
      "epsg",
      `EPSG:${input.epsg} (${entry.name}) measures in ${entry.unit}; Slipfield keeps map coordinates in metres, so give the metre version of that projection.`,
    );
  }
  try {
    // the projection itself (no datum shift, which may need grids not shipped): inverse and forward must round-trip
    const projection = new proj4.Proj(entry.proj4);
    const geographic = projection.inverse({ x: 500_000, y: 1_000_000 });
    const back = projection.forward({ x: geographic.x, y: geographic.y });
    if (!(Math.abs(back.x - 500_000) < 1e-3 && Math.abs(back.y - 1_000_000) < 1e-3)) throw new Error("no round trip");
  } catch {
    throw new CoordinateReferenceError("epsg", `EPSG:${input.epsg} (${entry.name}) could not be run by the projection library (proj4); choose another code.`);
  }
  const horizontal = { epsg: input.epsg, name: entry.name, unit: "metre" as const, proj4: entry.proj4, area: entry.area };
  if (input.verticalEpsg === undefined || input.verticalEpsg === null) {
    return { horizontal, vertical: { epsg: null, name: input.verticalDatum?.trim() || "not stated", unit: "metre" } };
  }
  const vertical = epsgEntry(input.verticalEpsg);
  if (!vertical)
    throw new CoordinateReferenceError("verticalEpsg", `EPSG:${input.verticalEpsg} is not in the EPSG index; check the code (e.g. 5714 is MSL height).`);
  if (vertical.kind !== "CRS-VERTCRS")
    throw new CoordinateReferenceError("verticalEpsg", `EPSG:${input.verticalEpsg} (${vertical.name}) is not a vertical system.`);
  if (!isMetre(vertical.unit))
    throw new CoordinateReferenceError(
      "verticalEpsg",
      `EPSG:${input.verticalEpsg} (${vertical.name}) measures in ${vertical.unit}; Slipfield keeps elevations in metres, so give the metre version.`,
    );
  if (/AXIS\[[^\]]*,\s*DOWN\]/i.test(vertical.wkt)) {
    throw new CoordinateReferenceError(
      "verticalEpsg",
      `EPSG:${input.verticalEpsg} (${vertical.name}) measures depth (positive down); z in Slipfield is elevation, positive up, so give the height system of that datum (e.g. 5714 MSL height rather than 5715 MSL depth).`,
    );
  }
  return { horizontal, vertical: { epsg: input.verticalEpsg, name: vertical.name, unit: "metre" } };
}

/** "EPSG:32631 (WGS 84 / UTM zone 31N); z: EPSG:5714 (MSL height), metres, positive up" */
export function describeCoordinateReference(reference: CoordinateReference | null | undefined): string {
  if (!reference) return "map coordinates of the pick files, no coordinate reference recorded; z elevation in metres, positive up";
  const vertical = reference.vertical.epsg ? `EPSG:${reference.vertical.epsg} (${reference.vertical.name})` : `datum ${reference.vertical.name}`;
  return `EPSG:${reference.horizontal.epsg} (${reference.horizontal.name}), metres; z elevation above ${vertical}, metres, positive up`;
}

/** Longitude and latitude (degrees, on the CRS's own datum) of a map point in the reference's projection. */
export function toLongitudeLatitude(reference: CoordinateReference, x: number, y: number): [number, number] {
  const { x: lon, y: lat } = new proj4.Proj(reference.horizontal.proj4).inverse({ x, y });
  return [(lon * 180) / Math.PI, (lat * 180) / Math.PI];
}
