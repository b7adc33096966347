import type { DigestSummary } from "@/lib/contracts/health";
import "server-only";
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { notifications, users } from "@/db/schema";
import { appUrl, sendMail } from "@/lib/mail";

export type NotificationKind = "pin-reply" | "mention" | "pin-resolved";

export interface NotificationInput {
  userId: string;
  kind: NotificationKind;
  studyId: string;
  pinId: string;
  subject: string;
  text: string;
}

/**
 * Tells one person about something, as they asked in their settings: "immediate" e-mails now, "digest"
 * queues it for the next digest, "off" drops it. Returns what happened.
 */
export async function notifyUser(input: NotificationInput): Promise<"sent" | "queued" | "off"> {
  const db = await getDb();
  const user = await db.query.users.findFirst({ where: eq(users.id, input.userId), columns: { email: true, notifyMode: true } });
  if (!user || user.notifyMode === "off") return "off";
  if (user.notifyMode === "digest") {
    await db.insert(notifications).values({ ...input, sentAt: null });
    return "queued";
  }
  await sendMail({ to: user.email, kind: input.kind, studyId: input.studyId, subject: input.subject, text: input.text });
  await db.insert(notifications).values({ ...input, sentAt: new Date() });
  return "sent";
}

/**
 * Sends every pending notification: one e-mail per person listing all of theirs, oldest first. People whose
 * setting is now "off" get nothing and their queue is cleared.
 */
export async function runDigest(now = new Date()): Promise<DigestSummary> {
  const db = await getDb();
  const pending = await db
    .select({
      id: notifications.id,
      userId: notifications.userId,
      subject: notifications.subject,
      text: notifications.text,
      createdAt: notifications.createdAt,
      email: users.email,
      name: users.name,
      notifyMode: users.notifyMode,
    })
    .from(notifications)
    .innerJoin(users, eq(users.id, notifications.userId))
    .where(isNull(notifications.sentAt))
    .orderBy(asc(notifications.createdAt));

  const byUser = new Map<string, typeof pending>();
  for (const row of pending) byUser.set(row.userId, [...(byUser.get(row.userId) ?? []), row]);

  const summary: DigestSummary = { emails: 0, notifications: 0, dropped: 0 };
  for (const [userId, rows] of byUser) {
    const ids = rows.map((row) => row.id);
    if (rows[0].notifyMode === "off") {
      await db.delete(notifications).where(inArray(notifications.id, ids));
      summary.dropped += rows.length;
      continue;
    }
    const count = rows.length;
    const body = [
      `Hello ${rows[0].name},`,
      ``,
      `${count === 1 ? "One thing" : `${count} things`} happened on Slipfield since your last digest:`,
      ``,
      ...rows.flatMap((row, index) => [
        `${index + 1}. ${row.subject} (${row.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC)`,
        indent(row.text),
        ``,
      ]),
      `You get these as a daily digest. Change that here: ${appUrl("/settings")}`,
    ].join("\n");
    await sendMail({ to: rows[0].email, kind: "digest", subject: `Slipfield digest: ${count} notification${count === 1 ? "" : "s"}`, text: body });
    await db
      .update(notifications)
      .set({ sentAt: now })
      .where(and(inArray(notifications.id, ids), isNull(notifications.sentAt)));
    await db.update(users).set({ lastDigestAt: now }).where(eq(users.id, userId));
    summary.emails += 1;
    summary.notifications += count;
  }
  return summary;
}

const indent = (text: string) =>
  text
    .split("\n")
    .map((line) => `   ${line}`)
    .join("\n");

export const NOTIFY_MODES = ["immediate", "digest", "off"] as const;
export type NotifyMode = (typeof NOTIFY_MODES)[number];

export async function getNotifyMode(userId: string): Promise<NotifyMode> {
  const db = await getDb();
  const user = await db.query.users.findFirst({ where: eq(users.id, userId), columns: { notifyMode: true } });
  return user?.notifyMode ?? "immediate";
}

export async function setNotifyMode(userId: string, mode: NotifyMode) {
  const db = await getDb();
  await db.update(users).set({ notifyMode: mode }).where(eq(users.id, userId));
}
