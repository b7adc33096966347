// The displacement surface of a fault as a glTF 2.0 binary file (.glb; Khronos glTF 2.0 specification), written by hand
// from the display's typed arrays: one mesh per segment on its true surface with displacement as vertex colours
// (viridis), and the tip lines (central, 5 % and 95 %, open edges apart) as line primitives. Positions are in metres
// relative to an origin that a root node's translation puts back, so the file is in world coordinates while its float32
// vertices keep centimetres; glTF's axes are +X East, +Y Up, +Z South (−North), as the specification's right-handed
// Y-up frame asks. The origin, the axes and the study's coordinate reference are recorded in the asset's extras.
// Pure: used by the export route and the command line.
import { interpolateViridis } from "d3-scale-chromatic";
import type { DisplaySegment, FaultDisplay } from "@/lib/contracts/display";
import { surfaceOffsetAt } from "@/lib/display/surface";
import type { CoordinateReference } from "@/lib/crs";

const FLOAT = 5126;
const UNSIGNED_INT = 5125;
const ARRAY_BUFFER = 34962;
const ELEMENT_ARRAY_BUFFER = 34963;
const TRIANGLES = 4;
const LINES = 1;

/** sRGB 0–255 → linear 0–1 (IEC 61966-2-1): glTF vertex colours are linear. */
function linear(channel255: number): number {
  const c = channel255 / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function viridisLinear(fraction: number): [number, number, number] {
  const css = interpolateViridis(Math.min(1, Math.max(0, fraction)));
  const hex = Number.parseInt(css.slice(1, 7), 16);
  return [linear((hex >> 16) & 255), linear((hex >> 8) & 255), linear(hex & 255)];
}

/** world-local East, North, Up → glTF X, Y, Z */
const toGltf = (east: number, north: number, up: number): [number, number, number] => [east, up, -north];

interface Primitive {
  positions: Float32Array;
  colors?: Float32Array;
  indices?: Uint32Array;
  mode: number;
  material: number;
}

/** The surface of one segment: a vertex per grid node with data, two triangles per cell with four, one with three. */
function surfacePrimitive(segment: DisplaySegment, colourRangeM: [number, number]): Primitive | null {
  const { grid, frame } = segment;
  const { columns, rows } = grid;
  const vertexOf = new Int32Array(columns * rows).fill(-1);
  const positions: number[] = [];
  const colors: number[] = [];
  const [low, high] = colourRangeM;
  for (let row = 0; row < rows; row++) {
    for (let column = 0; column < columns; column++) {
      const node = row * columns + column;
      const d = grid.displacementM[node];
      if (Number.isNaN(d)) continue;
      const s = grid.s0 + column * grid.cellM,
        t = grid.t0 + row * grid.cellM;
      const w = grid.offPlaneM && !Number.isNaN(grid.offPlaneM[node]) ? grid.offPlaneM[node] : 0;
      const p = [0, 1, 2].map((axis) => frame.centroid[axis] + s * frame.strikeVector[axis] + t * frame.dipVector[axis] + w * frame.normal[axis]);
      vertexOf[node] = positions.length / 3;
      positions.push(...toGltf(p[0], p[1], p[2]));
      colors.push(...viridisLinear(high > low ? (d - low) / (high - low) : 0.5));
    }
  }
  const indices: number[] = [];
  for (let row = 0; row + 1 < rows; row++) {
    for (let column = 0; column + 1 < columns; column++) {
      const a = row * columns + column,
        b = a + 1,
        c = a + columns,
        d = c + 1;
      const corners = [a, b, d, c].filter((node) => vertexOf[node] >= 0).map((node) => vertexOf[node]);
      if (corners.length === 4) indices.push(corners[0], corners[1], corners[2], corners[0], corners[2], corners[3]);
      else if (corners.length === 3) indices.push(corners[0], corners[1], corners[2]);
    }
  }
  if (indices.length === 0) return null;
  return { positions: Float32Array.from(positions), colors: Float32Array.from(colors), indices: Uint32Array.from(indices), mode: TRIANGLES, material: 0 };
}

/** Line pairs along a closed (s, t) polygon on the surface; with `flags`, only the edges whose two ends are flagged `wanted`. */
function linePairs(segment: DisplaySegment, polygon: [number, number][], flags: number[] | undefined, wanted: 0 | 1, out: number[]) {
  const { frame } = segment;
  const point = (s: number, t: number) => {
    const w = surfaceOffsetAt(segment, s, t);
    const p = [0, 1, 2].map((axis) => frame.centroid[axis] + s * frame.strikeVector[axis] + t * frame.dipVector[axis] + w * frame.normal[axis]);
    return toGltf(p[0], p[1], p[2]);
  };
  for (let i = 0; i + 1 < polygon.length; i++) {
    const open = flags ? (flags[i] === 1 && flags[i + 1] === 1 ? 1 : 0) : 0;
    if (open !== wanted) continue;
    out.push(...point(polygon[i][0], polygon[i][1]), ...point(polygon[i + 1][0], polygon[i + 1][1]));
  }
}

function linePrimitive(values: number[], material: number): Primitive | null {
  return values.length ? { positions: Float32Array.from(values), mode: LINES, material } : null;
}

export interface GltfOptions {
  faultName: string;
  coordinateReference?: CoordinateReference | null;
  /** longitude/latitude of the origin, when a coordinate reference gives it */
  originLongitudeLatitude?: [number, number] | null;
}

/** The .glb bytes of a fault's display (surfaces, tip lines), in world coordinates. */
export function faultGltf(display: FaultDisplay, options: GltfOptions): Uint8Array {
  const materials = [
    { name: "displacement", pbrMetallicRoughness: { baseColorFactor: [1, 1, 1, 1], metallicFactor: 0, roughnessFactor: 1 }, doubleSided: true },
    { name: "tip line", pbrMetallicRoughness: { baseColorFactor: [linear(0xf0), linear(0x8c), linear(0x00), 1], metallicFactor: 0, roughnessFactor: 1 } },
    {
      name: "tip line 5 % and 95 %",
      pbrMetallicRoughness: { baseColorFactor: [linear(0xf7), linear(0xb9), linear(0x55), 1], metallicFactor: 0, roughnessFactor: 1 },
    },
    {
      name: "open edge (no tip inferred)",
      pbrMetallicRoughness: { baseColorFactor: [linear(0x0e), linear(0x74), linear(0x90), 1], metallicFactor: 0, roughnessFactor: 1 },
    },
  ];
  const meshes: { name: string; primitives: Primitive[] }[] = [];
  for (const segment of display.segments) {
    const surface = surfacePrimitive(segment, display.displacementRangeM);
    const central: number[] = [],
      band: number[] = [],
      open: number[] = [];
    linePairs(segment, segment.tipLine, segment.tipOpen, 0, central);
    linePairs(segment, segment.tipLine, segment.tipOpen, 1, open);
    if (segment.tipBand) {
      linePairs(segment, segment.tipBand.inner, segment.tipOpen, 0, band);
      linePairs(segment, segment.tipBand.outer, segment.tipOpen, 0, band);
    }
    const primitives = [surface, linePrimitive(central, 1), linePrimitive(band, 2), linePrimitive(open, 3)].filter((p): p is Primitive => p !== null);
    if (primitives.length) meshes.push({ name: `segment ${segment.id}`, primitives });
  }

  // one binary buffer: each accessor's data 4-byte aligned in its own buffer view
  const chunks: Uint8Array[] = [];
  let byteLength = 0;
  const bufferViews: Record<string, unknown>[] = [];
  const accessors: Record<string, unknown>[] = [];
  const addAccessor = (data: Float32Array | Uint32Array, type: "VEC3" | "SCALAR", target: number, bounds: boolean) => {
    const bytes = new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
    bufferViews.push({ buffer: 0, byteOffset: byteLength, byteLength: bytes.byteLength, target });
    chunks.push(bytes);
    byteLength += bytes.byteLength;
    const padding = (4 - (byteLength % 4)) % 4;
    if (padding) {
      chunks.push(new Uint8Array(padding));
      byteLength += padding;
    }
    const components = type === "VEC3" ? 3 : 1;
    const accessor: Record<string, unknown> = {
      bufferView: bufferViews.length - 1,
      componentType: data instanceof Float32Array ? FLOAT : UNSIGNED_INT,
      count: data.length / components,
      type,
    };
    if (bounds) {
      const min = new Array(components).fill(Infinity),
        max = new Array(components).fill(-Infinity);
      for (let i = 0; i < data.length; i++) {
        min[i % components] = Math.min(min[i % components], data[i]);
        max[i % components] = Math.max(max[i % components], data[i]);
      }
      Object.assign(accessor, { min, max });
    }
    accessors.push(accessor);
    return accessors.length - 1;
  };
  const gltfMeshes = meshes.map((mesh) => ({
    name: mesh.name,
    primitives: mesh.primitives.map((primitive) => {
      const attributes: Record<string, number> = { POSITION: addAccessor(primitive.positions, "VEC3", ARRAY_BUFFER, true) };
      if (primitive.colors) attributes.COLOR_0 = addAccessor(primitive.colors, "VEC3", ARRAY_BUFFER, false);
      return {
        attributes,
        ...(primitive.indices ? { indices: addAccessor(primitive.indices, "SCALAR", ELEMENT_ARRAY_BUFFER, false) } : {}),
        mode: primitive.mode,
        material: primitive.material,
      };
    }),
  }));
  const [east, north, up] = display.origin;
  const reference = options.coordinateReference ?? null;
  const json = {
    asset: {
      version: "2.0",
      generator: "Slipfield",
      extras: {
        fault: options.faultName,
        quantity: "displacement (m), vertex colours on the viridis scale",
        displacementRangeM: display.displacementRangeM,
        origin: { east, north, up, note: "world position of the root node's translation, in the coordinate reference below" },
        axes: "glTF +X East, +Y Up (elevation), +Z South; metres",
        coordinateReference: reference
          ? {
              horizontal: `EPSG:${reference.horizontal.epsg}`,
              horizontalName: reference.horizontal.name,
              vertical: reference.vertical.epsg ? `EPSG:${reference.vertical.epsg}` : null,
              verticalName: reference.vertical.name,
              units: "metre",
            }
          : "none recorded: map coordinates of the pick files, metres",
        ...(options.originLongitudeLatitude ? { originLongitudeLatitude: options.originLongitudeLatitude } : {}),
      },
    },
    scene: 0,
    scenes: [{ name: options.faultName, nodes: [0] }],
    nodes: [
      { name: options.faultName, translation: toGltf(east, north, up), children: gltfMeshes.map((_, k) => k + 1) },
      ...gltfMeshes.map((mesh, k) => ({ name: mesh.name, mesh: k })),
    ],
    meshes: gltfMeshes,
    materials,
    accessors,
    bufferViews,
    buffers: [{ byteLength }],
  };
  return glb(json, chunks, byteLength);
}

/** The GLB container: 12-byte header, JSON chunk (space-padded), BIN chunk (zero-padded), lengths multiples of 4. */
function glb(json: unknown, chunks: Uint8Array[], binLength: number): Uint8Array {
  const text = new TextEncoder().encode(JSON.stringify(json));
  const jsonLength = Math.ceil(text.byteLength / 4) * 4;
  const total = 12 + 8 + jsonLength + 8 + binLength;
  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  view.setUint32(0, 0x46546c67, true); // "glTF"
  view.setUint32(4, 2, true);
  view.setUint32(8, total, true);
  view.setUint32(12, jsonLength, true);
  view.setUint32(16, 0x4e4f534a, true); // "JSON"
  out.set(text, 20);
  out.fill(0x20, 20 + text.byteLength, 20 + jsonLength);
  let offset = 20 + jsonLength;
  view.setUint32(offset, binLength, true);
  view.setUint32(offset + 4, 0x004e4942, true); // "BIN\0"
  offset += 8;
  for (const chunk of chunks) {
    out.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return out;
}
