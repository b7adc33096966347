import { notFound } from "next/navigation";
import { FaultReport } from "@/components/analysis-views/FaultReport";
import { ApiError } from "@/lib/api/errors";
import { faultReportData } from "@/lib/exports/report";
import { pageFaultAccess } from "@/lib/pages";

export const metadata = { title: "Fault report — Slipfield" };

export default async function FaultReportPage({
  params,
  searchParams,
}: {
  params: Promise<{ studyId: string; faultId: string }>;
  searchParams: Promise<{ analysis?: string }>;
}) {
  const { studyId, faultId } = await params;
  const { analysis } = await searchParams;
  const access = await pageFaultAccess(faultId, `/studies/${studyId}/faults/${faultId}/report`);
  if (access.studyId !== studyId) notFound();
  const data = await faultReportData(faultId, typeof analysis === "string" && analysis.length <= 64 ? analysis : undefined).catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) return null;
    throw error;
  });
  if (!data) {
    return (
      <main className="mx-auto max-w-3xl p-8 text-sm" data-testid="report-missing">
        This fault has no finished analysis yet, so there is no report to print.
      </main>
    );
  }
  return <FaultReport data={data} />;
}
