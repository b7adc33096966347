// Throw from cut-off lines: each horizon's hanging-wall and footwall cut-offs are paired at stations along strike on
// the fault's reference frame (the plane fitted to all of a segment's cut-off vertices in depth); at each station the
// throw is the vertical separation of the two cut-offs, the heave their horizontal separation (in the dip direction:
// both points have the same along-strike coordinate), the displacement their separation along the dip line or, for a
// given rake, along the slip line. Stations where only one wall has a cut-off are reported, never filled in.
// The result is a derived pick set (x, y, z at the midpoint of the two cut-offs, throw, heave, horizon, segment).
import { CutoffInputError, lineWords, strikeAxisOf, WALL_WORDS, type CutoffColumns, type CutoffLine, type CutoffParseResult, type Wall } from "./cutoffs";
import { DegeneratePlaneError, fitPlane } from "./plane";
import { depthFromTwtIntervals, depthFromTwtLinear, velocityModelProblems, type VelocityModel } from "./time-depth";
import type { PickColumns, RejectedRow } from "./types";

const RAD = Math.PI / 180;
/** most missing-wall stations listed one by one (all are counted) */
export const MAX_MISSING_LISTED = 500;
const MAX_STATIONS = 200_000;

export interface CutoffDeriveOptions {
  /** needed when the file is in two-way time */
  velocityModel?: VelocityModel | null;
  /** distance between stations along strike (m); default from the vertex spacing */
  stationSpacingM?: number;
  /** angle in the fault plane from the strike direction to the slip line (°); 90 is pure dip slip (the default) */
  rakeDeg?: number;
  /** the fault's sense: separations of the other sense are counted in a warning (default: the commoner sense) */
  sense?: "normal" | "reverse";
}

export interface CutoffFrame {
  centroid: [number, number, number];
  strikeVector: [number, number, number];
  dipVector: [number, number, number];
  normal: [number, number, number];
  strikeDeg: number;
  dipDeg: number;
  dipDirectionDeg: number;
}

/** One horizon at a segment's stations; null where that wall (or the pair) has no value. */
export interface StationHorizon {
  name: string;
  /** cut-off elevation (m, up) on each wall */
  hwZ: (number | null)[];
  fwZ: (number | null)[];
  /** the original two-way times (ms) of time files */
  hwTwtMs?: (number | null)[];
  fwTwtMs?: (number | null)[];
  throwM: (number | null)[];
  heaveM: (number | null)[];
  /** along the dip line, or along the rake when one was given */
  displacementM: (number | null)[];
}

export interface StationSegment {
  name: string;
  frame: CutoffFrame;
  /** station positions along strike (m) in the frame */
  stationsS: number[];
  /** shallow to deep by the mean footwall cut-off */
  horizons: StationHorizon[];
}

export interface MissingStation {
  segment: string;
  horizon: string;
  s: number;
  /** the wall that has a cut-off there */
  present: Wall;
  x: number;
  y: number;
  z: number;
}

export interface CutoffSummary {
  domain: "depth" | "time";
  velocityModel: VelocityModel | null;
  stationSpacingM: number;
  stationSpacingSource: "data" | "set";
  rakeDeg: number;
  /** per horizon over every segment, shallow to deep: paired stations and their throws */
  horizons: { name: string; stations: number; maxThrowM: number; meanThrowM: number; missingStations: number }[];
  missingStations: number;
  missing: MissingStation[];
  segments: StationSegment[];
  warnings: string[];
}

export interface CutoffDerivation {
  picks: PickColumns;
  summary: CutoffSummary;
  /** every vertex's elevation (m) after depth conversion, aligned with the parsed columns */
  vertexZ: Float64Array;
}

/** The station spacing chosen from the data: the median vertex spacing along strike, rounded to 1, 2, 2.5 or 5 × 10ⁿ m. */
export function spacingFromData(spacingsM: number[]): number {
  const positive = spacingsM.filter((d) => d > 1e-9).sort((a, b) => a - b);
  if (positive.length === 0) return 10;
  const median = positive[Math.floor(positive.length / 2)];
  const power = 10 ** Math.floor(Math.log10(median));
  const candidates = [1, 2, 2.5, 5, 10].map((m) => m * power);
  let best = candidates[0];
  for (const candidate of candidates) if (Math.abs(Math.log(candidate / median)) < Math.abs(Math.log(best / median))) best = candidate;
  return Math.max(1, best);
}

/** Elevation (m) of every vertex: as read (depth files) or converted from two-way time with the model. */
export function verticesInDepth(
  parsed: Pick<CutoffParseResult, "columns" | "lines">,
  model: VelocityModel | null | undefined,
): { z: Float64Array; warnings: string[] } {
  const { columns } = parsed;
  const n = columns.x.length;
  const z = new Float64Array(n);
  if (columns.domain === "depth") {
    z.set(columns.vertical);
    return { z, warnings: [] };
  }
  if (!model)
    throw new CutoffInputError(
      "the cut-offs are in two-way time (twt, ms): give a velocity model to convert them to depth; metrics are computed in depth only",
      [{ row: 1, column: "twt", reason: "a velocity model is needed for two-way time" }],
    );
  const problems = velocityModelProblems(model);
  if (problems.length)
    throw new CutoffInputError(
      `the velocity model cannot be used: ${problems.join("; ")}`,
      problems.map((reason) => ({ row: 1, column: "velocity model", reason })),
    );
  if (model.kind === "linear") {
    for (let i = 0; i < n; i++) z[i] = -depthFromTwtLinear(columns.vertical[i], model.v0MPerS, model.kPerS);
    return { z, warnings: [] };
  }
  // interval velocities: the times of the horizons above a vertex, read at its place along strike on its own wall
  const order = model.intervals.map((interval) => columns.horizonNames.findIndex((name) => sameName(name, interval.horizon)));
  const velocities = model.intervals.map((interval) => interval.velocityMPerS);
  const axes = columns.segmentNames.map((_, s) => strikeAxisOf(columns, s));
  const u = (i: number) => {
    const axis = axes[columns.segment[i]];
    return (columns.x[i] - axis.cx) * axis.ux + (columns.y[i] - axis.cy) * axis.uy;
  };
  const traces = new Map<string, CutoffLine[]>();
  for (const line of parsed.lines) {
    const key = `${line.segment}:${line.wall}:${line.horizon}`;
    traces.set(key, [...(traces.get(key) ?? []), line]);
  }
  const problemsByKey = new Map<string, RejectedRow>();
  let pinched = 0;
  let held = 0;
  for (const line of parsed.lines) {
    const level = order.indexOf(line.horizon);
    if (level < 0) {
      const key = `h${line.horizon}`;
      if (!problemsByKey.has(key))
        problemsByKey.set(key, {
          row: line.firstRow,
          column: "horizon",
          reason: `horizon "${columns.horizonNames[line.horizon]}" has no interval velocity in the model`,
        });
      continue;
    }
    for (const i of line.vertices) {
      const times: number[] = [];
      for (let above = 0; above < level; above++) {
        const pieces = traces.get(`${line.segment}:${line.wall}:${order[above]}`);
        if (order[above] < 0 || !pieces) {
          const name = model.intervals[above].horizon;
          const key = `a${above}:${line.wall}:${line.segment}`;
          if (!problemsByKey.has(key))
            problemsByKey.set(key, {
              row: line.firstRow,
              column: "horizon",
              reason: `interval velocities need the time of "${name}" above ${lineWords(columns, line)}, but "${name}" has no ${WALL_WORDS[line.wall]} cut-off in the file`,
            });
          times.push(NaN);
          continue;
        }
        const at = traceTimeAt(columns, pieces, u, u(i));
        if (at.held) held++;
        times.push(at.twtMs);
      }
      times.push(columns.vertical[i]);
      const { depthM, pinched: p } = depthFromTwtIntervals(times, velocities.slice(0, level + 1));
      pinched += p;
      z[i] = -depthM;
    }
  }
  if (problemsByKey.size) {
    const list = [...problemsByKey.values()];
    throw new CutoffInputError(`the interval velocities cannot convert every cut-off: ${list.map((p) => p.reason).join("; ")}`, list);
  }
  const warnings: string[] = [];
  if (held > 0)
    warnings.push(
      `${held} vertex conversion${held === 1 ? "" : "s"} needed the time of a shallower horizon beyond the end of its cut-off line; its end value was used`,
    );
  if (pinched > 0)
    warnings.push(`${pinched} interval${pinched === 1 ? "" : "s"} had a base above its top in time (horizons crossing); taken as zero thickness`);
  return { z, warnings };
}

const sameName = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/** Time (ms) of a horizon's pieces on one wall at an along-strike position, held at the nearest end beyond them. */
function traceTimeAt(columns: CutoffColumns, pieces: CutoffLine[], u: (i: number) => number, at: number): { twtMs: number; held: boolean } {
  let nearest = { distance: Infinity, twtMs: NaN };
  for (const piece of pieces) {
    const v = piece.vertices;
    for (let k = 0; k + 1 < v.length; k++) {
      const u0 = u(v[k]);
      const u1 = u(v[k + 1]);
      if ((at - u0) * (at - u1) <= 0 && u0 !== u1) {
        const f = (at - u0) / (u1 - u0);
        return { twtMs: columns.vertical[v[k]] + f * (columns.vertical[v[k + 1]] - columns.vertical[v[k]]), held: false };
      }
    }
    for (const end of [v[0], v[v.length - 1]]) {
      const distance = Math.abs(u(end) - at);
      if (distance < nearest.distance) nearest = { distance, twtMs: columns.vertical[end] };
    }
  }
  return { twtMs: nearest.twtMs, held: true };
}

interface PlacedLine {
  line: CutoffLine;
  /** along-strike and down-dip coordinates of the vertices, ordered by s */
  s: Float64Array;
  t: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  twt: Float64Array | null;
}

function placeLine(columns: CutoffColumns, line: CutoffLine, z: Float64Array, frame: CutoffFrame): PlacedLine {
  const ids = Array.from(line.vertices);
  const sOf = (i: number) =>
    (columns.x[i] - frame.centroid[0]) * frame.strikeVector[0] +
    (columns.y[i] - frame.centroid[1]) * frame.strikeVector[1] +
    (z[i] - frame.centroid[2]) * frame.strikeVector[2];
  ids.sort((a, b) => sOf(a) - sOf(b));
  const pick = (get: (i: number) => number) => Float64Array.from(ids, get);
  return {
    line,
    s: pick(sOf),
    t: pick(
      (i) =>
        (columns.x[i] - frame.centroid[0]) * frame.dipVector[0] +
        (columns.y[i] - frame.centroid[1]) * frame.dipVector[1] +
        (z[i] - frame.centroid[2]) * frame.dipVector[2],
    ),
    x: pick((i) => columns.x[i]),
    y: pick((i) => columns.y[i]),
    z: pick((i) => z[i]),
    twt: columns.domain === "time" ? pick((i) => columns.vertical[i]) : null,
  };
}

interface LinePoint {
  x: number;
  y: number;
  z: number;
  twt: number;
  /** slope dt/ds of the line where the station falls */
  slope: number;
}

/**
 * The point of the first piece covering s (linear between its vertices), or null where none does. A station within
 * `toleranceM` beyond a line's end takes the end point: lines that end at the same northing can differ there by the
 * rounding of their coordinates.
 */
function pointAt(pieces: PlacedLine[], s: number, toleranceM: number): LinePoint | null {
  for (const piece of pieces) {
    const n = piece.s.length;
    if (s < piece.s[0] - toleranceM || s > piece.s[n - 1] + toleranceM) continue;
    let k = 0;
    while (k < n - 2 && piece.s[k + 1] < s) k++;
    const ds = piece.s[k + 1] - piece.s[k];
    const f = ds > 0 ? Math.min(1, Math.max(0, (s - piece.s[k]) / ds)) : 0;
    const lerp = (a: ArrayLike<number>) => a[k] + f * (a[k + 1] - a[k]);
    return {
      x: lerp(piece.x),
      y: lerp(piece.y),
      z: lerp(piece.z),
      twt: piece.twt ? lerp(piece.twt) : NaN,
      slope: ds > 0 ? (piece.t[k + 1] - piece.t[k]) / ds : 0,
    };
  }
  return null;
}

const rounded = (value: number, digits = 3) => (Number.isFinite(value) ? Number(value.toFixed(digits)) : null);

/** Pairs the cut-offs at stations and builds the derived pick set. Throws CutoffInputError when nothing usable results. */
export function deriveFromCutoffs(parsed: Pick<CutoffParseResult, "columns" | "lines" | "warnings">, options: CutoffDeriveOptions = {}): CutoffDerivation {
  const { columns } = parsed;
  const rakeDeg = options.rakeDeg ?? 90;
  if (!(rakeDeg > 0 && rakeDeg < 180))
    throw new CutoffInputError(`the rake must be between 0° and 180° (90° is pure dip slip); got ${rakeDeg}`, [
      { row: 1, column: "rake", reason: "rake out of range" },
    ]);
  const converted = verticesInDepth(parsed, options.velocityModel);
  const z = converted.z;
  const warnings = [...parsed.warnings, ...converted.warnings];

  // the reference frame of each segment: the plane through all its cut-off vertices in depth
  const frames: (CutoffFrame | null)[] = [];
  const frameProblems: RejectedRow[] = [];
  columns.segmentNames.forEach((name, segment) => {
    const ids: number[] = [];
    for (const line of parsed.lines) if (line.segment === segment) ids.push(...line.vertices);
    if (ids.length === 0) {
      frames.push(null);
      return;
    }
    try {
      const plane = fitPlane(columns.x, columns.y, z, ids);
      if (plane.planarityWarning) warnings.push(`segment "${name}" cut-offs: ${plane.planarityWarning}`);
      frames.push({
        centroid: plane.centroid,
        strikeVector: plane.strikeVector,
        dipVector: plane.dipVector,
        normal: plane.normal,
        strikeDeg: plane.strikeDeg,
        dipDeg: plane.dipDeg,
        dipDirectionDeg: plane.dipDirectionDeg,
      });
    } catch (error) {
      if (!(error instanceof DegeneratePlaneError)) throw error;
      frames.push(null);
      frameProblems.push({
        row: columns.sourceRow[ids[0]],
        column: "x,y,z",
        reason: `the cut-offs of segment "${name}" do not span a plane (${error.message}): the fault's reference frame is undetermined`,
      });
    }
  });
  if (frameProblems.length) throw new CutoffInputError(frameProblems.map((p) => p.reason).join("; "), frameProblems);

  const placed = parsed.lines.map((line) => placeLine(columns, line, z, frames[line.segment]!));
  const spacingSource = options.stationSpacingM !== undefined ? "set" : "data";
  const stationSpacingM =
    options.stationSpacingM ?? spacingFromData(placed.flatMap((p) => Array.from({ length: p.s.length - 1 }, (_, k) => p.s[k + 1] - p.s[k])));
  if (!(stationSpacingM > 0) || !Number.isFinite(stationSpacingM))
    throw new CutoffInputError(`the station spacing must be a positive number of metres; got ${stationSpacingM}`, [
      { row: 1, column: "station spacing", reason: "not a positive length" },
    ]);

  const px: number[] = [],
    py: number[] = [],
    pz: number[] = [],
    pt: number[] = [],
    ph: number[] = [],
    psg: number[] = [],
    phz: number[] = [],
    prow: number[] = [];
  const missing: MissingStation[] = [];
  let missingCount = 0;
  let positive = 0,
    negative = 0;
  let slipAlongCutoff = 0;
  const segments: StationSegment[] = [];
  const usedHorizons: string[] = [];
  const horizonIndex = (name: string) => {
    let at = usedHorizons.indexOf(name);
    if (at < 0) at = usedHorizons.push(name) - 1;
    return at;
  };
  const usedSegments: string[] = [];
  const perHorizon = new Map<string, { throws: number[]; missing: number }>();
  const rake = rakeDeg * RAD;
  const sinRake = Math.sin(rake);
  const cosRake = Math.abs(rakeDeg - 90) < 1e-12 ? 0 : Math.cos(rake);

  columns.segmentNames.forEach((segmentName, segment) => {
    const frame = frames[segment];
    if (!frame) return;
    const mine = placed.filter((p) => p.line.segment === segment);
    let sMin = Infinity,
      sMax = -Infinity;
    for (const p of mine) {
      sMin = Math.min(sMin, p.s[0]);
      sMax = Math.max(sMax, p.s[p.s.length - 1]);
    }
    const first = Math.ceil(sMin / stationSpacingM - 1e-9);
    const last = Math.floor(sMax / stationSpacingM + 1e-9);
    if (last - first + 1 > MAX_STATIONS)
      throw new CutoffInputError(
        `a station spacing of ${stationSpacingM} m gives more than ${MAX_STATIONS.toLocaleString("en")} stations along segment "${segmentName}"; choose a larger spacing`,
        [{ row: 1, column: "station spacing", reason: "too many stations" }],
      );
    const endToleranceM = 0.01 * stationSpacingM;
    const stationsS = Array.from({ length: Math.max(0, last - first + 1) }, (_, k) => (first + k) * stationSpacingM);
    const dipDirection: [number, number] = [Math.sin(frame.dipDirectionDeg * RAD), Math.cos(frame.dipDirectionDeg * RAD)];
    const horizonsHere = [...new Set(mine.map((p) => p.line.horizon))];
    const meanFootwallZ = (h: number) => {
      let sum = 0,
        n = 0;
      for (const p of mine)
        if (p.line.horizon === h && p.line.wall === "fw")
          for (const value of p.z) {
            sum += value;
            n++;
          }
      return n ? sum / n : -Infinity;
    };
    horizonsHere.sort((a, b) => meanFootwallZ(b) - meanFootwallZ(a));
    const horizons: StationHorizon[] = [];
    for (const h of horizonsHere) {
      const name = columns.horizonNames[h];
      const walls = {
        hw: mine.filter((p) => p.line.horizon === h && p.line.wall === "hw"),
        fw: mine.filter((p) => p.line.horizon === h && p.line.wall === "fw"),
      };
      const row: StationHorizon = { name, hwZ: [], fwZ: [], throwM: [], heaveM: [], displacementM: [] };
      if (columns.domain === "time") {
        row.hwTwtMs = [];
        row.fwTwtMs = [];
      }
      const stats = perHorizon.get(name) ?? { throws: [], missing: 0 };
      perHorizon.set(name, stats);
      for (const s of stationsS) {
        const hw = pointAt(walls.hw, s, endToleranceM);
        const fw = pointAt(walls.fw, s, endToleranceM);
        row.hwZ.push(hw ? rounded(hw.z) : null);
        row.fwZ.push(fw ? rounded(fw.z) : null);
        row.hwTwtMs?.push(hw ? rounded(hw.twt) : null);
        row.fwTwtMs?.push(fw ? rounded(fw.twt) : null);
        if (!hw || !fw) {
          row.throwM.push(null);
          row.heaveM.push(null);
          row.displacementM.push(null);
          const present = hw ?? fw;
          if (present) {
            missingCount++;
            stats.missing++;
            if (missing.length < MAX_MISSING_LISTED)
              missing.push({ segment: segmentName, horizon: name, s, present: hw ? "hw" : "fw", x: present.x, y: present.y, z: present.z });
          }
          continue;
        }
        const dz = fw.z - hw.z;
        if (dz > 0) positive++;
        else if (dz < 0) negative++;
        const throwM = Math.abs(dz);
        const heaveM = Math.abs((fw.x - hw.x) * dipDirection[0] + (fw.y - hw.y) * dipDirection[1]);
        const dipSeparationM = Math.hypot(throwM, heaveM);
        // slip along the rake r moves the footwall cut-off line (pitch φ on the plane) to the hanging-wall one, so the
        // separation measured down the dip line at one station is D (sin r − cos r · tan φ)
        const tanPitch = (hw.slope + fw.slope) / 2;
        const factor = sinRake - cosRake * tanPitch;
        let displacementM = dipSeparationM / factor;
        if (!(Math.abs(factor) > 0.05)) {
          displacementM = NaN;
          slipAlongCutoff++;
        }
        stats.throws.push(throwM);
        row.throwM.push(rounded(throwM));
        row.heaveM.push(rounded(heaveM));
        row.displacementM.push(rounded(displacementM));
        px.push((hw.x + fw.x) / 2);
        py.push((hw.y + fw.y) / 2);
        pz.push((hw.z + fw.z) / 2);
        pt.push(throwM);
        ph.push(heaveM);
        phz.push(horizonIndex(name));
        let segmentAt = usedSegments.indexOf(segmentName);
        if (segmentAt < 0) segmentAt = usedSegments.push(segmentName) - 1;
        psg.push(segmentAt);
        prow.push(walls.hw[0].line.firstRow);
      }
      horizons.push(row);
    }
    segments.push({ name: segmentName, frame, stationsS, horizons });
  });

  if (px.length === 0)
    throw new CutoffInputError(
      "no station has a cut-off on both walls, so no throw can be measured; check that the hanging-wall and footwall cut-offs of each horizon overlap along strike",
      [{ row: 2, column: "wall", reason: "no paired stations" }],
    );
  const sense = options.sense ?? (negative > positive ? "reverse" : "normal");
  const against = sense === "normal" ? negative : positive;
  if (against > 0)
    warnings.push(
      `at ${against} station${against === 1 ? "" : "s"} the hanging-wall cut-off lies ${sense === "normal" ? "above" : "below"} the footwall one, against the fault's ${sense} sense; check the wall labels there`,
    );
  if (missingCount > 0)
    warnings.push(
      `${missingCount} station${missingCount === 1 ? "" : "s"} ha${missingCount === 1 ? "s" : "ve"} a cut-off on one wall only: reported, not filled in`,
    );
  if (slipAlongCutoff > 0)
    warnings.push(
      `at ${slipAlongCutoff} station${slipAlongCutoff === 1 ? "" : "s"} the rake of ${rakeDeg}° runs nearly along the cut-off lines, so the displacement along it is undetermined there`,
    );

  const picks: PickColumns = {
    x: Float64Array.from(px),
    y: Float64Array.from(py),
    z: Float64Array.from(pz),
    throwM: Float64Array.from(pt),
    heaveM: Float64Array.from(ph),
    quality: new Float64Array(px.length).fill(NaN),
    segment: Uint32Array.from(psg),
    horizon: Int32Array.from(phz),
    segmentNames: usedSegments,
    horizonNames: usedHorizons,
    sourceRow: Uint32Array.from(prow),
  };
  const horizonOrder = segments.flatMap((s) => s.horizons.map((h) => h.name)).filter((name, i, all) => all.indexOf(name) === i);
  const summary: CutoffSummary = {
    domain: columns.domain,
    velocityModel: columns.domain === "time" ? (options.velocityModel ?? null) : null,
    stationSpacingM,
    stationSpacingSource: spacingSource,
    rakeDeg,
    horizons: horizonOrder.map((name) => {
      const stats = perHorizon.get(name)!;
      const total = stats.throws.reduce((a, b) => a + b, 0);
      return {
        name,
        stations: stats.throws.length,
        maxThrowM: stats.throws.length ? (rounded(Math.max(...stats.throws)) as number) : 0,
        meanThrowM: stats.throws.length ? (rounded(total / stats.throws.length) as number) : 0,
        missingStations: stats.missing,
      };
    }),
    missingStations: missingCount,
    missing,
    segments,
    warnings,
  };
  return { picks, summary, vertexZ: z };
}

/** The derived pick set as a pick CSV (x, y, z, throw, heave, horizon, segment), for download and the command line. */
export function derivedPicksCsv(picks: PickColumns): string {
  const lines = ["x,y,z,throw,heave,horizon,segment"];
  const quote = (text: string) => (/[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text);
  for (let i = 0; i < picks.x.length; i++) {
    const horizon = picks.horizon[i] >= 0 ? picks.horizonNames[picks.horizon[i]] : "";
    lines.push(
      `${picks.x[i].toFixed(3)},${picks.y[i].toFixed(3)},${picks.z[i].toFixed(3)},${picks.throwM[i].toFixed(3)},${picks.heaveM[i].toFixed(3)},${quote(horizon)},${quote(picks.segmentNames[picks.segment[i]])}`,
    );
  }
  return `${lines.join("\n")}\n`;
}

/** The derived picks of each segment must span a surface: at least three, not all on one line (one horizon). */
export function derivedPickProblems(picks: PickColumns): RejectedRow[] {
  const problems: RejectedRow[] = [];
  picks.segmentNames.forEach((name, segment) => {
    const ids: number[] = [];
    for (let i = 0; i < picks.segment.length; i++) if (picks.segment[i] === segment) ids.push(i);
    const horizons = new Set(ids.map((i) => picks.horizon[i]));
    const where = { row: ids.length ? picks.sourceRow[ids[0]] : 2, column: "horizon" };
    if (ids.length < 3) {
      problems.push({ ...where, reason: `segment "${name}" has ${ids.length} paired station${ids.length === 1 ? "" : "s"}; at least 3 are needed` });
      return;
    }
    try {
      fitPlane(picks.x, picks.y, picks.z, ids);
    } catch (error) {
      if (!(error instanceof DegeneratePlaneError)) throw error;
      problems.push({
        ...where,
        reason: `segment "${name}": the derived picks ${horizons.size < 2 ? "all lie on one horizon's cut-offs" : "lie on one line"}, so they do not span a fault surface; cut-offs of at least two horizons are needed`,
      });
    }
  });
  return problems;
}
