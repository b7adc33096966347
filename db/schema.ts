import { sql } from "drizzle-orm";
import type { CoordinateReference } from "@/lib/crs";
import {
  type AnyPgColumn,
  boolean,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  real,
  text,
  timestamp,
  uniqueIndex,
} from "drizzle-orm/pg-core";
// JSON columns are typed by the contracts they hold (lib/contracts): one definition of each shape.
import type { AnalysisSettings } from "@/lib/contracts/analysis-settings";
import type { CameraState } from "@/lib/contracts/camera";
import type { AnalysisReport } from "@/lib/contracts/report";
import { FAULT_SENSE_VALUES, STUDY_ROLES } from "@/lib/contracts/roles";
import type { SceneSettings } from "@/lib/contracts/scene-settings";
import type { StressParameters } from "@/lib/contracts/stress";
import type { PickSetProvenance } from "@/lib/contracts/seal";
import type { CutoffSummary } from "@/lib/engine/cutoff-stations";
import type { StratigraphyUnit } from "@/lib/engine/juxtaposition";
import type { VelocityModel } from "@/lib/engine/time-depth";

/**
 * Binary columns are written as binary parameters (see db/pglite-options.ts: PGlite's default turns them into hex
 * text in JavaScript, 1.3–1.5 s for a 5.6 MB pick set) and read as base64 text that the database encodes: read such
 * a column with `base64Bytes(column)`, since PGlite also parses bytea results from hex text in JavaScript (0.6 s for
 * the same pick set, 0.03 s as base64). A plain select still works.
 */
const bytea = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => "bytea",
  toDriver: (value) => value,
  fromDriver: (value) => (value instanceof Uint8Array ? value : new Uint8Array(value as unknown as ArrayBufferLike)),
});

/** A bytea column selected as base64 text (see `bytea`) and decoded to bytes. */
export function base64Bytes(column: AnyPgColumn) {
  return sql<Uint8Array>`encode(${column}, 'base64')`.mapWith((text: string) => {
    const bytes = Buffer.from(text, "base64"); // Node's decoder skips the line breaks PostgreSQL puts every 76 characters
    return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  });
}

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () => timestamp("created_at", { withTimezone: true }).notNull().defaultNow();

export const studyRole = pgEnum("study_role", STUDY_ROLES);
export const analysisStatus = pgEnum("analysis_status", ["queued", "running", "done", "failed"]);
export const pinState = pgEnum("pin_state", ["open", "resolved"]);
export const notifyMode = pgEnum("notify_mode", ["immediate", "digest", "off"]);

export const users = pgTable("users", {
  id: id(),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  notifyMode: notifyMode("notify_mode").notNull().default("immediate"),
  lastDigestAt: timestamp("last_digest_at", { withTimezone: true }),
  createdAt: createdAt(),
});

export const studies = pgTable("studies", {
  id: id(),
  name: text("name").notNull(),
  description: text("description").notNull().default(""),
  /** the projected CRS of the pick files' x, y and the vertical reference of z, as checked (lib/crs.ts); null: not recorded */
  coordinateReference: jsonb("coordinate_reference").$type<CoordinateReference>(),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
});

export const memberships = pgTable(
  "memberships",
  {
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: studyRole("role").notNull(),
    createdAt: createdAt(),
  },
  (table) => [primaryKey({ columns: [table.studyId, table.userId] }), index("memberships_user_idx").on(table.userId)],
);

export const faults = pgTable(
  "faults",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    description: text("description").notNull().default(""),
    sense: text("sense", { enum: FAULT_SENSE_VALUES }).notNull().default("normal"),
    /** rake of the slip (degrees from the strike, negative normal, positive reverse); oblique faults only */
    rakeDeg: doublePrecision("rake_deg"),
    /** negative throw (offset of the opposite sense) is expected: the fault was inverted */
    inversion: boolean("inversion").notNull().default(false),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("faults_study_name_idx").on(table.studyId, table.name)],
);

export const segments = pgTable(
  "segments",
  {
    id: id(),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    createdAt: createdAt(),
  },
  (table) => [uniqueIndex("segments_fault_name_idx").on(table.faultId, table.name)],
);

/** One uploaded CSV of picks: immutable once saved; versions count up per fault. */
export const pickSets = pgTable(
  "pick_sets",
  {
    id: id(),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    fileName: text("file_name").notNull(),
    checksum: text("checksum").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    rowCount: integer("row_count").notNull(),
    droppedRows: integer("dropped_rows").notNull().default(0),
    units: text("units", { enum: ["m", "ft"] }).notNull(),
    segmentNames: jsonb("segment_names").$type<string[]>().notNull(),
    horizonNames: jsonb("horizon_names").$type<string[]>().notNull(),
    /** picks in compact column-major binary (see lib/picks/codec.ts), metres */
    picks: bytea("picks").notNull(),
    /** the velocity model the file's two-way times were converted to depth with; null for a file in depth */
    velocityModel: jsonb("velocity_model").$type<VelocityModel>(),
    /** set when the picks were derived from a cut-off line file (the cut-off set row holds the rest) */
    derivedFrom: jsonb("derived_from").$type<PickSetProvenance>(),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex("pick_sets_fault_version_idx").on(table.faultId, table.version), index("pick_sets_checksum_idx").on(table.faultId, table.checksum)],
);

/**
 * One uploaded cut-off line file: its vertices as read (times kept for a file in two-way time), the stations where the
 * walls were paired and the derived pick set they made, saved in the same transaction as that pick set.
 */
export const cutoffSets = pgTable(
  "cutoff_sets",
  {
    id: id(),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    pickSetId: text("pick_set_id")
      .notNull()
      .references(() => pickSets.id, { onDelete: "cascade" }),
    fileName: text("file_name").notNull(),
    checksum: text("checksum").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    vertexCount: integer("vertex_count").notNull(),
    domain: text("domain", { enum: ["depth", "time"] }).notNull(),
    velocityModel: jsonb("velocity_model").$type<VelocityModel>(),
    stationSpacingM: doublePrecision("station_spacing_m").notNull(),
    rakeDeg: doublePrecision("rake_deg").notNull().default(90),
    /** the parsed vertices in compact column-major binary (lib/picks/codec.ts), as read: z in m, or TWT in ms */
    vertices: bytea("vertices").notNull(),
    /** stations, throws per horizon, missing-wall stations and the reference frames (lib/engine/cutoff-stations.ts) */
    summary: jsonb("summary").$type<CutoffSummary>().notNull(),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex("cutoff_sets_pick_set_idx").on(table.pickSetId), index("cutoff_sets_fault_idx").on(table.faultId)],
);

/** A study's stratigraphy: its units top to bottom, each with its top horizon, kind and shale fraction. */
export const stratigraphyTables = pgTable("stratigraphy_tables", {
  studyId: text("study_id")
    .primaryKey()
    .references(() => studies.id, { onDelete: "cascade" }),
  units: jsonb("units").$type<StratigraphyUnit[]>().notNull(),
  version: integer("version").notNull().default(1),
  updatedBy: text("updated_by").references(() => users.id, { onDelete: "set null" }),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

export const analyses = pgTable(
  "analyses",
  {
    id: id(),
    pickSetId: text("pick_set_id")
      .notNull()
      .references(() => pickSets.id, { onDelete: "cascade" }),
    status: analysisStatus("status").notNull().default("queued"),
    stage: text("stage").notNull().default("queued"),
    progress: real("progress").notNull().default(0),
    /** the interpreter's settings for this run (lib/contracts/analysis-settings.ts) */
    parameters: jsonb("parameters")
      .$type<AnalysisSettings>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    /** the engine's report, its contour levels without rings (the display payload holds them) */
    result: jsonb("result").$type<AnalysisReport>(),
    /** decimated display grids for the 3D view (see lib/display/payload.ts) */
    display: bytea("display"),
    engineVersion: text("engine_version"),
    errorMessage: text("error_message"),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (table) => [index("analyses_pick_set_idx").on(table.pickSetId)],
);

/**
 * What an analysis computed besides its report and display payload, kept so nothing is computed twice: the
 * full-resolution grids (the exports read them) and each segment's triangulation of the picks (the stress screen reads
 * it). One deflated record per analysis (lib/analysis/outputs.ts), written in the transaction that ends the analysis.
 */
export const analysisOutputs = pgTable("analysis_outputs", {
  analysisId: text("analysis_id")
    .primaryKey()
    .references(() => analyses.id, { onDelete: "cascade" }),
  body: bytea("body").notNull(),
  createdAt: createdAt(),
});

export const pins = pgTable(
  "pins",
  {
    id: id(),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    pickSetId: text("pick_set_id").references(() => pickSets.id, { onDelete: "set null" }),
    pickSetVersion: integer("pick_set_version"),
    segmentName: text("segment_name"),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    x: doublePrecision("x").notNull(),
    y: doublePrecision("y").notNull(),
    z: doublePrecision("z").notNull(),
    s: doublePrecision("s").notNull(),
    t: doublePrecision("t").notNull(),
    body: text("body").notNull(),
    state: pinState("state").notNull().default("open"),
    resolvedBy: text("resolved_by").references(() => users.id, { onDelete: "set null" }),
    resolvedAt: timestamp("resolved_at", { withTimezone: true }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    deletedAt: timestamp("deleted_at", { withTimezone: true }),
  },
  (table) => [index("pins_fault_idx").on(table.faultId)],
);

export const pinReplies = pgTable(
  "pin_replies",
  {
    id: id(),
    pinId: text("pin_id")
      .notNull()
      .references(() => pins.id, { onDelete: "cascade" }),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    body: text("body").notNull(),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    deletedAt: timestamp("deleted_at", { withTimezone: true }),
  },
  (table) => [index("pin_replies_pin_idx").on(table.pinId)],
);

/** When each user last looked at each fault's pins: drives unread markers. */
export const pinVisits = pgTable(
  "pin_visits",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    visitedAt: timestamp("visited_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.userId, table.faultId] })],
);

export const viewpoints = pgTable(
  "viewpoints",
  {
    id: id(),
    faultId: text("fault_id")
      .notNull()
      .references(() => faults.id, { onDelete: "cascade" }),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    title: text("title").notNull(),
    note: text("note").notNull().default(""),
    camera: jsonb("camera").$type<CameraState>().notNull(),
    settings: jsonb("settings").$type<SceneSettings>().notNull(),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("viewpoints_fault_idx").on(table.faultId)],
);

export const viewpointLinks = pgTable("viewpoint_links", {
  id: id(),
  viewpointId: text("viewpoint_id")
    .notNull()
    .references(() => viewpoints.id, { onDelete: "cascade" }),
  token: text("token").notNull().unique(),
  includePins: boolean("include_pins").notNull().default(false),
  expiresAt: timestamp("expires_at", { withTimezone: true }),
  revokedAt: timestamp("revoked_at", { withTimezone: true }),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
});

export const invitations = pgTable("invitations", {
  id: id(),
  studyId: text("study_id")
    .notNull()
    .references(() => studies.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  role: studyRole("role").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  acceptedAt: timestamp("accepted_at", { withTimezone: true }),
  createdAt: createdAt(),
});

export const outbox = pgTable("outbox", {
  id: id(),
  to: text("to_address").notNull(),
  subject: text("subject").notNull(),
  text: text("text_body").notNull(),
  html: text("html_body"),
  kind: text("kind").notNull(),
  studyId: text("study_id"),
  createdAt: createdAt(),
});

/**
 * E-mail notifications owed to a person (a reply to their pin, an @mention, their pin resolved). Sent at once
 * for notify mode "immediate" (sentAt set when sent); queued with sentAt null for "digest" until the digest job
 * sends one e-mail per person with everything pending.
 */
export const notifications = pgTable(
  "notifications",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    studyId: text("study_id"),
    pinId: text("pin_id"),
    subject: text("subject").notNull(),
    text: text("text_body").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (table) => [index("notifications_pending_idx").on(table.userId, table.sentAt)],
);

export const auditLog = pgTable(
  "audit_log",
  {
    id: id(),
    studyId: text("study_id"),
    userId: text("user_id"),
    action: text("action").notNull(),
    target: text("target").notNull().default(""),
    details: jsonb("details")
      .$type<Record<string, unknown>>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    createdAt: createdAt(),
  },
  (table) => [index("audit_log_study_idx").on(table.studyId, table.createdAt)],
);

/** The stress state used for reactivation screening: one row per saved version, per study or per fault. */
export const stressStates = pgTable(
  "stress_states",
  {
    id: id(),
    studyId: text("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    /** null: applies to every fault of the study without its own */
    faultId: text("fault_id").references(() => faults.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    parameters: jsonb("parameters").$type<StressParameters>().notNull(),
    source: text("source").notNull().default(""),
    setBy: text("set_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (table) => [index("stress_states_scope_idx").on(table.studyId, table.faultId, table.version)],
);

// ---- running on several processes: the job queue, shared limits and revoked sessions ----------------------------

export const jobState = pgEnum("job_state", ["queued", "running", "done", "failed"]);

/**
 * The durable job queue (lib/jobs/queue.ts): analyses and exports waiting for, or held by, a worker. A worker claims a
 * job with `FOR UPDATE SKIP LOCKED` and holds it by a lease it renews while it works (its heartbeat); a job whose lease
 * ran out (its worker died) is queued again after a back-off, at most `maxAttempts` times.
 */
export const jobs = pgTable(
  "jobs",
  {
    id: id(),
    /** "analysis" (subject: the analysis id) or "export" (subject: the export file's key) */
    kind: text("kind").notNull(),
    subjectId: text("subject_id").notNull(),
    payload: jsonb("payload")
      .$type<Record<string, unknown>>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    state: jobState("state").notNull().default("queued"),
    /** claims so far (a claim whose worker died counts) */
    attempts: integer("attempts").notNull().default(0),
    maxAttempts: integer("max_attempts").notNull().default(3),
    /** not claimed before this time (the back-off after an interrupted attempt) */
    runAfter: timestamp("run_after", { withTimezone: true }).notNull().defaultNow(),
    /** the worker holding the job, and until when its lease runs unless renewed */
    leaseOwner: text("lease_owner"),
    leaseUntil: timestamp("lease_until", { withTimezone: true }),
    heartbeatAt: timestamp("heartbeat_at", { withTimezone: true }),
    lastError: text("last_error"),
    createdAt: createdAt(),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (table) => [
    // one live job per subject: a second request for the same export joins the first
    uniqueIndex("jobs_live_subject_idx")
      .on(table.kind, table.subjectId)
      .where(sql`${table.state} in ('queued', 'running')`),
    index("jobs_queued_idx")
      .on(table.kind, table.runAfter)
      .where(sql`${table.state} = 'queued'`),
    index("jobs_lease_idx")
      .on(table.leaseUntil)
      .where(sql`${table.state} = 'running'`),
  ],
);

/** Every process that works the queue, with its heartbeat (shown by /api/health). */
export const jobWorkers = pgTable("job_workers", {
  id: text("id").primaryKey(),
  /** "web" (a web process that also runs jobs, the embedded default) or "worker" (`npm run worker`) */
  role: text("role").notNull(),
  kinds: text("kinds").array().notNull(),
  slots: integer("slots").notNull(),
  running: integer("running").notNull().default(0),
  /** "running" or "draining" (after SIGTERM: takes no new jobs) */
  state: text("state").notNull().default("running"),
  startedAt: timestamp("started_at", { withTimezone: true }).notNull().defaultNow(),
  heartbeatAt: timestamp("heartbeat_at", { withTimezone: true }).notNull().defaultNow(),
});

/** Export files made by a worker (gzip), kept for a while so that every web process can serve them. */
export const exportFiles = pgTable(
  "export_files",
  {
    /** analysis id, export kind and mode */
    key: text("key").primaryKey(),
    analysisId: text("analysis_id")
      .notNull()
      .references(() => analyses.id, { onDelete: "cascade" }),
    contentType: text("content_type").notNull(),
    fileName: text("file_name").notNull(),
    body: bytea("body").notNull(),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  },
  (table) => [index("export_files_expiry_idx").on(table.expiresAt)],
);

/** Attempts per key inside a sliding window (lib/rate-limit.ts), shared by every process on a PostgreSQL server. */
export const rateLimitWindows = pgTable(
  "rate_limit_windows",
  {
    scope: text("scope").notNull(),
    key: text("key").notNull(),
    hits: timestamp("hits", { withTimezone: true }).array().notNull(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [primaryKey({ columns: [table.scope, table.key] })],
);

/** Sessions ended by signing out: refused by every process until the token would have expired anyway. */
export const revokedSessions = pgTable("revoked_sessions", {
  sessionId: text("session_id").primaryKey(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
});

export type User = typeof users.$inferSelect;
export type Study = typeof studies.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Fault = typeof faults.$inferSelect;
export type Segment = typeof segments.$inferSelect;
export type PickSet = typeof pickSets.$inferSelect;
export type CutoffSet = typeof cutoffSets.$inferSelect;
export type StratigraphyTable = typeof stratigraphyTables.$inferSelect;
export type Analysis = typeof analyses.$inferSelect;
export type Pin = typeof pins.$inferSelect;
export type PinReply = typeof pinReplies.$inferSelect;
export type Viewpoint = typeof viewpoints.$inferSelect;
export type ViewpointLink = typeof viewpointLinks.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type OutboxMessage = typeof outbox.$inferSelect;
export type AuditEntry = typeof auditLog.$inferSelect;
export type Notification = typeof notifications.$inferSelect;
export type StressState = typeof stressStates.$inferSelect;
export type Job = typeof jobs.$inferSelect;
export type JobState = (typeof jobState.enumValues)[number];
