import { describe, expect, it } from "vitest";
import { htmlFromText } from "@/lib/mail-html";

const ORIGIN = "https://slipfield.example.test";
const bodyOf = (html: string) => html.slice(html.indexOf(">Slipfield</div>") + ">Slipfield</div>".length, html.lastIndexOf("</div>"));

describe("the HTML part of an e-mail", () => {
  it("escapes everything a note could carry", () => {
    const html = htmlFromText(`Ana wrote:\n\n<script>alert("x")</script> & <b>bold</b> 'quoted'`, ORIGIN);
    expect(html).not.toContain("<script>");
    expect(html).not.toContain("<b>");
    expect(bodyOf(html)).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &lt;b&gt;bold&lt;/b&gt; &#39;quoted&#39;");
  });

  it("makes links into this Slipfield clickable and leaves other links as text", () => {
    const html = htmlFromText(`Open it: ${ORIGIN}/studies/a/faults/b?pin=c.\nSee also https://elsewhere.example/login (typed by someone)`, ORIGIN);
    expect(html).toContain(`<a href="${ORIGIN}/studies/a/faults/b?pin=c" style="color:#247a75">${ORIGIN}/studies/a/faults/b?pin=c</a>.`);
    expect(html).not.toContain('href="https://elsewhere.example');
    expect(html).toContain("https://elsewhere.example/login (typed by someone)");
  });

  it("an attribute-breaking link into Slipfield stays inside its quotes", () => {
    const html = htmlFromText(`${ORIGIN}/x?a=1&b=2`, ORIGIN);
    expect(html).toContain(`<a href="${ORIGIN}/x?a=1&amp;b=2"`);
  });

  it("keeps paragraphs, line breaks and indentation", () => {
    const html = bodyOf(htmlFromText("Hello Ana,\r\n\r\nTwo things happened:\n\n1. First\n   the note\n\n\nBye", ORIGIN));
    const paragraphs = [...html.matchAll(/<p[^>]*>(.*?)<\/p>/gs)].map((match) => match[1]);
    expect(paragraphs).toHaveLength(4);
    expect(paragraphs[0]).toBe("Hello Ana,");
    expect(paragraphs[2]).toBe('1. First<br><span style="display:inline-block;padding-left:1.5em">the note</span>');
    expect(paragraphs[3]).toBe("Bye");
  });
});
