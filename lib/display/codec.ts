// The one binary encoding of typed arrays with their metadata: the display payload, stored pick sets, stored analysis
// outputs (full-resolution grids, triangulations) and the stress screen's colour fields all travel and rest in it.
// Pure and browser-safe (no Buffer, no zlib).
//
// Layout: 4 magic bytes (which kind of record) | u32 header byte length (little endian) | UTF-8 JSON header | padding to
// 8 | array bodies, each starting on an 8-byte boundary. The header is { arrays, body }: `body` is the record as JSON with
// every typed array replaced by { $array: index } (and every non-finite number by { $number: "NaN" | "Infinity" |
// "-Infinity" }); `arrays` lists each array's type, element count and byte offset from the start of the bodies.

const typedArrayKinds = {
  Float32Array,
  Float64Array,
  Uint32Array,
  Int32Array,
  Uint16Array,
  Uint8Array,
} as const;
type TypedArrayKind = keyof typeof typedArrayKinds;
type AnyTypedArray = InstanceType<(typeof typedArrayKinds)[TypedArrayKind]>;

interface ArrayEntry {
  kind: TypedArrayKind;
  length: number;
  offset: number;
}

const align8 = (n: number) => Math.ceil(n / 8) * 8;

function typedArrayKind(value: unknown): TypedArrayKind | null {
  for (const kind of Object.keys(typedArrayKinds) as TypedArrayKind[]) {
    if (value instanceof typedArrayKinds[kind]) return kind;
  }
  return null;
}

function magicBytes(magic: string): number[] {
  if (!/^[\x20-\x7e]{4}$/.test(magic)) throw new Error(`A record's magic is four ASCII characters, not "${magic}".`);
  return Array.from(magic, (character) => character.charCodeAt(0));
}

/** The record's kind (its magic), or null when the bytes are too short to have one. */
export function recordMagic(bytes: Uint8Array): string | null {
  return bytes.byteLength >= 8 ? String.fromCharCode(bytes[0], bytes[1], bytes[2], bytes[3]) : null;
}

/** Encodes `record` (plain JSON values and typed arrays, nested anyhow) under the four-character `magic`. */
export function encodeRecord(record: unknown, magic: string): Uint8Array {
  const arrays: AnyTypedArray[] = [];
  const entries: ArrayEntry[] = [];
  let bodyBytes = 0;
  const body = JSON.stringify(record, (_key, value: unknown) => {
    const kind = typedArrayKind(value);
    if (!kind) return typeof value === "number" && !Number.isFinite(value) ? { $number: String(value) } : value;
    const array = value as AnyTypedArray;
    entries.push({ kind, length: array.length, offset: bodyBytes });
    arrays.push(array);
    bodyBytes = align8(bodyBytes + array.byteLength);
    return { $array: arrays.length - 1 };
  });
  const header = new TextEncoder().encode(JSON.stringify({ arrays: entries, body }));
  const bodiesStart = align8(8 + header.length);
  const bytes = new Uint8Array(bodiesStart + bodyBytes);
  bytes.set(magicBytes(magic), 0);
  new DataView(bytes.buffer).setUint32(4, header.length, true);
  bytes.set(header, 8);
  arrays.forEach((array, i) => {
    bytes.set(new Uint8Array(array.buffer, array.byteOffset, array.byteLength), bodiesStart + entries[i].offset);
  });
  return bytes;
}

/**
 * Decodes what encodeRecord wrote under `magic`; the typed arrays are views into one aligned copy of the bytes (no
 * copy when `input` is already aligned). Throws when the bytes are another kind of record or cut short.
 */
export function decodeRecord(input: Uint8Array, magic: string, what = "record"): unknown {
  if (recordMagic(input) !== magic) throw new Error(`Not a Slipfield ${what}.`);
  // typed-array views need aligned offsets: work on a fresh buffer when the input is a view into another one
  const bytes = input.byteOffset % 8 === 0 ? input : input.slice();
  const headerLength = new DataView(bytes.buffer, bytes.byteOffset).getUint32(4, true);
  if (8 + headerLength > bytes.byteLength) throw new Error(`The ${what} is cut short.`);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + headerLength))) as { arrays: ArrayEntry[]; body: string };
  const bodiesStart = bytes.byteOffset + align8(8 + headerLength);
  const arrays = header.arrays.map(({ kind, length, offset }) => {
    const Kind = typedArrayKinds[kind];
    if (!Kind || bodiesStart + offset + length * Kind.BYTES_PER_ELEMENT > bytes.byteOffset + bytes.byteLength) throw new Error(`The ${what} is cut short.`);
    return new Kind(bytes.buffer as ArrayBuffer, bodiesStart + offset, length);
  });
  return JSON.parse(header.body, (_key, value: unknown) => {
    if (value && typeof value === "object") {
      if ("$array" in value) return arrays[(value as { $array: number }).$array];
      if ("$number" in value) return Number((value as { $number: string }).$number);
    }
    return value;
  });
}
