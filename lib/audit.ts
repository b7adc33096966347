import "server-only";
import { getDb } from "@/db/client";
import { auditLog } from "@/db/schema";

export async function recordAudit(entry: {
  studyId?: string | null;
  userId?: string | null;
  action: string;
  target?: string;
  details?: Record<string, unknown>;
}) {
  const db = await getDb();
  await db.insert(auditLog).values({
    studyId: entry.studyId ?? null,
    userId: entry.userId ?? null,
    action: entry.action,
    target: entry.target ?? "",
    details: entry.details ?? {},
  });
}
