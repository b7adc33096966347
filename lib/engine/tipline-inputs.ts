// What the tip-line fits need, gathered from all picks in the analysing thread and small enough to post to the
// helper thread: a fit sample, the resolution cut-off, the data outline with which parts of it are open edges
// (the data stop while displacement is still high), and places just beyond the closed edges where nothing was picked.
import type { ProfileModel, TipEndSide } from "./types";
import { AUTOMATIC_CANDIDATES } from "./profiles";
import { select } from "./optimize";

/** At most this many picks enter the fits; neighbouring picks share interpretation error, so more add little. */
export const MAX_FIT_POINTS = 900;
/** At most this many outline vertices give places beyond the edge. */
const MAX_ABSENT_VERTICES = 240;

export interface TipLineSettings {
  /** displacement cut-off (m) below which nothing could be picked; estimated from the picks when absent */
  cutoffM?: number;
  /** profiles to try; default all automatic candidates */
  models?: ProfileModel[];
  /** the interpreter's word on an end: open (data stop there) or inferred (a tip lies beyond) */
  ends?: Partial<Record<TipEndSide, "open" | "inferred">>;
}

export interface TipLineInputs {
  ss: Float64Array;
  tt: Float64Array;
  dd: Float64Array;
  /** weight of each fit pick (pick quality; 1 when not given) */
  ww: Float64Array;
  cutoffM: number;
  cutoffSource: "estimated" | "set";
  /** interpretation noise from local plane fits near the edges (m) */
  noiseM: number;
  /** largest plausible gradient near the edges (m/m): the tip cannot be closer to an edge pick than d / this */
  steepGradientPerM: number;
  /** the data outline (closed, counter-clockwise, without repeating the first vertex) */
  outlineS: Float64Array;
  outlineT: Float64Array;
  outlineD: Float64Array;
  /** 1 where the outline is an open edge */
  outlineOpen: Uint8Array;
  absentS: Float64Array;
  absentT: Float64Array;
  /** where displacement peaks, roughly: the starting centre of the fits */
  centreGuess: { s: number; t: number };
  models: ProfileModel[];
  ends: Partial<Record<TipEndSide, "open" | "inferred">>;
  spacing: { alongStrikeM: number; downDipM: number };
}

/** The value at a fraction of the way through the sorted values (nearest rank, on a copy). */
function quantileOf(values: ArrayLike<number>, fraction: number): number {
  const a = Float64Array.from(values);
  if (!a.length) return NaN;
  return select(a, Math.min(a.length - 1, Math.max(0, Math.floor(fraction * (a.length - 1)))));
}

/**
 * Resolution cut-off estimated from the picks: the displacement below which (nearly) nothing was picked. The
 * lowest half-percent is set aside so that a few stray small picks do not pull it down (common practice, no source).
 */
export function estimateCutoffM(d: ArrayLike<number>): number {
  return Math.max(0, quantileOf(d, 0.005));
}

/**
 * Typical pick spacing along strike and down dip from the triangulation's edges: line-style picks (dense along
 * seismic lines, sparse between them) have very different spacings in the two directions.
 */
export function directionalSpacing(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  triangles: ArrayLike<number>,
  fallbackM: number,
): { alongStrikeM: number; downDipM: number } {
  const stride = Math.max(1, Math.floor(triangles.length / 60_000));
  const capacity = Math.ceil(triangles.length / stride);
  const along = new Float64Array(capacity);
  const down = new Float64Array(capacity);
  let na = 0,
    nd = 0;
  for (let e = 0; e < triangles.length; e += stride) {
    const a = triangles[e];
    const b = triangles[e % 3 === 2 ? e - 2 : e + 1];
    const ds = Math.abs(s[a] - s[b]);
    const dt = Math.abs(t[a] - t[b]);
    if (ds >= dt) along[na++] = ds;
    else down[nd++] = dt;
  }
  const median = (v: Float64Array, count: number) => (count ? select(v.subarray(0, count), count >> 1) : fallbackM);
  return { alongStrikeM: median(along, na) || fallbackM, downDipM: median(down, nd) || fallbackM };
}

/** Order-independent subsample: a pick is kept when a hash of its coordinates falls in the kept fraction. */
export function fitSampleIndices(s: ArrayLike<number>, t: ArrayLike<number>, limit = MAX_FIT_POINTS): Uint32Array {
  const n = s.length;
  if (n <= limit) return Uint32Array.from({ length: n }, (_, i) => i);
  const keep = limit / n;
  const buf = new Float64Array(2);
  const words = new Uint32Array(buf.buffer);
  const out = new Uint32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    buf[0] = s[i];
    buf[1] = t[i];
    let h = Math.imul(2166136261 ^ words[0], 16777619);
    h = Math.imul(h ^ words[1], 16777619);
    h = Math.imul(h ^ words[2], 16777619);
    h = Math.imul(h ^ words[3], 16777619);
    h ^= h >>> 15;
    h = Math.imul(h, 2246822507);
    h ^= h >>> 13;
    if ((h >>> 0) / 4294967296 < keep) out[count++] = i;
  }
  return out.slice(0, count);
}

/** Picks bucketed on a square grid, to find the neighbours of a few places quickly. */
class Buckets {
  private readonly start: Int32Array;
  private readonly items: Int32Array;
  private readonly columns: number;
  private readonly rows: number;
  private readonly cell: number;
  constructor(
    private readonly s: ArrayLike<number>,
    private readonly t: ArrayLike<number>,
    cell: number,
    private readonly s0: number,
    private readonly t0: number,
    sMax: number,
    tMax: number,
  ) {
    // at most 1024 buckets a side, whatever the spacing (degenerate or enormous extents included)
    const span = Math.max(sMax - s0, tMax - t0);
    const size = Math.max(cell, span / 1024);
    this.cell = Number.isFinite(size) && size > 0 ? size : Number.isFinite(span) && span > 0 ? span : 1;
    this.columns = Math.min(1024, Math.max(1, Math.floor((sMax - s0) / this.cell) + 1) || 1);
    this.rows = Math.min(1024, Math.max(1, Math.floor((tMax - t0) / this.cell) + 1) || 1);
    const count = new Int32Array(this.columns * this.rows + 1);
    const n = s.length;
    const key = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      key[i] = this.keyOf(s[i], t[i]);
      count[key[i] + 1]++;
    }
    for (let k = 1; k < count.length; k++) count[k] += count[k - 1];
    this.start = count.slice();
    this.items = new Int32Array(n);
    const fill = count;
    for (let i = 0; i < n; i++) this.items[fill[key[i]]++] = i;
  }
  private keyOf(s: number, t: number): number {
    const c = Math.min(this.columns - 1, Math.max(0, Math.floor((s - this.s0) / this.cell)));
    const r = Math.min(this.rows - 1, Math.max(0, Math.floor((t - this.t0) / this.cell)));
    return r * this.columns + c;
  }
  /** indices of the picks within radius of (s, t) */
  near(s: number, t: number, radius: number, out: number[]): number[] {
    out.length = 0;
    const c0 = Math.max(0, Math.floor((s - radius - this.s0) / this.cell));
    const c1 = Math.min(this.columns - 1, Math.floor((s + radius - this.s0) / this.cell));
    const r0 = Math.max(0, Math.floor((t - radius - this.t0) / this.cell));
    const r1 = Math.min(this.rows - 1, Math.floor((t + radius - this.t0) / this.cell));
    const r2 = radius * radius;
    for (let r = r0; r <= r1; r++) {
      for (let c = c0; c <= c1; c++) {
        const k = r * this.columns + c;
        for (let q = this.start[k]; q < this.start[k + 1]; q++) {
          const i = this.items[q];
          const ds = this.s[i] - s;
          const dt = this.t[i] - t;
          if (ds * ds + dt * dt <= r2) out.push(i);
        }
      }
    }
    return out;
  }
}

/** Least-squares plane d = a + b·s + c·t through some picks: the gradient (b, c) and the rms residual. */
function localPlane(ids: number[], s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>): { gs: number; gt: number; rms: number } | null {
  const n = ids.length;
  if (n < 6) return null;
  let ms = 0,
    mt = 0,
    md = 0;
  for (const i of ids) {
    ms += s[i];
    mt += t[i];
    md += d[i];
  }
  ms /= n;
  mt /= n;
  md /= n;
  let sss = 0,
    stt = 0,
    sst = 0,
    ssd = 0,
    std = 0;
  for (const i of ids) {
    const a = s[i] - ms,
      b = t[i] - mt,
      c = d[i] - md;
    sss += a * a;
    stt += b * b;
    sst += a * b;
    ssd += a * c;
    std += b * c;
  }
  const det = sss * stt - sst * sst;
  if (!(Math.abs(det) > 1e-12 * (sss * stt + 1e-300))) return null;
  const gs = (ssd * stt - std * sst) / det;
  const gt = (std * sss - ssd * sst) / det;
  let sse = 0;
  for (const i of ids) {
    const r = d[i] - md - gs * (s[i] - ms) - gt * (t[i] - mt);
    sse += r * r;
  }
  return { gs, gt, rms: Math.sqrt(sse / Math.max(1, n - 3)) };
}

/** Outward unit normals of a closed counter-clockwise polygon, at its vertices (mean of the two edge normals). */
function outwardNormals(ps: Float64Array, pt: Float64Array): { ns: Float64Array; nt: Float64Array } {
  const n = ps.length;
  const ns = new Float64Array(n);
  const nt = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const prev = (k + n - 1) % n;
    const next = (k + 1) % n;
    // for a counter-clockwise polygon the outward normal of edge (a → b) is (tb − ta, −(sb − sa)) normalised
    let xs = 0,
      xt = 0;
    for (const [a, b] of [
      [prev, k],
      [k, next],
    ]) {
      const es = ps[b] - ps[a],
        et = pt[b] - pt[a];
      const len = Math.hypot(es, et);
      if (len > 0) {
        xs += et / len;
        xt += -es / len;
      }
    }
    const len = Math.hypot(xs, xt) || 1;
    ns[k] = xs / len;
    nt[k] = xt / len;
  }
  return { ns, nt };
}

/** Twice the signed area of a polygon (positive when counter-clockwise in (s, t)). */
export function signedArea2(ps: ArrayLike<number>, pt: ArrayLike<number>): number {
  let area = 0;
  for (let k = 0, n = ps.length; k < n; k++) {
    const j = (k + 1) % n;
    area += ps[k] * pt[j] - ps[j] * pt[k];
  }
  return area;
}

/** Even–odd point-in-polygon test. */
export function insidePolygon(ps: ArrayLike<number>, pt: ArrayLike<number>, s: number, t: number): boolean {
  let inside = false;
  for (let k = 0, n = ps.length, j = n - 1; k < n; j = k++) {
    if (pt[k] > t !== pt[j] > t && s < ((ps[j] - ps[k]) * (t - pt[k])) / (pt[j] - pt[k]) + ps[k]) inside = !inside;
  }
  return inside;
}

/** Running median of a closed sequence (each value with its `half` neighbours either side). */
function circularMedian(values: Float64Array, half: number): Float64Array {
  const n = values.length;
  const out = new Float64Array(n);
  const window = new Float64Array(2 * half + 1);
  for (let k = 0; k < n; k++) {
    for (let j = -half; j <= half; j++) window[j + half] = values[(k + j + n * (half + 1)) % n];
    out[k] = Float64Array.from(window).sort()[half];
  }
  return out;
}

/**
 * The tip-line inputs for one segment. `outline` lists pick indices around the data (the mapped limit), `triangles`
 * the kept Delaunay triangles (for the pick spacing), `weights` each pick's quality weight.
 */
export function tipLineInputs(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  d: ArrayLike<number>,
  outline: ArrayLike<number>,
  triangles: ArrayLike<number>,
  spacingM: number,
  settings: TipLineSettings = {},
  weights?: ArrayLike<number>,
): TipLineInputs {
  const n = s.length;
  const cutoffSet = settings.cutoffM !== undefined && settings.cutoffM >= 0;
  const cutoffM = cutoffSet ? settings.cutoffM! : estimateCutoffM(d);
  const spacing = directionalSpacing(s, t, triangles, spacingM);

  const ids = fitSampleIndices(s, t);
  const m = ids.length;
  const ss = new Float64Array(m),
    tt = new Float64Array(m),
    dd = new Float64Array(m),
    ww = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const i = ids[k];
    ss[k] = s[i];
    tt[k] = t[i];
    dd[k] = d[i];
    const w = weights ? weights[i] : 1;
    ww[k] = Number.isFinite(w) ? Math.max(0, w) : 1;
  }

  // outline, counter-clockwise
  let ol = Array.from(outline);
  const probeS = Float64Array.from(ol, (i) => s[i]);
  const probeT = Float64Array.from(ol, (i) => t[i]);
  if (signedArea2(probeS, probeT) < 0) ol = ol.reverse();
  const no = ol.length;
  const outlineS = Float64Array.from(ol, (i) => s[i]);
  const outlineT = Float64Array.from(ol, (i) => t[i]);
  const outlineD = Float64Array.from(ol, (i) => d[i]);

  // centre guess: displacement²-weighted centroid (the maximum pulls it)
  let wsum = 0,
    cs = 0,
    ct = 0,
    minS = Infinity,
    maxS = -Infinity,
    minT = Infinity,
    maxT = -Infinity,
    dTop = 0;
  for (let i = 0; i < n; i++) {
    const w = d[i] * d[i];
    wsum += w;
    cs += w * s[i];
    ct += w * t[i];
    if (s[i] < minS) minS = s[i];
    if (s[i] > maxS) maxS = s[i];
    if (t[i] < minT) minT = t[i];
    if (t[i] > maxT) maxT = t[i];
  }
  const centreGuess = wsum > 0 ? { s: cs / wsum, t: ct / wsum } : { s: (minS + maxS) / 2, t: (minT + maxT) / 2 };
  dTop = quantileOf(d, 0.98);

  // edges: local gradient and noise from picks near each outline vertex
  const { ns, nt } = no >= 3 ? outwardNormals(outlineS, outlineT) : { ns: new Float64Array(no), nt: new Float64Array(no) };
  const reach = 3 * Math.max(spacing.alongStrikeM, spacing.downDipM, spacingM);
  const buckets = new Buckets(s, t, reach, minS, minT, maxS, maxT);
  const near: number[] = [];
  const outwardGradient = new Float64Array(no).fill(NaN);
  const gradientSize: number[] = [];
  const residuals: number[] = [];
  const stride = Math.max(1, Math.floor(no / 600));
  for (let k = 0; k < no; k += stride) {
    const fit = localPlane(buckets.near(outlineS[k], outlineT[k], reach, near), s, t, d);
    if (!fit) continue;
    outwardGradient[k] = fit.gs * ns[k] + fit.gt * nt[k];
    gradientSize.push(Math.hypot(fit.gs, fit.gt));
    residuals.push(fit.rms);
  }
  // fill the vertices skipped by the stride from their nearest computed neighbour
  for (let k = 0; k < no; k++) if (Number.isNaN(outwardGradient[k])) outwardGradient[k] = outwardGradient[k - (k % stride)];
  const noiseM = residuals.length ? quantileOf(residuals, 0.5) : 0;
  const steepGradientPerM = gradientSize.length ? 10 * quantileOf(gradientSize, 1) : Infinity;

  // an edge is open where the data stop while displacement is well above the cut-off and, at its gradient, would
  // stay above it for several more pick spacings: picks would exist beyond it if the survey had looked there
  const outlineOpen = new Uint8Array(no);
  if (no >= 3) {
    const edgeD = circularMedian(outlineD, Math.min(3, (no - 1) >> 1));
    const edgeGradient = circularMedian(
      outwardGradient.map((g) => (Number.isFinite(g) ? g : 0)),
      Math.min(3, (no - 1) >> 1),
    );
    const raised = Math.max(3 * noiseM, 0.15 * (dTop - cutoffM));
    for (let k = 0; k < no; k++) {
      const above = edgeD[k] - cutoffM;
      if (!(above > raised)) continue;
      const falling = -edgeGradient[k];
      const spacingOut = Math.hypot(ns[k] * spacing.alongStrikeM, nt[k] * spacing.downDipM);
      const reachM = falling > 0 ? above / falling : Infinity;
      if (reachM > 3 * spacingOut) outlineOpen[k] = 1;
    }
    // single vertices do not make an edge: keep runs of three or more
    const kept = new Uint8Array(no);
    for (let k = 0; k < no; k++) {
      if (!outlineOpen[k]) continue;
      let run = 1;
      for (let j = 1; j < no && outlineOpen[(k + j) % no]; j++) run++;
      for (let j = 1; j < no && outlineOpen[(k - j + no) % no]; j++) run++;
      if (run >= 3) kept[k] = 1;
    }
    outlineOpen.set(kept);
  }

  // the interpreter's word overrides the detection on each end's quarter of the outline
  const halfS = Math.max(maxS - centreGuess.s, centreGuess.s - minS, 1e-9);
  const halfT = Math.max(maxT - centreGuess.t, centreGuess.t - minT, 1e-9);
  for (const [side, status] of Object.entries(settings.ends ?? {}) as [TipEndSide, "open" | "inferred"][]) {
    for (let k = 0; k < no; k++) {
      const u = (outlineS[k] - centreGuess.s) / halfS;
      const w = (outlineT[k] - centreGuess.t) / halfT;
      const facing =
        side === "strike-start" ? -u > Math.abs(w) : side === "strike-end" ? u > Math.abs(w) : side === "up-dip" ? -w > Math.abs(u) : w > Math.abs(u);
      if (facing) outlineOpen[k] = status === "open" ? 1 : 0;
    }
  }

  // places beyond the closed edges where nothing was picked: 1.5 and 3 pick spacings out along the outward normal
  const ps: number[] = [];
  const pt: number[] = [];
  const every = Math.max(1, Math.ceil(no / MAX_ABSENT_VERTICES));
  for (let k = 0; k < no; k += every) {
    if (outlineOpen[k]) continue;
    const spacingOut = Math.hypot(ns[k] * spacing.alongStrikeM, nt[k] * spacing.downDipM);
    for (const step of [1.5, 3]) {
      const ps1 = outlineS[k] + ns[k] * step * spacingOut;
      const pt1 = outlineT[k] + nt[k] * step * spacingOut;
      if (!insidePolygon(outlineS, outlineT, ps1, pt1)) {
        ps.push(ps1);
        pt.push(pt1);
      }
    }
  }

  return {
    ss,
    tt,
    dd,
    ww,
    cutoffM,
    cutoffSource: cutoffSet ? "set" : "estimated",
    noiseM,
    steepGradientPerM,
    outlineS,
    outlineT,
    outlineD,
    outlineOpen,
    absentS: Float64Array.from(ps),
    absentT: Float64Array.from(pt),
    centreGuess,
    models: settings.models?.length ? settings.models : AUTOMATIC_CANDIDATES,
    ends: settings.ends ?? {},
    spacing,
  };
}
