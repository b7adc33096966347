import "server-only";
import { loadExportSource, pinSummary, studyScalingPoints } from "./load";

/** Everything the printable fault report shows, serialisable for the client. */
export async function faultReportData(faultId: string, analysisId?: string) {
  const source = await loadExportSource(faultId, analysisId);
  const [pins, scaling] = await Promise.all([pinSummary(faultId), studyScalingPoints(source.fault.studyId)]);
  return {
    fault: source.fault,
    analysisId: source.analysis.id,
    report: source.report,
    provenance: {
      fileName: source.pickSet.fileName,
      version: source.pickSet.version,
      checksum: source.pickSet.checksum,
      uploadedBy: source.pickSet.uploadedBy ?? "unknown (account removed)",
      uploadedAt: source.pickSet.uploadedAt.toISOString(),
      units: source.pickSet.units,
      rowCount: source.pickSet.rowCount,
      engineVersion: source.analysis.engineVersion ?? source.report.engineVersion,
      analysedAt: source.analysis.finishedAt?.toISOString() ?? null,
    },
    pins: { open: pins.open, resolved: pins.resolved, openPins: pins.openPins.map((pin) => ({ ...pin, createdAt: pin.createdAt.toISOString() })) },
    scaling,
  };
}

export type FaultReportData = Awaited<ReturnType<typeof faultReportData>>;
