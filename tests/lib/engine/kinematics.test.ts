import { describe, expect, it } from "vitest";
import { analyzeCsv, analyzePicks } from "@/lib/engine/pipeline";
import { parsePickCsv, PickInputError } from "@/lib/engine/csv";
import { displacementColumn, displacementFromThrow, slipComponents } from "@/lib/engine/displacement";
import { kinematicsProblems, rakeProblem } from "@/lib/engine/kinematics";
import type { PickColumns } from "@/lib/engine/types";

// Hand-computed values from the dip-slip relation T = D·sin δ (Groshong 2006, 3-D Structural Geology, eq. 8.3) and
// the decomposition of an oblique slip vector of length S at rake r into a dip-slip part S·sin r and a strike-slip
// part S·cos r, of which only the dip-slip part has a vertical component, T = S·sin r·sin δ (from memory: the
// standard slip-vector relations, e.g. Fossen 2016, Structural Geology, 2nd ed.). Rake sign: Aki & Richards (1980),
// negative for normal slip, positive for reverse.
describe("throw to displacement for normal, reverse and oblique slip", () => {
  it("matches the hand-computed dip-slip and oblique values", () => {
    // D = 100 / sin 60° = 115.470 m
    expect(displacementFromThrow(100, 60)).toBeCloseTo(115.47, 3);
    // S = 200 m at r = 45° on δ = 60°: T = 200 · sin 45° · sin 60° = 122.474 m, so D from that throw is 200.000 m
    expect(displacementFromThrow(122.474487, 60, 45)).toBeCloseTo(200, 3);
    expect(displacementFromThrow(122.474487, 60, -45)).toBeCloseTo(200, 3);
    // its strike-slip and dip-slip parts are both 141.421 m
    const parts = slipComponents(200, 45);
    expect(parts.strikeSlipM).toBeCloseTo(141.421, 3);
    expect(parts.dipSlipM).toBeCloseTo(141.421, 3);
    // reverse, δ = 30°, T = 50 m: D = 100.000 m (hanging wall up; the sense does not change the magnitude)
    expect(displacementFromThrow(50, 30, 90)).toBeCloseTo(100, 6);
    // heave given: the dip-slip part is √(T² + H²) = 50 m for T = 30, H = 40; at r = −30° the slip is 100 m
    const column = displacementColumn([30, 30], [40, 40], 60, [-90, -30]);
    expect(column[0]).toBeCloseTo(50, 9);
    expect(column[1]).toBeCloseTo(100, 9);
  });

  it("refuses rakes near pure strike-slip, with a reason", () => {
    expect(rakeProblem(10)).toMatch(/within 20° of pure strike-slip/);
    expect(rakeProblem(-170)).toMatch(/within 20° of pure strike-slip/);
    expect(rakeProblem(190)).toMatch(/outside −180° to 180°/);
    expect(rakeProblem(-45)).toBeNull();
    expect(kinematicsProblems({ sense: "oblique" })[0]).toMatch(/an oblique fault needs its rake/);
    expect(kinematicsProblems({ sense: "oblique", rakeDeg: 5 })[0]).toMatch(/^rake: rake 5° is within 20° of pure strike-slip/);
    expect(kinematicsProblems({ sense: "normal", rakeDeg: 60 })[0]).toMatch(/reverse slip, not normal/);
  });
});

/** A plane of dip δ striking 000 (dipping east) with picks of the given throws on a 7 × 7 lattice (rake column optional). */
function planeCsv(dipDeg: number, throwOf: (i: number, j: number) => number, rakeOf?: (i: number, j: number) => number): string {
  const rows = [rakeOf ? "x,y,z,throw,rake" : "x,y,z,throw"];
  const tan = Math.tan((dipDeg * Math.PI) / 180);
  for (let j = 0; j < 7; j++) {
    for (let i = 0; i < 7; i++) {
      const x = 500_000 + i * 50,
        y = 6_000_000 + j * 50;
      const z = -1000 - i * 50 * tan;
      rows.push([x, y, z.toFixed(6), throwOf(i, j), ...(rakeOf ? [rakeOf(i, j)] : [])].join(","));
    }
  }
  return rows.join("\n") + "\n";
}

const bump = (i: number, j: number) => 20 + 30 * Math.exp(-((i - 3) ** 2 + (j - 3) ** 2) / 4);

describe("fault types in the analysis", () => {
  it("a reverse fault: hanging wall up, D = T / sin δ, the sense on the report", () => {
    const { report, pickDisplacementM } = analyzeCsv(planeCsv(35, bump), { kinematics: { sense: "reverse" } });
    expect(report.kinematics).toMatchObject({ sense: "reverse", rakeDeg: 90, hangingWall: "up" });
    expect(report.kinematics!.note).toMatch(/^Reverse fault: the hanging wall moved up the dip/);
    // the peak pick: T = 50 m on a 35° plane → D = 87.172 m
    expect(report.segments[0].max.displacementM).toBeCloseTo(50 / Math.sin((35 * Math.PI) / 180), 3);
    expect(Math.max(...pickDisplacementM)).toBeCloseTo(87.172, 3);
  });

  it("an oblique fault: D = T / (sin δ · |sin r|) with the fault's rake, or each pick's own", () => {
    const oblique = analyzeCsv(planeCsv(60, bump), { kinematics: { sense: "oblique", rakeDeg: -45 } });
    // T = 50 m, δ = 60°, r = −45°: D = 50 / (0.866025 · 0.707107) = 81.650 m
    expect(oblique.report.segments[0].max.displacementM).toBeCloseTo(81.65, 3);
    expect(oblique.report.kinematics).toMatchObject({ sense: "oblique", rakeDeg: -45, hangingWall: "down" });
    // per-pick rakes: −30° on the west half, −90° on the east: D = T / (sin 60° · 0.5) and T / sin 60°
    const mixed = analyzeCsv(
      planeCsv(
        60,
        () => 10,
        (i) => (i < 3 ? -30 : -90),
      ),
      { kinematics: { sense: "normal" } },
    );
    const values = Array.from(mixed.pickDisplacementM);
    expect(values.filter((d) => Math.abs(d - 23.094) < 1e-3)).toHaveLength(21);
    expect(values.filter((d) => Math.abs(d - 11.547) < 1e-3)).toHaveLength(28);
    expect(mixed.report.kinematics!.picksWithRake).toBe(49);
  });

  it("refuses a pick rake near strike-slip and one of the other sense, naming row and column", () => {
    const csv = planeCsv(
      60,
      () => 10,
      (i, j) => (i === 2 && j === 0 ? 8 : i === 4 && j === 0 ? 60 : -90),
    );
    let error: unknown;
    try {
      parsePickCsv(csv, { kinematics: { sense: "normal" } });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(PickInputError);
    const rejected = (error as PickInputError).rejected;
    expect(rejected).toContainEqual(expect.objectContaining({ row: 4, column: "rake", reason: expect.stringMatching(/within 20° of pure strike-slip/) }));
    expect(rejected).toContainEqual(expect.objectContaining({ row: 6, column: "rake", reason: expect.stringMatching(/reverse slip .* on a normal fault/) }));
  });

  it("negative throw is an error unless the fault's type expects inversion, and then the report says so", () => {
    const csv = planeCsv(60, (i, j) => (i === 0 && j === 0 ? -4 : bump(i, j)));
    expect(() => parsePickCsv(csv)).toThrow(
      /row 2, column throw: throw must be ≥ 0 \(got -4\): negative throw is offset opposite to the fault's normal sense; if the fault was inverted, set its type to expect inversion/,
    );
    const inverted = analyzeCsv(csv, { kinematics: { sense: "normal", inversion: true } });
    expect(inverted.report.kinematics).toMatchObject({ inversion: true, oppositeSensePicks: 1 });
    expect(inverted.report.kinematics!.note).toMatch(/expects inversion: 1 pick has negative throw/);
    expect(inverted.pickDisplacementM[0]).toBeCloseTo(-4 / Math.sin((60 * Math.PI) / 180), 6);
  });

  it("the engine refuses stored picks the fault type no longer allows", () => {
    const picks: PickColumns = parsePickCsv(
      planeCsv(60, (i) => (i === 1 ? -2 : 10)),
      { kinematics: { sense: "normal", inversion: true } },
    ).picks;
    expect(() => analyzePicks(picks, { kinematics: { sense: "normal" } })).toThrow(PickInputError);
    expect(() => analyzePicks(picks, { kinematics: { sense: "oblique", rakeDeg: 3 } })).toThrow(/The fault's type cannot be used: rake: rake 3° is within 20°/);
  });
});
