// Recent activity in plain sentences: each audit entry becomes words with names and links, never raw ids or action
// codes. Pure: the loader (lib/activity/load.ts) resolves the ids an entry refers to and passes them in.
import type { z } from "zod";
import type { activityPartSchema } from "@/lib/contracts/studies";

/** A piece of a sentence: plain words, or words that link somewhere in the study. */
export type ActivityPart = z.infer<typeof activityPartSchema>;

export interface ActivityEntry {
  action: string;
  target: string;
  details: Record<string, unknown>;
}

/** What the study knows about the ids entries refer to (absent: deleted since, or not in this study). */
export interface ActivityLookups {
  studyId: string;
  faults: Map<string, { name: string }>;
  /** current fault ids by name, for entries written before fault ids were recorded */
  faultIdsByName: Map<string, string>;
  users: Map<string, { name: string }>;
  pins: Map<string, { faultId: string; body: string; deleted: boolean }>;
  replies: Map<string, { pinId: string }>;
  viewpoints: Map<string, { faultId: string; title: string }>;
  links: Map<string, { viewpointId: string }>;
}

const QUOTE_LIMIT = 60;

/** The first words of a note, for a sentence: markup stripped, one line, cut at a word. */
export function quoteOf(body: string): string {
  const flat = body
    .replace(/`([^`]*)`/g, "$1")
    .replace(/\*\*([^*]+)\*\*/g, "$1")
    .replace(/\[([^\]]+)\]\([^)]*\)/g, "$1")
    .replace(/\s+/g, " ")
    .trim();
  if (flat.length <= QUOTE_LIMIT) return `“${flat}”`;
  const cut = flat.slice(0, QUOTE_LIMIT);
  const space = cut.lastIndexOf(" ");
  return `“${(space > QUOTE_LIMIT / 2 ? cut.slice(0, space) : cut).trimEnd()}…”`;
}

const REGIME_WORDS: Record<string, string> = {
  normal: "normal faulting",
  "strike-slip": "strike-slip faulting",
  reverse: "reverse faulting",
  custom: "custom",
};

const text = (words: string): ActivityPart => ({ text: words });
const str = (value: unknown): string | undefined => (typeof value === "string" && value.length > 0 ? value : undefined);
const num = (value: unknown): number | undefined => (typeof value === "number" && Number.isFinite(value) ? value : undefined);

/** Sentence parts after the actor's name ("uploaded … to QG-1."), ending with a full stop. */
export function activitySentence(entry: ActivityEntry, lookups: ActivityLookups): ActivityPart[] {
  const { details } = entry;
  const faultHref = (faultId: string, query = "") => `/studies/${lookups.studyId}/faults/${faultId}${query}`;

  /** The fault by id (linked), or by the name it had (linked if a fault of that name still exists). */
  const fault = (faultId: string | undefined, nameAtTheTime?: string): ActivityPart => {
    const known = faultId ? lookups.faults.get(faultId) : undefined;
    if (faultId && known) return { text: known.name, href: faultHref(faultId) };
    if (nameAtTheTime) {
      const current = lookups.faultIdsByName.get(nameAtTheTime);
      return current && !faultId ? { text: nameAtTheTime, href: faultHref(current) } : text(nameAtTheTime);
    }
    return text("a fault since removed");
  };
  const person = (userId: string | undefined): ActivityPart => text((userId && lookups.users.get(userId)?.name) || "a former member");
  const viewpointWords = (viewpointId: string | undefined, titleAtTheTime?: string): ActivityPart[] => {
    const viewpoint = viewpointId ? lookups.viewpoints.get(viewpointId) : undefined;
    const title = viewpoint?.title ?? titleAtTheTime;
    const faultId = viewpoint?.faultId ?? str(details.faultId);
    const named = title ? text(`the viewpoint “${title}”`) : text("a viewpoint");
    return faultId ? [named, text(" of "), fault(faultId)] : [named];
  };
  const pinWords = (pinId: string | undefined, deletedBody?: string): ActivityPart[] => {
    const pin = pinId ? lookups.pins.get(pinId) : undefined;
    const faultId = pin?.faultId ?? str(details.faultId);
    const on: ActivityPart[] = faultId ? [text(" on "), fault(faultId)] : [];
    const body = pin?.body ?? deletedBody;
    if (pin && !pin.deleted && faultId && lookups.faults.has(faultId)) {
      return [{ text: "a note", href: faultHref(faultId, `?pin=${pinId}`) }, ...on, ...(body ? [text(`: ${quoteOf(body)}`)] : [])];
    }
    return [text("a note"), ...on, ...(body ? [text(`: ${quoteOf(body)}`)] : [])];
  };
  const end = (parts: ActivityPart[]): ActivityPart[] => [...parts, text(".")];

  switch (entry.action) {
    case "study.create":
      return end([text("created the study")]);
    case "study.update":
      return end([text("edited the study’s name or description")]);
    case "fault.create":
      return end([text("added the fault "), fault(str(details.faultId), entry.target)]);
    case "fault.update":
      return end([text("edited the fault "), fault(str(details.faultId), entry.target)]);
    case "fault.delete":
      return end([text(`removed the fault ${entry.target || "(unnamed)"}`)]);
    case "pickset.upload": {
      const rows = num(details.rows);
      const derived = details.derivedFrom === "cutoffs";
      const file = entry.target ? `${derived ? "cut-off lines" : "pick set"} ${entry.target}` : derived ? "cut-off lines" : "a pick set";
      const count = rows !== undefined ? `${rows.toLocaleString("en")} ${derived ? "throw picks derived" : "picks"}` : "";
      const about = [count, details.depthConverted ? "depth-converted from two-way time" : ""].filter(Boolean).join(", ");
      return end([text(`uploaded ${file} to `), fault(str(details.faultId)), ...(about ? [text(` (${about})`)] : [])]);
    }
    case "stratigraphy.set": {
      const units = num(details.units);
      return end([text(`set the study’s stratigraphy table${units !== undefined ? ` (${units} unit${units === 1 ? "" : "s"})` : ""}`)]);
    }
    case "member.invite":
      return end([text(`invited ${entry.target}${str(details.role) ? ` as ${details.role}` : ""}`)]);
    case "member.accept-invitation":
      return end([text(`joined the study${str(details.role) ? ` as ${details.role}` : ""}`)]);
    case "member.role":
      return end([
        text("made "),
        person(entry.target),
        text(str(details.role) ? ` ${details.role === "owner" || details.role === "interpreter" ? "an" : "a"} ${details.role}` : " a member with another role"),
      ]);
    case "member.remove":
      return end([text("removed "), person(entry.target), text(" from the study")]);
    case "pin.create":
      return end([text("pinned "), ...pinWords(entry.target)]);
    case "pin.resolve":
      return end([text("resolved "), ...pinWords(entry.target)]);
    case "pin.reopen":
      return end([text("reopened "), ...pinWords(entry.target)]);
    case "pin.delete":
      return end([text("deleted "), ...pinWords(undefined, str(details.body))]);
    case "pin.reply.delete": {
      const pinId = str(details.pinId) ?? lookups.replies.get(entry.target)?.pinId;
      return end([text("deleted a reply to "), ...pinWords(pinId)]);
    }
    case "viewpoint.create":
      return end([text("saved "), ...viewpointWords(entry.target, str(details.title))]);
    case "viewpoint.update":
      return end([text("edited "), ...viewpointWords(entry.target, str(details.title))]);
    case "viewpoint.delete":
      return end([text("deleted "), ...viewpointWords(undefined, str(details.title))]);
    case "viewpoint-link.create": {
      const days = num(details.expiresInDays);
      const terms = [details.includePins ? "with pinned notes" : "without pinned notes", days ? `for ${days} day${days === 1 ? "" : "s"}` : "with no expiry"];
      return end([
        text("shared "),
        ...viewpointWords(str(details.viewpointId) ?? lookups.links.get(entry.target)?.viewpointId),
        text(` as a read-only link (${terms.join(", ")})`),
      ]);
    }
    case "viewpoint-link.revoke":
      return end([text("turned off a shared link to "), ...viewpointWords(str(details.viewpointId) ?? lookups.links.get(entry.target)?.viewpointId)]);
    case "stress.set": {
      const version = num(details.version);
      const regime = str(details.regime);
      const about = [version !== undefined ? `version ${version}` : "", regime ? (REGIME_WORDS[regime] ?? regime) : ""].filter(Boolean).join(", ");
      const studyWide = entry.target.startsWith("study:");
      const subject: ActivityPart[] = studyWide ? [text("the study’s default stress state")] : [text("the stress state of "), fault(entry.target)];
      return end([text("set "), ...subject, ...(about ? [text(` (${about})`)] : [])]);
    }
    default:
      // an event this page has no words for yet: say what kind of thing changed, never its id
      return end([text(`made a change (${entry.action.replace(/[._-]+/g, " ")})`)]);
  }
}
