import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { build } from "esbuild";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FuzzReply, FuzzRequest } from "./fuzz-worker";

/**
 * Bad-input fuzzing of the CSV parser and the whole analysis pipeline (fast-check). Each input runs in a worker thread;
 * the time limit only detects a hang (an input still running after HANG_LIMIT_MS fails the test), it is not a speed check.
 * Every outcome must be a result or a PickInputError naming rows; anything else (TypeError, RangeError, …) fails.
 */
const HANG_LIMIT_MS = 120_000;
const RUNS = Number(process.env.SLIPFIELD_FUZZ_RUNS ?? 300);

/** The engine sources, bundled like dist/analysis-worker.mjs so the thread runs exactly the code under test. */
async function bundleFuzzWorker() {
  const outfile = path.join(mkdtempSync(path.join(os.tmpdir(), "slipfield-fuzz-")), "fuzz-worker.mjs");
  await build({
    entryPoints: [path.join(__dirname, "fuzz-worker.ts")],
    outfile,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    banner: { js: "import { createRequire } from 'node:module'; const require = createRequire(import.meta.url);" },
    logLevel: "warning",
  });
  return outfile;
}

class EngineThread {
  private worker!: Worker;
  file = "";
  tally = { result: 0, "input-error": 0, crash: 0 };
  private nextId = 0;
  calls = 0;
  start() {
    this.worker = new Worker(this.file);
  }
  run(kind: FuzzRequest["kind"], text: string, options: FuzzRequest["options"] = {}): Promise<FuzzReply> {
    const id = ++this.nextId;
    this.calls++;
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => {
        this.worker.off("message", onMessage);
        void this.worker.terminate();
        this.start();
        reject(new Error(`the engine did not finish one input within ${HANG_LIMIT_MS / 1000} s (hang): ${JSON.stringify(text.slice(0, 300))}`));
      }, HANG_LIMIT_MS);
      const onError = (error: Error) => {
        clearTimeout(timer);
        reject(new Error(`the engine thread crashed: ${error.message}`));
        this.start();
      };
      const onMessage = (reply: FuzzReply) => {
        if (reply.id !== id) return;
        clearTimeout(timer);
        this.worker.off("message", onMessage);
        this.worker.off("error", onError);
        this.tally[reply.outcome]++;
        resolve(reply);
      };
      this.worker.on("message", onMessage);
      this.worker.once("error", onError);
      this.worker.postMessage({ id, kind, text, options } satisfies FuzzRequest);
    });
  }
  stop() {
    return this.worker.terminate();
  }
}

/** The contract: a result with finite picks, or a PickInputError whose message and rows say what and where. */
function expectClearOutcome(reply: FuzzReply, input: string) {
  if (reply.outcome === "crash") {
    throw new Error(`crash (${reply.name}: ${reply.message}) on input ${JSON.stringify(input.slice(0, 400))}\n${reply.stack ?? ""}`);
  }
  if (reply.outcome === "result") {
    expect(reply.accepted).toBeGreaterThanOrEqual(3);
    expect(reply.allFinite).toBe(true);
    expect(reply.throwsNonNegative).toBe(true);
    return;
  }
  expect(reply.message.length).toBeGreaterThan(0);
  expect(reply.message).not.toMatch(/\n\s+at /); // no stack trace in what the user reads
  for (const row of reply.rejected) {
    expect(Number.isInteger(row.row) && (row.row as number) >= 1, `row number in ${JSON.stringify(row)}`).toBe(true);
    expect(typeof row.column).toBe("string");
    expect(typeof row.reason === "string" && row.reason.length > 0).toBe(true);
  }
}

// ---- generators -------------------------------------------------------------------------------------------------
const COLUMNS = ["x", "y", "z", "depth", "throw", "heave", "quality", "segment", "horizon", "extra"];

const numberText = fc.oneof(
  fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }).map(String),
  fc.integer({ min: -5000, max: 5000 }).map(String),
  fc.constantFrom("1e308", "-1e308", "1e999", "-1e999", "9007199254740993", "1e-320", "0", "-0", "00012", "+5"),
  fc.constantFrom("NaN", "nan", "Infinity", "-Infinity", "inf", "", " ", "abc", "1,5", "1.2.3", "0x10", "١٢", "null", '"12"', "12 m"),
);

const cellText = fc.oneof({ weight: 4, arbitrary: numberText }, { weight: 1, arbitrary: fc.string({ maxLength: 8 }) });

interface Layout {
  header: string[];
  separator: string;
  newline: string;
  bom: boolean;
  quoteAll: boolean;
}

const layout: fc.Arbitrary<Layout> = fc.record({
  header: fc.oneof(
    fc.constant<string[]>(["x", "y", "z", "throw"]),
    fc.constant<string[]>(["X", "Y", "Depth", "Throw", "Segment"]),
    fc.shuffledSubarray(COLUMNS, { minLength: 0, maxLength: COLUMNS.length }),
    fc.array(fc.string({ maxLength: 6 }), { maxLength: 6 }),
  ),
  separator: fc.constantFrom(",", ";", "\t", ", "),
  newline: fc.constantFrom("\n", "\r\n", "\r"),
  bom: fc.boolean(),
  quoteAll: fc.boolean(),
});

function renderCsv(shape: Layout, rows: string[][]) {
  const quote = (cell: string) => (shape.quoteAll || /[",;\n\r]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell);
  const lines = [shape.header.map(quote).join(shape.separator), ...rows.map((row) => row.map(quote).join(shape.separator))];
  return (shape.bom ? "\uFEFF" : "") + lines.join(shape.newline);
}

const messyCsv = layout.chain((shape) =>
  fc
    .array(fc.array(cellText, { minLength: Math.max(0, shape.header.length - 1), maxLength: shape.header.length + 1 }), { maxLength: 40 })
    .map((rows) => renderCsv(shape, rows)),
);

/** Geometric edge cases with a well-formed header: 0/1/2 points, all collinear, all coincident, duplicates, huge coordinates. */
const geometricCsv = fc
  .record({
    kind: fc.constantFrom("few", "collinear", "coincident", "duplicated", "huge", "plane"),
    count: fc.integer({ min: 0, max: 40 }),
    scale: fc.constantFrom(1, 1e3, 1e7, 1e150, 1e300),
    newline: fc.constantFrom("\n", "\r\n"),
    bom: fc.boolean(),
    seed: fc.integer({ min: 1, max: 1_000_000 }),
  })
  .map(({ kind, count, scale, newline, bom, seed }) => {
    let state = seed;
    const random = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648;
    const n = kind === "few" ? count % 3 : count + 3;
    const rows: string[] = [];
    for (let index = 0; index < n; index++) {
      const u = random() * scale;
      const v = random() * scale;
      let x = u,
        y = v,
        z = -random() * scale;
      if (kind === "collinear") [x, y, z] = [u, 2 * u, -3 * u];
      if (kind === "coincident") [x, y, z] = [scale, scale, -scale];
      if (kind === "duplicated" && index % 2 === 1) [x, y, z] = rows[index - 1].split(",").slice(0, 3).map(Number) as [number, number, number];
      if (kind === "plane") z = -(0.5 * x + 0.2 * y);
      rows.push(`${x},${y},${z},${(random() * 50).toFixed(2)}`);
    }
    return (bom ? "\uFEFF" : "") + ["x,y,z,throw", ...rows].join(newline);
  });

const randomBytesText = fc.uint8Array({ maxLength: 400 }).map((bytes) => new TextDecoder("utf-8").decode(bytes));

const options = fc.record({
  dropBadRows: fc.boolean(),
  dedupe: fc.constantFrom<"reject" | "average">("reject", "average"),
  units: fc.constantFrom<"m" | "ft">("m", "ft"),
});

// ---- tests ------------------------------------------------------------------------------------------------------
const engine = new EngineThread();
beforeAll(async () => {
  engine.file = await bundleFuzzWorker();
  engine.start();
});
afterAll(async () => {
  // figures for the README's Reliability section
  console.log(`fuzz: ${engine.calls} inputs → ${engine.tally.result} results, ${engine.tally["input-error"]} row-level errors, ${engine.tally.crash} crashes`);
  await engine.stop();
});

describe("fuzzing the pick CSV parser and the analysis pipeline", { timeout: 600_000 }, () => {
  it("parser: random bytes, messy CSV and geometric edge cases give a result or a row-level error", async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(randomBytesText, messyCsv, geometricCsv, fc.string({ maxLength: 300 })), options, async (text, opts) => {
        expectClearOutcome(await engine.run("parse", text, opts), text);
      }),
      { numRuns: RUNS },
    );
  });

  it("pipeline (parse → plane → triangulate → grid → contours → tip line → metrics): never a crash", async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(messyCsv, geometricCsv, geometricCsv), options, async (text, opts) => {
        expectClearOutcome(await engine.run("analyze", text, opts), text);
      }),
      { numRuns: Math.ceil(RUNS / 2) },
    );
  });

  it("10⁶ identical rows: a clear error naming duplicate rows, not a crash or a hang", async () => {
    const text = "x,y,z,throw\n" + "100,200,-300,5\n".repeat(1_000_000);
    for (const opts of [{}, { dedupe: "average" as const }, { dropBadRows: true }]) {
      const reply = await engine.run("parse", text, opts);
      expectClearOutcome(reply, text);
      expect(reply.outcome).toBe("input-error");
      if (reply.outcome === "input-error") expect(reply.message.length).toBeGreaterThan(10);
    }
    const analysed = await engine.run("analyze", text, { dedupe: "average" });
    expectClearOutcome(analysed, text);
    expect(analysed.outcome).toBe("input-error");
  });

  it("named cases: BOM + CRLF + semicolons + quoted fields are read, NaN text and huge numbers are refused by row", async () => {
    const good = '\uFEFF"x";"y";"z";"throw"\r\n0;0;0;1\r\n100;0;-10;2\r\n0;100;-20;3\r\n100;100;-35;4\r\n';
    const parsed = await engine.run("parse", good);
    expectClearOutcome(parsed, good);
    const bad = "x,y,z,throw\n0,0,0,1\nNaN,0,-10,2\n0,1e999,-20,3\n100,100,-35,abc\n";
    const refused = await engine.run("parse", bad);
    expectClearOutcome(refused, bad);
    expect(refused.outcome).toBe("input-error");
    if (refused.outcome === "input-error") expect(refused.rejected.map((r) => r.row)).toEqual(expect.arrayContaining([3, 4, 5]));
  });
});
