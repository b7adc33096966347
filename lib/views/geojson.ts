// GeoJSON (RFC 7946 structure) of a fault's contours, inferred tip lines and mapped limits in world coordinates
// [x, y, z] (m, the pick file's map coordinates and elevation), on the true fault surface. The positions are projected
// map metres, not longitude/latitude: with the study's coordinate reference the collection states it in a `crs` member
// (the named-CRS form of the 2008 GeoJSON specification, which GIS software still reads) and in words in `coordinateReference`.
import type { AnalysisReport } from "@/lib/engine/types";
import type { CoordinateReference } from "@/lib/crs";
import { surfacePointToWorld } from "./profiles";

type Position = [number, number, number];

export interface LineFeature {
  type: "Feature";
  geometry: { type: "LineString"; coordinates: Position[] };
  properties: { fault: string; segment: string; kind: "contour" | "tip-line" | "mapped-limit"; level: number | null; units: "m"; quantity: string };
}

export interface FaultFeatureCollection {
  type: "FeatureCollection";
  features: LineFeature[];
  crs?: { type: "name"; properties: { name: string } };
  coordinateReference?: string;
}

const round = (v: number) => Math.round(v * 1000) / 1000;
const position = (p: readonly number[]): Position => [round(p[0]), round(p[1]), round(p[2])];

function closed(ring: Position[]): Position[] {
  if (ring.length < 2) return ring;
  const [a, b] = [ring[0], ring[ring.length - 1]];
  return a[0] === b[0] && a[1] === b[1] && a[2] === b[2] ? ring : [...ring, a];
}

export function faultGeoJson(faultName: string, report: AnalysisReport, reference?: CoordinateReference | null): FaultFeatureCollection {
  const features: LineFeature[] = [];
  for (const segment of report.segments) {
    const base = { fault: faultName, segment: segment.id, units: "m" as const };
    for (const level of segment.contours) {
      for (const ring of level.rings) {
        const coordinates = ring.map(([s, t]) => position(surfacePointToWorld(segment, s, t)));
        if (coordinates.length < 2) continue;
        features.push({
          type: "Feature",
          geometry: { type: "LineString", coordinates },
          properties: { ...base, kind: "contour", level: level.levelM, quantity: "displacement" },
        });
      }
    }
    const tip = segment.tipLine.worldPolygon.map(position);
    if (tip.length >= 2) {
      features.push({
        type: "Feature",
        geometry: { type: "LineString", coordinates: closed(tip) },
        properties: { ...base, kind: "tip-line", level: 0, quantity: "displacement" },
      });
    }
    const mapped = segment.mappedLimit.worldPolygon.map(position);
    if (mapped.length >= 2) {
      features.push({
        type: "Feature",
        geometry: { type: "LineString", coordinates: closed(mapped) },
        properties: { ...base, kind: "mapped-limit", level: null, quantity: "displacement" },
      });
    }
  }
  if (!reference) return { type: "FeatureCollection", features };
  const vertical = reference.vertical.epsg ? `EPSG:${reference.vertical.epsg} (${reference.vertical.name})` : `datum ${reference.vertical.name}`;
  return {
    type: "FeatureCollection",
    crs: { type: "name", properties: { name: `urn:ogc:def:crs:EPSG::${reference.horizontal.epsg}` } },
    coordinateReference: `x, y: EPSG:${reference.horizontal.epsg} (${reference.horizontal.name}), metres; z: elevation above ${vertical}, metres, positive up`,
    features,
  };
}
