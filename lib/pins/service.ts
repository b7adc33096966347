import "server-only";
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { faults, memberships, pinReplies, pins, pinVisits, users, type Pin, type PinReply } from "@/db/schema";
import { rememberedWhileRolesStand, requireFaultRole, requireUser, type StudyAccess } from "@/lib/access";
import type { StudyAction } from "@/lib/contracts/roles";
import { latestAnalysisForFault } from "@/lib/analysis/reports";
import { ApiError, forbidden } from "@/lib/api/errors";
import { recordAudit } from "@/lib/audit";
import { appUrl } from "@/lib/mail";
import { createRateLimiter } from "@/lib/rate-limit";
import type { AnalysisReport } from "@/lib/engine/types";
import { notifyUser, type NotificationInput } from "./notify";
import { resolveMentions } from "./text";
import type { PinFilter, PinInput, PinList, PinPatch, PinView, ReplyView } from "@/lib/contracts/pins";

/** How long after writing a pin or reply its author may still change the text. */
export const EDIT_WINDOW_MINUTES = 15;
const EDIT_WINDOW_MS = EDIT_WINDOW_MINUTES * 60_000;

/** Pins and replies together, per person: generous for a review session, a stop for a runaway script. */
const writeLimiter = createRateLimiter({ scope: "pin-write", limit: 40, windowMs: 10 * 60_000 });

type FaultAccess = StudyAccess & { faultId: string };

// ---- access ------------------------------------------------------------------------------------------

/** Session, then the pin (not deleted), then the role in its study; other studies' pins are 404. */
export async function requirePinRole(pinId: string, action: StudyAction): Promise<FaultAccess & { pin: Pin }> {
  await requireUser();
  const db = await getDb();
  const pin = await db.query.pins.findFirst({ where: and(eq(pins.id, pinId), isNull(pins.deletedAt)) });
  if (!pin) throw new ApiError(404, "Pin not found.");
  const access = await requireFaultRole(pin.faultId, action).catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) throw new ApiError(404, "Pin not found.");
    throw error;
  });
  return { ...access, pin };
}

async function requireReply(pinId: string, replyId: string): Promise<PinReply> {
  const db = await getDb();
  const reply = await db.query.pinReplies.findFirst({ where: and(eq(pinReplies.id, replyId), eq(pinReplies.pinId, pinId), isNull(pinReplies.deletedAt)) });
  if (!reply) throw new ApiError(404, "Reply not found.");
  return reply;
}

async function spendWrite(userId: string) {
  if (!(await writeLimiter.attempt(userId)))
    throw new ApiError(429, "You have written many pins and replies in the last few minutes; wait a little and try again.");
}

function requireOwnWithinWindow(authorId: string | null, userId: string, createdAt: Date, what: "pin" | "reply") {
  if (authorId !== userId) throw new ApiError(403, `Only the author can edit this ${what}.`);
  if (Date.now() - createdAt.getTime() > EDIT_WINDOW_MS)
    throw new ApiError(403, `A ${what} can be edited only within ${EDIT_WINDOW_MINUTES} minutes of writing it; reply instead.`);
}

// ---- reading -----------------------------------------------------------------------------------------

/** The study's members (names and e-mail addresses never change; who is a member changes only through changingRoles). */
function studyMembers(studyId: string): Promise<readonly { id: string; email: string; name: string }[]> {
  return rememberedWhileRolesStand(`members:${studyId}`, async () => {
    const db = await getDb();
    return db
      .select({ id: users.id, email: users.email, name: users.name })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(eq(memberships.studyId, studyId));
  });
}

export async function listPins(access: FaultAccess, filter: PinFilter = "all"): Promise<PinList> {
  const db = await getDb();
  const me = access.user.id;
  const canComment = access.role !== "viewer";
  const conditions = [eq(pins.faultId, access.faultId), isNull(pins.deletedAt)];
  if (filter === "mine") conditions.push(eq(pins.authorId, me));
  if (filter === "open") conditions.push(eq(pins.state, "open"));
  // independent reads sent together: one wait for the database instead of four in a row
  const [visit, pinRows, repliesOfFault, members] = await Promise.all([
    db.query.pinVisits.findFirst({ where: and(eq(pinVisits.userId, me), eq(pinVisits.faultId, access.faultId)) }),
    db
      .select()
      .from(pins)
      .where(and(...conditions))
      .orderBy(desc(pins.createdAt)),
    // the replies of every live pin of the fault (those of pins the filter leaves out are not used)
    db
      .select({ reply: pinReplies })
      .from(pinReplies)
      .innerJoin(pins, eq(pins.id, pinReplies.pinId))
      .where(and(eq(pins.faultId, access.faultId), isNull(pins.deletedAt), isNull(pinReplies.deletedAt)))
      .orderBy(asc(pinReplies.createdAt))
      .then((rows) => rows.map((row) => row.reply)),
    studyMembers(access.studyId),
  ]);
  const shown = new Set(pinRows.map((pin) => pin.id));
  const replyRows = repliesOfFault.filter((reply) => shown.has(reply.pinId));
  const since = visit?.visitedAt ?? null;
  const isUnread = (createdAt: Date, authorId: string | null) => authorId !== me && (since === null || createdAt > since);

  const personIds = new Set<string>();
  for (const row of [...pinRows, ...replyRows]) if (row.authorId) personIds.add(row.authorId);
  for (const pin of pinRows) if (pin.resolvedBy) personIds.add(pin.resolvedBy);
  const people = new Map(members.map((member) => [member.id, { id: member.id, name: member.name }]));
  const missing = [...personIds].filter((id) => !people.has(id));
  if (missing.length) {
    // former members still sign their old notes
    for (const person of await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, missing))) people.set(person.id, person);
  }
  const person = (id: string | null) => (id ? (people.get(id) ?? null) : null);
  const editableUntil = (createdAt: Date) => new Date(createdAt.getTime() + EDIT_WINDOW_MS);
  const now = Date.now();

  const repliesByPin = new Map<string, ReplyView[]>();
  for (const reply of replyRows) {
    const mine = reply.authorId === me;
    const until = editableUntil(reply.createdAt);
    const view: ReplyView = {
      id: reply.id,
      author: person(reply.authorId),
      body: reply.body,
      createdAt: reply.createdAt.toISOString(),
      edited: reply.updatedAt.getTime() - reply.createdAt.getTime() > 1000,
      unread: isUnread(reply.createdAt, reply.authorId),
      mine,
      editableUntil: until.toISOString(),
      can: { edit: canComment && mine && until.getTime() > now, delete: canComment && mine },
    };
    const ofPin = repliesByPin.get(reply.pinId);
    if (ofPin) ofPin.push(view);
    else repliesByPin.set(reply.pinId, [view]);
  }

  const pinViews = pinRows.map((pin): PinView => {
    const mine = pin.authorId === me;
    const until = editableUntil(pin.createdAt);
    const replies = repliesByPin.get(pin.id) ?? [];
    return {
      id: pin.id,
      x: pin.x,
      y: pin.y,
      z: pin.z,
      s: pin.s,
      t: pin.t,
      segmentName: pin.segmentName,
      pickSetVersion: pin.pickSetVersion,
      body: pin.body,
      state: pin.state,
      author: person(pin.authorId),
      createdAt: pin.createdAt.toISOString(),
      edited: pin.updatedAt.getTime() - pin.createdAt.getTime() > 1000,
      resolvedBy: person(pin.resolvedBy),
      resolvedAt: pin.resolvedAt?.toISOString() ?? null,
      unread: isUnread(pin.createdAt, pin.authorId) || replies.some((reply) => reply.unread),
      mine,
      editableUntil: until.toISOString(),
      can: {
        edit: canComment && mine && until.getTime() > now,
        resolve: canComment && (mine || access.role === "owner"),
        delete: canComment && mine,
        reply: canComment,
      },
      replies,
    };
  });

  return {
    pins: pinViews,
    lastVisitAt: since?.toISOString() ?? null,
    editWindowMinutes: EDIT_WINDOW_MINUTES,
    mentionable: members.map((member) => ({ name: member.name, handle: member.email.split("@")[0] })),
  };
}

/** Records that this person has now seen the fault's pins (clears their unread markers from the next read). */
export async function markPinsVisited(access: FaultAccess, at = new Date()) {
  const db = await getDb();
  await db
    .insert(pinVisits)
    .values({ userId: access.user.id, faultId: access.faultId, visitedAt: at })
    .onConflictDoUpdate({ target: [pinVisits.userId, pinVisits.faultId], set: { visitedAt: at } });
  return { visitedAt: at.toISOString() };
}

// ---- writing -----------------------------------------------------------------------------------------

async function faultContext(faultId: string) {
  const db = await getDb();
  const fault = await db.query.faults.findFirst({ where: eq(faults.id, faultId), columns: { id: true, name: true, studyId: true } });
  if (!fault) throw new ApiError(404, "Fault not found.");
  return fault;
}

const pinLink = (studyId: string, faultId: string, pinId: string) => appUrl(`/studies/${studyId}/faults/${faultId}?pin=${pinId}`);

/** E-mails to the members a text mentions, except the writer and anyone in `skip` (already told). */
async function notifyMentions(access: FaultAccess, pinId: string, text: string, skip: Set<string>, where: string) {
  const fault = await faultContext(access.faultId);
  const mentioned = resolveMentions(text, await studyMembers(access.studyId)).filter((member) => member.id !== access.user.id && !skip.has(member.id));
  for (const member of mentioned)
    await notifyUser({
      userId: member.id,
      kind: "mention",
      studyId: access.studyId,
      pinId,
      subject: `${access.user.name} mentioned you on ${fault.name}`,
      text: `${access.user.name} mentioned you in ${where} on fault ${fault.name}:\n\n${text}\n\nOpen it: ${pinLink(access.studyId, access.faultId, pinId)}`,
    });
  return mentioned.map((member) => member.id);
}

export async function createPin(access: FaultAccess, input: PinInput) {
  await spendWrite(access.user.id);
  const analysis = await latestAnalysisForFault(access.faultId);
  if (!analysis || analysis.status !== "done") throw new ApiError(409, "This fault has no finished analysis yet; pins go on the analysed surface.");
  const report = analysis.result as AnalysisReport | null;
  if (!report?.segments.some((segment) => segment.id === input.segmentId))
    throw new ApiError(400, `The fault has no segment "${input.segmentId}".`, {
      fieldErrors: { segmentId: ["Not a segment of this fault's current analysis."] },
    });
  const db = await getDb();
  const [pin] = await db
    .insert(pins)
    .values({
      faultId: access.faultId,
      pickSetId: analysis.pickSetId,
      pickSetVersion: analysis.version,
      segmentName: input.segmentId,
      authorId: access.user.id,
      x: input.x,
      y: input.y,
      z: input.z,
      s: input.s,
      t: input.t,
      body: input.body,
    })
    .returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "pin.create", target: pin.id, details: { faultId: access.faultId } });
  const mentioned = await notifyMentions(access, pin.id, input.body, new Set(), "a pinned note");
  return { pin, mentioned };
}

export async function replyToPin(access: FaultAccess & { pin: Pin }, input: { body: string }) {
  await spendWrite(access.user.id);
  const db = await getDb();
  const [reply] = await db.insert(pinReplies).values({ pinId: access.pin.id, authorId: access.user.id, body: input.body }).returning();
  const told = new Set<string>();
  const authorId = access.pin.authorId;
  if (authorId && authorId !== access.user.id && (await isMember(access.studyId, authorId))) {
    const fault = await faultContext(access.faultId);
    await notifyUser({
      userId: authorId,
      kind: "pin-reply",
      studyId: access.studyId,
      pinId: access.pin.id,
      subject: `${access.user.name} replied to your pin on ${fault.name}`,
      text: `${access.user.name} replied to your pin on fault ${fault.name}:\n\n${input.body}\n\nYour pin: ${excerpt(access.pin.body)}\n\nOpen it: ${pinLink(access.studyId, access.faultId, access.pin.id)}`,
    });
    told.add(authorId);
  }
  const mentioned = await notifyMentions(access, access.pin.id, input.body, told, "a reply");
  return { reply, notified: [...told, ...mentioned] };
}

async function isMember(studyId: string, userId: string) {
  const db = await getDb();
  return Boolean(
    await db.query.memberships.findFirst({ where: and(eq(memberships.studyId, studyId), eq(memberships.userId, userId)), columns: { role: true } }),
  );
}

const excerpt = (text: string) => (text.length > 160 ? `${text.slice(0, 157)}…` : text);

export async function updatePin(access: FaultAccess & { pin: Pin }, patch: PinPatch) {
  const db = await getDb();
  const { pin, user } = access;
  if (patch.action === "edit") {
    requireOwnWithinWindow(pin.authorId, user.id, pin.createdAt, "pin");
    const [updated] = await db.update(pins).set({ body: patch.body, updatedAt: new Date() }).where(eq(pins.id, pin.id)).returning();
    // people newly mentioned by the edit are told; those already mentioned are not told twice
    const before = new Set(resolveMentions(pin.body, await studyMembers(access.studyId)).map((member) => member.id));
    await notifyMentions(access, pin.id, patch.body, before, "a pinned note");
    return updated;
  }
  if (pin.authorId !== user.id && access.role !== "owner") throw forbidden("resolve or reopen other people's pins (only the pin's author or an owner can)");
  const resolving = patch.action === "resolve";
  if ((pin.state === "resolved") === resolving) return pin;
  const now = new Date();
  const [updated] = await db
    .update(pins)
    .set(resolving ? { state: "resolved", resolvedBy: user.id, resolvedAt: now } : { state: "open", resolvedBy: null, resolvedAt: null })
    .where(eq(pins.id, pin.id))
    .returning();
  await recordAudit({ studyId: access.studyId, userId: user.id, action: resolving ? "pin.resolve" : "pin.reopen", target: pin.id });
  if (resolving && pin.authorId && pin.authorId !== user.id && (await isMember(access.studyId, pin.authorId))) {
    const fault = await faultContext(access.faultId);
    const notice: NotificationInput = {
      userId: pin.authorId,
      kind: "pin-resolved",
      studyId: access.studyId,
      pinId: pin.id,
      subject: `${user.name} resolved your pin on ${fault.name}`,
      text: `${user.name} marked your pin on fault ${fault.name} as resolved:\n\n${excerpt(pin.body)}\n\nOpen it: ${pinLink(access.studyId, access.faultId, pin.id)}`,
    };
    await notifyUser(notice);
  }
  return updated;
}

export async function deletePin(access: FaultAccess & { pin: Pin }) {
  if (access.pin.authorId !== access.user.id) throw new ApiError(403, "Only the author can delete this pin.");
  const db = await getDb();
  await db.update(pins).set({ deletedAt: new Date() }).where(eq(pins.id, access.pin.id));
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "pin.delete",
    target: access.pin.id,
    details: { faultId: access.faultId, body: access.pin.body },
  });
}

export async function editReply(access: FaultAccess & { pin: Pin }, replyId: string, input: { body: string }) {
  const reply = await requireReply(access.pin.id, replyId);
  requireOwnWithinWindow(reply.authorId, access.user.id, reply.createdAt, "reply");
  const db = await getDb();
  const [updated] = await db.update(pinReplies).set({ body: input.body, updatedAt: new Date() }).where(eq(pinReplies.id, reply.id)).returning();
  return updated;
}

export async function deleteReply(access: FaultAccess & { pin: Pin }, replyId: string) {
  const reply = await requireReply(access.pin.id, replyId);
  if (reply.authorId !== access.user.id) throw new ApiError(403, "Only the author can delete this reply.");
  const db = await getDb();
  await db.update(pinReplies).set({ deletedAt: new Date() }).where(eq(pinReplies.id, reply.id));
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "pin.reply.delete",
    target: reply.id,
    details: { pinId: access.pin.id, body: reply.body },
  });
}
