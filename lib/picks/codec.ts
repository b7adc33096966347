// Stored pick sets: the picks in flat columns and the fault plane of each segment fitted while the file was read (so the
// analysis fits no plane twice, lib/engine/pipeline.ts), in the one typed-array codec (lib/display/codec.ts), deflated.
// Other stored column records (a cut-off file's vertices) use the same codec and packing.
// fflate (pure JavaScript) rather than node:zlib: these run in analysis worker threads that a time limit may stop at
// any moment, and Node aborts the whole process when a worker is stopped inside a native zlib call.
import { unzlibSync, zlibSync } from "fflate";
import { decodeRecord, encodeRecord, recordMagic } from "@/lib/display/codec";
import type { PickColumns, PlaneFit } from "@/lib/engine/types";

const PICK_SET_MAGIC = "SLP3";
/** any other record of columns (cut-off vertices) */
const COLUMNS_MAGIC = "SLC3";
/** the same bytes, deflated (fastest level): as pick sets are stored */
const PACKED_MAGIC = 0x534c5a31; // "SLZ1"
/** pick sets stored before the one codec: read, never written */
const LEGACY_MAGIC = 0x534c5032; // "SLP2"

/** A pick set as stored: the columns, and per segment (index into segmentNames) its plane fitted at upload, if any. */
export interface StoredPickSet {
  picks: PickColumns;
  planes: (PlaneFit | null)[] | null;
}

/** A plane's numbers in one Float64Array (exact, -0 and all) and its words apart. */
const PLANE_NUMBERS = 19;
function planeNumbers(plane: PlaneFit): number[] {
  return [
    plane.strikeDeg,
    plane.dipDeg,
    plane.dipDirectionDeg,
    plane.rmsM,
    ...plane.centroid,
    ...plane.strikeVector,
    ...plane.dipVector,
    ...plane.normal,
    ...plane.singularValues,
  ];
}
function planeFrom(numbers: Float64Array, offset: number, planarityWarning: string | null): PlaneFit {
  const n = (k: number) => numbers[offset + k];
  const triple = (k: number): [number, number, number] => [n(k), n(k + 1), n(k + 2)];
  return {
    strikeDeg: n(0),
    dipDeg: n(1),
    dipDirectionDeg: n(2),
    rmsM: n(3),
    centroid: triple(4),
    strikeVector: triple(7),
    dipVector: triple(10),
    normal: triple(13),
    singularValues: triple(16),
    planarityWarning,
  };
}

/** The pick set in the one codec (not deflated: `packPicks` is what is stored). */
export function encodePicks(picks: PickColumns, planes: (PlaneFit | null)[] | null = null): Uint8Array {
  const planeValues = planes ? new Float64Array(planes.length * PLANE_NUMBERS) : null;
  planes?.forEach((plane, k) => plane && planeValues!.set(planeNumbers(plane), k * PLANE_NUMBERS));
  const planeWords = planes ? planes.map((plane) => (plane ? { warning: plane.planarityWarning } : null)) : null;
  return encodeRecord({ picks, planeValues, planeWords }, PICK_SET_MAGIC);
}

/** Deflated (fastest level) behind its own magic: how pick sets and other column records are stored. */
function pack(encoded: Uint8Array): Uint8Array {
  const deflated = zlibSync(encoded, { level: 1 });
  const bytes = new Uint8Array(4 + deflated.byteLength);
  new DataView(bytes.buffer).setUint32(0, PACKED_MAGIC, true);
  bytes.set(deflated, 4);
  return bytes;
}

function unpack(stored: Uint8Array): Uint8Array {
  const packed = stored.byteLength >= 4 && new DataView(stored.buffer, stored.byteOffset, 4).getUint32(0, true) === PACKED_MAGIC;
  return packed ? unzlibSync(stored.subarray(4)) : stored;
}

/**
 * The stored form of a pick set: `encodePicks` deflated. Packed columns hold the database a fraction of the time
 * (10⁵ picks: 4.2 → 1.3 MB; insert 60–160 → 35–50 ms, read 53 → 10 ms in PGlite, whose own compression of the raw
 * bytes is slower and weaker). Runs in the worker pool, like the parsing.
 */
export function packPicks(picks: PickColumns, planes: (PlaneFit | null)[] | null = null): Uint8Array {
  return pack(encodePicks(picks, planes));
}

/** Any record of typed-array columns and plain JSON fields (e.g. cut-off vertices), stored as pick sets are. */
export function packColumns(record: object): Uint8Array {
  return pack(encodeRecord(record, COLUMNS_MAGIC));
}

/** Reads what `packColumns` wrote, or a record stored before the one codec. */
export function decodeColumns<T>(stored: Uint8Array): T {
  const plain = unpack(stored);
  if (recordMagic(plain) === COLUMNS_MAGIC) return decodeRecord(plain, COLUMNS_MAGIC, "column record") as T;
  return decodeLegacyColumns(plain) as T;
}

/** Reads what `packPicks` or `encodePicks` wrote, or a pick set stored before the one codec (columns only). */
export function decodePickSet(stored: Uint8Array): StoredPickSet {
  const plain = unpack(stored);
  if (recordMagic(plain) === PICK_SET_MAGIC) {
    const record = decodeRecord(plain, PICK_SET_MAGIC, "pick set") as {
      picks: PickColumns;
      planeValues: Float64Array | null;
      planeWords: ({ warning: string | null } | null)[] | null;
    };
    const planes = record.planeWords
      ? record.planeWords.map((words, k) => (words ? planeFrom(record.planeValues!, k * PLANE_NUMBERS, words.warning) : null))
      : null;
    return { picks: record.picks, planes };
  }
  return { picks: decodeLegacyColumns(plain) as unknown as PickColumns, planes: null };
}

/** The stored picks' columns (metres). */
export function decodePicks(stored: Uint8Array): PickColumns {
  return decodePickSet(stored).picks;
}

/** Records stored before the one codec ("SLP2": a JSON header of column types, then 8-byte-aligned columns). */
function decodeLegacyColumns(plain: Uint8Array): Record<string, unknown> {
  const CONSTRUCTORS = { Float64Array, Float32Array, Uint32Array, Int32Array, Uint8Array } as const;
  // Copy into a fresh buffer: driver buffers may start at any offset, typed views need alignment.
  const bytes = new Uint8Array(plain.byteLength);
  bytes.set(plain);
  const view = new DataView(bytes.buffer);
  if (bytes.byteLength < 8 || view.getUint32(0, true) !== LEGACY_MAGIC) throw new Error("Stored picks are not in the expected format.");
  const headerLength = view.getUint32(4, true);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + headerLength))) as {
    columns: { key: string; type: keyof typeof CONSTRUCTORS; length: number }[];
    plain: Record<string, unknown>;
  };
  const result: Record<string, unknown> = { ...header.plain };
  let offset = Math.ceil((8 + headerLength) / 8) * 8;
  for (const column of header.columns) {
    const Constructor = CONSTRUCTORS[column.type];
    result[column.key] = new Constructor(bytes.buffer, offset, column.length);
    offset += Math.ceil((column.length * Constructor.BYTES_PER_ELEMENT) / 8) * 8;
  }
  return result;
}
