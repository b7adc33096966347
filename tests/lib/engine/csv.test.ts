import { describe, expect, it } from "vitest";
import { parsePickCsv, PickInputError, MAX_REJECTED_LISTED } from "@/lib/engine/csv";

const header = "X,Y,Z,Throw,Segment";
const good = [header, "0,0,0,10,a", "100,0,-50,12,a", "0,100,-20,8,a", "100,100,-70,9,a"].join("\n");

function rejection(text: string, options = {}): PickInputError {
  try {
    parsePickCsv(text, options);
  } catch (e) {
    if (e instanceof PickInputError) return e;
    throw e;
  }
  throw new Error("expected a PickInputError");
}

describe("pick CSV parsing", () => {
  it("reads a header in any case and order, rows numbered as in a spreadsheet", () => {
    const r = parsePickCsv(good);
    expect(r.accepted).toBe(4);
    expect(Array.from(r.picks.sourceRow)).toEqual([2, 3, 4, 5]);
    expect(r.picks.segmentNames).toEqual(["a"]);
    expect(r.picks.throwM[1]).toBe(12);
  });

  it("accepts depth (positive down) instead of z and converts feet", () => {
    const r = parsePickCsv("x,y,depth,throw\n0,0,1000,10\n100,0,1050,12\n0,100,1020,8\n", { units: "ft" });
    expect(r.picks.z[0]).toBeCloseTo(-304.8, 9);
    expect(r.picks.x[1]).toBeCloseTo(30.48, 9);
    expect(r.picks.throwM[0]).toBeCloseTo(3.048, 9);
  });

  it("reads optional heave, quality and horizon", () => {
    const r = parsePickCsv("x,y,z,throw,heave,quality,horizon\n0,0,0,10,5,0.5,H1\n100,0,-50,12,,1,H2\n0,100,-20,8,4,,H1\n");
    expect(r.picks.heaveM[0]).toBe(5);
    expect(Number.isNaN(r.picks.heaveM[1])).toBe(true);
    expect(r.picks.quality[0]).toBe(0.5);
    expect(r.picks.horizonNames).toEqual(["H1", "H2"]);
  });

  it("lists every bad row with its row and column", () => {
    const text = [header, "0,0,0,10,a", "abc,0,0,10,a", "1,2,3,-4,a", "5,6,,7,a", "7,8,9,Infinity,a", "100,100,-70,9,a", "0,100,-20,8,a"].join("\n");
    const e = rejection(text);
    const where = e.rejected.map((r) => `${r.row}:${r.column}`);
    expect(where).toEqual(["3:x", "4:throw", "5:z", "6:throw"]);
    expect(e.message).toContain("row 4, column throw");
    expect(e.rejected[1].reason).toContain("≥ 0");
  });

  it("reports a missing required column on the header row", () => {
    const e = rejection("x,y,z\n1,2,3\n");
    expect(e.rejected[0]).toMatchObject({ row: 1, column: "throw" });
  });

  it("rejects quality outside 0–1", () => {
    const e = rejection("x,y,z,throw,quality\n0,0,0,1,1.5\n1,0,0,1,0\n0,1,0,1,0\n");
    expect(e.rejected[0]).toMatchObject({ row: 2, column: "quality" });
  });

  it("reports duplicate positions, or averages them on request", () => {
    const text = good + "\n100,0,-50,14,a";
    const e = rejection(text);
    expect(e.rejected[0].row).toBe(6);
    expect(e.rejected[0].reason).toContain("row 3");
    const avg = parsePickCsv(text, { dedupe: "average" });
    expect(avg.accepted).toBe(4);
    expect(avg.picks.throwM[1]).toBe(13);
    expect(avg.warnings[0]).toContain("averaged");
  });

  it("keeps good rows with dropBadRows and still lists the bad ones", () => {
    const r = parsePickCsv(good + "\n1,1,1,-3,a", { dropBadRows: true });
    expect(r.accepted).toBe(4);
    expect(r.rejected).toEqual([{ row: 6, column: "throw", reason: expect.stringContaining("≥ 0") }]);
  });

  it("rejects segments with fewer than 3 picks, and collinear or coincident picks", () => {
    const few = rejection(good + "\n5,5,5,1,b\n6,6,6,1,b");
    expect(few.rejected[0].reason).toContain('segment "b" has 2 usable picks');
    const collinear = rejection([header, "0,0,0,1,c", "1,1,-1,1,c", "2,2,-2,1,c", "3,3,-3,1,c"].join("\n"));
    expect(collinear.rejected[0].reason).toContain("collinear");
    const coincident = rejection([header, "0,0,0,1,c", "0,0,0,2,c", "0,0,0,3,c"].join("\n"), { dedupe: "average" });
    expect(coincident.rejected[0].reason).toMatch(/3 usable picks|1 usable picks|coincide/);
  });

  it("caps the listed rejections and flags truncation", () => {
    const rows = [header];
    for (let i = 0; i < 300; i++) rows.push(`${i},0,0,-1,a`);
    const e = rejection(rows.join("\n"));
    expect(e.rejected).toHaveLength(MAX_REJECTED_LISTED);
    expect(e.truncated).toBe(true);
  });
});

describe("fast reader for clean numeric files", () => {
  // The fast loop and papaparse + zod must agree exactly (common practice, no source): a quoted cell forces the
  // general reader on the same content, so both paths are compared bit for bit.
  const lines = [
    "x,y,z,throw,heave,quality,segment,horizon",
    "450000.125,6700000.5,-2000.25,12.5,3,0.5,a,H1",
    " 450100.1 ,6700010.75,-2010,1e1,,1,a,H1",
    "450050.333333333333,6700020.0001,-1.5e3,0.000001234,0.5,,b ,H2",
    "0x10,+6700030,-0.0,7.,2,0.25, b,",
    "",
    ",,,,,,,",
    "450150,6700040,-2030,8,1,0,a,H2",
    "450160,6700050,-2031,9,1,0,b,H2",
    "450170,6700065,-2045,9.5,1,0,b,H1",
    "450180,6700070,-2050,11,1,0,a,H1",
  ];
  const quoted = (ls: string[]) => ls.map((l, i) => (i === 1 ? l.replace(",a,", ',"a",') : l));
  const same = (a: ReturnType<typeof parsePickCsv>, b: ReturnType<typeof parsePickCsv>) => {
    expect(a.rows).toBe(b.rows);
    expect(a.accepted).toBe(b.accepted);
    for (const k of ["x", "y", "z", "throwM", "heaveM", "quality", "segment", "horizon", "sourceRow"] as const) {
      expect(Array.from(a.picks[k]).map((v) => (Object.is(v, -0) ? "-0" : v))).toEqual(Array.from(b.picks[k]).map((v) => (Object.is(v, -0) ? "-0" : v)));
    }
    expect(a.picks.segmentNames).toEqual(b.picks.segmentNames);
    expect(a.picks.horizonNames).toEqual(b.picks.horizonNames);
  };

  it("gives the same columns, row numbers and names as the general reader (LF, CRLF, feet)", () => {
    for (const eol of ["\n", "\r\n"]) {
      for (const units of ["m", "ft"] as const) {
        const fast = parsePickCsv(lines.join(eol) + eol, { units });
        const general = parsePickCsv(quoted(lines).join(eol) + eol, { units });
        same(fast, general);
        expect(fast.accepted).toBe(8);
        expect(fast.picks.sourceRow[7]).toBe(10);
      }
    }
  });

  it("falls back to the general reader for bad rows, so messages are unchanged", () => {
    const bad = [...lines, "450200,6700080,-2060,-3,1,0,a,H1", "1,2,nope,4,1,0,a,H1"];
    const a = rejection(bad.join("\n"));
    const b = rejection(quoted(bad).join("\n"));
    expect(a.rejected).toEqual(b.rejected);
    expect(a.message).toBe(b.message);
    expect(a.rejected.map((r) => `${r.row}:${r.column}`)).toEqual(["11:throw", "12:z"]);
  });
});
