// The inferred tip line of one segment: where displacement dies to zero beyond the picks. Candidate displacement
// profiles are fitted with the resolution cut-off as censoring (lib/engine/tipline-fit.ts, on a helper thread),
// weighted by an information criterion, and turned here into a central tip line with an inner and an outer one from
// the fits' uncertainty. The tip line never crosses the data, and where the data stop while displacement is still
// high (a survey edge, a gap) that end stays open instead of getting an invented tip.
import type { PlaneFit, ProfileModel, TipEnd, TipEndSide, TipLine, TipProfileModel } from "./types";
import { PROFILE_CANDIDATES, PROFILE_LABELS, extrapolateTipLinear, modelRadius } from "./profiles";
import { planeToWorld } from "@/lib/display/frame";
import { weightedQuantiles } from "./optimize";
import type { TipLineFits, TipModel } from "./tipline-fit";

type Frame = Pick<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal">;

/** Directions around the centre at which the tip lines are built (every 2.5°). */
export const RAY_COUNT = 144;

export const END_SIDES: TipEndSide[] = ["strike-start", "strike-end", "up-dip", "down-dip"];
/** Direction of each end from the centre in (s, t): t grows down dip, so up dip is −t. */
const END_ANGLE: Record<TipEndSide, number> = { "strike-start": Math.PI, "strike-end": 0, "up-dip": -Math.PI / 2, "down-dip": Math.PI / 2 };
/** Rays within this angle of an end's direction decide whether the end is open. */
const END_HALF_ANGLE = (20 * Math.PI) / 180;

/** Points on a model's tip line used to find where rays cross it, and their angles' cosines and sines. */
const TIP_VERTICES = 160;
const UNIT_COS = Float64Array.from({ length: TIP_VERTICES }, (_, k) => Math.cos((2 * Math.PI * k) / TIP_VERTICES));
const UNIT_SIN = Float64Array.from({ length: TIP_VERTICES }, (_, k) => Math.sin((2 * Math.PI * k) / TIP_VERTICES));

/**
 * Distances from (cs, ct) to a model's tip line along each ray angle (ascending from −π): the tip line as a fine
 * polygon, walked in angle order round the centre (the tip line is convex, so every ray from inside crosses it once).
 * 0 where the centre lies outside the model's tip line.
 */
export function modelReachAlongRays(m: Pick<TipProfileModel, "centre" | "reach" | "exponent">, cs: number, ct: number, angles: Float64Array): Float64Array {
  const out = new Float64Array(angles.length);
  if (modelRadius(m, cs, ct) >= 1) return out;
  // the tip line as TIP_VERTICES points (straight in typed arrays: this runs for every drawn model)
  const n = TIP_VERTICES;
  const ps = new Float64Array(n),
    pt = new Float64Array(n),
    pa = new Float64Array(n);
  const power = 2 / m.exponent;
  for (let k = 0; k < n; k++) {
    const c = UNIT_COS[k],
      s = UNIT_SIN[k];
    const a = c < 0 ? m.reach.strikeStartM : m.reach.strikeEndM;
    const b = s < 0 ? m.reach.upDipM : m.reach.downDipM;
    ps[k] = m.centre.s + a * Math.sign(c) * Math.pow(Math.abs(c), power) - cs;
    pt[k] = m.centre.t + b * Math.sign(s) * Math.pow(Math.abs(s), power) - ct;
    pa[k] = Math.atan2(pt[k], ps[k]);
  }
  // vertices in angle order from the smallest, unwrapped so the angles rise through one turn (and back to the first)
  let first = 0;
  for (let k = 1; k < n; k++) if (pa[k] < pa[first]) first = k;
  const order = new Int32Array(n + 1);
  const ua = new Float64Array(n + 1);
  for (let k = 0; k <= n; k++) {
    order[k] = (first + k) % n;
    ua[k] = pa[order[k]];
    if (k > 0) while (ua[k] < ua[k - 1]) ua[k] += 2 * Math.PI;
  }
  for (let q = 0; q < angles.length; q++) {
    const ray = angles[q] < ua[0] ? angles[q] + 2 * Math.PI : angles[q];
    let lo = 0,
      hi = n;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (ua[mid] <= ray) lo = mid;
      else hi = mid;
    }
    const i0 = order[lo];
    const i1 = order[hi];
    const ex = Math.cos(ray),
      ey = Math.sin(ray);
    const fx = ps[i1] - ps[i0],
      fy = pt[i1] - pt[i0];
    const det = ex * fy - ey * fx;
    out[q] = det !== 0 ? (ps[i0] * fy - pt[i0] * fx) / det : Math.hypot(ps[i0], pt[i0]);
    if (!(out[q] > 0)) out[q] = Math.hypot(ps[i0], pt[i0]);
  }
  return out;
}

/** Where each ray from the centre leaves the data outline: distance, displacement there and whether that edge is open. */
export function outlineExits(
  outlineS: ArrayLike<number>,
  outlineT: ArrayLike<number>,
  outlineD: ArrayLike<number>,
  outlineOpen: ArrayLike<number>,
  cs: number,
  ct: number,
  angles: Float64Array,
): { rho: Float64Array; d: Float64Array; open: Uint8Array } {
  const k = angles.length;
  const rho = new Float64Array(k);
  const d = new Float64Array(k);
  const open = new Uint8Array(k);
  const n = outlineS.length;
  for (let q = 0; q < k; q++) {
    const ex = Math.cos(angles[q]);
    const ey = Math.sin(angles[q]);
    for (let i = 0; i < n; i++) {
      const j = (i + 1) % n;
      const ax = outlineS[i] - cs,
        ay = outlineT[i] - ct;
      const bx = outlineS[j] - cs,
        by = outlineT[j] - ct;
      // solve c + ρ·e = a + λ·(b − a) with ρ ≥ 0 and 0 ≤ λ ≤ 1
      const fx = bx - ax,
        fy = by - ay;
      const det = fx * ey - fy * ex;
      if (det === 0) continue;
      const lambda = (ax * ey - ay * ex) / -det;
      if (lambda < 0 || lambda > 1) continue;
      const r = (ax * fy - ay * fx) / -det;
      if (r > rho[q]) {
        rho[q] = r;
        d[q] = outlineD[i] + lambda * (outlineD[j] - outlineD[i]);
        open[q] = outlineOpen[i] && outlineOpen[j] ? 1 : 0;
      }
    }
  }
  return { rho, d, open };
}

/** Radii of a tip line along the rays, held at least `floor` (the data plus a margin) and at the data edge where open. */
function constrained(radii: Float64Array, floor: Float64Array, exits: { rho: Float64Array; open: Uint8Array }): Float64Array {
  const out = new Float64Array(radii.length);
  for (let q = 0; q < radii.length; q++) out[q] = exits.open[q] ? exits.rho[q] : Math.max(radii[q], floor[q]);
  return out;
}

function polygonOf(cs: number, ct: number, angles: Float64Array, radii: Float64Array): [number, number][] {
  const out: [number, number][] = [];
  for (let q = 0; q < angles.length; q++) out.push([cs + radii[q] * Math.cos(angles[q]), ct + radii[q] * Math.sin(angles[q])]);
  out.push([out[0][0], out[0][1]]);
  return out;
}

/** Extent of a polygon in (s, t): its length along strike, height down dip and bounds (m). */
export function extents(polygon: [number, number][]): { lengthM: number; heightM: number; minS: number; maxS: number; minT: number; maxT: number } {
  let minS = Infinity,
    maxS = -Infinity,
    minT = Infinity,
    maxT = -Infinity;
  for (const [s, t] of polygon) {
    minS = Math.min(minS, s);
    maxS = Math.max(maxS, s);
    minT = Math.min(minT, t);
    maxT = Math.max(maxT, t);
  }
  return { lengthM: maxS - minS, heightM: maxT - minT, minS, maxS, minT, maxT };
}

/** Area of a closed (s, t) polygon (shoelace formula), m². */
export function ringArea(polygon: [number, number][]): number {
  let area = 0;
  for (let k = 0; k + 1 < polygon.length; k++) area += polygon[k][0] * polygon[k + 1][1] - polygon[k + 1][0] * polygon[k][1];
  return Math.abs(area) / 2;
}

export interface GradientTips {
  /** |gradient| of displacement near each tip (m/m) */
  strikeStartPerM: number;
  strikeEndPerM: number;
  upDipPerM: number;
  downDipPerM: number;
}

/**
 * Near-tip displacement gradients (common practice; Barnett et al. 1987 use gradients near tips): along a band
 * through the centre, a least-squares line through the outermost quarter of picks on each side.
 */
export function gradientTips(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  d: ArrayLike<number>,
  centre: { s: number; t: number },
  halfSize: { sM: number; tM: number },
): GradientTips {
  const bandT = 0.2 * halfSize.tM;
  const bandS = 0.2 * halfSize.sM;
  const sides = [0, 1, 2, 3].map(() => ({ xs: [] as number[], ds: [] as number[], far: 0 }));
  const [sStart, sEnd, tUp, tDown] = sides;
  const add = (side: (typeof sides)[number], x: number, di: number) => {
    if (!(x > 0)) return;
    side.xs.push(x);
    side.ds.push(di);
    side.far = Math.max(side.far, x);
  };
  for (let i = 0; i < s.length; i++) {
    if (!(Math.abs(t[i] - centre.t) > bandT)) {
      add(sStart, centre.s - s[i], d[i]);
      add(sEnd, s[i] - centre.s, d[i]);
    }
    if (!(Math.abs(s[i] - centre.s) > bandS)) {
      add(tUp, centre.t - t[i], d[i]);
      add(tDown, t[i] - centre.t, d[i]);
    }
  }
  const gradient = ({ xs, ds, far }: (typeof sides)[number]) => {
    const nx: number[] = [];
    const nd: number[] = [];
    for (let k = 0; k < xs.length; k++)
      if (xs[k] >= 0.75 * far) {
        nx.push(xs[k]);
        nd.push(ds[k]);
      }
    return nx.length < 3 ? NaN : Math.abs(extrapolateTipLinear(nx, nd).slopePerM);
  };
  return { strikeStartPerM: gradient(sStart), strikeEndPerM: gradient(sEnd), upDipPerM: gradient(tUp), downDipPerM: gradient(tDown) };
}

/** Angle difference folded into [0, π]. */
function angleGap(a: number, b: number): number {
  const d = Math.abs(((a - b) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
  return Math.min(d, 2 * Math.PI - d);
}

function describeShape(model: ProfileModel, shape: number[]): string {
  const values = PROFILE_CANDIDATES[model].describe(shape);
  if (model === "flat-topped") return `, plateau to ${Math.round(100 * values.plateauFraction)} % of the way to the tip`;
  if (model === "flexible") return `, p = ${values.p.toFixed(2)}, q = ${values.q.toFixed(2)}`;
  return "";
}

/**
 * Push a polygon's vertices out (scaling each one's distance from the centre) until every pick lies strictly inside:
 * the tip line is where displacement reaches zero, and every pick has displacement above the cut-off.
 */
export function enclosePicks(
  radii: Float64Array,
  angles: Float64Array,
  cs: number,
  ct: number,
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  marginM: (i: number) => number,
): Float64Array {
  const k = angles.length;
  const out = Float64Array.from(radii);
  let minRadius = Infinity;
  for (let q = 0; q < k; q++) minRadius = Math.min(minRadius, out[q]);
  const step = (2 * Math.PI) / k;
  const start = angles[0];
  for (let i = 0; i < s.length; i++) {
    const ds = s[i] - cs,
      dt = t[i] - ct;
    const rho = Math.sqrt(ds * ds + dt * dt) + marginM(i);
    // the chord between neighbouring vertices is at least cos(step/2)·min(radius) from the centre
    if (rho < minRadius * Math.cos(step / 2) * 0.999) continue;
    const phi = Math.atan2(dt, ds);
    let f = ((((phi - start) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI)) / step;
    const q0 = Math.floor(f) % k;
    const q1 = (q0 + 1) % k;
    f -= Math.floor(f);
    // distance from the centre to the chord q0–q1 along the pick's direction
    const a0 = angles[q0],
      a1 = angles[q1];
    const x0 = out[q0] * Math.cos(a0),
      y0 = out[q0] * Math.sin(a0);
    const x1 = out[q1] * Math.cos(a1),
      y1 = out[q1] * Math.sin(a1);
    const ex = Math.cos(phi),
      ey = Math.sin(phi);
    const fx = x1 - x0,
      fy = y1 - y0;
    const det = fx * ey - fy * ex;
    const chord = det !== 0 ? (x0 * fy - y0 * fx) / (ex * fy - ey * fx) : Math.min(out[q0], out[q1]);
    if (chord < rho * 1.0005) {
      const grow = (rho * 1.0005) / Math.max(chord, 1e-12);
      out[q0] *= grow;
      out[q1] *= grow;
      minRadius = Math.min(minRadius, out[q0], out[q1]);
    }
  }
  return out;
}

/**
 * Everything about the tip line that does not need every pick, computed where the fits ran (the helper thread):
 * the centre, the central, inner and outer radii along RAY_COUNT rays, which rays leave the data through an open
 * edge, the ranges from the drawn models, and the words that explain the choice.
 */
export interface TipLineSummary {
  centre: { s: number; t: number };
  central: Float64Array;
  inner: Float64Array;
  outer: Float64Array;
  open: Uint8Array;
  /** the tip must stay beyond each pick by its displacement over this gradient (m/m) */
  steepGradientPerM: number;
  /** 5th and 95th percentiles of the drawn models' length, height and Dmax (NaN without draws) */
  drawn: { lengthM: [number, number]; heightM: [number, number]; dmaxM: [number, number] };
  dmaxM: number;
  ends: TipEnd[];
  best: TipProfileModel;
  candidates: TipLine["candidates"];
  modelMisfits: TipLine["modelMisfits"];
  cutoff: TipLine["cutoff"];
  noiseM: number;
  selection: string;
}

/**
 * The tip line from the fits: centre and central line from the Akaike-weighted published profiles (model averaging,
 * Burnham & Anderson 2002), inner and outer lines from the 5th and 95th percentiles of the models drawn from every
 * fit's uncertainty (both the mixture of all candidates and that of the published ones), each held beyond the data
 * and on the data edge where that edge is open.
 */
export function summariseTipLine(fits: TipLineFits): TipLineSummary {
  const { candidates, inputs } = fits;
  const { outlineS, outlineT, outlineD, outlineOpen, steepGradientPerM, spacing } = inputs;
  // the centre and central line come from the published profiles (the flexible family only widens the range)
  const centralWeights = candidates.map((c) => c.centralWeight);
  let cs = 0,
    ct = 0;
  candidates.forEach((c, k) => {
    cs += centralWeights[k] * c.best.centre.s;
    ct += centralWeights[k] * c.best.centre.t;
  });
  const angles = rayAngles();
  const exits = outlineExits(outlineS, outlineT, outlineD, outlineOpen, cs, ct, angles);
  const floor = Float64Array.from(exits.rho, (rho, q) => rho + marginFor(exits.d[q], steepGradientPerM));
  const cosines = Float64Array.from(angles, Math.cos);
  const sines = Float64Array.from(angles, Math.sin);
  const radiiOf = (m: TipModel) => modelReachAlongRays(m, cs, ct, angles);
  const sizeOf = (radii: Float64Array) => {
    let minS = Infinity,
      maxS = -Infinity,
      minT = Infinity,
      maxT = -Infinity;
    for (let q = 0; q < RAY_COUNT; q++) {
      const ps = radii[q] * cosines[q],
        pt = radii[q] * sines[q];
      if (ps < minS) minS = ps;
      if (ps > maxS) maxS = ps;
      if (pt < minT) minT = pt;
      if (pt > maxT) maxT = pt;
    }
    return { lengthM: maxS - minS, heightM: maxT - minT };
  };

  const weighted = new Float64Array(RAY_COUNT);
  candidates.forEach((c, k) => {
    if (!centralWeights[k]) return;
    const r = radiiOf(c.best);
    for (let q = 0; q < RAY_COUNT; q++) weighted[q] += centralWeights[k] * r[q];
  });
  const central = constrained(weighted, floor, exits);

  // two mixtures of drawn fault models: every candidate by its Akaike weight, and the published profiles by the
  // weights that set the centre; the range covers both
  const drawRadii: Float64Array[] = [];
  const drawLengths: number[] = [];
  const drawHeights: number[] = [];
  const drawDmax: number[] = [];
  const allWeights: number[] = [];
  const centralDrawWeights: number[] = [];
  candidates.forEach((c, k) => {
    for (const m of c.draws) {
      const r = constrained(radiiOf(m), floor, exits);
      const e = sizeOf(r);
      drawRadii.push(r);
      allWeights.push(c.weight / c.draws.length);
      centralDrawWeights.push(centralWeights[k] / c.draws.length);
      drawLengths.push(e.lengthM);
      drawHeights.push(e.heightM);
      drawDmax.push(m.dmaxM);
    }
  });
  const weightings = centralDrawWeights.some((w) => w > 0) ? [allWeights, centralDrawWeights] : [allWeights];
  /** 5th and 95th percentiles of both mixtures, the wider of each */
  const bounds = (values: ArrayLike<number>): [number, number] => {
    if (!values.length) return [NaN, NaN];
    const q = weightedQuantiles(values, weightings, [0.05, 0.95]);
    const lows = q.map((x) => x[0]).filter(Number.isFinite);
    const highs = q.map((x) => x[1]).filter(Number.isFinite);
    return [lows.length ? Math.min(...lows) : NaN, highs.length ? Math.max(...highs) : NaN];
  };
  const inner = new Float64Array(RAY_COUNT);
  const outer = new Float64Array(RAY_COUNT);
  const column = new Float64Array(drawRadii.length);
  for (let q = 0; q < RAY_COUNT; q++) {
    for (let k = 0; k < drawRadii.length; k++) column[k] = drawRadii[k][q];
    const [low, high] = bounds(column);
    // the picks sample the fault at their spacing: no tip is placed finer than half a spacing along the ray, so the
    // band is at least that wide either side of the central line
    const halfSpacing = 0.5 * Math.hypot(cosines[q] * spacing.alongStrikeM, sines[q] * spacing.downDipM);
    inner[q] = Math.max(floor[q], Math.min(central[q] - halfSpacing, Number.isFinite(low) ? low : central[q]));
    outer[q] = Math.max(central[q] + halfSpacing, Number.isFinite(high) ? high : central[q]);
    if (exits.open[q]) inner[q] = outer[q] = central[q];
  }

  const ends: TipEnd[] = END_SIDES.map((side) => {
    const forced = inputs.ends[side];
    let open = 0,
      count = 0;
    for (let q = 0; q < RAY_COUNT; q++) {
      if (angleGap(angles[q], END_ANGLE[side]) > END_HALF_ANGLE) continue;
      count++;
      open += exits.open[q];
    }
    const detected = count > 0 && open / count > 0.5 ? "open" : "inferred";
    return { side, status: forced ?? detected, source: forced ? "set" : "detected" };
  });

  let dmaxM = 0;
  candidates.forEach((c, k) => (dmaxM += centralWeights[k] * c.best.dmaxM));
  const ranked = [...candidates].sort((a, b) => b.weight - a.weight);
  const best = candidates[centralWeights.indexOf(Math.max(...centralWeights))].best;
  const modelMisfits: Partial<Record<ProfileModel, number>> = {};
  for (const c of candidates) modelMisfits[c.best.model] = c.rmsM;
  const percent = (w: number) => (w >= 0.995 ? "all" : w < 0.01 ? "under 1 %" : `${Math.round(100 * w)} %`);
  const ranking = ranked
    .filter((c) => c.weight >= 0.01)
    .map((c) => `${PROFILE_LABELS[c.best.model]}${describeShape(c.best.model, c.best.shape)} ${percent(c.weight)}`);
  const selection =
    `Candidate profiles compared by the small-sample Akaike information criterion (Burnham & Anderson 2002), weights: ${ranking.join("; ")}. ` +
    `The central tip line averages the published profiles by weight (${PROFILE_LABELS[best.model]} leads); the inner and outer lines are the 5th and 95th percentiles of ${drawRadii.length} fault models drawn from the fits' uncertainty. ` +
    `They assume displacement below the cut-off keeps falling the way one of these profiles does; a fault whose tail below resolution is unlike all of them can lie outside the range.`;

  return {
    centre: { s: cs, t: ct },
    central,
    inner,
    outer,
    open: exits.open,
    steepGradientPerM,
    // each end of a length or height is placed no finer than half a pick spacing: the range is at least one spacing wide
    drawn: { lengthM: atLeast(bounds(drawLengths), spacing.alongStrikeM), heightM: atLeast(bounds(drawHeights), spacing.downDipM), dmaxM: bounds(drawDmax) },
    dmaxM,
    ends,
    best: { model: best.model, shape: best.shape, centre: best.centre, reach: best.reach, exponent: best.exponent, dmaxM: best.dmaxM },
    candidates: ranked.map((c) => ({
      model: c.best.model,
      weight: c.weight,
      aicc: c.aicc,
      rmsM: c.rmsM,
      lengthM: c.best.reach.strikeStartM + c.best.reach.strikeEndM,
      heightM: c.best.reach.upDipM + c.best.reach.downDipM,
      dmaxM: c.best.dmaxM,
    })),
    modelMisfits,
    cutoff: { displacementM: inputs.cutoffM, source: inputs.cutoffSource },
    noiseM: inputs.noiseM,
    selection,
  };
}

/** A range at least `width` wide, widened evenly about its middle where narrower (NaN stays NaN). */
function atLeast([low, high]: [number, number], width: number): [number, number] {
  const short = width - (high - low);
  return short > 0 ? [low - short / 2, high + short / 2] : [low, high];
}

/** The rays' directions, from −π round. */
export function rayAngles(): Float64Array {
  return Float64Array.from({ length: RAY_COUNT }, (_, q) => -Math.PI + (2 * Math.PI * q) / RAY_COUNT);
}

/** How far beyond a pick of displacement d the tip must lie at least: d over the steepest plausible gradient. */
function marginFor(d: number, steepGradientPerM: number): number {
  return Number.isFinite(steepGradientPerM) && steepGradientPerM > 0 ? Math.max(0, d) / steepGradientPerM : 0;
}

export interface TipLineResult {
  tipLine: TipLine;
  fittedDmax: { displacementM: number; rangeM: [number, number] };
  gradientTips: GradientTips;
}

/**
 * The tip line of a segment, finished with every pick: each line pushed out until it encloses every pick (the fits
 * and the summary only saw a sample and the outline), lengths and heights with their ranges, and world coordinates.
 */
export function tipLineFromFits(s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>, frame: Frame, summary: TipLineSummary): TipLineResult {
  const { centre, ends, steepGradientPerM, drawn } = summary;
  const angles = rayAngles();
  const marginOf = (i: number) => marginFor(d[i], steepGradientPerM);
  const enclose = (radii: Float64Array) => enclosePicks(radii, angles, centre.s, centre.t, s, t, marginOf);
  const centralRadii = enclose(summary.central);
  const innerRadii = enclose(summary.inner);
  const outerRadii = enclose(summary.outer);
  // keep inner ≤ central ≤ outer by growing only, so each line still encloses every pick
  for (let q = 0; q < RAY_COUNT; q++) {
    centralRadii[q] = Math.max(centralRadii[q], innerRadii[q]);
    outerRadii[q] = Math.max(outerRadii[q], centralRadii[q]);
  }
  const polygon = polygonOf(centre.s, centre.t, angles, centralRadii);
  const innerPolygon = polygonOf(centre.s, centre.t, angles, innerRadii);
  const outerPolygon = polygonOf(centre.s, centre.t, angles, outerRadii);
  const centralSize = extents(polygon);
  const innerSize = extents(innerPolygon);
  const outerSize = extents(outerPolygon);

  const isOpen = (side: TipEndSide) => ends.find((e) => e.side === side)?.status === "open";
  const lengthOpen = isOpen("strike-start") || isOpen("strike-end");
  const heightOpen = isOpen("up-dip") || isOpen("down-dip");
  const range = (
    [lowDrawn, highDrawn]: [number, number],
    centralValue: number,
    innerValue: number,
    outerValue: number,
    open: boolean,
  ): [number, number | null] => {
    const low = Math.min(centralValue, innerValue, Number.isFinite(lowDrawn) ? lowDrawn : innerValue);
    const high = Math.max(centralValue, outerValue, Number.isFinite(highDrawn) ? highDrawn : outerValue);
    return [low, open ? null : high];
  };
  const lengthRangeM = range(drawn.lengthM, centralSize.lengthM, innerSize.lengthM, outerSize.lengthM, lengthOpen);
  const heightRangeM = range(drawn.heightM, centralSize.heightM, innerSize.heightM, outerSize.heightM, heightOpen);
  const dmaxRange: [number, number] = [
    Math.min(summary.dmaxM, Number.isFinite(drawn.dmaxM[0]) ? drawn.dmaxM[0] : summary.dmaxM),
    Math.max(summary.dmaxM, Number.isFinite(drawn.dmaxM[1]) ? drawn.dmaxM[1] : summary.dmaxM),
  ];

  const halfSize = { sM: centralSize.lengthM / 2, tM: centralSize.heightM / 2 };
  const world = (p: [number, number][]) => p.map(([ps, pt]) => planeToWorld(frame, ps, pt));
  const endNames: Record<TipEndSide, string> = {
    "strike-start": "strike start",
    "strike-end": "strike end",
    "up-dip": "up-dip end",
    "down-dip": "down-dip end",
  };
  const openEnds = ends.filter((e) => e.status === "open").map((e) => `the ${endNames[e.side]}`);
  const minimums = [lengthOpen ? "length" : "", heightOpen ? "height" : ""].filter(Boolean);
  const tipLine: TipLine = {
    lengthM: centralSize.lengthM,
    heightM: centralSize.heightM,
    lengthRangeM,
    heightRangeM,
    lengthIsMinimum: lengthOpen,
    heightIsMinimum: heightOpen,
    aspectRatio: centralSize.lengthM / centralSize.heightM,
    areaM2: ringArea(polygon),
    centre,
    semiAxes: halfSize,
    model: summary.best.model,
    profile: summary.best,
    candidates: summary.candidates,
    modelMisfits: summary.modelMisfits,
    uncertaintyM: Math.max((lengthRangeM[1] ?? centralSize.lengthM) - lengthRangeM[0], (heightRangeM[1] ?? centralSize.heightM) - heightRangeM[0]) / 2,
    cutoff: summary.cutoff,
    noiseM: summary.noiseM,
    ends,
    openRays: Array.from(summary.open),
    selection: summary.selection,
    method:
      `tip line where the fitted displacement reaches zero, with picks below the ${summary.cutoff.displacementM.toFixed(1)} m cut-off treated as unresolved (censored)` +
      (openEnds.length
        ? `; open at ${openEnds.join(" and ")}, where the picks stop while displacement is still well above the cut-off, so no tip is inferred there and the ${minimums.join(" and ")} ${minimums.length > 1 ? "are minimums" : "is a minimum"}`
        : ""),
    polygon,
    innerPolygon,
    outerPolygon,
    worldPolygon: world(polygon),
    innerWorldPolygon: world(innerPolygon),
    outerWorldPolygon: world(outerPolygon),
  };
  return {
    tipLine,
    fittedDmax: { displacementM: summary.dmaxM, rangeM: dmaxRange },
    gradientTips: gradientTips(s, t, d, centre, halfSize),
  };
}
