// Pin and reply text: @mentions and a markdown-lite (links, **bold**, `code`). Pure functions shared by the
// server (who to e-mail) and the browser (what to draw). The renderer produces a token tree that React
// draws as text nodes and <a>/<strong>/<code> elements: nothing is ever handed to the DOM as HTML, and a
// link is only a link when its address parses as http: or https:.

export type Inline =
  | { kind: "text"; text: string }
  | { kind: "bold"; children: Inline[] }
  | { kind: "code"; text: string }
  | { kind: "link"; href: string; text: string }
  | { kind: "mention"; handle: string; text: string };

/** One line of the text; an empty line is a paragraph gap. */
export type RichLine = Inline[];

export const PIN_TEXT_MAX = 4000;

// An @ that does not follow a word character, dot or another @ (so "ana@quillon.test" is not a mention).
const MENTION = /(?<![\w.@])@([A-Za-z0-9](?:[A-Za-z0-9._-]{0,62}[A-Za-z0-9])?)/g;
const CODE_SPAN = /`[^`\n]+`/g;

/** The distinct handles mentioned in a text, lower-case, outside `code` spans. */
export function parseMentions(text: string): string[] {
  const withoutCode = text.replace(CODE_SPAN, " ");
  const handles = new Set<string>();
  for (const match of withoutCode.matchAll(MENTION)) handles.add(match[1].toLowerCase());
  return [...handles];
}

export interface MentionCandidate {
  id: string;
  email: string;
  name: string;
}

/** The handles a person answers to: e-mail local part, full name with dots or run together, first name. */
export function mentionKeys(person: MentionCandidate): string[] {
  const local = person.email.split("@")[0].toLowerCase();
  const words = person.name.trim().toLowerCase().split(/\s+/).filter(Boolean);
  const keys = new Set([local]);
  if (words.length > 0) {
    keys.add(words.join("."));
    keys.add(words.join(""));
    keys.add(words.join("_"));
    keys.add(words.join("-"));
    keys.add(words[0]);
  }
  return [...keys];
}

/**
 * The members a text mentions. A handle that fits several people (a shared first name) mentions nobody,
 * unless it is someone's exact e-mail local part.
 */
export function resolveMentions<T extends MentionCandidate>(text: string, members: readonly T[]): T[] {
  const handles = parseMentions(text);
  if (handles.length === 0) return [];
  const found = new Map<string, T>();
  for (const handle of handles) {
    const byLocal = members.filter((member) => member.email.split("@")[0].toLowerCase() === handle);
    const candidates = byLocal.length > 0 ? byLocal : members.filter((member) => mentionKeys(member).includes(handle));
    if (candidates.length === 1) found.set(candidates[0].id, candidates[0]);
  }
  return [...found.values()];
}

/** The address as a link target when it is a well-formed http(s) URL; null for anything else (javascript:, data:, …). */
export function safeHref(raw: string): string | null {
  const trimmed = raw.trim();
  if (!/^https?:\/\//i.test(trimmed)) return null;
  try {
    const url = new URL(trimmed);
    if (url.protocol !== "http:" && url.protocol !== "https:") return null;
    if (url.username || url.password) return null;
    return url.toString();
  } catch {
    return null;
  }
}

// code | bold | [label](address) | bare URL | mention
const INLINE =
  /`([^`\n]+)`|\*\*(?=\S)([^\n]*?\S)\*\*|\[([^\]\n]{1,200})\]\(([^()\s]{1,2000})\)|(https?:\/\/[^\s<>"'`]+)|(?<![\w.@])@([A-Za-z0-9](?:[A-Za-z0-9._-]{0,62}[A-Za-z0-9])?)/g;

function parseInline(line: string, allowBold: boolean): Inline[] {
  const out: Inline[] = [];
  const pushText = (text: string) => {
    if (!text) return;
    const last = out[out.length - 1];
    if (last?.kind === "text") last.text += text;
    else out.push({ kind: "text", text });
  };
  let cursor = 0;
  for (const match of line.matchAll(INLINE)) {
    const [whole, code, bold, label, address, bare, mention] = match;
    const start = match.index;
    pushText(line.slice(cursor, start));
    cursor = start + whole.length;
    if (code !== undefined) out.push({ kind: "code", text: code });
    else if (bold !== undefined) {
      if (allowBold) out.push({ kind: "bold", children: parseInline(bold, false) });
      else pushText(whole);
    } else if (label !== undefined) {
      const href = safeHref(address);
      if (href) out.push({ kind: "link", href, text: label });
      else pushText(label);
    } else if (bare !== undefined) {
      // a sentence's closing punctuation is not part of the address
      const trailing = /[.,;:!?)\]]+$/.exec(bare)?.[0] ?? "";
      const address = bare.slice(0, bare.length - trailing.length);
      const href = safeHref(address);
      if (href) out.push({ kind: "link", href, text: address });
      else pushText(address);
      pushText(trailing);
    } else if (mention !== undefined) out.push({ kind: "mention", handle: mention.toLowerCase(), text: `@${mention}` });
  }
  pushText(line.slice(cursor));
  return out;
}

/** Markdown-lite to a token tree, one entry per line. */
export function renderPinText(text: string): RichLine[] {
  return text
    .replace(/\r\n?/g, "\n")
    .split("\n")
    .map((line) => parseInline(line, true));
}

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
export const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (char) => HTML_ESCAPES[char]);

function inlineHtml(node: Inline): string {
  switch (node.kind) {
    case "text":
      return escapeHtml(node.text);
    case "bold":
      return `<strong>${node.children.map(inlineHtml).join("")}</strong>`;
    case "code":
      return `<code>${escapeHtml(node.text)}</code>`;
    case "link":
      return `<a href="${escapeHtml(node.href)}" rel="noopener noreferrer nofollow">${escapeHtml(node.text)}</a>`;
    case "mention":
      return `<span class="mention">${escapeHtml(node.text)}</span>`;
  }
}

/** The same tree as escaped HTML (for HTML e-mail bodies). */
export function pinTextToHtml(text: string): string {
  return renderPinText(text)
    .map((line) => line.map(inlineHtml).join(""))
    .join("<br>");
}

export interface Mentionable {
  name: string;
  handle: string;
}

/** The "@partial" right before the caret while a mention is being typed (read as MENTION reads it), else null. */
export function mentionBeforeCaret(text: string, caret: number): { start: number; query: string } | null {
  const match = /(^|[^\w.@])@([\w.-]*)$/.exec(text.slice(0, caret));
  if (!match) return null;
  return { start: caret - match[2].length - 1, query: match[2].toLowerCase() };
}

/** People whose handle, or a word of whose name, starts with the query: handles first, at most six. */
export function mentionSuggestions(people: Mentionable[], query: string): Mentionable[] {
  const byHandle = people.filter((person) => person.handle.toLowerCase().startsWith(query));
  const byName = people.filter(
    (person) =>
      !byHandle.includes(person) &&
      person.name
        .toLowerCase()
        .split(/\s+/)
        .some((word) => word.startsWith(query)),
  );
  return [...byHandle, ...byName].slice(0, 6);
}
