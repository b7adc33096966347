import { describe, expect, it } from "vitest";
import { CutoffInputError, isCutoffCsv, parseCutoffCsv, selfCrossing, type CutoffParseOptions } from "@/lib/engine/cutoffs";
import { deriveFromCutoffs, derivedPickProblems, derivedPicksCsv, spacingFromData, type CutoffDeriveOptions } from "@/lib/engine/cutoff-stations";
import { parsePickCsv } from "@/lib/engine/csv";
import { alongStrike, cutoffCsv, DIP_DEG, DIP_VECTOR, onFault, STRIKE_VECTOR, translated, type LineSpec } from "./cutoff-fixtures";

const RAD = Math.PI / 180;
const SIN = Math.sin(DIP_DEG * RAD);
const TAN = Math.tan(DIP_DEG * RAD);

function derive(text: string, parse: CutoffParseOptions = {}, options: CutoffDeriveOptions = {}) {
  const parsed = parseCutoffCsv(text, parse);
  return { parsed, ...deriveFromCutoffs(parsed, options) };
}

function refusal(run: () => unknown): CutoffInputError {
  try {
    run();
  } catch (error) {
    if (error instanceof CutoffInputError) return error;
    throw error;
  }
  throw new Error("expected a CutoffInputError");
}

/** Flat horizons H1 (footwall −1000 m) and H2 (−1200 m), both thrown down `throwM` in the hanging wall, y 0–1000 m. */
function flatHorizons(throwM: number): LineSpec[] {
  return [
    { horizon: "H1", wall: "fw", points: alongStrike(0, 1000, 11, () => -1000) },
    { horizon: "H1", wall: "hw", points: alongStrike(0, 1000, 11, () => -1000 - throwM) },
    { horizon: "H2", wall: "fw", points: alongStrike(0, 1000, 11, () => -1200) },
    { horizon: "H2", wall: "hw", points: alongStrike(0, 1000, 11, () => -1200 - throwM) },
  ];
}

describe("throw from cut-off lines on a planar fault (hand-computable; T = D sin δ, H = D cos δ: Groshong 2006, eq. 8.3)", () => {
  it("flat horizons offset by 50 m on a 60° fault: throw 50 m, heave 28.868 m, displacement 57.735 m at every station", () => {
    const { picks, summary } = derive(cutoffCsv(flatHorizons(50)));
    // the reference frame is the plane through every cut-off vertex: strike 000, dip 60° toward 090
    const [segment] = summary.segments;
    expect(segment.frame.dipDeg).toBeCloseTo(60, 9);
    expect(segment.frame.dipDirectionDeg).toBeCloseTo(90, 9);
    // the spacing from the data is the vertex spacing along strike, 100 m: 11 stations from s = −500 to 500 m
    expect(summary.stationSpacingM).toBe(100);
    expect(summary.stationSpacingSource).toBe("data");
    expect(segment.stationsS).toEqual([-500, -400, -300, -200, -100, 0, 100, 200, 300, 400, 500]);
    expect(picks.x.length).toBe(22);
    for (let i = 0; i < picks.x.length; i++) {
      expect(picks.throwM[i]).toBeCloseTo(50, 9);
      expect(picks.heaveM[i]).toBeCloseTo(50 / TAN, 9); // 28.868 m
      expect(Math.hypot(picks.throwM[i], picks.heaveM[i])).toBeCloseTo(50 / SIN, 9); // 57.735 m (docs/check-values.md G1)
    }
    for (const horizon of segment.horizons) for (const d of horizon.displacementM) expect(d).toBeCloseTo(57.735, 3);
    // each derived pick sits midway between its two cut-offs
    const h1 = picks.horizonNames.indexOf("H1");
    const first = Array.from(picks.horizon).indexOf(h1);
    expect(picks.z[first]).toBeCloseTo(-1025, 9);
    expect(picks.y[first]).toBeCloseTo(0, 9);
    expect(picks.horizonNames).toEqual(["H1", "H2"]);
    expect(summary.horizons).toEqual([
      { name: "H1", stations: 11, maxThrowM: 50, meanThrowM: 50, missingStations: 0 },
      { name: "H2", stations: 11, maxThrowM: 50, meanThrowM: 50, missingStations: 0 },
    ]);
    expect(summary.missingStations).toBe(0);
  });

  it("the same read from a depth column (positive down), and with a spacing the interpreter set", () => {
    const { picks, summary } = derive(cutoffCsv(flatHorizons(50), { vertical: "depth" }), {}, { stationSpacingM: 250 });
    expect(summary.stationSpacingSource).toBe("set");
    expect(summary.segments[0].stationsS).toEqual([-500, -250, 0, 250, 500]);
    expect(picks.x.length).toBe(10);
    for (const t of picks.throwM) expect(t).toBeCloseTo(50, 9);
  });

  it("dipping horizons (0.2 m/m east, 0.1 m/m north): the hanging-wall cut-off is the footwall one moved 57.735 m down dip, so throw is still 50 m", () => {
    // footwall horizon z = −1000 − 0.1 y + 0.2 x; on the fault x = −z / tan δ, so its cut-off is z(y) = (−1000 − 0.1 y) / (1 + 0.2 / tan δ)
    const fwZ = (y: number) => (-1000 - 0.1 * y) / (1 + 0.2 / TAN);
    const slipM = 50 / SIN;
    const slip: [number, number, number] = [slipM * DIP_VECTOR[0], 0, slipM * DIP_VECTOR[2]];
    const fw1 = alongStrike(0, 1000, 21, fwZ);
    const fw2 = alongStrike(0, 1000, 21, (y) => fwZ(y) - 300);
    const { picks, summary } = derive(
      cutoffCsv([
        { horizon: "H1", wall: "fw", points: fw1 },
        { horizon: "H1", wall: "hw", points: translated(fw1, slip) },
        { horizon: "H2", wall: "fw", points: fw2 },
        { horizon: "H2", wall: "hw", points: translated(fw2, slip) },
      ]),
    );
    expect(summary.segments[0].frame.dipDeg).toBeCloseTo(60, 9);
    expect(picks.x.length).toBeGreaterThan(20);
    for (let i = 0; i < picks.x.length; i++) {
      // to 1e-7 m: the file carries nine decimals
      expect(picks.throwM[i]).toBeCloseTo(50, 7);
      expect(picks.heaveM[i]).toBeCloseTo(50 / TAN, 7);
    }
  });

  it("oblique slip of 200 m at a rake of 45° on cut-offs pitching 0.1/sin 60° on the plane: the displacement along the rake is 200 m (derived: separation down the dip line = D (sin r − cos r tan φ))", () => {
    const rakeDeg = 45;
    const slipM = 200;
    const r = rakeDeg * RAD;
    const slip = [0, 1, 2].map((axis) => slipM * (Math.cos(r) * STRIKE_VECTOR[axis] + Math.sin(r) * DIP_VECTOR[axis])) as [number, number, number];
    const fwZ = (y: number) => -1000 - 0.1 * y;
    const fw1 = alongStrike(0, 1000, 41, fwZ);
    const fw2 = alongStrike(0, 1000, 41, (y) => fwZ(y) - 400);
    const text = cutoffCsv([
      { horizon: "H1", wall: "fw", points: fw1 },
      { horizon: "H1", wall: "hw", points: translated(fw1, slip) },
      { horizon: "H2", wall: "fw", points: fw2 },
      { horizon: "H2", wall: "hw", points: translated(fw2, slip) },
    ]);
    // the cut-off lines' pitch on the plane: t = −z / sin δ, so dt/ds = 0.1 / sin δ
    const tanPitch = 0.1 / SIN;
    const dipSeparation = slipM * (Math.sin(r) - Math.cos(r) * tanPitch); // 125.09 m
    const oblique = derive(text, {}, { rakeDeg, stationSpacingM: 50 });
    const dipSlip = derive(text, {}, { stationSpacingM: 50 });
    const paired = (result: typeof oblique) =>
      result.summary.segments[0].horizons
        .flatMap((h) => h.displacementM.map((d, k) => ({ d, throwM: h.throwM[k], heaveM: h.heaveM[k] })))
        .filter((v) => v.d !== null);
    expect(paired(oblique).length).toBeGreaterThan(20);
    for (const station of paired(oblique)) {
      expect(station.d!).toBeCloseTo(200, 6);
      expect(station.throwM!).toBeCloseTo(dipSeparation * SIN, 2); // 108.33 m
      expect(station.heaveM!).toBeCloseTo(dipSeparation * Math.cos(DIP_DEG * RAD), 2); // 62.55 m
    }
    // without a rake (pure dip slip assumed) the displacement is the separation down the dip line
    for (const station of paired(dipSlip)) expect(station.d!).toBeCloseTo(dipSeparation, 2);
    // the slip moved the hanging-wall lines 141 m along strike: the unmatched ends are reported, not filled in
    expect(oblique.summary.missingStations).toBeGreaterThan(0);
  });

  it("a station with one wall missing is reported with its place, never filled in", () => {
    // H1's hanging-wall cut-off stops at y = 700 m. Vertices only at the line ends: the centroid's y is
    // (0 + 1000 + 0 + 700 + 0 + 1000 + 0 + 1000) / 8 = 462.5 m, so stations every 100 m fall at y = 62.5 … 962.5 m
    const text = cutoffCsv([
      { horizon: "H1", wall: "fw", points: [onFault(0, -1000), onFault(1000, -1000)] },
      { horizon: "H1", wall: "hw", points: [onFault(0, -1050), onFault(700, -1050)] },
      { horizon: "H2", wall: "fw", points: [onFault(0, -1200), onFault(1000, -1200)] },
      { horizon: "H2", wall: "hw", points: [onFault(0, -1250), onFault(1000, -1250)] },
    ]);
    const { picks, summary } = derive(text, {}, { stationSpacingM: 100 });
    expect(summary.segments[0].frame.centroid[1]).toBeCloseTo(462.5, 9);
    expect(summary.missingStations).toBe(3);
    expect(summary.missing.map((m) => [m.horizon, m.present, Number(m.y.toFixed(6))])).toEqual([
      ["H1", "fw", 762.5],
      ["H1", "fw", 862.5],
      ["H1", "fw", 962.5],
    ]);
    expect(summary.missing[0].z).toBeCloseTo(-1000, 9);
    expect(summary.horizons.find((h) => h.name === "H1")).toMatchObject({ stations: 7, missingStations: 3 });
    expect(picks.x.length).toBe(7 + 10);
    const h1 = summary.segments[0].horizons.find((h) => h.name === "H1")!;
    expect(h1.throwM.slice(-3)).toEqual([null, null, null]);
    expect(h1.hwZ.slice(-3)).toEqual([null, null, null]);
    expect(summary.warnings.join(" ")).toMatch(/3 stations have a cut-off on one wall only: reported, not filled in/);
  });

  it("several pieces of one cut-off (the line column) pair like one line", () => {
    const lines = flatHorizons(40);
    lines[0] = { horizon: "H1", wall: "fw", line: "a", points: alongStrike(0, 500, 6, () => -1000) };
    lines.push({ horizon: "H1", wall: "fw", line: "b", points: alongStrike(500, 1000, 6, () => -1000) });
    const { picks, summary } = derive(cutoffCsv(lines, { extra: ["line"] }), {}, { stationSpacingM: 100 });
    expect(summary.horizons[0]).toMatchObject({ name: "H1", stations: 11, missingStations: 0 });
    for (const t of picks.throwM) expect(t).toBeCloseTo(40, 9);
  });

  it("the derived picks read back through the pick CSV reader unchanged (x, y, z, throw, heave, horizon, segment)", () => {
    const { picks } = derive(cutoffCsv(flatHorizons(50)));
    const back = parsePickCsv(derivedPicksCsv(picks)).picks;
    expect(back.x.length).toBe(picks.x.length);
    expect(back.horizonNames).toEqual(["H1", "H2"]);
    expect(back.throwM[3]).toBeCloseTo(50, 3);
    expect(back.heaveM[3]).toBeCloseTo(28.868, 3);
  });

  it("one horizon alone gives picks along one line: refused, a surface needs two horizons", () => {
    const { picks } = derive(cutoffCsv(flatHorizons(50).slice(0, 2)));
    const problems = derivedPickProblems(picks);
    expect(problems).toHaveLength(1);
    expect(problems[0].reason).toMatch(/one horizon's cut-offs.*at least two horizons/);
  });

  it("a reverse separation on a normal fault is counted in a warning", () => {
    const lines = flatHorizons(50);
    lines[1] = { horizon: "H1", wall: "hw", points: alongStrike(0, 1000, 11, () => -950) };
    const { summary } = derive(cutoffCsv(lines), {}, { sense: "normal" });
    expect(summary.warnings.join(" ")).toMatch(/at 11 stations the hanging-wall cut-off lies above the footwall one, against the fault's normal sense/);
  });
});

describe("cut-off file checks: row and column named, the whole file refused unless bad rows are dropped", () => {
  it("tells a cut-off file from a pick file by its wall column", () => {
    expect(isCutoffCsv("x,y,z,horizon,WALL\n")).toBe(true);
    expect(isCutoffCsv("\uFEFFx,y,twt,horizon,wall\n")).toBe(true);
    expect(isCutoffCsv("x,y,z,throw,horizon\n")).toBe(false);
  });

  it("a self-crossing line is refused, naming the rows of the two pieces that cross", () => {
    // rows 2–5: the footwall cut-off of H1 runs north to y = 400, back down to (300, −1050), then up through itself
    const crossing: LineSpec = { horizon: "H1", wall: "fw", points: [onFault(0, -1000), onFault(400, -1000), onFault(300, -1050), onFault(200, -950)] };
    const lines = [crossing, ...flatHorizons(50).slice(1)];
    const error = refusal(() => parseCutoffCsv(cutoffCsv(lines)));
    expect(error.rejected).toHaveLength(1);
    expect(error.rejected[0]).toMatchObject({ row: 4, column: "x,y" });
    expect(error.rejected[0].reason).toMatch(
      /the footwall cut-off of "H1" crosses itself: the piece from row 2 to row 3 crosses the piece from row 4 to row 5/,
    );
    expect(error.message).toMatch(/row 4, column x,y/);
    // asked to order the vertices along strike, the same file is read, with the reordering stated
    const ordered = parseCutoffCsv(cutoffCsv(lines), { orderAlongStrike: true });
    expect(ordered.warnings.join(" ")).toMatch(
      /the footwall cut-off of "H1" \(from row 2\) was not in order along the line; its vertices were ordered along strike as asked/,
    );
  });

  it("the crossing test on its own: an X crosses, a zigzag forward and a line doubling back over itself do not", () => {
    expect(selfCrossing([0, 4, 3, 2], [0, 0, -5, 5])).toEqual([0, 2]);
    expect(selfCrossing([0, 1, 2, 3], [0, 5, 0, 5])).toBeNull();
    expect(selfCrossing([0, 6, 3, 10], [0, 0, 0, 0])).toBeNull();
  });

  it("vertices out of order that never cross are ordered along strike, with a warning naming the line and its row", () => {
    const scrambled = alongStrike(0, 1000, 11, () => -1000);
    [scrambled[2], scrambled[7]] = [scrambled[7], scrambled[2]];
    const lines = [{ horizon: "H1", wall: "fw" as const, points: scrambled }, ...flatHorizons(50).slice(1)];
    const { picks, parsed } = derive(cutoffCsv(lines));
    expect(parsed.warnings.join(" ")).toMatch(
      /the footwall cut-off of "H1" \(from row 2\) goes back and forth along strike; its vertices were ordered along strike/,
    );
    for (const t of picks.throwM) expect(t).toBeCloseTo(50, 9);
  });

  it("a line of zero length, a line of one vertex and a horizon with one wall are refused with their rows", () => {
    const zero: LineSpec = { horizon: "H1", wall: "fw", points: [onFault(500, -1000), onFault(500, -1000)] };
    let error = refusal(() => parseCutoffCsv(cutoffCsv([zero, ...flatHorizons(50).slice(1)])));
    expect(error.rejected[0]).toMatchObject({ row: 2 });
    expect(error.rejected[0].reason).toMatch(/the footwall cut-off of "H1" has zero length/);

    const single: LineSpec = { horizon: "H1", wall: "fw", points: [onFault(500, -1000)] };
    error = refusal(() => parseCutoffCsv(cutoffCsv([single, ...flatHorizons(50).slice(1)])));
    expect(error.rejected[0].reason).toMatch(/has one vertex; a cut-off line needs at least two/);

    // H2 without its footwall: rows 2–23 are H1, the hanging wall of H2 starts on row 24
    const noFootwall = [...flatHorizons(50).slice(0, 2), flatHorizons(50)[3]];
    error = refusal(() => parseCutoffCsv(cutoffCsv(noFootwall)));
    expect(error.rejected[0]).toMatchObject({ row: 24, column: "wall" });
    expect(error.rejected[0].reason).toMatch(/horizon "H2" has a hanging wall cut-off but no footwall cut-off; a throw needs both walls/);
    // dropping bad rows drops that horizon, listed, and keeps the rest
    const dropped = parseCutoffCsv(cutoffCsv(noFootwall), { dropBadRows: true });
    expect(dropped.rejected.map((r) => r.row)).toEqual([24]);
    expect(dropped.rejected[0].reason).toMatch(/\(dropped\)$/);
    expect(dropped.lines.map((line) => line.wall).sort()).toEqual(["fw", "hw"]);
  });

  it("lists every bad row with its column; dropping them keeps the good rows", () => {
    const good = cutoffCsv(flatHorizons(50)).trimEnd().split("\n");
    good[3] = good[3].replace(/,fw$/, ",up");
    good[5] = `abc${good[5].slice(good[5].indexOf(","))}`;
    good[7] = good[7].replace(/,H1,/, ",,");
    const error = refusal(() => parseCutoffCsv(good.join("\n")));
    expect(error.rejected.map((r) => `${r.row}:${r.column}`)).toEqual(["4:wall", "6:x", "8:horizon"]);
    expect(error.rejected[0].reason).toMatch(/wall must be "hw" \(hanging wall\) or "fw" \(footwall\) \(got "up"\)/);
    expect(error.message).toMatch(/3 problems in the cut-off file/);
    const kept = parseCutoffCsv(good.join("\n"), { dropBadRows: true });
    expect(kept.accepted).toBe(44 - 3);
    expect(kept.rejected).toHaveLength(3);
  });

  it("the header needs x, y, one vertical column, horizon and wall", () => {
    let error = refusal(() => parseCutoffCsv("x,y,horizon,wall\n1,2,H,hw\n"));
    expect(error.rejected[0]).toMatchObject({ row: 1, column: "z" });
    error = refusal(() => parseCutoffCsv("x,y,z,twt,horizon,wall\n1,2,3,4,H,hw\n"));
    expect(error.rejected[0].reason).toMatch(/give one vertical column, not z and twt/);
  });

  it("a file in two-way time without a velocity model is refused: metrics are computed in depth only", () => {
    const text = "x,y,twt,horizon,wall\n0,0,1000,H1,fw\n0,100,1000,H1,fw\n10,0,1040,H1,hw\n10,100,1040,H1,hw\n";
    const parsed = parseCutoffCsv(text);
    expect(parsed.columns.domain).toBe("time");
    const error = refusal(() => deriveFromCutoffs(parsed, {}));
    expect(error.message).toMatch(/two-way time \(twt, ms\): give a velocity model/);
  });

  it("the spacing chosen from the data is the median vertex spacing rounded to 1, 2, 2.5 or 5 × 10ⁿ m", () => {
    expect(spacingFromData([48, 52, 50, 49])).toBe(50);
    expect(spacingFromData([23, 24, 26])).toBe(25);
    expect(spacingFromData([180, 190, 210])).toBe(200);
    expect(spacingFromData([0.2, 0.3])).toBe(1);
  });
});
