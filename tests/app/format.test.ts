import { describe, expect, it } from "vitest";
import { degrees, inSentence, metres, plain } from "@/lib/format";

describe("numbers as the fault sheet prints them", () => {
  it("never prints a negative zero after rounding", () => {
    expect(plain(-0.004)).toBe("0.00");
    expect(plain(-0.0049, 2)).toBe("0.00");
    expect(plain(-0.006)).toBe("-0.01");
    expect(metres(-0.001)).toBe("0.00 m");
    expect(metres(-0.4, 0)).toBe("0 m");
    expect(degrees(-0.04)).toBe("0.0°");
    expect(degrees(-0.06)).toBe("-0.1°");
  });

  it("keeps units and a dash for missing values", () => {
    expect(metres(1234.5)).toBe("1,235 m");
    expect(metres(null)).toBe("—");
    expect(plain(Number.NaN)).toBe("—");
  });
});

describe("labels inside a sentence or menu", () => {
  it("lower-cases ordinary words but keeps symbols and abbreviations", () => {
    expect(inSentence("Slip tendency τ/σn′")).toBe("slip tendency τ/σn′");
    expect(inSentence("Dilation tendency")).toBe("dilation tendency");
    expect(inSentence("ΔP to failure, μ = 0.6")).toBe("ΔP to failure, μ = 0.6");
    expect(inSentence("Dmax/L")).toBe("Dmax/L");
    expect(inSentence("SHmax azimuth")).toBe("SHmax azimuth");
  });
});
