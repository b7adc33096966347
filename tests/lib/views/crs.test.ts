import { describe, expect, it } from "vitest";
import { CoordinateReferenceError, checkCoordinateReference, describeCoordinateReference, toLongitudeLatitude } from "@/lib/crs";
import { parseCrsText } from "@/lib/crs-text";

// A study's coordinate reference, checked against the EPSG index (npm epsg-index) and run by proj4.
describe("a study's coordinate reference", () => {
  it("takes a projected metre CRS with a vertical height system, and projects as the UTM definition says", () => {
    const reference = checkCoordinateReference({ epsg: 32631, verticalEpsg: 5714 });
    expect(reference.horizontal).toMatchObject({ epsg: 32631, name: "WGS 84 / UTM zone 31N", unit: "metre" });
    expect(reference.vertical).toEqual({ epsg: 5714, name: "MSL height", unit: "metre" });
    expect(describeCoordinateReference(reference)).toBe(
      "EPSG:32631 (WGS 84 / UTM zone 31N), metres; z elevation above EPSG:5714 (MSL height), metres, positive up",
    );
    // UTM zone 31N by definition: false easting 500 km on the central meridian 3° E, false northing 0 on the equator
    // (the UTM system's own definition, e.g. Snyder 1987, Map Projections: A Working Manual)
    const [lon, lat] = toLongitudeLatitude(reference, 500_000, 0);
    expect(lon).toBeCloseTo(3, 9);
    expect(lat).toBeCloseTo(0, 9);
    // on the central meridian the northing is the meridian arc length × k0 = 0.9996: 1° of latitude from the equator
    // is 110,574.4 m of arc on the WGS 84 ellipsoid (Snyder 1987, eq. 3-21), so 110,530.2 m of northing
    const [, oneDegree] = toLongitudeLatitude(reference, 500_000, 110_574.389 * 0.9996);
    expect(oneDegree).toBeCloseTo(1, 4);
  });

  it("refuses, by name, codes that are not in the index, geographic, in feet, or depth systems; a datum in words is kept", () => {
    const refusal = (input: Parameters<typeof checkCoordinateReference>[0]) => {
      try {
        checkCoordinateReference(input);
      } catch (error) {
        expect(error).toBeInstanceOf(CoordinateReferenceError);
        return `${(error as CoordinateReferenceError).field}: ${(error as Error).message}`;
      }
      throw new Error("accepted");
    };
    expect(refusal({ epsg: 1234 })).toMatch(/^epsg: EPSG:1234 is not in the EPSG index/);
    expect(refusal({ epsg: 4326 })).toMatch(/^epsg: EPSG:4326 \(WGS 84\) is a geographic \(longitude\/latitude\) system/);
    expect(refusal({ epsg: 2277 })).toMatch(/^epsg: EPSG:2277 .* measures in US survey foot/);
    expect(refusal({ epsg: 32631, verticalEpsg: 5715 })).toMatch(/^verticalEpsg: EPSG:5715 \(MSL depth\) measures depth \(positive down\)/);
    expect(refusal({ epsg: 32631, verticalEpsg: 32631 })).toMatch(/^verticalEpsg: .* is not a vertical system/);
    expect(checkCoordinateReference({ epsg: 23031, verticalDatum: "LAT" }).vertical).toEqual({ epsg: null, name: "LAT", unit: "metre" });
    expect(parseCrsText("EPSG:32631+5714")).toEqual({ epsg: 32631, verticalEpsg: 5714 });
    expect(parseCrsText("32631")).toEqual({ epsg: 32631 });
    expect(parseCrsText("utm31")).toBeNull();
  });
});
