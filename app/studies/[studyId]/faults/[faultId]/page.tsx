import { notFound } from "next/navigation";
import { FaultWorkspace } from "@/components/workspace/FaultWorkspace";
import { roleAllows } from "@/lib/contracts/roles";
import { pageFaultAccess } from "@/lib/pages";
import { getFault } from "@/lib/studies";
import { getDb } from "@/db/client";
import { studies } from "@/db/schema";
import { eq } from "drizzle-orm";

export default async function FaultPage({ params }: { params: Promise<{ studyId: string; faultId: string }> }) {
  const { studyId, faultId } = await params;
  const access = await pageFaultAccess(faultId, `/studies/${studyId}/faults/${faultId}`);
  if (access.studyId !== studyId) notFound();
  const fault = await getFault(faultId);
  const study = await (await getDb()).query.studies.findFirst({ where: eq(studies.id, studyId), columns: { name: true } });
  return (
    <FaultWorkspace
      studyId={studyId}
      studyName={study?.name ?? "Study"}
      faultId={faultId}
      faultName={fault.name}
      canEdit={roleAllows(access.role, "edit")}
      role={access.role}
    />
  );
}
