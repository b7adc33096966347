// Cut-off line files on a planar fault whose answers are known by hand: strike 000, dip 60° toward 090 (east), through
// the origin, so a point at elevation z lies at x = −z / tan 60° and the down-dip unit vector is (cos 60°, 0, −sin 60°).
import { twtFromDepthLinear } from "@/lib/engine/time-depth";

const RAD = Math.PI / 180;
export const DIP_DEG = 60;
const TAN = Math.tan(DIP_DEG * RAD);
export const DIP_VECTOR: [number, number, number] = [Math.cos(DIP_DEG * RAD), 0, -Math.sin(DIP_DEG * RAD)];
export const STRIKE_VECTOR: [number, number, number] = [0, 1, 0];

/** The point of the fault plane at northing y and elevation z. */
export function onFault(y: number, z: number): [number, number, number] {
  return [-z / TAN, y, z];
}

export interface LineSpec {
  horizon: string;
  wall: "hw" | "fw";
  points: [number, number, number][];
  line?: string;
  segment?: string;
}

/** A CSV with x, y, z (or depth, or twt through `vertical`), horizon, wall and the optional line/segment columns. */
export function cutoffCsv(lines: LineSpec[], options: { vertical?: "z" | "depth"; extra?: ("line" | "segment")[] } = {}): string {
  const vertical = options.vertical ?? "z";
  const extra = options.extra ?? [];
  const rows = [["x", "y", vertical, "horizon", "wall", ...extra].join(",")];
  for (const spec of lines) {
    for (const [x, y, z] of spec.points) {
      const v = vertical === "depth" ? -z : z;
      rows.push(
        [
          x.toFixed(9),
          y.toFixed(9),
          v.toFixed(9),
          spec.horizon,
          spec.wall,
          ...extra.map((name) => (name === "line" ? (spec.line ?? "") : (spec.segment ?? ""))),
        ].join(","),
      );
    }
  }
  return `${rows.join("\n")}\n`;
}

/** A line of `count` vertices along y from y0 to y1 with the elevation given by z(y), on the fault. */
export function alongStrike(y0: number, y1: number, count: number, z: (y: number) => number): [number, number, number][] {
  return Array.from({ length: count }, (_, k) => {
    const y = y0 + ((y1 - y0) * k) / (count - 1);
    return onFault(y, z(y));
  });
}

/** The footwall line translated by a slip vector (in the fault plane): the hanging-wall cut-off of the same horizon. */
export function translated(points: [number, number, number][], slip: [number, number, number]): [number, number, number][] {
  return points.map(([x, y, z]) => [x + slip[0], y + slip[1], z + slip[2]]);
}

/**
 * Three horizons on the fault above, written in two-way time with v(z) = 1800 + 0.6 z:
 * footwall depths 1500, 1800, 2100 m, thrown down 60, 70 and 80 m, vertices every 100 m of northing from 0 to 2000 m;
 * the hanging-wall cut-off of H3 stops at 1500 m.
 */
export function timeCutoffCsv(): string {
  const rows = ["x,y,twt,horizon,wall"];
  const horizons: [string, number, number][] = [
    ["H1", 1500, 60],
    ["H2", 1800, 70],
    ["H3", 2100, 80],
  ];
  for (const [name, depth, throwM] of horizons) {
    for (const [wall, d] of [
      ["fw", depth],
      ["hw", depth + throwM],
    ] as const) {
      const lastY = name === "H3" && wall === "hw" ? 1500 : 2000;
      for (let y = 0; y <= lastY; y += 100) {
        const [x] = onFault(y, -d);
        rows.push(`${x.toFixed(3)},${y},${twtFromDepthLinear(d, 1800, 0.6).toFixed(4)},${name},${wall}`);
      }
    }
  }
  return `${rows.join("\n")}\n`;
}
