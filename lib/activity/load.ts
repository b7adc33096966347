import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, faults, pinReplies, pins, users, viewpointLinks, viewpoints } from "@/db/schema";
import { activitySentence, type ActivityLookups, type ActivityPart } from "./sentences";

export interface ActivityItem {
  id: string;
  createdAt: Date;
  actor: string;
  parts: ActivityPart[];
}

const idsOf = (values: (string | undefined)[]) => [...new Set(values.filter((value): value is string => typeof value === "string" && value.length > 0))];

/** The study's latest events as sentences; every id an event names is looked up within this study only. */
export async function studyActivity(studyId: string, limit = 20): Promise<ActivityItem[]> {
  const db = await getDb();
  const entries = await db
    .select({ id: auditLog.id, action: auditLog.action, target: auditLog.target, details: auditLog.details, createdAt: auditLog.createdAt, actor: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(eq(auditLog.studyId, studyId))
    .orderBy(desc(auditLog.createdAt))
    .limit(limit);

  const detail = (entry: (typeof entries)[number], key: string) => (typeof entry.details[key] === "string" ? (entry.details[key] as string) : undefined);
  const targetsOf = (...actions: string[]) =>
    idsOf(entries.filter((entry) => actions.some((action) => entry.action.startsWith(action))).map((entry) => entry.target));
  const replyIds = targetsOf("pin.reply.");
  const linkIds = targetsOf("viewpoint-link.");
  const memberIds = targetsOf("member.role", "member.remove");

  const [studyFaults, replyRows, linkRows, memberRows] = await Promise.all([
    db.select({ id: faults.id, name: faults.name }).from(faults).where(eq(faults.studyId, studyId)),
    replyIds.length ? db.select({ id: pinReplies.id, pinId: pinReplies.pinId }).from(pinReplies).where(inArray(pinReplies.id, replyIds)) : [],
    linkIds.length
      ? db.select({ id: viewpointLinks.id, viewpointId: viewpointLinks.viewpointId }).from(viewpointLinks).where(inArray(viewpointLinks.id, linkIds))
      : [],
    memberIds.length ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, memberIds)) : [],
  ]);
  const faultIds = studyFaults.map((fault) => fault.id);
  const pinIds = idsOf([
    ...targetsOf("pin.create", "pin.resolve", "pin.reopen"),
    ...entries.map((entry) => detail(entry, "pinId")),
    ...replyRows.map((reply) => reply.pinId),
  ]);
  const viewpointIds = idsOf([
    ...targetsOf("viewpoint.create", "viewpoint.update"),
    ...entries.map((entry) => detail(entry, "viewpointId")),
    ...linkRows.map((link) => link.viewpointId),
  ]);
  const [pinRows, viewpointRows] = await Promise.all([
    pinIds.length && faultIds.length
      ? db
          .select({ id: pins.id, faultId: pins.faultId, body: pins.body, deletedAt: pins.deletedAt })
          .from(pins)
          .where(and(inArray(pins.id, pinIds), inArray(pins.faultId, faultIds)))
      : [],
    viewpointIds.length && faultIds.length
      ? db
          .select({ id: viewpoints.id, faultId: viewpoints.faultId, title: viewpoints.title })
          .from(viewpoints)
          .where(and(inArray(viewpoints.id, viewpointIds), inArray(viewpoints.faultId, faultIds)))
      : [],
  ]);

  const lookups: ActivityLookups = {
    studyId,
    faults: new Map(studyFaults.map((fault) => [fault.id, { name: fault.name }])),
    faultIdsByName: new Map(studyFaults.map((fault) => [fault.name, fault.id])),
    users: new Map(memberRows.map((user) => [user.id, { name: user.name }])),
    pins: new Map(pinRows.map((pin) => [pin.id, { faultId: pin.faultId, body: pin.body, deleted: pin.deletedAt !== null }])),
    replies: new Map(replyRows.map((reply) => [reply.id, { pinId: reply.pinId }])),
    viewpoints: new Map(viewpointRows.map((viewpoint) => [viewpoint.id, { faultId: viewpoint.faultId, title: viewpoint.title }])),
    links: new Map(linkRows.map((link) => [link.id, { viewpointId: link.viewpointId }])),
  };
  return entries.map((entry) => ({
    id: entry.id,
    createdAt: entry.createdAt,
    actor: entry.actor ?? "A former member",
    parts: activitySentence({ action: entry.action, target: entry.target, details: entry.details }, lookups),
  }));
}
