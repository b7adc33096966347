import { StudyOverview } from "@/components/studies/StudyOverview";
import { pageStudyAccess } from "@/lib/pages";
import { roleAllows } from "@/lib/contracts/roles";

export default async function StudyPage({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const access = await pageStudyAccess(studyId, `/studies/${studyId}`);
  return (
    <main className="mx-auto max-w-6xl px-6 py-10">
      <StudyOverview studyId={studyId} currentUserId={access.user.id} canEdit={roleAllows(access.role, "edit")} canAdmin={roleAllows(access.role, "admin")} />
    </main>
  );
}
