import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  depthFromTwtIntervals,
  depthFromTwtLinear,
  intervalVelocityLinear,
  parseVelocityText,
  twtFromDepthLinear,
  velocityModelProblems,
} from "@/lib/engine/time-depth";
import { parseCutoffCsv } from "@/lib/engine/cutoffs";
import { deriveFromCutoffs } from "@/lib/engine/cutoff-stations";
import { runPythonOracle } from "../../support/python";

const ORACLE = path.join(__dirname, "time_depth_oracle.py");

describe("linear velocity v(z) = v0 + k·z: closed form z = (v0/k)(exp(k·TWT/2) − 1) (Sheriff & Geldart 1995, from memory; numbers derived)", () => {
  it("check values docs/check-values.md T1: v0 1800 m/s, k 0.6 1/s → 1500 m at 1351.55 ms, 2100 m at 1768.76 ms", () => {
    expect(twtFromDepthLinear(1500, 1800, 0.6)).toBeCloseTo(1351.55, 2);
    expect(twtFromDepthLinear(2100, 1800, 0.6)).toBeCloseTo(1768.76, 2);
    // 2 ln(1.5) / 0.6 s, by hand
    expect(twtFromDepthLinear(1500, 1800, 0.6)).toBeCloseTo((2000 * Math.log(1.5)) / 0.6, 9);
    expect(depthFromTwtLinear((2000 * Math.log(1.5)) / 0.6, 1800, 0.6)).toBeCloseTo(1500, 9);
  });

  it("k → 0 is constant velocity: 20 ms of TWT at 2500 m/s is 25 m (docs/check-values.md T2)", () => {
    expect(depthFromTwtLinear(20, 2500, 0)).toBe(25);
    expect(depthFromTwtLinear(20, 2500, 1e-9)).toBeCloseTo(25, 9);
    expect(twtFromDepthLinear(25, 2500, 0)).toBe(20);
  });

  it("agrees with scipy's numerical integration of the same velocity function (quad for time, solve_ivp for depth)", () => {
    const cases = [
      { v0: 1800, k: 0.6, depths: [0, 250, 1500, 2100, 3400], times_ms: [100, 800, 1351.55, 1768.76, 2600] },
      { v0: 1500, k: 1.2, depths: [100, 900, 2750], times_ms: [50, 1200, 2300] },
      { v0: 2200, k: 0.05, depths: [500, 4000], times_ms: [400, 3000] },
    ];
    const oracle = runPythonOracle<{ cases: { twt_ms: number[]; depth_m: number[] }[] }>(ORACLE, { cases });
    cases.forEach((c, i) => {
      c.depths.forEach((depth, j) => expect(twtFromDepthLinear(depth, c.v0, c.k)).toBeCloseTo(oracle.cases[i].twt_ms[j], 6));
      c.times_ms.forEach((t, j) => expect(depthFromTwtLinear(t, c.v0, c.k)).toBeCloseTo(oracle.cases[i].depth_m[j], 5));
    });
  });

  it("the interval velocity between two depths is the thickness over the one-way time between them", () => {
    const v = intervalVelocityLinear(1500, 2100, 1800, 0.6);
    expect(v).toBeCloseTo(600 / ((1768.76 - 1351.55) / 2000), 0);
    expect(v).toBeGreaterThan(1800 + 0.6 * 1500);
    expect(v).toBeLessThan(1800 + 0.6 * 2100);
  });
});

describe("interval velocities by horizon (layer cake), against depths computed by hand (docs/check-values.md T3)", () => {
  it("H1 800 ms, H2 1200 ms, H3 1500 ms at 2000, 2500, 3000 m/s: 800 m, 1300 m, 1750 m", () => {
    // 2000 × 0.4 s = 800 m; + 2500 × 0.2 s = 1300 m; + 3000 × 0.15 s = 1750 m
    expect(depthFromTwtIntervals([800], [2000]).depthM).toBe(800);
    expect(depthFromTwtIntervals([800, 1200], [2000, 2500]).depthM).toBe(1300);
    expect(depthFromTwtIntervals([800, 1200, 1500], [2000, 2500, 3000]).depthM).toBe(1750);
    // horizons crossing in time: the negative interval counts as nothing, and is told
    expect(depthFromTwtIntervals([800, 780, 1000], [2000, 2500, 3000])).toEqual({ depthM: 800 + 3000 * 0.1, pinched: 1 });
  });

  it("a cut-off file in TWT: each vertex converted with the times of the horizons above it on its own wall, at its place along strike", () => {
    // H1 dips in time along strike: footwall 800 → 820 ms, hanging wall 840 → 860 ms from y = 0 to 1000 m; H2 is flat
    // in time (footwall 1200 ms, hanging wall 1250 ms) with a vertex at y = 250 m, where H1 is read between its vertices.
    // Interval velocities 2000 m/s above H1, 2500 m/s between H1 and H2. The fault is the plane x = 0.75 (TWT − 800) in
    // time, striking north.
    const x = (twtMs: number) => 0.75 * (twtMs - 800);
    const rows = ["x,y,twt,horizon,wall", `${x(800)},0,800,H1,fw`, `${x(820)},1000,820,H1,fw`, `${x(840)},0,840,H1,hw`, `${x(860)},1000,860,H1,hw`];
    for (const y of [0, 250, 1000]) rows.push(`${x(1200)},${y},1200,H2,fw`, `${x(1250)},${y},1250,H2,hw`);
    const parsed = parseCutoffCsv(rows.join("\n"));
    const { summary, vertexZ } = deriveFromCutoffs(parsed, {
      velocityModel: {
        kind: "intervals",
        intervals: [
          { horizon: "H1", velocityMPerS: 2000 },
          { horizon: "H2", velocityMPerS: 2500 },
        ],
      },
      stationSpacingM: 250,
    });
    const zAt = (horizon: string, wall: "hw" | "fw", y: number) => {
      const { columns } = parsed;
      const i = Array.from(columns.x.keys()).find(
        (k) => columns.horizonNames[columns.horizon[k]] === horizon && columns.wall[k] === (wall === "hw" ? 0 : 1) && columns.y[k] === y,
      )!;
      return vertexZ[i];
    };
    expect(zAt("H1", "fw", 0)).toBeCloseTo(-800, 9); // 2000 × 0.400 s
    expect(zAt("H1", "hw", 1000)).toBeCloseTo(-860, 9); // 2000 × 0.430 s
    expect(zAt("H2", "fw", 0)).toBeCloseTo(-1300, 9); // 800 + 2500 × 0.200 s
    expect(zAt("H2", "hw", 0)).toBeCloseTo(-1352.5, 9); // 840 + 2500 × 0.205 s
    // at y = 250 m H1 is at 805 ms (footwall) and 845 ms (hanging wall)
    expect(zAt("H2", "fw", 250)).toBeCloseTo(-1298.75, 9); // 805 + 2500 × 0.1975 s
    expect(zAt("H2", "hw", 250)).toBeCloseTo(-1351.25, 9); // 845 + 2500 × 0.2025 s
    const h2 = summary.segments[0].horizons.find((h) => h.name === "H2")!;
    // between vertices the depth-converted lines are read at one along-strike place on the plane fitted in depth
    for (const t of h2.throwM) if (t !== null) expect(t).toBeCloseTo(52.5, 2);
    // the original times are kept beside the depths
    expect(h2.hwTwtMs?.every((t) => t === 1250)).toBe(true);
    expect(summary.velocityModel).toMatchObject({ kind: "intervals" });
  });

  it("a linear model converts a TWT cut-off file vertex by vertex", () => {
    const rows = ["x,y,twt,horizon,wall"];
    for (const y of [0, 1000]) rows.push(`0,${y},1351.5504,H1,fw`, `40,${y},1400,H1,hw`, `300,${y},1768.76,H2,fw`, `340,${y},1800,H2,hw`);
    const parsed = parseCutoffCsv(rows.join("\n"));
    const { vertexZ, summary } = deriveFromCutoffs(parsed, { velocityModel: { kind: "linear", v0MPerS: 1800, kPerS: 0.6 }, stationSpacingM: 500 });
    expect(vertexZ[0]).toBeCloseTo(-1500, 2);
    expect(vertexZ[2]).toBeCloseTo(-2100, 2);
    expect(summary.horizons[0].maxThrowM).toBeCloseTo(depthFromTwtLinear(1400, 1800, 0.6) - 1500, 2);
  });

  it("a horizon missing from the interval table, or an interval without the horizon above on that wall, is named", () => {
    const rows = ["x,y,twt,horizon,wall", "0,0,800,H1,fw", "0,100,800,H1,fw", "30,0,840,H1,hw", "30,100,840,H1,hw"];
    const parsed = parseCutoffCsv(rows.join("\n"));
    expect(() => deriveFromCutoffs(parsed, { velocityModel: { kind: "intervals", intervals: [{ horizon: "H0", velocityMPerS: 1900 }] } })).toThrow(
      /horizon "H1" has no interval velocity in the model/,
    );
    expect(() =>
      deriveFromCutoffs(parsed, {
        velocityModel: {
          kind: "intervals",
          intervals: [
            { horizon: "H0", velocityMPerS: 1900 },
            { horizon: "H1", velocityMPerS: 2000 },
          ],
        },
      }),
    ).toThrow(/need the time of "H0" above the (hanging wall|footwall) cut-off of "H1", but "H0" has no/);
  });
});

describe("velocity models as given on the command line and in forms", () => {
  it("reads v0=…,k=… and interval lists; names what is wrong", () => {
    expect(parseVelocityText("v0=1800,k=0.6")).toEqual({ kind: "linear", v0MPerS: 1800, kPerS: 0.6 });
    expect(parseVelocityText("Top Sand=2100, Base Sand=2600")).toEqual({
      kind: "intervals",
      intervals: [
        { horizon: "Top Sand", velocityMPerS: 2100 },
        { horizon: "Base Sand", velocityMPerS: 2600 },
      ],
    });
    expect(() => parseVelocityText("v0=1800")).toThrow(/both and nothing else/);
    expect(() => parseVelocityText("v0=50,k=0.6")).toThrow(/v0 must be between 100 and 10,000 m\/s \(got 50\)/);
    expect(() => parseVelocityText("v0=1800,k=x")).toThrow(/does not end in a number/);
    expect(velocityModelProblems({ kind: "linear", v0MPerS: 1800, kPerS: 9 })).toEqual(["k must be between −5 and 5 1/s (got 9)"]);
  });
});

describe("throw picks in two-way time: each wall converted on its own, never a time throw scaled by one velocity", () => {
  it("linear model: the hanging wall at TWT + ΔTWT/2, the footwall at TWT − ΔTWT/2; the original times kept", async () => {
    const { parsePickCsv } = await import("@/lib/engine/csv");
    const text = "x,y,twt,throw\n0,0,1400,40\n100,0,1420,44\n0,100,1380,36\n100,100,1450,30\n";
    const { picks } = parsePickCsv(text, { velocityModel: { kind: "linear", v0MPerS: 1800, kPerS: 0.6 } });
    const hw = depthFromTwtLinear(1420, 1800, 0.6);
    const fw = depthFromTwtLinear(1380, 1800, 0.6);
    expect(picks.throwM[0]).toBeCloseTo(hw - fw, 9);
    expect(picks.z[0]).toBeCloseTo(-(hw + fw) / 2, 9);
    // a 40 ms throw at about 1 s one-way time is some 44 m here, not 40 × 1800 / 2000 = 36 m
    expect(picks.throwM[0]).toBeGreaterThan(43);
    expect(Array.from(picks.twtMs!)).toEqual([1400, 1420, 1380, 1450]);
    expect(Array.from(picks.throwMs!)).toEqual([40, 44, 36, 30]);
  });

  it("without a velocity model a file in time is refused on its header", async () => {
    const { parsePickCsv, PickInputError } = await import("@/lib/engine/csv");
    expect(() => parsePickCsv("x,y,twt,throw\n0,0,1400,40\n")).toThrow(PickInputError);
    expect(() => parsePickCsv("x,y,twt,throw\n0,0,1400,40\n")).toThrow(/two-way time \(twt, ms\): give a velocity model/);
  });

  it("interval velocities: picks of H1 and H2 along strike, H2 converted through H1's time on the same wall", async () => {
    const { parsePickCsv } = await import("@/lib/engine/csv");
    // H1 at 800 ms with a 40 ms throw (walls 820 / 780 ms), H2 at 1200 ms with a 50 ms throw (1225 / 1175 ms)
    const rows = ["x,y,twt,throw,horizon"];
    for (const y of [0, 500, 1000]) rows.push(`0,${y},800,40,H1`, `200,${y},1200,50,H2`);
    const { picks } = parsePickCsv(rows.join("\n"), {
      velocityModel: {
        kind: "intervals",
        intervals: [
          { horizon: "H1", velocityMPerS: 2000 },
          { horizon: "H2", velocityMPerS: 2500 },
        ],
      },
    });
    // H1: 2000 × 0.41 − 2000 × 0.39 = 40 m. H2 hanging wall 820 + 2500 × 0.2025 = 1326.25 m; footwall 780 + 2500 × 0.1975 = 1273.75 m
    expect(picks.throwM[0]).toBeCloseTo(40, 9);
    expect(picks.throwM[1]).toBeCloseTo(52.5, 9);
    expect(picks.z[1]).toBeCloseTo(-1300, 9);
  });
});
