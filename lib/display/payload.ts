// The display payload on the wire and at rest: FaultDisplay (lib/contracts/display.ts) in the one typed-array codec.
// Pure and browser-safe.
import { faultDisplaySchema, type FaultDisplay } from "@/lib/contracts/display";
import type { AnalysisReport, Ring } from "@/lib/contracts/report";
import { decodeRecord, encodeRecord } from "./codec";

const DISPLAY_MAGIC = "SLFD";

export function encodeFaultDisplay(display: FaultDisplay): Uint8Array {
  return encodeRecord(display, DISPLAY_MAGIC);
}

/** Decodes and checks a display payload against its contract (fields a newer payload adds are kept as they are). */
export function decodeFaultDisplay(bytes: Uint8Array): FaultDisplay {
  const display = decodeRecord(bytes, DISPLAY_MAGIC, "display payload") as FaultDisplay;
  const checked = faultDisplaySchema.safeParse(display);
  if (!checked.success) {
    const version = (display as { version?: unknown } | null)?.version;
    if (version !== 1 && version !== 2) throw new Error(`Unsupported display payload version ${String(version)}.`);
    throw new Error(`The display payload is not what the viewer expects: ${checked.error.issues[0]?.path.join(".")} ${checked.error.issues[0]?.message}`);
  }
  return display;
}

/**
 * The report with its contour rings put back from the display payload, which keeps them once, at the engine's precision
 * (reports stored before that kept their own rings: those are left as they are).
 */
export function reportWithContourRings(report: AnalysisReport, display: FaultDisplay): AnalysisReport {
  if (report.segments.some((segment) => segment.contours.some((level) => level.rings.length > 0))) return report;
  return {
    ...report,
    segments: report.segments.map((segment) => {
      const contours = display.segments.find((candidate) => candidate.id === segment.id)?.contours;
      if (!contours) return segment;
      const rings: Ring[][] = segment.contours.map(() => []);
      for (let ring = 0; ring + 1 < contours.ringStarts.length; ring++) {
        const points: Ring = [];
        for (let point = contours.ringStarts[ring]; point < contours.ringStarts[ring + 1]; point++)
          points.push([contours.points[2 * point], contours.points[2 * point + 1]]);
        rings[contours.ringLevelIndex[ring]]?.push(points);
      }
      return { ...segment, contours: segment.contours.map((level, index) => ({ levelM: level.levelM, rings: rings[index] })) };
    }),
  };
}

/** The report as stored: its contour levels without their rings (the display payload holds them). */
export function withoutContourRings(report: AnalysisReport): AnalysisReport {
  return { ...report, segments: report.segments.map((segment) => ({ ...segment, contours: segment.contours.map(({ levelM }) => ({ levelM, rings: [] })) })) };
}
