import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, base64Bytes, faults, pickSets, pinReplies, pins, users, viewpointLinks, viewpoints, type ViewpointLink } from "@/db/schema";
import { requireFaultRole, requireUser, type StudyAccess } from "@/lib/access";
import { roleAllows, type FaultSense } from "@/lib/contracts/roles";
import type { LinkInput, LinkState, PublicViewpoint, ViewpointInput, ViewpointPatch } from "@/lib/contracts/viewpoints";
import { ApiError, forbidden } from "@/lib/api/errors";
import { recordAudit } from "@/lib/audit";
import { createRateLimiter } from "@/lib/rate-limit";
import type { AnalysisReport } from "@/lib/engine/types";

// ---- tokens ------------------------------------------------------------------------------------------------

const TOKEN_BYTES = 32;
/** 32 bytes in base64url without padding: 43 characters. */
export const LINK_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export function newLinkToken() {
  return randomBytes(TOKEN_BYTES).toString("base64url");
}

/**
 * Only a hash of a link token is stored (the `token` column holds it). A lookup then compares hashes, so response
 * timing can reveal nothing useful about a live token, and a copy of the database opens no links.
 */
export function hashLinkToken(token: string) {
  return createHash("sha256").update(token).digest("hex");
}

const linkLimiter = createRateLimiter({ scope: "link", limit: 30, windowMs: 60 * 60_000 });

// ---- access ------------------------------------------------------------------------------------------------

/** Session first (401), then the viewpoint (404), then the role in its study (404 for non-members, 403 for the role). */
export async function requireViewpointRole(viewpointId: string, action: "view" | "share") {
  await requireUser();
  const db = await getDb();
  const viewpoint = await db.query.viewpoints.findFirst({ where: eq(viewpoints.id, viewpointId) });
  if (!viewpoint) throw new ApiError(404, "Viewpoint not found.");
  const access = await requireFaultRole(viewpoint.faultId, action).catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) throw new ApiError(404, "Viewpoint not found.");
    throw error;
  });
  return { access, viewpoint };
}

type FaultAccess = StudyAccess & { faultId: string };
export type ViewpointAccess = Awaited<ReturnType<typeof requireViewpointRole>>;

/** The person who saved a viewpoint, or an owner, may rename or delete it. */
function mayChange(access: StudyAccess, createdBy: string | null) {
  if (!roleAllows(access.role, "share")) return false;
  return access.role === "owner" || (createdBy !== null && createdBy === access.user.id);
}

function assertMayChange(access: StudyAccess, createdBy: string | null, what: string) {
  if (mayChange(access, createdBy)) return;
  throw new ApiError(403, `Only the person who saved this viewpoint or a study owner may ${what}.`);
}

// ---- viewpoints ----------------------------------------------------------------------------------------------

const viewpointColumns = {
  id: viewpoints.id,
  faultId: viewpoints.faultId,
  title: viewpoints.title,
  note: viewpoints.note,
  camera: viewpoints.camera,
  settings: viewpoints.settings,
  createdAt: viewpoints.createdAt,
  updatedAt: viewpoints.updatedAt,
  createdById: viewpoints.createdBy,
  createdByName: users.name,
};

/** The fault's viewpoints, newest first, each saying whether the caller may rename or delete it. */
export async function listViewpoints(access: FaultAccess) {
  const db = await getDb();
  const rows = await db
    .select(viewpointColumns)
    .from(viewpoints)
    .leftJoin(users, eq(users.id, viewpoints.createdBy))
    .where(eq(viewpoints.faultId, access.faultId))
    .orderBy(desc(viewpoints.createdAt));
  return rows.map((row) => ({ ...row, canChange: mayChange(access, row.createdById) }));
}

export async function createViewpoint(access: FaultAccess, input: ViewpointInput) {
  const { faultId } = access;
  const db = await getDb();
  const [created] = await db
    .insert(viewpoints)
    .values({ faultId, createdBy: access.user.id, title: input.title, note: input.note, camera: input.camera, settings: input.settings })
    .returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "viewpoint.create", target: created.id, details: { title: created.title } });
  return { ...created, createdById: created.createdBy, createdByName: access.user.name, canChange: true };
}

export async function updateViewpoint({ access, viewpoint }: ViewpointAccess, patch: ViewpointPatch) {
  const viewpointId = viewpoint.id;
  assertMayChange(access, viewpoint.createdBy, "rename it or edit its note");
  const db = await getDb();
  const [updated] = await db
    .update(viewpoints)
    .set({ ...patch, updatedAt: new Date() })
    .where(eq(viewpoints.id, viewpointId))
    .returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "viewpoint.update", target: viewpointId, details: patch });
  return updated;
}

/** Deleting a viewpoint deletes its links too (cascade), so they stop working at once. */
export async function deleteViewpoint({ access, viewpoint }: ViewpointAccess) {
  const viewpointId = viewpoint.id;
  assertMayChange(access, viewpoint.createdBy, "delete it");
  const db = await getDb();
  await db.delete(viewpoints).where(eq(viewpoints.id, viewpointId));
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "viewpoint.delete",
    target: viewpointId,
    details: { title: viewpoint.title, faultId: viewpoint.faultId },
  });
}

// ---- links ---------------------------------------------------------------------------------------------------

export function linkState(link: Pick<ViewpointLink, "expiresAt" | "revokedAt">, now = new Date()): LinkState {
  if (link.revokedAt) return "revoked";
  if (link.expiresAt && link.expiresAt.getTime() <= now.getTime()) return "expired";
  return "active";
}

function mayRevoke(access: StudyAccess, link: Pick<ViewpointLink, "createdBy">, viewpointCreatedBy: string | null) {
  return access.role === "owner" || link.createdBy === access.user.id || viewpointCreatedBy === access.user.id;
}

function describeLink(link: ViewpointLink, canRevoke = false) {
  return {
    canRevoke,
    id: link.id,
    viewpointId: link.viewpointId,
    includePins: link.includePins,
    expiresAt: link.expiresAt,
    revokedAt: link.revokedAt,
    createdAt: link.createdAt,
    createdById: link.createdBy,
    state: linkState(link),
  };
}

/** The token is returned once, here; only its hash is kept. */
export async function createViewpointLink({ access, viewpoint }: ViewpointAccess, input: LinkInput) {
  const viewpointId = viewpoint.id;
  if (!(await linkLimiter.attempt(access.user.id))) throw new ApiError(429, "Too many links made in the last hour; try again later.");
  const token = newLinkToken();
  const expiresAt = input.expiresInDays === null ? null : new Date(Date.now() + input.expiresInDays * 24 * 3600_000);
  const db = await getDb();
  const [link] = await db
    .insert(viewpointLinks)
    .values({ viewpointId, token: hashLinkToken(token), includePins: input.includePins, expiresAt, createdBy: access.user.id })
    .returning();
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "viewpoint-link.create",
    target: link.id,
    details: { viewpointId, includePins: input.includePins, expiresInDays: input.expiresInDays },
  });
  return { ...describeLink(link, true), token, path: `/v/${token}` };
}

/** Sharers see the links of a viewpoint (without tokens); viewers may not manage links. */
export async function listViewpointLinks({ access, viewpoint }: ViewpointAccess) {
  const db = await getDb();
  const rows = await db.select().from(viewpointLinks).where(eq(viewpointLinks.viewpointId, viewpoint.id)).orderBy(desc(viewpointLinks.createdAt));
  return rows.map((link) => describeLink(link, mayRevoke(access, link, viewpoint.createdBy)));
}

/** The link's maker, the viewpoint's maker or an owner may revoke. Revoking twice is harmless. */
export async function revokeViewpointLink(linkId: string) {
  await requireUser();
  const db = await getDb();
  const link = await db.query.viewpointLinks.findFirst({ where: eq(viewpointLinks.id, linkId) });
  if (!link) throw new ApiError(404, "Link not found.");
  const { access, viewpoint } = await requireViewpointRole(link.viewpointId, "share").catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) throw new ApiError(404, "Link not found.");
    throw error;
  });
  if (!mayRevoke(access, link, viewpoint.createdBy)) throw forbidden("revoke a link someone else made (ask them or an owner)");
  if (link.revokedAt) return describeLink(link, true);
  const [revoked] = await db
    .update(viewpointLinks)
    .set({ revokedAt: new Date() })
    .where(and(eq(viewpointLinks.id, linkId), isNull(viewpointLinks.revokedAt)))
    .returning();
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "viewpoint-link.revoke",
    target: linkId,
    details: { viewpointId: link.viewpointId },
  });
  return describeLink(revoked ?? link, true);
}

// ---- the public side of a link -------------------------------------------------------------------------------

export type PublicLinkLookup =
  | { state: "not-found" | "revoked" | "expired" }
  | { state: "active"; link: ViewpointLink; viewpoint: typeof viewpoints.$inferSelect; fault: { id: string; name: string; sense: FaultSense } };

/** Resolves a token and nothing else: no session, no study. Malformed tokens never reach the database. */
export async function lookupLinkToken(token: string): Promise<PublicLinkLookup> {
  if (!LINK_TOKEN_PATTERN.test(token)) return { state: "not-found" };
  const db = await getDb();
  const link = await db.query.viewpointLinks.findFirst({ where: eq(viewpointLinks.token, hashLinkToken(token)) });
  if (!link) return { state: "not-found" };
  const state = linkState(link);
  if (state !== "active") return { state };
  const viewpoint = await db.query.viewpoints.findFirst({ where: eq(viewpoints.id, link.viewpointId) });
  if (!viewpoint) return { state: "not-found" };
  const fault = await db.query.faults.findFirst({ where: eq(faults.id, viewpoint.faultId), columns: { id: true, name: true, sense: true } });
  if (!fault) return { state: "not-found" };
  return { state: "active", link, viewpoint, fault };
}

const GONE: Record<"not-found" | "revoked" | "expired", { status: number; message: string }> = {
  "not-found": { status: 404, message: "This link does not exist." },
  revoked: { status: 410, message: "This link was revoked." },
  expired: { status: 410, message: "This link has expired." },
};

/** The HTTP status a link's state answers with (the link page and the token routes agree). */
export async function linkStateResponse(token: string): Promise<{ status: number; state: PublicLinkLookup["state"] }> {
  const { state } = await lookupLinkToken(token);
  return { state, status: state === "active" ? 200 : GONE[state].status };
}

export function linkGoneError(state: "not-found" | "revoked" | "expired") {
  return new ApiError(GONE[state].status, GONE[state].message, { state });
}

async function activeLink(token: string) {
  const found = await lookupLinkToken(token);
  if (found.state !== "active") throw linkGoneError(found.state);
  return found;
}

/** The newest finished analysis of the fault: the surface a link shows. */
async function latestFinishedAnalysis(faultId: string) {
  const db = await getDb();
  const [row] = await db
    .select({ id: analyses.id, version: pickSets.version })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(and(eq(pickSets.faultId, faultId), eq(analyses.status, "done")))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  return row ?? null;
}

/** The report without the rejected input rows (raw file content) and without contour rings (the display has them). */
export function publicReport(report: AnalysisReport): AnalysisReport {
  return {
    engineVersion: report.engineVersion,
    input: { rows: report.input.rows, accepted: report.input.accepted, rejected: [], units: report.input.units },
    segments: report.segments.map((segment) => ({ ...segment, contours: [] })),
    relays: report.relays,
    warnings: report.warnings,
  };
}

/** Everything the link page shows, and only that: one fault's name, the saved view, the surface's report, pins if included. */
export async function publicViewpoint(token: string): Promise<PublicViewpoint> {
  const { link, viewpoint, fault } = await activeLink(token);
  const db = await getDb();
  const latest = await latestFinishedAnalysis(fault.id);
  const analysis = latest ? await db.query.analyses.findFirst({ where: eq(analyses.id, latest.id), columns: { result: true } }) : null;
  let pinRows: PublicViewpoint["pins"] = null;
  if (link.includePins) {
    const rows = await db
      .select({
        id: pins.id,
        x: pins.x,
        y: pins.y,
        z: pins.z,
        body: pins.body,
        state: pins.state,
        pickSetVersion: pins.pickSetVersion,
        createdAt: pins.createdAt,
      })
      .from(pins)
      .where(and(eq(pins.faultId, fault.id), isNull(pins.deletedAt)))
      .orderBy(asc(pins.createdAt));
    const replies = rows.length
      ? await db
          .select({ pinId: pinReplies.pinId, body: pinReplies.body, createdAt: pinReplies.createdAt })
          .from(pinReplies)
          .where(
            and(
              inArray(
                pinReplies.pinId,
                rows.map((row) => row.id),
              ),
              isNull(pinReplies.deletedAt),
            ),
          )
          .orderBy(asc(pinReplies.createdAt))
      : [];
    pinRows = rows.map((row) => ({
      ...row,
      createdAt: row.createdAt.toISOString(),
      replies: replies.filter((reply) => reply.pinId === row.id).map((reply) => ({ body: reply.body, createdAt: reply.createdAt.toISOString() })),
    }));
  }
  return {
    fault: { name: fault.name, sense: fault.sense },
    viewpoint: { title: viewpoint.title, note: viewpoint.note, camera: viewpoint.camera, settings: viewpoint.settings },
    link: { includePins: link.includePins, expiresAt: link.expiresAt?.toISOString() ?? null },
    analysis: latest && analysis?.result ? { pickSetVersion: latest.version, report: publicReport(analysis.result as AnalysisReport) } : null,
    pins: pinRows,
  };
}

/** The binary display payload of the fault behind the token. */
export async function publicDisplay(token: string) {
  const { fault } = await activeLink(token);
  const latest = await latestFinishedAnalysis(fault.id);
  const db = await getDb();
  const [analysis] = latest
    ? await db
        .select({ display: base64Bytes(analyses.display) })
        .from(analyses)
        .where(eq(analyses.id, latest.id))
    : [];
  if (!analysis?.display) throw new ApiError(404, "This fault has no surface to show yet.");
  return analysis.display;
}
