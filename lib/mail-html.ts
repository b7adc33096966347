// The HTML part of Slipfield's e-mails, made from their text part so the two always say the same thing.
import { escapeHtml } from "@/lib/pins/text";

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
const TRAILING_PUNCTUATION = /[.,;:!?)\]]+$/;

/**
 * One line of text as HTML: everything escaped; a link is clickable only when it points into this Slipfield
 * (`appOrigin`), so a link someone typed into a note stays plain text in the mail.
 */
function lineToHtml(line: string, appOrigin: string) {
  let html = "";
  let from = 0;
  for (const match of line.matchAll(URL_PATTERN)) {
    const url = match[0].replace(TRAILING_PUNCTUATION, "");
    const start = match.index;
    html += escapeHtml(line.slice(from, start));
    let ours = false;
    try {
      ours = new URL(url).origin === appOrigin;
    } catch {
      ours = false;
    }
    html += ours ? `<a href="${escapeHtml(url)}" style="color:#247a75">${escapeHtml(url)}</a>` : escapeHtml(url);
    from = start + url.length;
  }
  return html + escapeHtml(line.slice(from));
}

/** The e-mail's text as a small HTML page: paragraphs at blank lines, line breaks kept, indented lines kept indented. */
export function htmlFromText(text: string, appOrigin: string): string {
  const paragraphs = text
    .replace(/\r\n?/g, "\n")
    .split(/\n{2,}/)
    .filter((paragraph) => paragraph.trim() !== "")
    .map((paragraph) => {
      const lines = paragraph.split("\n").map((line) => {
        const indent = /^\s*/.exec(line)![0].length;
        const body = lineToHtml(line.trimStart(), appOrigin);
        return indent > 0 ? `<span style="display:inline-block;padding-left:${Math.min(indent, 12) * 0.5}em">${body}</span>` : body;
      });
      return `<p style="margin:0 0 14px">${lines.join("<br>")}</p>`;
    });
  return [
    "<!doctype html>",
    '<html><head><meta charset="utf-8"></head>',
    '<body style="margin:0;padding:24px;background:#eefaf8;font-family:system-ui,-apple-system,Segoe UI,sans-serif;font-size:15px;line-height:1.5;color:#0b2627">',
    '<div style="max-width:560px;margin:0 auto;background:#ffffff;border:1px solid #aee4dd;border-radius:8px;padding:20px 24px">',
    '<div style="font-weight:600;color:#21625f;letter-spacing:0.02em;margin-bottom:16px">Slipfield</div>',
    ...paragraphs,
    "</div></body></html>",
  ].join("\n");
}
