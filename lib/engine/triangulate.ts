import Delaunator from "delaunator";
import { select } from "./optimize";

export interface Triangulation {
  /** vertex indices, three per kept triangle */
  triangles: Uint32Array;
  /** median Delaunay edge length before sliver removal (m) */
  medianEdgeM: number;
  removedSlivers: number;
  /** the data outline: vertex indices of the longest boundary loop of the kept triangles */
  outline: number[];
}

export interface TriangulateOptions {
  /** remove sliver triangles along the hull (default true) */
  removeSlivers?: boolean;
  /** a boundary triangle is a sliver when its longest edge exceeds this multiple of the median edge (default 3) */
  sliverEdgeFactor?: number;
}

/**
 * Delaunay triangulation in fault-plane coordinates (s, t). Hull slivers — long thin triangles that bridge a
 * concave outline — are peeled iteratively: a triangle on the current boundary whose longest edge is more than
 * `sliverEdgeFactor` × the median edge length is removed, which exposes its neighbours to the same test
 * (an edge-length criterion in the spirit of alpha shapes; common practice, no single source).
 */
export function triangulate(s: Float64Array, t: Float64Array, options: TriangulateOptions = {}): Triangulation {
  const n = s.length;
  const coords = interleave(s, t);
  const d = new Delaunator(coords);
  const tri = d.triangles;
  const half = d.halfedges;
  const nt = tri.length / 3;
  const medianEdgeM = medianEdge(tri, coords);
  const removed = new Uint8Array(nt);
  const removedSlivers = (options.removeSlivers ?? true) ? peelSlivers(tri, half, coords, removed, (options.sliverEdgeFactor ?? 3) * medianEdgeM) : 0;
  const kept = keptTriangles(tri, removed, nt - removedSlivers);
  const outline = longestBoundaryLoop(tri, half, removed, s, t, n);
  return { triangles: kept, medianEdgeM, removedSlivers, outline };
}

// Each pass below is its own function, so the engine optimises each loop on its own.

function interleave(s: Float64Array, t: Float64Array): Float64Array {
  const coords = new Float64Array(2 * s.length);
  for (let i = 0; i < s.length; i++) {
    coords[2 * i] = s[i];
    coords[2 * i + 1] = t[i];
  }
  return coords;
}

/** length of half-edge e, read from the interleaved (s, t): one cache line per vertex instead of two */
function edgeLength(tri: Uint32Array, coords: Float64Array, e: number): number {
  const a = 2 * tri[e];
  const b = 2 * tri[e % 3 === 2 ? e - 2 : e + 1];
  const ds = coords[a] - coords[b];
  const dt = coords[a + 1] - coords[b + 1];
  return Math.sqrt(ds * ds + dt * dt);
}

/** median edge length over (a regular sample of at most ~200,000 of) the half-edges */
function medianEdge(tri: Uint32Array, coords: Float64Array): number {
  const stride = Math.max(1, Math.floor(tri.length / 200_000));
  const sample = new Float64Array(Math.ceil(tri.length / stride));
  for (let e = 0, k = 0; e < tri.length; e += stride) sample[k++] = edgeLength(tri, coords, e);
  return sample.length ? select(sample, sample.length >> 1) : 0;
}

function peelSlivers(tri: Uint32Array, half: Int32Array, coords: Float64Array, removed: Uint8Array, limit: number): number {
  let removedSlivers = 0;
  // a stack of triangles to test: each hull edge pushes once, each removal at most three times
  const stack = new Int32Array(half.length + 3 * removed.length);
  let top = 0;
  for (let e = 0; e < half.length; e++) if (half[e] === -1) stack[top++] = (e / 3) | 0;
  while (top > 0) {
    const k = stack[--top];
    if (removed[k]) continue;
    const longest = Math.max(edgeLength(tri, coords, 3 * k), edgeLength(tri, coords, 3 * k + 1), edgeLength(tri, coords, 3 * k + 2));
    if (longest <= limit) continue;
    removed[k] = 1;
    removedSlivers++;
    for (let j = 0; j < 3; j++) {
      const opp = half[3 * k + j];
      if (opp !== -1 && !removed[(opp / 3) | 0]) stack[top++] = (opp / 3) | 0;
    }
  }
  return removedSlivers;
}

function keptTriangles(tri: Uint32Array, removed: Uint8Array, keptCount: number): Uint32Array {
  const kept = new Uint32Array(3 * keptCount);
  let w = 0;
  for (let k = 0; k < removed.length; k++) {
    if (removed[k]) continue;
    kept[w++] = tri[3 * k];
    kept[w++] = tri[3 * k + 1];
    kept[w++] = tri[3 * k + 2];
  }
  return kept;
}

/**
 * Boundary edges of the kept triangles, chained into loops; the loop with the longest perimeter. Each vertex's
 * outgoing boundary edges are a stack (last found, first followed), and loops start from the vertices in the order
 * their first boundary edge was found, so pinched outlines resolve the same way every time.
 */
function longestBoundaryLoop(tri: Uint32Array, half: Int32Array, removed: Uint8Array, s: Float64Array, t: Float64Array, n: number): number[] {
  const edges = boundaryEdges(tri, half, removed, n);
  const { first, targets, starts } = edges;
  const left = edges.count;
  let outline: number[] = [];
  let bestPerimeter = -1;
  for (let q = 0; q < starts.length; q++) {
    const start = starts[q];
    while (left[start] > 0) {
      const loop = [start];
      let perimeter = 0;
      let cur = start;
      for (let guard = 0; guard <= n + 1; guard++) {
        if (left[cur] === 0) break;
        const nb = targets[first[cur] + --left[cur]];
        perimeter += Math.hypot(s[nb] - s[cur], t[nb] - t[cur]);
        cur = nb;
        if (cur === start) break;
        loop.push(cur);
      }
      if (perimeter > bestPerimeter) {
        bestPerimeter = perimeter;
        outline = loop;
      }
    }
  }
  return outline;
}

/**
 * The directed boundary edges a → b of the kept triangles grouped by a (compressed rows: targets[first[a] …
 * first[a] + count[a]) in the order found), and the vertices with any, in the order their first edge was found.
 */
function boundaryEdges(
  tri: Uint32Array,
  half: Int32Array,
  removed: Uint8Array,
  n: number,
): { first: Int32Array; count: Int32Array; targets: Int32Array; starts: Int32Array } {
  const isBoundary = (e: number) => !removed[(e / 3) | 0] && (half[e] === -1 || removed[(half[e] / 3) | 0] === 1);
  const count = new Int32Array(n);
  let total = 0;
  let vertices = 0;
  for (let e = 0; e < tri.length; e++) {
    if (!isBoundary(e)) continue;
    if (count[tri[e]]++ === 0) vertices++;
    total++;
  }
  const first = new Int32Array(n);
  for (let v = 0, offset = 0; v < n; v++) {
    first[v] = offset;
    offset += count[v];
  }
  const targets = new Int32Array(total);
  const starts = new Int32Array(vertices);
  count.fill(0);
  for (let e = 0, q = 0; e < tri.length; e++) {
    if (!isBoundary(e)) continue;
    const a = tri[e];
    if (count[a] === 0) starts[q++] = a;
    targets[first[a] + count[a]++] = tri[e % 3 === 2 ? e - 2 : e + 1];
  }
  return { first, count, targets, starts };
}
