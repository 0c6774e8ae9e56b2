import { describe, expect, it } from "vitest";
import { escapeHtml, renderEmail } from "../../../lib/mail/template";

describe("escapeHtml", () => {
  it("escapes the five HTML-significant characters", () => {
    expect(escapeHtml(`<a href="x">Tom's & Jerry's</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;Tom&#39;s &amp; Jerry&#39;s&lt;/a&gt;");
  });
});

describe("renderEmail", () => {
  it("escapes the title, every paragraph and the action in the HTML but keeps the text plain", () => {
    const { text, html } = renderEmail({
      title: "<b>Run</b>",
      paragraphs: ["1 < 2", "a & b"],
      action: { label: "Go <now>", url: "https://tankbook.test/r?x=1&y=2" },
    });
    expect(html).toContain("&lt;b&gt;Run&lt;/b&gt;");
    expect(html).toContain("1 &lt; 2");
    expect(html).toContain("a &amp; b");
    expect(html).toContain("Go &lt;now&gt;");
    expect(html).toContain('href="https://tankbook.test/r?x=1&amp;y=2"');
    expect(html).not.toMatch(/<b>|<now>/);
    expect(text.split("\n").slice(0, 5)).toEqual(["<b>Run</b>", "", "1 < 2", "", "a & b"]);
    expect(text).toContain("Go <now>: https://tankbook.test/r?x=1&y=2");
  });

  it("renders without an action", () => {
    const { text, html } = renderEmail({ title: "Hello", paragraphs: ["One."] });
    expect(html).not.toContain("<a ");
    expect(text).not.toContain(": http");
  });

  it("throws TypeError for a javascript: or relative action URL", () => {
    expect(() => renderEmail({ title: "t", paragraphs: [], action: { label: "x", url: "javascript:alert(1)" } })).toThrow(TypeError);
    expect(() => renderEmail({ title: "t", paragraphs: [], action: { label: "x", url: "/runs/1" } })).toThrow(/absolute http/);
  });
});
